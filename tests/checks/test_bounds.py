"""``bounds``: values outside their physical range.  Physical limits are common
practice (a proportion lies in [0, 1]; x = D p >= 0 so mean(D p) - 1 >= -1;
a p-value lies in (0, 1])."""

from __future__ import annotations

import textwrap

import pytest

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import parse_text

BASE = "title: Invented claim\nmetric: {metric}\nestimate: {estimate}\n"


def bounds(check_claim, metric, estimate, extra=""):
    report = check_claim(BASE.format(metric=metric, estimate=estimate) + extra, only=["bounds"])
    assert all(f.check == "bounds" for f in report.findings)
    return report.findings


def statuses(findings):
    return [f.status for f in findings]


def test_a_proportion_above_one_is_impossible(check_claim):
    (f,) = bounds(check_claim, "proportion", "1.02")
    assert f.status == "fail"
    assert f.message == "The estimate 1.02 lies above 1, which a proportion cannot do."
    assert f.reported == 1.02 and f.details["field"] == "estimate" and f.details["limit"] == 1.0


@pytest.mark.parametrize("estimate, status", [
    ("1.0", "pass"), ("1.00", "pass"), ("100%", "pass"),  # [0.95, 1.05] etc. reach 1
    ("1.1", "fail"), ("100.4%", "fail"), ("1.005", "fail"),  # the whole printed interval is above 1
    ("0", "pass"), ("-0.1", "fail"), ("-0.00", "pass"), ("-0.004", "fail"),
])
def test_the_printed_interval_decides_at_the_edges(check_claim, estimate, status):
    assert statuses(bounds(check_claim, "proportion", estimate))[0] == status


def test_a_noisy_fidelity_above_one(check_claim):
    (f,) = bounds(check_claim, "linear-xeb", "1.02", "stat_error: 0.05\n")
    assert f.status == "warn"
    assert f.message == ("The estimate 1.02 lies above 1, the most a linear XEB fidelity can be, by 0.27 "
                         "standard errors: possible through noise, worth a word from the authors.")
    (f,) = bounds(check_claim, "linear-xeb", "1.12", "stat_error: 0.02\n")
    assert f.status == "fail" and "by more than 3 standard errors" in f.message


def test_three_standard_errors_is_the_edge(check_claim):
    # "1.035" is [1.0345, 1.0355]; 0.0345 / 0.0115 = 3 exactly at the printed edge ("0.011" is
    # [0.0105, 0.0115]); "1.036" is one digit beyond.
    assert statuses(bounds(check_claim, "linear-xeb", "1.035", "stat_error: 0.011\n")) == ["warn"]
    assert statuses(bounds(check_claim, "linear-xeb", "1.037", "stat_error: 0.011\n")) == ["fail"]


def test_a_fidelity_above_one_without_an_error_is_a_question(check_claim):
    (f,) = bounds(check_claim, "linear-xeb", "1.2")
    assert f.status == "warn" and "no standard error is printed" in f.message


def test_linear_xeb_cannot_go_below_minus_one_through_noise(check_claim):
    (f,) = bounds(check_claim, "linear-xeb", "-1.5", "stat_error: 0.4\n")
    assert f.status == "fail" and f.message == "The estimate -1.5 lies below -1, which a linear XEB fidelity cannot do."


def test_errors_must_be_positive(check_claim):
    found = bounds(check_claim, "mean", "5", "stat_error: 0\nsyst_error: 0\nsd: -1\n")
    assert [(f.status, f.details["field"]) for f in found] == [("fail", "stat_error"), ("fail", "sd")]
    assert found[0].message == "The statistical error is printed as 0; an error must be more than zero."
    assert statuses(bounds(check_claim, "mean", "5", "stat_error: -0.1\n")) == ["fail"]
    assert statuses(bounds(check_claim, "mean", "5", "syst_error: -0.1\n")) == ["fail"]


@pytest.mark.parametrize("p, status", [("1.5", "fail"), ("1", "pass"), ("0.05", "pass"), ("1e-400", "pass"),
                                       ("'< 1e-300'", "pass"), ("0", "warn"), ("0.000", "warn"), ("-0.01", "fail")])
def test_p_values(check_claim, p, status):
    found = bounds(check_claim, "mean", "5", f"significance: {{p_value: {p}}}\n")
    assert statuses(found) == [status]
    if status == "fail":
        assert found[0].message.startswith("The p-value is printed as ")


