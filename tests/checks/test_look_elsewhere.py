"""``look-elsewhere``: the global significance after many trials or a scan,
against the published Sidak, Bonferroni and Gross-Vitells values."""

from __future__ import annotations

import math

import pytest

BASE = "title: Invented claim\nmetric: mean\nestimate: 1\n"


def le_findings(check_claim, extra):
    return check_claim(BASE + extra, only=["look-elsewhere"]).findings


# REFERENCES.md, "Look-elsewhere effect" (Sidak 1967; Bonferroni): local Z = 3 one-sided
# (p = 1.34990e-3): N = 10 -> Sidak Z 2.2139; N = 100 -> Sidak Z 1.1438, Bonferroni Z 1.1031.
LOCAL_3 = "p_value: 1.34990e-3"


def test_sidak_with_ten_trials(check_claim):
    (f,) = le_findings(check_claim, f"trials: 10\nsignificance: {{{LOCAL_3}, global_sigma: 2.2139}}\n")
    assert f.status == "pass" and f.details["method"] == "sidak"
    assert f.details["global_sigma_low"] == pytest.approx(2.2139, abs=5e-5)
    assert f.details["global_sigma_high"] == pytest.approx(2.2139, abs=5e-5)


def test_sidak_with_a_hundred_trials(check_claim):
    (f,) = le_findings(check_claim, f"trials: 100\ntolerance: 0\nsignificance: {{{LOCAL_3}, global_sigma: 1.1438}}\n")
    assert f.status == "pass" and f.reproduced_by is None
    assert f.details["bonferroni_sigma_low"] == pytest.approx(1.1031, abs=5e-5)


def test_the_bonferroni_bound_is_reproduced_and_accepted_as_conservative(check_claim):
    (f,) = le_findings(check_claim, f"trials: 100\ntolerance: 0\nsignificance: {{{LOCAL_3}, global_sigma: 1.1031}}\n")
    assert f.status == "pass" and dict(f.reproduced_by) == {"method": "bonferroni"}
    assert f.message.startswith("Printed global 1.1031 sigma is the Bonferroni bound, slightly conservative:")


def test_a_printed_uncorrected_global_sigma_is_caught(check_claim):
    (f,) = le_findings(check_claim, "trials: 24\nsignificance: {sigma: 4.1, global_sigma: 4.1}\n")
    assert f.status == "fail" and dict(f.reproduced_by) == {"method": "none"}
    # Pinned: the finding a referee acts on.
    assert f.message == ("Printed global 4.1 sigma, but local 4.05 to 4.15 sigma (printed sigma) with 24 trials is "
                         "global 3.23 to 3.35 sigma (p = 0.0004 to 0.00061, Sidak, one-sided); the printed value "
                         "is the local one, uncorrected.")


def test_no_method_reproduces_a_made_up_global_sigma(check_claim):
    (f,) = le_findings(check_claim, f"trials: 10\nsignificance: {{{LOCAL_3}, global_sigma: 1.5}}\n")
    assert f.status == "fail" and f.reproduced_by is None and f.message.endswith("no method reproduces it.")


# Gross and Vitells, Eur. Phys. J. C 70, 525 (2010), arXiv:1005.1891 (REFERENCES.md): local Z = 5,
# 2 upcrossings at 0.5 sigma -> trials factor ~30, p_global 8.73e-6, Z_global 4.295; with the
# local p two-sided the factor is 15.7.  Upcrossings printed "2.000" so their precision is negligible.
GV = "upcrossings: 2.000, upcrossing_sigma: 0.5"


def test_gross_vitells_worked_example(check_claim):
    (f,) = le_findings(check_claim, f"significance: {{p_value: 2.86652e-7, global_sigma: 4.295, {GV}}}\n")
    assert f.status == "pass" and f.details["method"] == "gross-vitells"
    assert f.details["global_sigma_low"] == pytest.approx(4.295, abs=5e-4)
    assert f.details["global_sigma_high"] == pytest.approx(4.295, abs=5e-4)
    assert f.details["trials_factor"] == pytest.approx(30.46, rel=2e-3)
    assert 10 ** f.details["log10_global_p_high"] == pytest.approx(8.73e-6, rel=2e-3)


