"""Student's t tails held as log-p, so that deep tails round-trip.

``scipy.special.stdtr`` (and ``scipy.stats.t.logsf``) lose the tail to
underflow: ``t.logsf(200, 399)`` is ``-inf``.  Here the upper tail is

    P(T > t) = I_x(df/2, 1/2) / 2,   x = df / (df + t^2),

with the incomplete beta function taken in log space below p = 1e-280
(:mod:`checker.stats.log_special`), so 40 sigma and p = 1e-300 round-trip
at any number of degrees of freedom.

References
----------
M. Abramowitz and I. A. Stegun, Handbook of Mathematical Functions (1964),
eq. 26.7.1 and 26.5.27: the t distribution through the incomplete beta
function (from memory).
"""

from __future__ import annotations

import math

from scipy.optimize import brentq
from scipy.special import stdtr, stdtrit

from .log_special import log_betainc

LOG2 = math.log(2.0)
# Below this p the library's double-precision tail is replaced.
_SERIES_BELOW = 1e-280

def log_sf(t: float, df: float) -> float:
    """Natural log of P(T > t) for Student's t with ``df`` degrees of freedom.

    Parameters
    ----------
    t : float
        Any finite value.
    df : float
        Degrees of freedom, > 0 (need not be whole).

    Returns
    -------
    float
        Finite for every finite ``t``: 40 sigma and p = 1e-300 round-trip.
    """
    if not df > 0:
        raise ValueError(f"degrees of freedom must be > 0, got {df}")
    p = float(stdtr(df, -t))
    if p > _SERIES_BELOW or t <= 0:
        return math.log(p) if p > 0 else -math.inf
    # log x = log(df / (df + t^2)), written so that t^2 never overflows
    log_x = math.log(df) - 2.0 * math.log(t) - math.log1p(df / t / t)
    return log_betainc(df / 2.0, 0.5, math.exp(log_x), log_x=log_x) - LOG2


def log_p(t: float, df: float, sided: str = "one") -> float:
    """log p of a t statistic: the upper tail, or both tails."""
    if sided == "one":
        return log_sf(t, df)
    if sided == "two":
        return min(0.0, LOG2 + log_sf(abs(t), df))
    raise ValueError(f"sided must be 'one' or 'two', got {sided!r}")


def t_from_log_p(log_p_value: float, df: float, sided: str = "one") -> float:
    """The t whose tail has log ``log_p_value`` (the inverse of :func:`log_p`);
    two-sided p-values give t >= 0.  +inf when the t would overflow a double."""
    if log_p_value > 0.0:
        raise ValueError(f"log p must be <= 0, got {log_p_value}")
    target = log_p_value - LOG2 if sided == "two" else log_p_value
    if sided not in ("one", "two"):
        raise ValueError(f"sided must be 'one' or 'two', got {sided!r}")
    if target > math.log(_SERIES_BELOW) * 0.999:
        t = -float(stdtrit(df, math.exp(target)))
        return max(0.0, t) if sided == "two" else t
    # Deep tail: the root in log t; the t tail is heavier than the normal one,
    # so the normal z is a lower bracket.
    lo = math.log(max(1.0, math.sqrt(-2.0 * target) * 0.5))
    hi = lo + 1.0
    while log_sf(math.exp(hi), df) > target:
        hi += 2.0 * (hi - lo)
        if hi > 709.0:
            if log_sf(math.exp(709.0), df) > target:
                return math.inf
            hi = 709.0
            break
    u = brentq(lambda u: log_sf(math.exp(u), df) - target, lo, hi, xtol=1e-14, rtol=1e-15, maxiter=500)
    return math.exp(u)
