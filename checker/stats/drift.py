"""A stability systematic from repeated measurements of the same quantity.

Given a series (time t_i, estimate y_i, optional error sigma_i), fit the
straight line y = a + b (t - t_c) by ordinary least squares (statsmodels),
with t_c the centre of the data-taking window [t_start, t_end] that the
headline number comes from, so that a is the trend's level there and its
standard error is the intercept uncertainty.  Then:

* trend spread: a linear drift of slope b moves the quantity by b w across a
  window of width w; as a spread about the window's mean it is
  |b| w / sqrt(12) (the standard deviation of a uniform ramp);
* residual spread inside the window: the standard deviation of the residuals
  of the points in the window; with stated errors, the part beyond them,
  sqrt(max(0, s_res^2 - mean(sigma_i^2))) (without errors all of it counts);
* combined systematic: the trend spread, the excess spread and the intercept
  uncertainty added in quadrature (each a separate source; common practice);
* constant model: rejected when the slope's t-test gives p < alpha or, with
  stated errors, when the chi-square of the points about their weighted mean
  has p < alpha.

References
----------
OLS slope, its standard error, t-based confidence interval and t-test:
N. R. Draper and H. Smith, "Applied Regression Analysis", 3rd ed., Wiley
(1998), ch. 1 (from memory); computed by statsmodels.regression.linear_model.OLS.
Chi-square of a constant fit with known errors: Particle Data Group, Review of
Particle Physics, chapter "Statistics" (the method of least squares).
The standard deviation of a uniform distribution of width w is w/sqrt(12)
(common practice).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np


@dataclass(frozen=True)
class DriftResult:
    """What the series says about the stability of the estimate."""

    points: int
    level: float
    alpha: float
    slope: float
    slope_error: float
    slope_low: float
    slope_high: float
    slope_p_value: float
    window_start: float
    window_end: float
    window_points: int
    trend_level: float
    trend_level_error: float
    trend_change: float
    trend_spread: float
    residual_sd: float
    residual_sd_window: float | None
    stated_error_rms_window: float | None
    excess_spread_window: float | None
    systematic: float
    constant_chi2: float | None
    constant_dof: int | None
    constant_p_value: float | None
    constant_rejected: bool
    reasons: tuple[str, ...] = field(default=())

    def to_dict(self) -> dict:
        return {
            "points": self.points, "level": self.level, "alpha": self.alpha,
            "slope": self.slope, "slope_error": self.slope_error,
            "slope_interval": {"low": self.slope_low, "high": self.slope_high, "level": self.level},
            "slope_p_value": self.slope_p_value,
            "window": {"start": self.window_start, "end": self.window_end, "points": self.window_points},
            "intercept": self.trend_level, "intercept_error": self.trend_level_error,
            "trend_change": self.trend_change, "trend_spread": self.trend_spread,
            "residual_sd": self.residual_sd, "residual_sd_window": self.residual_sd_window,
            "stated_error_rms_window": self.stated_error_rms_window,
            "excess_spread_window": self.excess_spread_window,
            "systematic": self.systematic,
            "constant_model": {"chi2": self.constant_chi2, "dof": self.constant_dof,
                               "p_value": self.constant_p_value, "rejected": self.constant_rejected,
                               "reasons": list(self.reasons)},
        }


def drift_analysis(times, estimates, errors=None, window: tuple[float, float] | None = None,
                   level: float = 0.95, alpha: float = 0.05) -> DriftResult:
    """Trend, spreads and a combined stability systematic for one series.

    Parameters
    ----------
    times, estimates : array
        At least three points, at no fewer than two distinct times.
    errors : array, optional
        Stated one-sigma error of each estimate (all > 0).
    window : (start, end), optional
        The data-taking window of the headline number; the whole series by
        default.
    level : float
        Confidence level of the slope interval.
    alpha : float
        Test size for rejecting the constant model.

    Returns
    -------
    DriftResult
    """
    import statsmodels.api as sm
    from scipy import stats

    t = np.asarray(times, dtype=float)
    y = np.asarray(estimates, dtype=float)
    if t.size < 3:
        raise ValueError("a trend needs at least three points")
    if np.ptp(t) == 0:
        raise ValueError("all points are at the same time")
    start, end = (float(t.min()), float(t.max())) if window is None else (float(window[0]), float(window[1]))
    if end < start:
        raise ValueError("the window ends before it starts")
    centre = 0.5 * (start + end)
    design = np.column_stack([np.ones_like(t), t - centre])
    fit = sm.OLS(y, design).fit()
    slope, intercept = float(fit.params[1]), float(fit.params[0])
    slope_se, intercept_se = float(fit.bse[1]), float(fit.bse[0])
    low, high = (float(v) for v in fit.conf_int(alpha=1.0 - level)[1])
    slope_p = float(fit.pvalues[1])
    resid = np.asarray(fit.resid)
    residual_sd = float(np.sqrt(np.sum(resid ** 2) / (t.size - 2))) if t.size > 2 else math.nan

    inside = (t >= start) & (t <= end)
    in_resid = resid[inside]
    sd_window = float(np.std(in_resid, ddof=1)) if in_resid.size >= 2 else None
    stated_rms = None
    excess = None
    if errors is not None:
        e = np.asarray(errors, dtype=float)
        if e[inside].size:
            stated_rms = float(np.sqrt(np.mean(e[inside] ** 2)))
        if sd_window is not None and stated_rms is not None:
            excess = math.sqrt(max(0.0, sd_window ** 2 - stated_rms ** 2))
    elif sd_window is not None:
        excess = sd_window
    width = end - start
    trend_spread = abs(slope) * width / math.sqrt(12.0)
    systematic = math.sqrt(trend_spread ** 2 + (excess or 0.0) ** 2 + intercept_se ** 2)

    reasons = []
    if slope_p < alpha:
        reasons.append("slope")
    chi2 = dof = chi2_p = None
    if errors is not None:
        e = np.asarray(errors, dtype=float)
        w = 1.0 / e ** 2
        mean_w = float(np.sum(w * y) / np.sum(w))
        chi2 = float(np.sum(w * (y - mean_w) ** 2))
        dof = int(t.size - 1)
        chi2_p = float(stats.chi2.sf(chi2, dof))
        if chi2_p < alpha:
            reasons.append("scatter")
    return DriftResult(
        points=int(t.size), level=level, alpha=alpha, slope=slope, slope_error=slope_se,
        slope_low=low, slope_high=high, slope_p_value=slope_p, window_start=start, window_end=end,
        window_points=int(inside.sum()), trend_level=intercept, trend_level_error=intercept_se,
        trend_change=slope * width, trend_spread=trend_spread, residual_sd=residual_sd,
        residual_sd_window=sd_window, stated_error_rms_window=stated_rms, excess_spread_window=excess,
        systematic=systematic, constant_chi2=chi2, constant_dof=dof, constant_p_value=chi2_p,
        constant_rejected=bool(reasons), reasons=tuple(reasons))
