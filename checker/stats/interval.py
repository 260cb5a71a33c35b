"""What a printed confidence interval implies about the standard error."""

from __future__ import annotations

import functools
import math

from scipy.special import erfinv, ndtri


@functools.lru_cache(maxsize=256)  # pure; a claim asks for the same few levels many times
def z_for_level(level: float) -> float:
    """Two-sided Gaussian critical value: 1.96 for 0.95 (PDG, "Statistics").

    ndtri(0.5 + level / 2) in exact arithmetic; computed without its
    cancellations: as -ndtri((1 - level) / 2) from 0.5 up (1 - level is exact
    there, which keeps the digits of a level such as 1 - 1e-9) and as
    sqrt(2) erfinv(level) below (where 0.5 + level / 2 rounds a level of 1e-17
    to 0.5 and the critical value to 0); P(|Z| < z) = erf(z / sqrt 2)
    (Abramowitz and Stegun, eq. 26.2.3, from memory).
    """
    if level >= 0.5:
        return float(-ndtri((1.0 - level) / 2.0))
    return float(math.sqrt(2.0) * erfinv(level))


def sigma_from_interval(low: float, high: float, level: float) -> float:
    """Standard error implied by a symmetric interval's half-width (infinite
    when the level is so small that the half-width is not a number of
    standard errors a double can hold)."""
    z = z_for_level(level)
    if not z > 0.0:
        return math.inf
    try:
        return (high - low) / (2.0 * z)
    except (OverflowError, ZeroDivisionError):
        return math.inf
