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


def test_constant_model_rejection_rates():
    # Null: a constant with correctly stated errors.  Either test may reject,
    # each at 5%, so at most about 10% of 300 series (observed share must stay
    # below 0.14: 999 seeds in 1000).  A clear slope is rejected in at least
    # 95% of them (power is near 1 at 6 standard errors).
    rng = np.random.default_rng(3)
    t = np.arange(15.0)
    errors = np.full(15, 0.02)
    null = [drift_analysis(t, 0.5 + rng.normal(0, 0.02, 15), errors).constant_rejected for _ in range(300)]
    assert np.mean(null) < 0.14
    slope = 6 * 0.02 * math.sqrt(12) / (15 * math.sqrt(15))  # about 6 slope standard errors
    drifting = [drift_analysis(t, 0.5 + slope * t * 1.5 + rng.normal(0, 0.02, 15), errors).constant_rejected
                for _ in range(100)]
    assert np.mean(drifting) >= 0.95


def test_chi_square_of_the_constant_model_by_hand():
    # Least-squares constant with known errors (PDG, "Statistics"):
    # weighted mean (1/0.01^2 * 1 + 1/0.02^2 * 2 + 1/0.01^2 * 1.5) / sum of weights.
    t = np.array([0.0, 1.0, 2.0])
    y = np.array([1.0, 2.0, 1.5])
    e = np.array([0.01, 0.02, 0.01])
    w = 1 / e ** 2
    mean = np.sum(w * y) / np.sum(w)
    r = drift_analysis(t, y, e)
    assert r.constant_chi2 == pytest.approx(np.sum(w * (y - mean) ** 2))
    assert r.constant_dof == 2
    assert r.constant_p_value == pytest.approx(stats.chi2.sf(r.constant_chi2, 2))
    assert r.constant_rejected and "scatter" in r.reasons


def test_window_spreads_and_combined_systematic():
    t = np.arange(10.0)
    y = 2.0 + 0.1 * t + np.array([0.01, -0.01] * 5)
    errors = np.full(10, 0.005)
    r = drift_analysis(t, y, errors, window=(2.0, 6.0))
    assert r.window_points == 5
    assert r.trend_change == pytest.approx(r.slope * 4.0)
    assert r.trend_spread == pytest.approx(abs(r.slope) * 4.0 / math.sqrt(12.0))
    inside = (t >= 2) & (t <= 6)
    resid = y - (r.trend_level + r.slope * (t - 4.0))
    assert r.residual_sd_window == pytest.approx(np.std(resid[inside], ddof=1))
    assert r.stated_error_rms_window == pytest.approx(0.005)
    assert r.excess_spread_window == pytest.approx(math.sqrt(r.residual_sd_window ** 2 - 0.005 ** 2))
    assert r.systematic == pytest.approx(math.sqrt(r.trend_spread ** 2 + r.excess_spread_window ** 2
                                                   + r.trend_level_error ** 2))


def test_scatter_within_the_errors_leaves_no_excess():
    t = np.arange(6.0)
    y = np.array([1.0, 1.001, 0.999, 1.0, 1.001, 0.999])
    r = drift_analysis(t, y, np.full(6, 0.01))
    assert r.excess_spread_window == 0.0
    no_errors = drift_analysis(t, y)
    assert no_errors.excess_spread_window == pytest.approx(no_errors.residual_sd_window)
    assert no_errors.constant_chi2 is None


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
