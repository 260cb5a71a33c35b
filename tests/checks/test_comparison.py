"""The comparison check: each classic slip of a claim that beats a baseline is
named.  Reference values: McNemar's statistics as statsmodels computes them
(tests/stats/test_comparison.py holds those against statsmodels directly)."""

from __future__ import annotations

import math

import pytest
from scipy import stats

from checker.checks import comparison
from checker.claim import claim_from_document
from checker.claim.load import parse_text

PAIRED = ("title: t\nmetric: proportion\nestimate: 91.3%\nsamples: 1200\n"
          "baseline: {estimate: 89.0%, samples: 1200}\n")
UNPAIRED = "title: t\nmetric: mean\nestimate: 0.913\nstat_error: 0.008\nbaseline: {estimate: 0.890, stat_error: 0.009}\n"


def findings(text: str):
    return list(comparison.check(claim_from_document(parse_text(text, "c.yaml", "yaml"))))


def by_statement(text: str) -> dict:
    return {f.statement: f for f in findings(text)}


def test_paired_p_value_is_mcnemar_with_the_continuity_correction():
    # statsmodels mcnemar(exact=False, correction=True) for discordant 58 and 30: chi2 = 27^2/88,
    # p = 0.0040 two-sided (scipy.stats.chi2.sf as the reference)
    assert f"{stats.chi2.sf(27**2 / 88, 1):.4f}" == "0.0040"
    got = by_statement(PAIRED + "comparison: {paired: true, discordant: [58, 30], p_value: 0.004, sided: two}\n")
    assert got["p_value"].status == "pass"
    assert "continuity correction" in got["p_value"].message


def test_one_sided_claim_with_the_two_sided_p_names_the_sidedness():
    got = by_statement(PAIRED + "comparison: {paired: true, discordant: [58, 30], p_value: 0.004}\n")
    assert got["p_value"].status == "fail" and dict(got["p_value"].reproduced_by) == {"sided": "two"}


def test_paired_claim_computed_as_unpaired():
    # unpaired z of 0.913 vs 0.890 on 1200 each: 0.023 / sqrt(p1 q1/n + p2 q2/n) = 1.89 (common practice)
    z = 0.023 / math.sqrt(0.913 * 0.087 / 1200 + 0.890 * 0.110 / 1200)
    assert f"{z:.2f}" == "1.89"
    got = by_statement(PAIRED + "comparison: {paired: true, discordant: [58, 30], sigma: 1.87}\n")
    assert got["sigma"].status == "fail" and dict(got["sigma"].reproduced_by) == {"pairing": "unpaired"}
    assert got["sigma"].message == ("Printed 1.87 sigma, but the McNemar z (one-sided) gives 2.98 sigma; it would "
                                    "follow with the errors in quadrature, one-sided.")


def test_the_issues_paired_example_agrees():
    # "91.3% against 89.0% on the same 1,200 items, 2.9 sigma" with 58 and 30 discordant: McNemar z =
    # 28 / sqrt(88) = 2.98, which 2.9 meets within printed precision and the 2% tolerance
    got = by_statement(PAIRED + "comparison: {paired: true, discordant: [58, 30], sigma: 2.9}\n")
    assert got["sigma"].status == "pass"


def test_baseline_error_ignored():
    got = by_statement(UNPAIRED + "comparison: {difference: 0.023, difference_error: 0.008, sigma: 2.9}\n")
    assert got["difference"].status == "pass"
    for key in ("difference_error", "sigma"):
        assert got[key].status == "fail" and dict(got[key].reproduced_by) == {"baseline_error": "ignored"}
    assert got["difference_error"].message == (
        "Printed error of the difference 0.008, but with both errors in quadrature it is 0.0113 to 0.0127; "
        "it is the estimate's error alone (the baseline's left out).")


def test_errors_added_linearly():
    got = by_statement(UNPAIRED + "comparison: {difference_error: 0.017}\n")
    assert got["difference_error"].status == "fail" and dict(got["difference_error"].reproduced_by) == {
        "errors": "added"}


def test_clean_unpaired_claim():
    got = by_statement(UNPAIRED + "comparison: {difference: 0.023, difference_error: 0.012, sigma: 1.9}\n")
    assert {f.status for f in got.values()} == {"pass"}


def test_difference_taken_the_other_way():
    got = by_statement(UNPAIRED + "comparison: {difference: -0.023}\n")
    assert dict(got["difference"].reproduced_by) == {"difference": "baseline minus estimate"}


def test_paired_without_discordant_counts_gives_the_range_of_sigma():
    # brute force in tests/stats/test_comparison.py: 1096 and 1068 right of 1200 allow z in [1.82, 5.29]
    got = by_statement(PAIRED + "comparison: {paired: true, sigma: 2.9}\n")
    f = got["discordant_missing"]
    assert f.status == "warn" and "28 to 236 discordant items" in f.message
    assert (f.recomputed_range.low, f.recomputed_range.high) == pytest.approx((28 / math.sqrt(236), math.sqrt(28)))
    outside = by_statement(PAIRED + "comparison: {paired: true, sigma: 6.1}\n")["discordant_missing"]
    assert outside.status == "fail"


def test_no_baseline_is_a_skip():
    assert [f.status for f in findings("title: t\nmetric: mean\nestimate: 1\n")] == ["skip"]


def test_nothing_printed_gives_the_difference_for_information():
    # 0.913 +- 0.008 against 0.890 +- 0.009 (unpaired): z = 0.023 / hypot(0.008, 0.009) = 1.912
    # (by hand: hypot = 0.012042), p = norm.sf(1.912) (scipy.stats.norm.sf)
    (f,) = findings(UNPAIRED)
    assert f.status == "info" and f.statement == "inputs_only"
    c = f.details["central"]
    assert f"{math.hypot(0.008, 0.009):.6f}" == "0.012042"
    assert c["sigma"] == pytest.approx(0.023 / math.hypot(0.008, 0.009), rel=1e-12)
    assert 10 ** c["log10_p"] == pytest.approx(stats.norm.sf(0.023 / math.hypot(0.008, 0.009)), rel=1e-9)
    assert "1.91 sigma" in f.message


def test_central_values_ride_on_the_first_finding():
    # paired with discordant 58 and 30 of 1200: d = 28 / 1200, McNemar's z = 28 / sqrt(88) = 2.985
    text = PAIRED + "comparison: {paired: true, discordant: [58, 30], sigma: 2.98}\n"
    found = [f for f in findings(text) if "central" in f.details]
    assert len(found) == 1
    c = found[0].details["central"]
    assert c["error_from"] == "paired" and c["sigma"] == pytest.approx(28 / math.sqrt(88), rel=1e-12)
    assert c["difference"] == pytest.approx(28 / 1200, rel=1e-12)