def test_gross_vitells_two_sided(check_claim):
    (f,) = le_findings(check_claim, f"significance: {{sigma: 5.0000, sided: two, {GV}}}\n")
    # no global sigma printed: the global value is given for information (issue 16)
    assert f.status == "info" and f.details["trials_factor"] == pytest.approx(15.7, rel=3e-3)


def test_gross_vitells_uncorrected_global_is_caught(check_claim):
    (f,) = le_findings(check_claim, f"significance: {{p_value: 2.86652e-7, global_sigma: 5.0, {GV}}}\n")
    assert f.status == "fail" and dict(f.reproduced_by) == {"method": "none"}


def test_gross_vitells_sidedness_slip(check_claim):
    # Two-sided local 5 sigma with the factor 15.7 gives global 4.44 sigma; a one-sided claim printing
    # 4.44 used the other convention.
    (f,) = le_findings(check_claim, f"tolerance: 0\nsignificance: {{sigma: 5.0000, global_sigma: 4.44, {GV}}}\n")
    assert f.status == "fail" and dict(f.reproduced_by) == {"method": "gross-vitells", "sided": "two"}


def test_required_sigma_after_the_correction(check_claim):
    found = le_findings(check_claim, "trials: 100\nsignificance: {sigma: 3.0, required_sigma: 2}\n")
    assert [f.status for f in found] == ["fail"]
    assert found[0].message.startswith("After the look-elsewhere correction the claim reaches 1.05 to 1.24 sigma, "
                                       "below the required 2:")
    found = le_findings(check_claim, "trials: 10\nsignificance: {sigma: 3.0, required_sigma: 2}\n")
    assert [f.status for f in found] == ["pass"]
    found = le_findings(check_claim, "trials: 10\nsignificance: {sigma: 3, required_sigma: 2.2}\n")
    assert [f.status for f in found] == ["warn"]  # "3" is [2.5, 3.5]: global 1.55 to 2.83


def test_a_printed_bound_on_the_local_p_bounds_the_global_sigma(check_claim):
    # p < 1e-6 is at least 4.75 sigma; 10 trials make that at least 4.26 globally (Sidak).
    (f,) = le_findings(check_claim, "trials: 10\nsignificance: {p_value: '< 1e-6', global_sigma: 4.5}\n")
    assert f.status == "pass" and "global at least 4.26 sigma (p below 1e-5" in f.message
    (f,) = le_findings(check_claim, "trials: 10\nsignificance: {p_value: '< 1e-6', global_sigma: 3.0}\n")
    assert f.status == "fail"
    (f,) = le_findings(check_claim, "trials: 10\nsignificance: {p_value: '< 1e-6', required_sigma: 5}\n")
    assert f.status == "warn" and "does not settle the required 5" in f.message
    (f,) = le_findings(check_claim, "trials: 10\nsignificance: {p_value: '< 1e-6', required_sigma: 4}\n")
    assert f.status == "pass"


def test_a_40_sigma_local_significance_in_log_space(check_claim):
    # log p_g = log N + log p far in the tail: 40 sigma (log10 p = -349.437) with 1e6 trials is
    # log10 p_g = -343.437, i.e. 39.65 sigma.
    (f,) = le_findings(check_claim, "trials: 1000000\nsignificance: {sigma: 40.000, global_sigma: 39.65}\n")
    assert f.status == "pass"
    assert f.details["log10_global_p_high"] == pytest.approx(-349.437 + 6 + 0.0087, abs=0.02)
    assert f.details["trials_factor"] == pytest.approx(1e6, rel=1e-9)


def test_the_local_significance_can_be_recomputed(check_claim):
    text = "title: t\nmetric: mean\nestimate: 0.5400\nthreshold: 0.5\nstat_error: 0.0100\ntrials: 20\n"
    (f,) = check_claim(text, only=["look-elsewhere"]).findings
    assert f.status == "info" and f.details["local_from"] == "recomputed significance"
    assert f.message.startswith("No global significance is printed; local 3.98 to 4.03 sigma")


