"""Two-sided confidence intervals for a binomial proportion k/N, by the five
methods papers print, so that a printed interval can be matched to the one
that made it.

- ``wald``: p +- z sqrt(p(1 - p)/N) (statsmodels ``normal``);
- ``wilson``: the score interval;
- ``clopper-pearson``: the exact interval from beta quantiles (``beta``);
- ``agresti-coull``: the Wald form about (k + z^2/2)/(N + z^2);
- ``jeffreys``: beta(k + 1/2, N - k + 1/2) quantiles.

The formulas are written here with ``scipy.special`` (``ndtri``, ``betaincinv``,
``betainccinv``) rather than taken from statsmodels'
``proportion_confint``: that function gives the same numbers (the tests compare
every method over a grid of counts) but costs about half a millisecond per
call in argument handling, which a claim with an interval pays dozens of
times, and importing statsmodels costs more than the rest of a check.

References
----------
R. G. Newcombe, "Two-sided confidence intervals for the single proportion:
comparison of seven methods", Stat. Med. 17, 857 (1998), Table I.
L. D. Brown, T. T. Cai and A. DasGupta, "Interval estimation for a binomial
proportion", Statist. Sci. 16, 101 (2001), Eqs. (4), (5) and Section 4.1.3
(from memory).
A. Agresti and B. A. Coull, "Approximate is better than 'exact' for interval
estimation of binomial proportions", Amer. Statist. 52, 119 (1998).
"""

from __future__ import annotations

import math

import numpy as np
from scipy.special import betainccinv, betaincinv

from .interval import z_for_level

INTERVAL_METHODS = ("wald", "wilson", "clopper-pearson", "agresti-coull", "jeffreys")
SCALAR_UP_TO = 32  # counts below which plain floats beat numpy arrays
NAMES = {"wald": "Wald", "wilson": "Wilson", "clopper-pearson": "Clopper-Pearson",
         "agresti-coull": "Agresti-Coull", "jeffreys": "Jeffreys"}


def _check(method: str, level: float) -> None:
    if method not in NAMES:
        raise ValueError(f"method must be one of {INTERVAL_METHODS}, got {method!r}")
    if not 0 < level < 1:
        raise ValueError(f"level must lie in (0, 1), got {level}")


def _bounds(k: np.ndarray, n: np.ndarray, level: float, method: str) -> tuple[np.ndarray, np.ndarray]:
    """The method's raw ends for arrays of counts k and trials n (same shape)."""
    z = z_for_level(level)
    alpha = 1.0 - level
    p = k / n
    if method == "wald":
        half = z * np.sqrt(p * (1.0 - p) / n)
        return p - half, p + half
    if method == "wilson":
        z2 = z * z
        centre = (k + z2 / 2.0) / (n + z2)
        half = z * np.sqrt(n * p * (1.0 - p) + z2 / 4.0) / (n + z2)
        return centre - half, centre + half
    if method == "agresti-coull":
        z2 = z * z
        n_c = n + z2
        p_c = (k + z2 / 2.0) / n_c
        half = z * np.sqrt(p_c * (1.0 - p_c) / n_c)
        return p_c - half, p_c + half
    if method == "clopper-pearson":
        a_low, b_low, a_high, b_high = k, n - k + 1.0, k + 1.0, n - k
    else:  # jeffreys
        a_low, b_low, a_high, b_high = k + 0.5, n - k + 0.5, k + 0.5, n - k + 0.5
    with np.errstate(invalid="ignore", divide="ignore"):
        # The upper end is the upper alpha/2 quantile: betainccinv keeps its
        # digits where 1 - alpha/2 would round (a 1 - 1e-12 level).
        low = np.where(a_low > 0, betaincinv(np.where(a_low > 0, a_low, 1.0), b_low, alpha / 2.0), 0.0)
        high = np.where(b_high > 0, betainccinv(a_high, np.where(b_high > 0, b_high, 1.0), alpha / 2.0), 1.0)
    # The exact interval's ends are 0 at count 0 and 1 at count n; Brown, Cai
    # and DasGupta set the Jeffreys interval's ends the same way, so that it
    # holds the estimate.
    low = np.where((k <= 0) | np.isnan(low), 0.0, low)
    high = np.where((k >= n) | np.isnan(high), 1.0, high)
    return low, high


