"""The Claim: every number a Reported value with its printed interval; counts,
definitions and bounds read as DESIGN.md says; random documents either build a
claim or raise a documented error."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from checker.claim import read_claim
from checker.claim.load import parse_text
from checker.claim.model import DEFAULT_TOLERANCE, Reported
from checker.errors import ClaimcheckError, ClaimSchemaError

CLAIM = """\
title: Invented 30-qubit claim
metric: linear-xeb
qubits: 30
estimate: 2.24e-3
stat_error: "0.20e-3"
syst_error: 0.08e-3
samples: 2.5e7
circuits: 10
threshold: 1.0e-3
trials: 12
tolerance: 1%
interval: {low: 1.5e-3, high: 2.2e-3, level: 95%}
significance:
  sigma: 4.2
  p_value: "< 0.001"
  sided: two
  required_sigma: 3.0
  upcrossings: 2
  upcrossing_sigma: 0.5
parts:
  - {label: c1, estimate: 2.5e-3, stat_error: 0.5e-3, samples: 4000000}
  - {estimate: 91.2%}
error_budget:
  - {name: two-qubit gates, count: 380, error: 0.006, error_sd: 0.001}
  - {name: readout, error: 0.02}
extrapolation: {factor: 0.95, factor_error: 0.02}
combination: {method: inverse-variance, estimate: 2.24e-3}
"""


@pytest.fixture
def claim(write_claim):
    return read_claim(write_claim(CLAIM))


def test_every_number_is_its_printed_interval(claim):
    # DESIGN.md, "Printed precision".
    assert claim.estimate.bounds == (2.235e-3, 2.245e-3) and claim.estimate.text == "2.24e-3"
    assert claim.stat_error.bounds == (0.195e-3, 0.205e-3)  # a quoted number is read the same way
    assert claim.significance.sigma.bounds == (4.15, 4.25)
    assert claim.parts[1].estimate.bounds == (0.9115, 0.9125)
    assert claim.interval.low.bounds == (1.45e-3, 1.55e-3)
    assert claim.estimate.line == 4 and claim.estimate.path == "estimate"
    assert claim.parts[0].estimate.path == "parts.0.estimate" and claim.parts[0].estimate.line == 21


def test_definitions_are_exact(claim):
    for rep in (claim.threshold, claim.trials, claim.significance.required_sigma,
                claim.significance.upcrossing_sigma, claim.interval.level):
        assert rep.exact, rep.path
    assert claim.threshold.value == 1e-3 and claim.interval.level.value == 0.95
    assert claim.tolerance == 0.01


def test_counts_exact_when_written_out_and_printed_with_an_exponent(claim):
    assert claim.parts[0].samples.exact and claim.parts[0].samples.value == 4e6
    assert claim.circuits.exact and claim.qubit_count == 30
    assert claim.samples.bounds == (2.45e7, 2.55e7)  # "2.5e7" carries printed precision
    assert not claim.significance.upcrossings.exact  # a measured count, not a definition


def test_a_printed_bound(claim):
    p = claim.significance.p_value
    assert p.is_upper_bound and p.value == 0.001 and p.bounds == (0.0, 0.001)
    assert p.log_low == -math.inf and p.log_high == pytest.approx(math.log(0.001))


def test_stated_conventions_and_the_rest(claim):
    sig = claim.significance
    assert (sig.sided, sig.systematics, sig.error_at) == ("two", "none", "estimate")
    assert sig.stated == frozenset({"sided"})
    assert [p.label for p in claim.parts] == ["c1", "part 2"]
    assert [b.count.value for b in claim.error_budget] == [380, 1]
    assert claim.extrapolation.error_to == "syst" and claim.combination.method == "inverse-variance"


def test_defaults(write_claim):
    claim = read_claim(write_claim("title: t\nmetric: mean\nestimate: 1.5\n"))
    assert claim.tolerance == DEFAULT_TOLERANCE == 0.02
    sig = claim.significance
    assert (sig.sided, sig.systematics, sig.error_at, sig.stated) == ("one", "none", "estimate", frozenset())
    assert claim.stat_error is None and claim.parts == () and claim.qubit_count is None
    assert claim.integer_data is False


def test_a_p_value_below_the_double_range_keeps_its_size(write_claim):
    claim = read_claim(write_claim("title: t\nmetric: mean\nestimate: 1\nsignificance: {p_value: 3.7e-350}\n"))
    p = claim.significance.p_value
    assert p.value == 0.0
    assert p.log_high == pytest.approx(math.log(3.75) - 350 * math.log(10), rel=1e-14)


def test_json_and_yaml_give_the_same_claim(write_claim):
    text = CLAIM.replace("2.24e-3", "0.00224")  # JSON has no exponent-only forms to lose
    as_yaml = read_claim(write_claim(text))
    as_json = read_claim(write_claim(json.dumps(yaml.safe_load(text)), "c.json"))
    for get in (lambda c: c.estimate, lambda c: c.significance.sigma, lambda c: c.parts[0].samples,
                lambda c: c.significance.p_value, lambda c: c.interval.level, lambda c: c.threshold):
        assert get(as_json).bounds == get(as_yaml).bounds
    assert as_json.tolerance == as_yaml.tolerance
    assert as_json.significance.sided == as_yaml.significance.sided


def test_the_notebook_api_takes_a_mapping_with_numpy_numbers():
    claim = read_claim({"title": "t", "metric": "proportion", "estimate": np.float64(0.912),
                        "samples": np.int64(1000), "stat_error": 0.009})
    assert claim.estimate.value == 0.912 and claim.estimate.text == "0.912"
    assert claim.samples.exact and claim.samples.value == 1000


@pytest.mark.parametrize("field_text, message", [
    ("samples: -5", "samples (line 4): samples must be a whole number of at least 1, got -5; "
                    "counts are whole numbers such as 30 or 2.5e7"),
    ("samples: '2.5'", "samples (line 4): samples must be a whole number of at least 1, got 2.5; "
                       "counts are whole numbers such as 30 or 2.5e7"),
    ("circuits: 1.5e0", "circuits (line 4): circuits must be a whole number of at least 1, got 1.5e0"),
    ("trials: '0'", "trials (line 4): trials must be a whole number of at least 1, got 0"),
    ("samples: 50%", "samples is a count, so the percentage 50% means nothing"),
    ("samples: 3000%", "samples is a count, so the percentage 3000% means nothing"),
    ("qubits: '3000%'", "qubits is a count, so the percentage 3000% means nothing"),
    ("trials: 50%", "trials is a count, so the percentage 50% means nothing"),
    ("significance: {sigma: 420%}", "sigma is a significance in sigma, so the percentage 420% means nothing"),
    ("qubits: 5000", "qubits (line 4): qubits must be at most 1000, got 5000"),
    ("interval: {low: 0.8, high: 0.95, level: 95}", "interval.level (line 4): level must lie between 0 and 1, got 95"),
    ("stat_error: '1e400'", "stat_error (line 4): stat_error 1e400 is beyond the range of double precision"),
    ("stat_error: 1e-2000100", "stat_error (line 4): stat_error 1e-2000100 is beyond the powers of ten claimcheck reads"),
    ("significance: {p_value: 1e-2000100}", "p_value 1e-2000100 is beyond the powers of ten claimcheck reads"),
    ("significance: {p_value: '< .'}", "significance.p_value (line 4): p_value must be a number, got '< .'"),
])
def test_what_the_schema_cannot_say(write_claim, field_text, message):
    path = write_claim("title: t\nmetric: proportion\nestimate: 0.9\n" + field_text + "\n")
    with pytest.raises(ClaimSchemaError) as err:
        read_claim(path)
    assert message in str(err.value) and str(err.value).startswith(str(path) + ": ")


def test_reported_exact_value():
    rep = Reported.exact_value(0.95, "interval.level")
    assert rep.exact and rep.bounds == (0.95, 0.95) and rep.log_low == math.log(0.95)


# --- properties: random claim documents -------------------------------------------------

FIELDS = ["title", "metric", "estimate", "stat_error", "syst_error", "samples", "circuits", "qubits", "sd",
          "threshold", "trials", "tolerance", "source", "integer_data", "items", "interval", "significance",
          "parts", "error_budget", "extrapolation", "combination", "unknown_field"]
SUB_FIELDS = ["sigma", "p_value", "sided", "systematics", "error_at", "required_sigma", "global_sigma",
              "upcrossings", "upcrossing_sigma", "low", "high", "level", "label", "estimate", "samples",
              "name", "error", "count", "error_sd", "factor", "factor_error", "error_to", "method"]
SCALAR_TEXTS = ["0", "1", "-1", "0.5", "2.24e-3", "1e-400", "3.7e-350", "1e400", "91.2%", "'91.2%'", "'< 0.001'",
                "'<1e-400'", "017", "1:30", "yes", "no", "0x1F", "1_000", ".nan", ".inf", "~", "''", "true",
                "2.5e7", "25000000", "1.5", "one", "two", "quadrature", "marginalized", "threshold",
                "linear-xeb", "log-xeb", "heavy-output", "proportion", "mean", "inverse-variance", "[]",
                "{}", "[1, 2]", "'x'", "1e308", "-0", "100%", "0.0", "1001", "61"]


def scalar_text():
    return st.one_of(st.sampled_from(SCALAR_TEXTS),
                     st.floats(allow_nan=False, allow_infinity=False).map(repr),
                     st.integers(-10**6, 10**20).map(str))


@st.composite
def claim_yaml(draw):
    lines = ["title: Invented random claim"] if draw(st.booleans()) else []
    for field in draw(st.lists(st.sampled_from(FIELDS), unique=True, max_size=10)):
        if field in ("interval", "significance", "extrapolation", "combination"):
            subs = draw(st.lists(st.sampled_from(SUB_FIELDS), unique=True, max_size=5))
            inner = ", ".join(f"{k}: {draw(scalar_text())}" for k in subs)
            lines.append(f"{field}: {{{inner}}}")
        elif field in ("parts", "error_budget"):
            items = []
            for _ in range(draw(st.integers(0, 3))):
                subs = draw(st.lists(st.sampled_from(SUB_FIELDS), unique=True, max_size=4))
                items.append("{" + ", ".join(f"{k}: {draw(scalar_text())}" for k in subs) + "}")
            lines.append(f"{field}: [{', '.join(items)}]")
        else:
            lines.append(f"{field}: {draw(scalar_text())}")
    return "\n".join(lines) + "\n"


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow,
                                                                   HealthCheck.function_scoped_fixture])
@given(text=claim_yaml())
def test_random_claim_documents_build_or_raise_a_documented_error(write_claim, text):
    try:
        claim = read_claim(write_claim(text))
    except ClaimcheckError as exc:
        assert "\n" not in str(exc) and str(exc).count(": ") >= 1
    else:
        assert claim.title and math.isfinite(claim.estimate.value)


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow,
                                                                   HealthCheck.function_scoped_fixture])
@given(data=st.dictionaries(st.sampled_from(FIELDS + SUB_FIELDS),
                            st.recursive(st.one_of(st.none(), st.booleans(), st.integers(-10**25, 10**25),
                                                   st.floats(allow_nan=False, allow_infinity=False),
                                                   st.sampled_from(["2.24e-3", "91.2%", "< 0.001", "017",
                                                                    "yes", "mean", "proportion", "two"]),
                                                   st.text(max_size=10)),
                                         lambda kids: st.one_of(st.lists(kids, max_size=3),
                                                                st.dictionaries(st.sampled_from(SUB_FIELDS), kids,
                                                                                max_size=3)),
                                         max_leaves=12),
                            max_size=10),
       fmt=st.sampled_from(["yaml", "json"]))
def test_random_structures_dumped_to_yaml_and_json(write_claim, data, fmt):
    text = yaml.safe_dump(data) if fmt == "yaml" else json.dumps(data)
    try:
        read_claim(write_claim(text, f"random.{fmt}"))
    except ClaimcheckError as exc:
        assert "\n" not in str(exc)


# The kinds of claim of the issue "More kinds of claims": which may leave out the estimate,
# what a counting experiment needs, the baseline and the comparison.
def _built(text: str):
    from checker.claim import claim_from_document
    return claim_from_document(parse_text(text, "claim.yaml", "yaml"))


def _refused(text: str) -> str:
    from checker.claim import claim_from_document
    with pytest.raises(ClaimSchemaError) as err:
        claim_from_document(parse_text(text, "claim.yaml", "yaml"))
    assert "\n" not in str(err.value)
    return str(err.value)


def test_a_plain_claim_still_needs_its_estimate():
    assert _refused("title: t\nmetric: mean\n") == (
        "claim.yaml: estimate (line 1): estimate is missing; give the headline value as printed; only a "
        "counting experiment (metric counts), a claim that prints only its significances (a local sigma or "
        "p and a global sigma), a comparison that prints its difference, or a table of rates (counts_table) "
        "may leave it out")


def test_kinds_that_may_leave_out_the_estimate():
    assert _built("title: t\nmetric: counts\nobserved: 47\nbackground: 30.2\n").estimate is None
    assert _built("title: t\nmetric: mean\nsignificance: {sigma: 3.9, global_sigma: 2.3}\n").estimate is None
    assert _built("title: t\nmetric: proportion\ncomparison: {difference: 0.023}\n").estimate is None


def test_counting_experiment_fields():
    claim = _built("title: t\nmetric: counts\nobserved: 0\nbackground: 30.2\nbackground_error: 3.1\n")
    assert claim.observed.value == 0 and claim.observed.exact
    assert claim.background.bounds == pytest.approx((30.15, 30.25))
    assert claim.background_error.text == "3.1"


@pytest.mark.parametrize("text, message", [
    ("title: t\nmetric: counts\nobserved: 4\n",
     "claim.yaml: background (line 1): a counting experiment (metric counts) needs background; give observed "
     "(events seen) and background (events expected without a signal)"),
    ("title: t\nmetric: counts\nobserved: 4.5\nbackground: 1\n",
     "claim.yaml: observed (line 3): observed must be a whole number of at least 0, got 4.5; counts are whole "
     "numbers such as 0, 47 or 1200"),
    ("title: t\nmetric: counts\nobserved: 4\nbackground: 0\n",
     "claim.yaml: background (line 4): background must be above 0, got 0; the expected number of background "
     "events, such as 30.2"),
    ("title: t\nmetric: mean\nestimate: 1\nobserved: 4\n",
     "claim.yaml: observed (line 4): observed belongs to a counting experiment, but metric is mean; write "
     "metric: counts, or leave out observed, background and background_error"),
    ("title: t\nmetric: proportion\nestimate: 0.9\ncomparison: {discordant: [3, -1]}\n",
     "claim.yaml: comparison.discordant.1 (line 4): discordant entry 1 must be a whole number of at least 0, "
     "got -1; counts are whole numbers such as 0, 47 or 1200"),
    ("title: t\nmetric: proportion\nestimate: 0.9\ncomparison: {discordant: [3]}\n",
     "claim.yaml: comparison.discordant (line 4): discordant holds 1 entries, not 2; write [items only ours "
     "got right, items only the baseline got right]"),
])
def test_kind_inputs_are_refused_with_one_line(text, message):
    assert _refused(text) == message


def test_baseline_and_comparison():
    claim = _built("title: t\nmetric: proportion\nestimate: 91.3%\nsamples: 1200\n"
                   "baseline: {label: previous best, estimate: 89.0%, samples: 1200}\n"
                   "comparison: {paired: true, discordant: [58, 30], sigma: 2.9, sided: two}\n")
    assert claim.baseline.label == "previous best" and claim.baseline.estimate.value == pytest.approx(0.89)
    c = claim.comparison
    assert c.paired and [d.value for d in c.discordant] == [58, 30] and c.discordant[0].exact
    assert c.sided == "two" and c.test is None and c.stated == frozenset({"paired", "sided"})