def test_skips(check_claim):
    (f,) = le_findings(check_claim, "significance: {sigma: 3.0}\n")
    assert f.status == "skip" and f.message == "No look-elsewhere correction to check; needs trials or upcrossings."
    (f,) = le_findings(check_claim, "significance: {sigma: 3.0, upcrossings: 3}\n")
    assert f.status == "skip" and "needs significance.upcrossing_sigma" in f.message
    (f,) = le_findings(check_claim, "trials: 20\n")
    assert f.status == "skip" and f.message.startswith("No local significance to correct")


def test_finding_values_are_finite_numbers_or_none(check_claim):
    for extra in ("trials: 10\nsignificance: {p_value: '< 1e-6', global_sigma: 4.5}\n",
                  "trials: 1000\nsignificance: {p_value: 0.2, global_sigma: 0}\n"):
        for f in le_findings(check_claim, extra):
            for value in (f.reported, f.recomputed):
                assert value is None or math.isfinite(value)


# --- a claim printing only a local and a global significance (issue 14) -------------------
ONLY = "title: Invented claim\nmetric: mean\n"


def test_local_and_global_imply_their_trials(check_claim):
    # "local 3.9 sigma, global 2.3 sigma" (one-sided): scipy.stats.norm.sf gives p_local =
    # 4.8096e-5 and p_global = 1.0724e-2, so N = log1p(-p_g)/log1p(-p_l) = 224.2 at the printed
    # values; over the printed digits (3.85..3.95, 2.25..2.35) N runs from about 160 to 315
    from scipy import stats
    p_l, p_g = stats.norm.sf(3.9), stats.norm.sf(2.3)
    n_mid = math.log1p(-p_g) / math.log1p(-p_l)
    assert f"{n_mid:.1f}" == "224.2"
    (f,) = check_claim(ONLY + "significance: {sigma: 3.9, global_sigma: 2.3}\n", only=["look-elsewhere"]).findings
    assert f.status == "info" and f.statement == "implied_trials"
    # fewest trials: the least significant local (3.85) with the most significant global (2.35)
    low = math.log1p(-stats.norm.sf(2.35)) / math.log1p(-stats.norm.sf(3.85))
    high = math.log1p(-stats.norm.sf(2.25)) / math.log1p(-stats.norm.sf(3.95))
    assert f.details["trials_low"] == pytest.approx(low, rel=1e-9)
    assert f.details["trials_high"] == pytest.approx(high, rel=1e-9)
    assert f.details["trials_low"] < n_mid < f.details["trials_high"]
    assert "effective independent trials" in f.message


def test_a_global_above_the_local_is_flagged(check_claim):
    (f,) = check_claim(ONLY + "significance: {sigma: 2.3, global_sigma: 3.9}\n", only=["look-elsewhere"]).findings
    assert f.status == "fail" and f.details["trials_high"] < 1


def test_a_tiny_local_p_gives_a_finite_count(check_claim):
    # p_local = 1e-300 (37.0 sigma) and global 36 sigma: N = p_global / p_local, with p_global
    # from scipy.special.log_ndtr(-36) = -652.73 (so N ~ e^(-652.73 + 690.78) = 3.4e16)
    from scipy.special import log_ndtr
    (f,) = check_claim(ONLY + "significance: {p_value: 1e-300, global_sigma: 36.0}\n",
                       only=["look-elsewhere"]).findings
    assert f.status == "info"
    n_mid = math.exp(float(log_ndtr(-36.0)) - math.log(1e-300))
    assert f.details["trials_low"] < n_mid < f.details["trials_high"] < 1e300
    assert f.details["bonferroni_trials"] == pytest.approx(n_mid, rel=1e-9)


def test_a_global_alone_is_a_skip(check_claim):
    (f,) = check_claim(ONLY + "estimate: 1\nsignificance: {global_sigma: 2.3}\n", only=["look-elsewhere"]).findings
    assert f.status == "skip" and f.statement == "needs_inputs"


def test_implied_trials_at_the_printed_values(check_claim):
    # log1p(-norm.sf(2.3)) / log1p(-norm.sf(3.9)) = 224.2 (scipy.stats.norm.sf), the batch's column
    (f,) = check_claim(ONLY + "significance: {sigma: 3.9, global_sigma: 2.3}\n", only=["look-elsewhere"]).findings
    assert f"{f.details['trials_central']:.1f}" == "224.2"
