"""The significance check on counting experiments: each formula's slip is named.
Reference values: scipy.stats.poisson and the formulas of Cowan et al. (2011, Eq. 97) and
Cousins et al. (2008) (held against their tables in tests/stats/test_counts.py)."""

from __future__ import annotations

import math

from scipy import stats

from checker.checks import significance
from checker.claim import claim_from_document
from checker.claim.load import parse_text

BASE = "title: t\nmetric: counts\n"


def findings(text: str) -> list:
    return list(significance.check(claim_from_document(parse_text(BASE + text, "c.yaml", "yaml"))))


def one(text: str, statement: str):
    return next(f for f in findings(text) if f.statement == statement)


def test_exact_poisson_tail_agrees():
    # 12 events over 4.1: P(N >= 12) from scipy.stats.poisson.sf(11, 4.1), as sigma
    z = stats.norm.isf(stats.poisson.sf(11, 4.1))
    assert 3.02 < z < 3.09
    assert one("observed: 12\nbackground: 4.1\nsignificance: {sigma: 3.1}\n", "sigma_vs_inputs").status == "pass"


def test_background_error_ignored_is_named():
    # 47 over 30.2: Eq. 97 gives sqrt(2 (47 ln(47/30.2) - 16.8)) = 2.82 (the background's error left out);
    # with 3.1 the profile likelihood gives 2.41
    assert f"{math.sqrt(2 * (47 * math.log(47 / 30.2) - 16.8)):.2f}" == "2.82"
    f = one("observed: 47\nbackground: 30.2\nbackground_error: 3.1\nsignificance: {sigma: 2.9}\n", "sigma_vs_inputs")
    assert f.status == "fail" and dict(f.reproduced_by) == {"method": "asymptotic", "background_error": "ignored"}


def test_naive_s_over_root_b_is_named():
    # s / sqrt(b) = 16.8 / sqrt(30.2) = 3.06 (common practice)
    assert f"{16.8 / math.sqrt(30.2):.2f}" == "3.06"
    f = one("observed: 47\nbackground: 30.2\nsignificance: {sigma: 3.1}\n", "sigma_vs_inputs")
    assert f.status == "fail" and dict(f.reproduced_by) == {"method": "naive"}
    assert f.message == ("Printed 3.1 sigma, but 47 events over a background of 30.2 give 2.76 to 2.78 sigma by "
                         "the exact Poisson tail (one-sided); it follows from s / sqrt(b).")


def test_two_sided_p_is_named():
    # one-sided exact p for 12 over 4.1 is about 0.0011; the two-sided is twice that
    p2 = 2 * stats.poisson.sf(11, 4.1)
    f = one(f"observed: 12\nbackground: 4.1\nsignificance: {{p_value: {p2:.2g}}}\n", "p_vs_inputs")
    assert f.status == "fail" and dict(f.reproduced_by)["sided"] == "two"


def test_profile_likelihood_with_the_error_agrees():
    f = one("observed: 47\nbackground: 30.2\nbackground_error: 3.1\nsignificance: {sigma: 2.4}\n", "sigma_vs_inputs")
    assert f.status == "pass" and "profile likelihood" in f.message


def test_signal_yield_is_observed_minus_background():
    assert one("observed: 47\nbackground: 30.2\nestimate: 16.8\n", "signal_yield").status == "pass"
    assert one("observed: 47\nbackground: 30.2\nestimate: 18.8\n", "signal_yield").status == "fail"


def test_deep_tail_counts_stay_finite():
    # 2000 events over 3: far below the double range (scipy's poisson.logsf is -inf here)
    f = one("observed: 2000\nbackground: 3\n", "inputs_only")
    assert f.status == "info" and f.recomputed > 100


def test_required_sigma():
    got = one("observed: 47\nbackground: 30.2\nbackground_error: 3.1\nsignificance: {required_sigma: 3}\n",
              "required_sigma")
    assert got.status == "fail"
