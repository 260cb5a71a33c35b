"""The stability systematic: the OLS trend against scipy.stats.linregress
(the reference library), seeded coverage of the slope interval, and the
spreads by hand."""

import math

import numpy as np
import pytest
from scipy import stats

from checker.stats.drift import drift_analysis


def test_trend_agrees_with_scipy_linregress():
    rng = np.random.default_rng(1)
    t = np.sort(rng.uniform(0, 50, size=30))
    y = 0.6 - 0.001 * t + rng.normal(0, 0.01, size=30)
    result = drift_analysis(t, y, window=(10.0, 20.0))
    ref = stats.linregress(t - 15.0, y)  # centred on the window, so the intercept is the level there
    assert result.slope == pytest.approx(ref.slope, rel=1e-10)
    assert result.slope_error == pytest.approx(ref.stderr, rel=1e-10)
    assert result.slope_p_value == pytest.approx(ref.pvalue, rel=1e-8)
    assert result.trend_level == pytest.approx(ref.intercept, rel=1e-10)
    assert result.trend_level_error == pytest.approx(ref.intercept_stderr, rel=1e-10)
    half = stats.t.ppf(0.975, 28) * ref.stderr
    assert (result.slope_low, result.slope_high) == (pytest.approx(ref.slope - half), pytest.approx(ref.slope + half))


def test_slope_interval_covers_the_true_slope_at_its_level():
    # 400 series of 20 points: the 95% interval covers the true slope in
    # [0.92, 0.98] of them (+-2.8 binomial sd: about 995 seeds in 1000).
    rng = np.random.default_rng(2)
    t = np.arange(20.0)
    hits = 0
    for _ in range(400):
        r = drift_analysis(t, 1.0 + 0.01 * t + rng.normal(0, 0.05, 20))
        hits += r.slope_low <= 0.01 <= r.slope_high
    assert 0.92 <= hits / 400 <= 0.98


def test_constant_model_holds_its_alpha():
    # Null: a constant with correctly stated errors.  The weighted-slope test and the scatter about
    # the weighted line are independent under a Gaussian null and combined by Sidak, so the
    # familywise rate is exactly alpha: over 2000 seeded series 0.05 +- 0.0049 (binomial sd); the
    # band [0.035, 0.065] is 3 sd (about 997 seeds in 1000).  A clear slope is rejected in at
    # least 95% of 100 series (power near 1 at 6 standard errors).
    rng = np.random.default_rng(3)
    t = np.arange(20.0)
    null = []
    for _ in range(2000):
        errors = rng.uniform(0.8, 1.2, 20) * 0.02
        null.append(drift_analysis(t, 0.5 + rng.normal(0, 1, 20) * errors, errors).constant_rejected)
    assert 0.035 <= np.mean(null) <= 0.065
    errors = np.full(20, 0.02)
    slope = 6 * 0.02 * math.sqrt(12) / (20 * math.sqrt(20))  # about 6 slope standard errors
    drifting = [drift_analysis(t, 0.5 + slope * t + rng.normal(0, 0.02, 20), errors).constant_rejected
                for _ in range(100)]
    assert np.mean(drifting) >= 0.95


def test_without_errors_the_slope_test_alone_holds_its_alpha():
    # The OLS slope t-test is exact under Gaussian scatter: 2000 series, band as above.
    rng = np.random.default_rng(4)
    t = np.arange(20.0)
    null = [drift_analysis(t, 0.5 + rng.normal(0, 0.02, 20)).constant_rejected for _ in range(2000)]
    assert 0.035 <= np.mean(null) <= 0.065


def test_stable_series_are_consistent_with_no_systematic_and_the_level_interval_covers():
    # 2000 stable series of 20 points with correct stated errors: the systematic is 0 unless the
    # constant model is rejected, so its mean stays far below the level's statistical error
    # (it was 1.7x); the 95% level interval at the window centre covers the truth within 2 points
    # of nominal (binomial sd 0.49 points; about 9999 seeds in 10000).
    rng = np.random.default_rng(5)
    t = np.arange(20.0)
    syst, stat, covered, none = [], [], [], []
    for _ in range(2000):
        errors = rng.uniform(0.8, 1.2, 20) * 0.01
        r = drift_analysis(t, 0.5 + rng.normal(0, 1, 20) * errors, errors)
        syst.append(r.systematic)
        stat.append(r.trend_level_error)
        covered.append(r.trend_level_low <= 0.5 <= r.trend_level_high)
        none.append(r.consistent_with_none)
    assert np.mean(syst) < 0.4 * np.mean(stat)
    assert np.mean(none) > 0.9
    assert np.mean(covered) == pytest.approx(0.95, abs=0.02)


