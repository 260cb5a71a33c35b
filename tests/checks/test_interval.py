"""The ``interval`` check: the standard error a printed interval implies, and
which binomial interval method reproduces a printed interval for a proportion."""

from __future__ import annotations

import math
import subprocess
import sys
import textwrap

import pytest

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import parse_text


def findings(text: str):
    claim = claim_from_document(parse_text(textwrap.dedent(text), "claim.yaml", "yaml"))
    return {f.details.get("quantity", "none"): f for f in run_checks(claim, ["interval"]).findings}


# R. G. Newcombe, Stat. Med. 17, 857 (1998), Table I (from memory): 81/263, Wilson 0.2553-0.3662,
# Clopper-Pearson 0.2527-0.3676, Wald 0.2522-0.3638.
NEWCOMBE = """
    title: 81 of 263
    metric: proportion
    estimate: 0.3080
    samples: 263
    {extra}
    interval: {{low: {low}, high: {high}, level: 0.95}}
"""


@pytest.mark.parametrize("low, high, method", [("0.2553", "0.3662", "wilson"),
                                               ("0.2527", "0.3676", "clopper-pearson"),
                                               ("0.2522", "0.3638", "wald")])
def test_newcombe_intervals_are_matched_to_their_method(low, high, method):
    f = findings(NEWCOMBE.format(low=low, high=high, extra="tolerance: 0"))["method"]
    assert f.status == "pass"
    assert f.details["agreeing"] == [method]
    assert f.details["count"] == 81


def test_pinned_message_at_the_default_tolerance():
    f = findings(NEWCOMBE.format(low="0.2553", high="0.3662", extra=""))["method"]
    # At 2% of the half-width the Agresti-Coull and Jeffreys intervals (0.2552-0.3663, 0.2545-0.3656)
    # cannot be told from Wilson's; the closest is named first.
    assert f.message == ("The printed 95% interval [0.2553, 0.3662] for 81/263 is what the Wilson method "
                         "gives, [0.25529, 0.36621] (Agresti-Coull and Jeffreys agree too).")


@pytest.mark.parametrize("low, high", [("0.2554", "0.3662"), ("0.2553", "0.3663"), ("0.2552", "0.3662")])
def test_one_digit_off_matches_no_method_at_tolerance_zero(low, high):
    # Wilson 0.25529-0.36621: "0.2553" is [0.25525, 0.25535]; one digit either way leaves it.
    f = findings(NEWCOMBE.format(low=low, high=high, extra="tolerance: 0"))["method"]
    assert f.status == "fail"


def test_a_one_sigma_interval_labelled_95_percent():
    text = NEWCOMBE.format(low="0.2795", high="0.3365", extra="stat_error: 0.0285")
    found = findings(text)
    # sqrt(0.308 x 0.692 / 263) = 0.02847: the printed interval is the estimate +- 1 of it.
    assert found["sigma"].status == "fail"
    assert dict(found["sigma"].reproduced_by) == {"level": round(math.erf(1 / math.sqrt(2)), 6)}
    assert found["method"].status == "fail"
    assert dict(found["method"].reproduced_by) == {"method": "wald", "level": round(math.erf(1 / math.sqrt(2)), 6)}


def test_asymmetric_intervals_are_reported_as_such():
    found = findings(NEWCOMBE.format(low="0.2553", high="0.3662", extra="stat_error: 0.0285"))
    f = found["sigma"]
    # Wilson's interval sits 0.0527 below and 0.0582 above 0.308: over z = 1.95996 that is 0.0269
    # and 0.0297, and the binomial 0.0285 lies between.
    assert f.status == "pass" and f.details["asymmetric"] is True
    assert f.details["sigma_below"] == pytest.approx(0.0527 / 1.959964, rel=1e-3)
    assert f.details["sigma_above"] == pytest.approx(0.0582 / 1.959964, rel=1e-3)
    assert "asymmetric" in f.message
    # An error outside both sides fails.
    assert findings(NEWCOMBE.format(low="0.2553", high="0.3662", extra="stat_error: 0.040"))["sigma"].status == "fail"


