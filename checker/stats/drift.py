"""A stability systematic from repeated measurements of the same quantity.

Given a series (time t_i, estimate y_i, optional error sigma_i), fit the
straight line y = a + b (t - t_c) by ordinary least squares (statsmodels),
with t_c the centre of the data-taking window [t_start, t_end] that the
headline number comes from, so that a is the trend's level there; its
interval a +- t_{n-2} se(a) is the level's (statistical) uncertainty, not
part of the systematic.  The systematic estimates spread beyond what the
stated errors explain:

* trend: a drift of slope b moves the quantity by b w across a window of
  width w, a spread of |b| w / sqrt(12) about the window's mean (the sd of a
  uniform ramp).  |b| is biased up by noise (E b^2 = beta^2 + se(b)^2), so the
  systematic takes sqrt(max(0, b^2 - se(b)^2)) w / sqrt(12);
* excess scatter inside the window: with stated errors, the variance tau^2
  that the points scatter by beyond them, from the residuals r = (I - H) y of
  the line: E sum_W r_i^2 = sum_W sum_j M_ij^2 sigma_j^2 + tau^2 sum_W M_ii
  (M = I - H), so tau^2 = max(0, (sum_W r_i^2 - sum_W sum_j M_ij^2 sigma_j^2)
  / sum_W M_ii), unbiased before the truncation at 0.  Without stated errors
  the points' whole scatter counts (the same estimator with sigma = 0);
* systematic: the two in quadrature (``systematic_estimate``); its upper
  limit at ``level`` from the slope interval's larger end and, for tau, the
  Q-profile limit (the tau at which the weighted residual chi-square about
  the line falls to its (1 - level) quantile on n - 2 degrees of freedom).
  With stated errors, when the constant model is not rejected the series is
  consistent with no systematic: ``systematic`` is then 0 and the upper limit
  says how large one could be (a non-negative estimate of a spread is biased
  up by noise, so adding it anyway would count noise twice).  Without stated
  errors nothing separates noise from spread and the estimate stands.

Constant model.  With stated errors two independent tests: the weighted
slope against 0 (z = b_w / se_w, se_w from the stated errors alone) and the
chi-square of the residuals about the weighted line on n - 2 degrees of
freedom (under a Gaussian null the fitted line and its residuals are
independent), combined by Sidak's correction, p = 1 - (1 - min p)^2, which
holds the stated alpha exactly.  Without errors, the OLS slope t-test alone
(the scatter cannot be judged without errors).

References
----------
OLS slope, its standard error, t-based confidence interval and t-test:
N. R. Draper and H. Smith, "Applied Regression Analysis", 3rd ed., Wiley
(1998), ch. 1 (from memory); computed by statsmodels.regression.linear_model.OLS.
Chi-square of a fit with known errors: Particle Data Group, Review of
Particle Physics, chapter "Statistics" (the method of least squares).
Sidak's correction: Z. Sidak, J. Am. Stat. Assoc. 62, 626 (1967).
Q-profile interval for tau^2: W. Viechtbauer, Stat. Med. 26, 37 (2007).
The sd of a uniform distribution of width w is w/sqrt(12) (common practice).
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
    trend_level_low: float = math.nan
    trend_level_high: float = math.nan
    trend_systematic: float = 0.0
    systematic_upper: float = math.nan
    systematic_estimate: float = 0.0
    consistent_with_none: bool = False
    constant_test: str = ""
    scatter_p_value: float | None = None
    weighted_slope_p_value: float | None = None

    def to_dict(self) -> dict:
        return {
            "points": self.points, "level": self.level, "alpha": self.alpha,
            "slope": self.slope, "slope_error": self.slope_error,
            "slope_interval": {"low": self.slope_low, "high": self.slope_high, "level": self.level},
            "slope_p_value": self.slope_p_value,
            "window": {"start": self.window_start, "end": self.window_end, "points": self.window_points},
            "intercept": self.trend_level, "intercept_error": self.trend_level_error,
            "intercept_interval": {"low": self.trend_level_low, "high": self.trend_level_high, "level": self.level},
            "trend_change": self.trend_change, "trend_spread": self.trend_spread,
            "trend_systematic": self.trend_systematic,
            "residual_sd": self.residual_sd, "residual_sd_window": self.residual_sd_window,
            "stated_error_rms_window": self.stated_error_rms_window,
            "excess_spread_window": self.excess_spread_window,
            "systematic": self.systematic, "systematic_estimate": self.systematic_estimate,
            "systematic_upper": self.systematic_upper,
            "consistent_with_no_systematic": self.consistent_with_none,
            "constant_model": {"chi2": self.constant_chi2, "dof": self.constant_dof,
                               "p_value": self.constant_p_value, "rejected": self.constant_rejected,
                               "test": self.constant_test, "scatter_p_value": self.scatter_p_value,
                               "weighted_slope_p_value": self.weighted_slope_p_value,
                               "reasons": list(self.reasons)},
        }


def _wls(t, y, w):
    """Weighted straight line: (intercept, slope, slope error from the weights, residuals)."""
    sw = float(np.sum(w))
    tm = float(np.sum(w * t)) / sw
    ym = float(np.sum(w * y)) / sw
    stt = float(np.sum(w * (t - tm) ** 2))
    slope = float(np.sum(w * (t - tm) * (y - ym))) / stt
    resid = y - (ym + slope * (t - tm))
    return ym - slope * tm, slope, 1.0 / math.sqrt(stt), resid


def _tau_upper(t, y, e, level: float) -> float:
    """Q-profile upper limit of tau: Q(tau) = sum r_i^2 / (sigma_i^2 + tau^2) about the
    weighted line falls with tau; the limit is where it reaches chi2_{n-2}(1 - level)."""
    from scipy import optimize, stats

    target = float(stats.chi2.ppf(1.0 - level, t.size - 2))

    def q(tau):
        w = 1.0 / (e ** 2 + tau * tau)
        return float(np.sum(w * _wls(t, y, w)[3] ** 2)) - target

    if q(0.0) <= 0:
        return 0.0
    high = max(float(np.std(y)), float(e.max()), 1e-300)
    for _ in range(200):
        if q(high) < 0:
            break
        high *= 2.0
    return float(optimize.brentq(q, 0.0, high, xtol=1e-15 * high, maxiter=200))


def drift_analysis(times, estimates, errors=None, window: tuple[float, float] | None = None,
                   level: float = 0.95, alpha: float = 0.05) -> DriftResult:
    """Trend, spreads, a stability systematic and a test of constancy for one series.

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
        Confidence level of the slope and level intervals and of the
        systematic's upper limit.
    alpha : float
        Test size for rejecting the constant model (held exactly: module docstring).

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
    level_low, level_high = (float(v) for v in fit.conf_int(alpha=1.0 - level)[0])
    slope_p = float(fit.pvalues[1])
    resid = np.asarray(fit.resid)
    n = t.size
    residual_sd = float(np.sqrt(np.sum(resid ** 2) / (n - 2)))

    inside = (t >= start) & (t <= end)
    in_resid = resid[inside]
    sd_window = float(np.std(in_resid, ddof=1)) if in_resid.size >= 2 else None
    e = np.asarray(errors, dtype=float) if errors is not None else None
    stated_rms = float(np.sqrt(np.mean(e[inside] ** 2))) if (e is not None and inside.any()) else None
    # tau^2 from the residuals of the window points (module docstring): M = I - H.
    hat = design @ np.linalg.pinv(design)
    m = np.eye(n) - hat
    excess = None
    if inside.any():
        var = e ** 2 if e is not None else np.zeros(n)
        expected = float(np.sum((m[inside] ** 2) @ var))
        scale = float(np.sum(np.diag(m)[inside]))
        if scale > 0:
            excess = math.sqrt(max(0.0, (float(np.sum(in_resid ** 2)) - expected) / scale))
    width = end - start
    trend_spread = abs(slope) * width / math.sqrt(12.0)
    trend_syst = math.sqrt(max(0.0, slope * slope - slope_se * slope_se)) * width / math.sqrt(12.0)
    systematic = math.sqrt(trend_syst ** 2 + (excess or 0.0) ** 2)
    trend_upper = max(abs(low), abs(high)) * width / math.sqrt(12.0)

    reasons = []
    chi2 = dof = scatter_p = wslope_p = None
    if e is not None:
        w = 1.0 / e ** 2
        _, wslope, wslope_se, wresid = _wls(t, y, w)
        wslope_p = float(2.0 * stats.norm.sf(abs(wslope) / wslope_se))
        chi2 = float(np.sum(w * wresid ** 2))
        dof = int(n - 2)
        scatter_p = float(stats.chi2.sf(chi2, dof))
        combined = 1.0 - (1.0 - min(wslope_p, scatter_p)) ** 2  # Sidak over two independent tests
        constant_p = float(min(max(combined, 0.0), 1.0))
        test = "weighted slope and scatter about the line, Sidak-combined"
        corrected = 1.0 - math.sqrt(1.0 - alpha)
        if constant_p < alpha:
            if wslope_p < corrected:
                reasons.append("slope")
            if scatter_p < corrected:
                reasons.append("scatter")
        tau_upper = _tau_upper(t, y, e, level)
    else:
        constant_p = slope_p
        test = "OLS slope t-test (no stated errors: the scatter cannot be judged)"
        if constant_p < alpha:
            reasons.append("slope")
        # Without errors the whole scatter counts; its upper limit from chi2 on n - 2 dof.
        tau_upper = residual_sd * math.sqrt((n - 2) / float(stats.chi2.ppf(1.0 - level, n - 2)))
    rejected = constant_p < alpha
    upper = math.sqrt(trend_upper ** 2 + tau_upper ** 2)
    estimate = systematic
    if e is not None and not rejected:
        systematic = 0.0
    return DriftResult(
        points=int(n), level=level, alpha=alpha, slope=slope, slope_error=slope_se,
        slope_low=low, slope_high=high, slope_p_value=slope_p, window_start=start, window_end=end,
        window_points=int(inside.sum()), trend_level=intercept, trend_level_error=intercept_se,
        trend_change=slope * width, trend_spread=trend_spread, residual_sd=residual_sd,
        residual_sd_window=sd_window, stated_error_rms_window=stated_rms, excess_spread_window=excess,
        systematic=systematic, constant_chi2=chi2, constant_dof=dof, constant_p_value=constant_p,
        constant_rejected=bool(rejected), reasons=tuple(reasons), trend_level_low=level_low,
        trend_level_high=level_high, trend_systematic=trend_syst, systematic_upper=upper,
        systematic_estimate=estimate,
        consistent_with_none=bool(not rejected and e is not None), constant_test=test,
        scatter_p_value=scatter_p, weighted_slope_p_value=wslope_p)
