"""Hostile numbers, class by class, through the real command line under resource limits.

Each class was a crash or a hang before: decimal exponents beyond what the decimal
arithmetic holds (decimal.InvalidOperation), divisions by tiny or subnormal values
(ZeroDivisionError), whole numbers beyond the double range or where the double's
spacing exceeds 1 (OverflowError, an endless unit-step loop), and percentages where
they mean nothing.  Members of each class are generated over every field they apply to;
each must give exit 2 with one line naming the field, or a normal result (exit 0 or 1,
nothing on stderr, finite JSON), within the time and memory limits of limited.py.
The claims are invented.
"""

from __future__ import annotations

import itertools
import json

import pytest

from limited import assert_answered, assert_refused, claimcheck, claimcheck_many

BASE = {
    "title": "Hostile numbers (invented)",
    "metric": "linear-xeb",
    "qubits": "20",
    "estimate": "2.0e-3",
    "stat_error": "0.3e-3",
    "samples": "2000000",
    "threshold": "0",
    "significance": {"sigma": "6.7", "p_value": "1.0e-11"},
}
# Every number field of the vocabulary, with the context it needs.
NUMBER_FIELDS = {
    "estimate": {}, "stat_error": {}, "syst_error": {}, "threshold": {}, "sd": {"metric": "mean"},
    "significance.sigma": {}, "significance.p_value": {}, "significance.required_sigma": {},
    "significance.global_sigma": {"trials": "12"}, "significance.upcrossing_sigma": {},
    "interval.low": {"interval": {"low": "1.5e-3", "high": "2.5e-3"}},
    "interval.high": {"interval": {"low": "1.5e-3", "high": "2.5e-3"}},
    "interval.level": {"interval": {"low": "1.5e-3", "high": "2.5e-3"}},
    "extrapolation.factor": {"extrapolation": {"factor": "0.9"}},
    "extrapolation.factor_error": {"extrapolation": {"factor": "0.9"}},
    "parts.0.estimate": {"parts": [{"estimate": "2.1e-3", "stat_error": "0.4e-3"},
                                   {"estimate": "1.9e-3", "stat_error": "0.4e-3"}]},
    "parts.0.stat_error": {"parts": [{"estimate": "2.1e-3", "stat_error": "0.4e-3"},
                                     {"estimate": "1.9e-3", "stat_error": "0.4e-3"}]},
    "combination.estimate": {"combination": {"method": "equal"},
                             "parts": [{"estimate": "2.1e-3"}, {"estimate": "1.9e-3"}]},
    "error_budget.0.error": {"error_budget": [{"name": "gates", "count": "100", "error": "0.001"}]},
    "tolerance": {},
}
COUNT_FIELDS = {
    "samples": {}, "circuits": {}, "qubits": {}, "trials": {}, "items": {"metric": "mean", "sd": "1",
                                                                          "integer_data": "true"},
    "parts.0.samples": {"parts": [{"estimate": "2.1e-3", "stat_error": "0.4e-3"}]},
    "error_budget.0.count": {"error_budget": [{"name": "gates", "count": "100", "error": "0.001"}]},
}


def claim_text(fields: dict) -> str:
    """A YAML claim from nested fields; every value is written as plain text (so
    numbers keep their printed form)."""
    def emit(value, indent):
        pad = "  " * indent
        if isinstance(value, dict):
            return "".join(f"{pad}{k}:\n{emit(v, indent + 1)}" if isinstance(v, (dict, list))
                           else f"{pad}{k}: {v}\n" for k, v in value.items())
        return "".join(f"{pad}-\n{emit(item, indent + 1)}" for item in value)
    return emit(fields, 0)


def with_field(path: str, text: str, context: dict, base: dict = BASE) -> dict:
    doc = json.loads(json.dumps(base))
    for key, value in context.items():
        doc[key] = json.loads(json.dumps(value))
    node = doc
    keys = path.split(".")
    for key in keys[:-1]:
        node = node[int(key)] if key.isdigit() else node.setdefault(key, {})
    node[int(keys[-1]) if keys[-1].isdigit() else keys[-1]] = text
    return doc