def _scalar_bounds(k: float, n: float, level: float, method: str) -> tuple[float, float]:
    """:func:`_bounds` for one count in plain floats: the same formulas, without
    numpy's per-call overhead, which dominates for the handful of counts a
    claim's interval check evaluates (tests compare the two paths)."""
    z = z_for_level(level)
    p = k / n
    if method == "wald":
        half = z * math.sqrt(max(p * (1.0 - p), 0.0) / n)
        return p - half, p + half
    if method == "wilson":
        z2 = z * z
        centre = (k + z2 / 2.0) / (n + z2)
        half = z * math.sqrt(max(n * p * (1.0 - p), 0.0) + z2 / 4.0) / (n + z2)
        return centre - half, centre + half
    if method == "agresti-coull":
        z2 = z * z
        n_c = n + z2
        p_c = (k + z2 / 2.0) / n_c
        half = z * math.sqrt(p_c * (1.0 - p_c) / n_c)
        return p_c - half, p_c + half
    if method == "clopper-pearson":
        a_low, b_low, a_high, b_high = k, n - k + 1.0, k + 1.0, n - k
    else:
        a_low, b_low, a_high, b_high = k + 0.5, n - k + 0.5, k + 0.5, n - k + 0.5
    alpha = 1.0 - level
    low = float(betaincinv(a_low, b_low, alpha / 2.0)) if a_low > 0 and k > 0 else 0.0
    high = float(betainccinv(a_high, b_high, alpha / 2.0)) if b_high > 0 and k < n else 1.0
    return (0.0 if low != low else low), (1.0 if high != high else high)


def proportion_interval(count: float, n: float, level: float, method: str) -> tuple[float, float]:
    """The two-sided interval for count/n at confidence ``level``.

    Parameters
    ----------
    count : float
        Successes, 0 <= count <= n (a non-whole count is accepted, for
        evaluating over printed precision).
    n : float
        Trials, more than zero.
    level : float
        Confidence level in (0, 1), e.g. 0.95.
    method : str
        One of :data:`INTERVAL_METHODS`.

    Returns
    -------
    (low, high), clipped to [0, 1].
    """
    _check(method, level)
    if not n > 0 or not 0 <= count <= n:
        raise ValueError(f"need 0 <= count <= n and n > 0, got {count}/{n}")
    low, high = _scalar_bounds(float(count), float(n), level, method)
    return (min(max(low, 0.0), 1.0), min(max(high, 0.0), 1.0))


def interval_arrays(counts, n, level: float, method: str) -> tuple[np.ndarray, np.ndarray]:
    """Vectorised :func:`proportion_interval`: counts and n broadcast together
    (many counts of one n, or one count per denominator); arrays of ends."""
    _check(method, level)
    k, size = np.broadcast_arrays(np.asarray(counts, dtype=float), np.asarray(n, dtype=float))
    if np.any(~(size > 0)) or np.any(~(k >= 0)) or np.any(k > size):
        raise ValueError("need 0 <= count <= n and n > 0, and a level in (0, 1)")
    low, high = _bounds(k, size, level, method)
    return np.clip(low, 0.0, 1.0), np.clip(high, 0.0, 1.0)


def proportion_intervals(counts, n: float, level: float, method: str) -> list[tuple[float, float]]:
    """:func:`proportion_interval` for many counts of the same n in one call."""
    if len(counts) <= SCALAR_UP_TO:
        return [proportion_interval(k, n, level, method) for k in counts]
    low, high = interval_arrays(np.atleast_1d(np.asarray(counts, dtype=float)), n, level, method)
    return [(float(a), float(b)) for a, b in zip(low, high)]
