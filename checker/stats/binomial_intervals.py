"""Two-sided confidence intervals for a binomial proportion k/N, by the five
methods papers print, so that a printed interval can be matched to the one
that made it.

- ``wald``: p +- z sqrt(p(1 - p)/N) (statsmodels ``normal``);
- ``wilson``: the score interval;
- ``clopper-pearson``: the exact interval from beta quantiles (``beta``);
- ``agresti-coull``: the Wald form about (k + z^2/2)/(N + z^2);
- ``jeffreys``: beta(k + 1/2, N - k + 1/2) quantiles.

All five come from statsmodels.stats.proportion.proportion_confint, imported
only when a claim prints an interval for a proportion.

References
----------
R. G. Newcombe, "Two-sided confidence intervals for the single proportion:
comparison of seven methods", Stat. Med. 17, 857 (1998), Table I.
L. D. Brown, T. T. Cai and A. DasGupta, "Interval estimation for a binomial
proportion", Statist. Sci. 16, 101 (2001) (from memory).
"""

from __future__ import annotations

METHODS = ("wald", "wilson", "clopper-pearson", "agresti-coull", "jeffreys")
_STATSMODELS_NAME = {"wald": "normal", "wilson": "wilson", "clopper-pearson": "beta",
                     "agresti-coull": "agresti_coull", "jeffreys": "jeffreys"}
NAMES = {"wald": "Wald", "wilson": "Wilson", "clopper-pearson": "Clopper-Pearson",
         "agresti-coull": "Agresti-Coull", "jeffreys": "Jeffreys"}


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
        One of :data:`METHODS`.

    Returns
    -------
    (low, high), clipped to [0, 1].
    """
    if method not in _STATSMODELS_NAME:
        raise ValueError(f"method must be one of {METHODS}, got {method!r}")
    if not n > 0 or not 0 <= count <= n:
        raise ValueError(f"need 0 <= count <= n and n > 0, got {count}/{n}")
    if not 0 < level < 1:
        raise ValueError(f"level must lie in (0, 1), got {level}")
    from statsmodels.stats.proportion import proportion_confint  # heavy: only for intervals

    low, high = proportion_confint(count, n, alpha=1.0 - level, method=_STATSMODELS_NAME[method])
    low, high = float(low), float(high)
    if method in ("clopper-pearson", "jeffreys"):
        # The exact interval's ends are 0 at count 0 and 1 at count n (statsmodels
        # returns NaN there for non-whole counts near the ends); Brown, Cai and
        # DasGupta set the Jeffreys interval's ends the same way, so that it
        # holds the estimate (statsmodels does not).
        low = 0.0 if count == 0 or low != low else low
        high = 1.0 if count == n or high != high else high
    return (min(max(low, 0.0), 1.0), min(max(high, 0.0), 1.0))


def proportion_intervals(counts, n: float, level: float, method: str) -> list[tuple[float, float]]:
    """:func:`proportion_interval` for many counts of the same n in one call."""
    import numpy as np

    if method not in _STATSMODELS_NAME:
        raise ValueError(f"method must be one of {METHODS}, got {method!r}")
    k = np.asarray(counts, dtype=float)
    if not n > 0 or np.any(k < 0) or np.any(k > n) or not 0 < level < 1:
        raise ValueError("need 0 <= count <= n, n > 0 and a level in (0, 1)")
    from statsmodels.stats.proportion import proportion_confint

    low, high = (np.atleast_1d(np.asarray(b, dtype=float)) for b in
                 proportion_confint(k, n, alpha=1.0 - level, method=_STATSMODELS_NAME[method]))
    if method in ("clopper-pearson", "jeffreys"):
        low = np.where((k == 0) | np.isnan(low), 0.0, low)
        high = np.where((k == n) | np.isnan(high), 1.0, high)
    low, high = np.clip(low, 0.0, 1.0), np.clip(high, 0.0, 1.0)
    return [(float(a), float(b)) for a, b in zip(low, high)]