def write(tmp_path, name: str, doc: dict):
    path = tmp_path / name
    path.write_text(claim_text(doc), encoding="utf-8")
    return path


# --- exponents beyond the decimal arithmetic --------------------------------------------

HUGE_EXPONENTS = ["1e-2000100", "1e+2000100", "2.5e-10000000", "-3e1000000", "1.0e-999999999999", "7e+99999999"]


def test_exponents_beyond_the_arithmetic_are_refused_in_every_field(tmp_path):
    cases, expected = [], []
    for i, ((path, context), text) in enumerate(itertools.product(NUMBER_FIELDS.items(), HUGE_EXPONENTS)):
        claim = write(tmp_path, f"c{i}.yaml", with_field(path, text, context))
        cases.append(["check", claim, "--json"])
        expected.append((claim, path))
    # 10^-999,999 is the smallest power read; a p-value that small is a normal finding.
    cases.append(["check", write(tmp_path, "smallest.yaml", with_field("significance.p_value", "1e-999999", {})),
                  "--json"])
    outcomes = claimcheck_many(cases)
    for outcome, (claim, path) in zip(outcomes, expected):
        assert_refused(outcome, claim, path, "beyond")
    assert_answered(outcomes[-1])
    json.loads(outcomes[-1].stdout, parse_constant=lambda token: pytest.fail(f"{token} in JSON"))


def test_the_reproductions_through_the_console_script(tmp_path):
    # As first reported: estimate 1e-2000100 (decimal.InvalidOperation), interval.level 1e-17
    # (ZeroDivisionError), proportion 1e20 over 1e9 samples (a unit-step loop that never ended).
    claim = write(tmp_path, "c.yaml", with_field("estimate", "1e-2000100", {}))
    notes = tmp_path / "notes.md"
    assert_refused(claimcheck("check", claim, "--markdown", notes), claim, "estimate", outputs=[notes])
    claim = write(tmp_path, "c.yaml", with_field("interval.level", "1e-17", NUMBER_FIELDS["interval.level"]))
    assert_answered(claimcheck("check", claim))
    doc = {"title": "granularity (invented)", "metric": "proportion", "estimate": "1e20", "samples": "1000000000"}
    assert_answered(claimcheck("check", write(tmp_path, "c.yaml", doc), timeout=30))


# --- divisions by tiny and subnormal values ---------------------------------------------

TINY = ["1e-17", "5e-324", "1e-320", "1e-300"]
TINY_FIELDS = ["interval.level", "extrapolation.factor", "extrapolation.factor_error", "stat_error",
               "syst_error", "sd", "parts.0.stat_error", "error_budget.0.error", "significance.p_value",
               "tolerance", "estimate", "combination.estimate"]


def test_tiny_divisors_give_findings_or_one_line(tmp_path):
    cases = []
    for i, (metric, path, text) in enumerate(itertools.product(["linear-xeb", "proportion", "mean"], TINY_FIELDS,
                                                               TINY)):
        context = dict(NUMBER_FIELDS[path])
        context.update({"metric": metric, "sd": "1"} if metric == "mean" else {"metric": metric})
        if metric == "proportion":
            context["estimate"] = "0.52"
        claim = write(tmp_path, f"c{i}.yaml", with_field(path, text, context))
        # Every third case also writes the referee notes, which word every finding.
        cases.append(["check", claim, "--json"] + (["--markdown", tmp_path / f"n{i}.md"] if i % 3 == 0 else []))
    for outcome in claimcheck_many(cases):
        if outcome.status == 2:
            assert_refused(outcome, outcome.argv[1])
        else:
            assert_answered(outcome)
            json.loads(outcome.stdout, parse_constant=lambda token: pytest.fail(f"{token} in JSON"))


# --- whole numbers beyond the double range, or beyond its spacing ----------------------