# Printed-precision edge of the implied error: 1.2 +- 1.959964 x 0.0545 printed to ten digits, so
# the implied standard error is 0.0545, the edge between "0.054" and "0.055".
SIGMA_EDGE = """
    title: sigma edge
    metric: mean
    tolerance: 0
    estimate: 1.2
    stat_error: {error}
    interval: {{low: {low:.10f}, high: {high:.10f}, level: 0.95}}
"""


@pytest.mark.parametrize("error, status", [("0.054", "pass"), ("0.055", "pass"), ("0.053", "fail"),
                                           ("0.056", "fail")])
def test_printed_precision_edge_of_the_implied_error(error, status):
    from scipy.stats import norm

    half = norm.ppf(0.975) * 0.0545  # PDG "Statistics": two-sided 95% is 1.959964 sigma
    f = findings(SIGMA_EDGE.format(error=error, low=1.2 - half, high=1.2 + half))["sigma"]
    assert f.status == status
    assert f.details["asymmetric"] is False


def test_nothing_to_compare_is_a_skip_that_states_the_implied_error():
    (f,) = findings("title: t\nmetric: mean\nestimate: 1.0\ninterval: {low: 0.8, high: 1.2}\n").values()
    assert f.status == "skip"
    assert "implies a standard error of 0.102" in f.message  # 0.4 / (2 x 1.96)


def test_samples_with_limited_precision_are_treated_as_continuous():
    # 2.5e4 items stand for 24500 to 25500: Wilson's bounds over that box still hold the print.
    from checker.stats.binomial_intervals import proportion_interval

    low, high = proportion_interval(0.912 * 25000, 25000, 0.95, "wilson")
    text = f"title: t\nmetric: proportion\nestimate: 0.912\nsamples: 2.5e4\ninterval: {{low: {low:.4f}, high: {high:.4f}}}\n"
    f = findings(text)["method"]
    assert f.status == "pass" and "wilson" in f.details["agreeing"]
    assert f.details["count"] is None


def test_no_interval_is_a_skip():
    (f,) = findings("title: t\nmetric: mean\nestimate: 1\n").values()
    assert f.status == "skip" and f.message == "No interval is printed."


def test_an_interval_for_a_mean_does_not_load_statsmodels():
    code = textwrap.dedent("""
        import sys
        import checker
        checker.check({"title": "t", "metric": "mean", "estimate": 1.0, "stat_error": 0.1,
                       "interval": {"low": 0.8, "high": 1.2}})
        print("statsmodels" in sys.modules)
    """)
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.split() == ["False"]


def test_an_interval_made_with_another_samples_names_that_n():
    # By hand (common practice, Wald p +- 1.96 sqrt(p(1 - p)/N)): 0.8333 with N = 78 gives
    # 0.7506-0.9160; the claim says 42 samples, with which no method gives it. Within the claim's
    # tolerance (2% of the half-width on each end) N = 75 to 81 give it too.
    found = findings("""
        title: Invented recall (invented numbers)
        metric: proportion
        estimate: 0.8333
        samples: 42
        interval: {low: 0.7506, high: 0.9160, level: 0.95}
    """)["method"]
    assert found.status == "fail"
    assert dict(found.reproduced_by) == {"method": "wald", "samples": 78}
    assert "gives it with N = 75 to 81 (closest 78) instead of the printed samples 42" in found.message


def test_an_interval_far_wider_than_binomial_is_a_design_effect_note():
    # Kish (1965), Survey Sampling, Sec. 8.2 (from memory): design effect = N / N_eff.
    found = findings("""
        title: Invented clustered accuracy (invented numbers)
        metric: proportion
        estimate: 0.700
        samples: 400
        interval: {low: 0.570, high: 0.830, level: 0.95}
    """)["method"]
    assert found.status == "warn"
    n_eff = 1.959963984540054 ** 2 * 0.7 * 0.3 / 0.13 ** 2
    assert found.details["design_effect"] == pytest.approx(400 / n_eff, rel=1e-9)