def test_excess_scatter_and_drift_are_estimated_without_bias():
    # A real extra scatter tau = 0.01 over stated errors 0.01: the moment estimator of tau^2 is
    # unbiased before its truncation at 0 (mean within 10% of 1e-4 over 2000 series: its sd is
    # about 3.5e-5 per series, 0.8e-6 for the mean); the drift term likewise estimates
    # (b w)^2 / 12 without the noise bias of |b|.  The 95% upper limit covers tau in >= 95%.
    rng = np.random.default_rng(6)
    t = np.arange(20.0)
    tau2, upper, trend2 = [], [], []
    errors = np.full(20, 0.01)
    for _ in range(2000):
        r = drift_analysis(t, 0.5 + rng.normal(0, 0.01, 20) + rng.normal(0, 0.01, 20), errors)
        tau2.append(r.excess_spread_window ** 2)
        upper.append(r.systematic_upper >= 0.01)
        d = drift_analysis(t, 0.5 + 0.002 * t + rng.normal(0, 0.01, 20), errors)
        trend2.append(d.trend_systematic ** 2)
    assert np.mean(tau2) == pytest.approx(1e-4, rel=0.1)
    assert np.mean(upper) >= 0.95
    assert np.mean(trend2) == pytest.approx((0.002 * 19) ** 2 / 12, rel=0.1)


def test_chi_square_about_the_weighted_line_by_hand():
    # Least squares with known errors (PDG, "Statistics"): the weighted line, its chi-square on
    # n - 2 degrees of freedom, and the weighted slope's z from the errors alone; Sidak combines.
    t = np.array([0.0, 1.0, 2.0, 3.0])
    y = np.array([1.0, 2.0, 1.5, 1.2])
    e = np.array([0.01, 0.02, 0.01, 0.02])
    w = 1 / e ** 2
    tm, ym = np.sum(w * t) / np.sum(w), np.sum(w * y) / np.sum(w)
    b = np.sum(w * (t - tm) * (y - ym)) / np.sum(w * (t - tm) ** 2)
    chi2 = np.sum(w * (y - ym - b * (t - tm)) ** 2)
    r = drift_analysis(t, y, e)
    assert r.constant_chi2 == pytest.approx(chi2)
    assert r.constant_dof == 2
    assert r.scatter_p_value == pytest.approx(stats.chi2.sf(chi2, 2))
    z = b * math.sqrt(np.sum(w * (t - tm) ** 2))
    assert r.weighted_slope_p_value == pytest.approx(2 * stats.norm.sf(abs(z)))
    assert r.constant_p_value == pytest.approx(1 - (1 - min(r.scatter_p_value, r.weighted_slope_p_value)) ** 2)
    assert r.constant_rejected and "scatter" in r.reasons and not r.consistent_with_none
    assert r.systematic == r.systematic_estimate > 0


def test_window_spreads():
    t = np.arange(10.0)
    y = 2.0 + 0.1 * t + np.array([0.01, -0.01] * 5)
    errors = np.full(10, 0.005)
    r = drift_analysis(t, y, errors, window=(2.0, 6.0))
    assert r.window_points == 5
    assert r.trend_change == pytest.approx(r.slope * 4.0)
    assert r.trend_spread == pytest.approx(abs(r.slope) * 4.0 / math.sqrt(12.0))
    assert r.trend_systematic == pytest.approx(math.sqrt(r.slope ** 2 - r.slope_error ** 2) * 4.0 / math.sqrt(12.0))
    inside = (t >= 2) & (t <= 6)
    resid = y - (r.trend_level + r.slope * (t - 4.0))
    assert r.residual_sd_window == pytest.approx(np.std(resid[inside], ddof=1))
    assert r.stated_error_rms_window == pytest.approx(0.005)
    assert r.systematic == pytest.approx(math.hypot(r.trend_systematic, r.excess_spread_window))


def test_scatter_within_the_errors_leaves_no_excess():
    t = np.arange(6.0)
    y = np.array([1.0, 1.001, 0.999, 1.0, 1.001, 0.999])
    r = drift_analysis(t, y, np.full(6, 0.01))
    assert r.excess_spread_window == 0.0 and r.systematic == 0.0 and r.consistent_with_none
    no_errors = drift_analysis(t, y)
    # Without errors all of the scatter counts: the residual sd on n - 2 degrees of freedom.
    assert no_errors.excess_spread_window == pytest.approx(no_errors.residual_sd)
    assert no_errors.constant_chi2 is None and not no_errors.consistent_with_none


@pytest.mark.parametrize("times, values", [([0, 1], [1, 2]), ([3, 3, 3], [1, 2, 3])])
def test_unusable_series(times, values):
    with pytest.raises(ValueError):
        drift_analysis(np.array(times, float), np.array(values, float))
    with pytest.raises(ValueError):
        drift_analysis(np.arange(5.0), np.arange(5.0), window=(3.0, 1.0))


def test_to_dict_has_no_missing_keys():
    r = drift_analysis(np.arange(5.0), np.array([1.0, 1.1, 0.9, 1.05, 1.0]), np.full(5, 0.1))
    d = r.to_dict()
    assert {"slope", "slope_interval", "intercept_error", "residual_sd_window", "systematic",
            "constant_model"} <= set(d)
    assert d["constant_model"]["rejected"] is False