BIG_COUNTS = ["9" * 160, "1" + "0" * 300, "9" * 308, "123456789012345678901234567890", "1e300", "1000000000"]


def test_huge_counts_in_every_count_field(tmp_path):
    cases = []
    for i, ((path, context), text) in enumerate(itertools.product(COUNT_FIELDS.items(), BIG_COUNTS)):
        for metric in ("proportion", "mean"):
            extra = {**context, "metric": metric, "estimate": "0.52"}
            if metric == "mean":
                extra.update({"sd": "1", "integer_data": "true"})
            claim = write(tmp_path, f"c{i}{metric}.yaml", with_field(path, text, extra))
            cases.append(["check", claim, "--json"])
    for outcome in claimcheck_many(cases):
        assert outcome.status != "hang", outcome.argv
        if outcome.status == 2:
            assert_refused(outcome, outcome.argv[1])
        else:
            assert_answered(outcome)


def test_granularity_never_loops_or_overflows(tmp_path):
    cases = []
    for i, (estimate, samples) in enumerate(itertools.product(
            ["1e20", "1.234567e20", "1e300", "-1e300", "1.7e308", "3e15", "0.5", "1e-300"],
            ["1000000000", "9" * 160, "7", "1" + "0" * 300])):
        doc = {"title": "granularity (invented)", "metric": "proportion", "estimate": estimate, "samples": samples}
        cases.append(["check", write(tmp_path, f"c{i}.yaml", doc), "--json"])
    # items x samples beyond the double range: the counts are compared exactly.
    doc = {"title": "GRIM (invented)", "metric": "mean", "estimate": "2.5", "sd": "1", "samples": "9" * 160,
           "integer_data": "true", "items": "9" * 160}
    cases.append(["check", write(tmp_path, "grim.yaml", doc), "--json"])
    for outcome in claimcheck_many(cases):
        assert_answered(outcome)


# --- percentages where they mean nothing ------------------------------------------------

NO_PERCENT = ["samples", "circuits", "qubits", "trials", "items", "significance.sigma",
              "significance.required_sigma", "significance.global_sigma", "significance.upcrossings",
              "significance.upcrossing_sigma", "parts.0.samples", "error_budget.0.count"]


def test_percentages_are_refused_where_they_mean_nothing(tmp_path):
    cases, expected = [], []
    for i, (path, text) in enumerate(itertools.product(NO_PERCENT, ["3000%", "50%", "100%", "'420%'"])):
        context = COUNT_FIELDS.get(path) or NUMBER_FIELDS.get(path) or {}
        claim = write(tmp_path, f"c{i}.yaml", with_field(path, text, context))
        cases.append(["check", claim])
        expected.append((claim, path.split(".")[-1]))
    # Where a percentage means something it stays welcome.
    doc = {"title": "percent (invented)", "metric": "proportion", "estimate": "91.2%", "stat_error": "0.9%",
           "samples": "1000", "threshold": "88%", "interval": {"low": "89.4%", "high": "92.8%", "level": "95%"},
           "tolerance": "2%"}
    cases.append(["check", write(tmp_path, "welcome.yaml", doc)])
    outcomes = claimcheck_many(cases)
    for outcome, (claim, name) in zip(outcomes, expected):
        assert_refused(outcome, claim, f"{name} is a", "percentage", "means nothing")
    assert_answered(outcomes[-1])


# --- parts beyond the limit ---------------------------------------------------------------

def test_more_parts_than_the_limit_is_one_line(tmp_path):
    from checker.claim.model import MAX_PARTS

    parts = "".join(f"  - {{label: c{i}, estimate: 2.0e-3, stat_error: 0.3e-3}}\n" for i in range(MAX_PARTS + 1))
    claim = tmp_path / "many.yaml"
    claim.write_text("title: many parts (invented)\nmetric: linear-xeb\nestimate: 2.0e-3\nparts:\n" + parts)
    assert_refused(claimcheck("check", claim), claim, "parts", f"{MAX_PARTS + 1:,} entries", f"at most {MAX_PARTS:,}")