def test_threshold_of_a_bounded_metric(check_claim):
    (f,) = bounds(check_claim, "proportion", "0.5", "threshold: 1.5\n")
    assert f.status == "fail" and f.message == "The threshold 1.5 lies outside [0, 1], the range of a proportion."
    assert statuses(bounds(check_claim, "mean", "0.5", "threshold: 1.5\n")) == ["pass"]


def test_the_interval(check_claim):
    assert statuses(bounds(check_claim, "proportion", "0.5", "interval: {low: 0.6, high: 0.4}\n")) == ["fail"]
    (f,) = bounds(check_claim, "proportion", "0.5", "interval: {low: 0.6, high: 0.7}\n")
    assert f.message == "The estimate 0.5 lies outside its own interval [0.6, 0.7]."
    # An estimate equal to the printed low end is inside its interval.
    assert statuses(bounds(check_claim, "proportion", "0.5", "interval: {low: 0.5, high: 0.7}\n")) == ["pass"]


def test_parts_budget_and_extrapolation(check_claim):
    found = bounds(check_claim, "proportion", "0.5",
                   "parts: [{label: a, estimate: 1.5, stat_error: -1}, {label: b, estimate: 0.4}]\n"
                   "error_budget: [{name: g, error: 1.5, error_sd: -0.1}]\n"
                   "extrapolation: {factor: 0, factor_error: -1}\n")
    assert [(f.status, f.details.get("part") or f.details.get("component") or f.details.get("field"))
            for f in found] == [("fail", "a"), ("fail", "a"), ("fail", "g"), ("fail", "g"),
                                ("fail", "extrapolation.factor"), ("fail", "extrapolation.factor_error")]
    assert found[0].message == "Part a: the estimate 1.5 lies above 1, which a proportion cannot do."


def test_a_clean_claim_passes_once_and_counts_what_it_checked(check_claim):
    found = bounds(check_claim, "linear-xeb", "2.24e-3", "stat_error: 0.2e-3\nsyst_error: 0.1e-3\n"
                   "significance: {p_value: 1e-5}\n")
    assert statuses(found) == ["pass"]
    assert found[0].message == "All 4 printed values checked lie in their physical ranges."
    assert found[0].details["values_checked"] == 4


# --- parts: each part's values get their own findings, labelled with the part -------------------

def part_findings(text: str):
    claim = claim_from_document(parse_text(textwrap.dedent(text), "claim.yaml", "yaml"))
    return run_checks(claim, ["bounds"]).findings


def test_an_impossible_part_is_flagged_with_its_label():
    text = """
        title: parts
        metric: proportion
        estimate: 0.9
        parts:
          - {label: run 1, estimate: 0.91, stat_error: 0.01}
          - {label: run 2, estimate: 1.02, stat_error: 0.01}
          - {label: run 3, estimate: 0.88, stat_error: 0}
    """
    failed = [f for f in part_findings(text) if f.status == "fail"]
    assert {f.details["part"] for f in failed} == {"run 2", "run 3"}
    assert all(f.message.startswith(f"Part {f.details['part']}:") for f in failed)


def test_clean_parts_pass():
    text = """
        title: parts
        metric: linear-xeb
        estimate: 2.0e-3
        parts:
          - {label: a, estimate: 2.1e-3, stat_error: 0.5e-3}
          - {label: b, estimate: 1.9e-3, stat_error: 0.5e-3}
    """
    (f,) = part_findings(text)
    assert f.status == "pass"


@pytest.mark.parametrize("field, text, hint", [
    ("estimate", "estimate: 91.3", "The estimate 91.3 lies above 1, which a proportion cannot do; "
                                   "a proportion is at most 1: did you mean 91.3%?"),
    ("threshold", "estimate: 0.913\nthreshold: 50", "the range of a proportion; a proportion is at most 1: "
                                                     "did you mean 50%?"),
])
def test_a_percentage_without_its_sign_is_named_through_the_cli(write_claim, field, text, hint):
    import io
    import json

    from checker.cli import run

    out = io.StringIO()
    status = run(["check", str(write_claim(f"title: t\nmetric: proportion\n{text}\n")), "--json",
                  "--only", "bounds"], out, io.StringIO())
    (finding,) = json.loads(out.getvalue())["findings"]
    assert status == 1 and finding["details"]["field"] == field and hint in finding["message"]
    # 150 cannot be a percentage, and 1.02 is more likely a value just above 1: no guess then.
    for estimate in ("150", "1.02"):
        out = io.StringIO()
        run(["check", str(write_claim(f"title: t\nmetric: proportion\nestimate: {estimate}\n")), "--json",
             "--only", "bounds"], out, io.StringIO())
        assert "did you mean" not in out.getvalue()
