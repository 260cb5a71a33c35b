"""Gaussian tails held as log-p, so that 40 sigma and p = 1e-300 round-trip.

``scipy.special.log_ndtr`` and ``scipy.special.ndtri_exp`` convert between a
z value and the log of its tail area without ever forming the tail area itself;
``norm.sf(40)`` is already 0.0 in double precision.

References
----------
Particle Data Group, Review of Particle Physics, chapter "Statistics" (G. Cowan):
one-sided p = 1 - Phi(z); two-sided p = 2 (1 - Phi(|z|)).
"""

from __future__ import annotations

import math

from scipy.special import log_ndtr, ndtri_exp

LOG2 = math.log(2.0)
SIDES = ("one", "two")


def log_p_from_sigma(z: float, sided: str = "one") -> float:
    """Natural log of the tail area beyond ``z`` standard deviations.

    Parameters
    ----------
    z : float
        The z value (any sign for one-sided; its magnitude for two-sided).
    sided : {"one", "two"}
        One-sided upper tail, or both tails.

    Returns
    -------
    float
        ``log p``; finite for every finite ``z``.
    """
    if sided == "one":
        return float(log_ndtr(-z))
    if sided == "two":
        return float(min(0.0, LOG2 + log_ndtr(-abs(z))))
    raise ValueError(f"sided must be 'one' or 'two', got {sided!r}")


def sigma_from_log_p(log_p: float, sided: str = "one") -> float:
    """The z value whose tail area has log ``log_p`` (the inverse of
    :func:`log_p_from_sigma`).  Two-sided p-values give ``z >= 0``."""
    if log_p > 0.0:
        raise ValueError(f"log p must be <= 0, got {log_p}")
    if sided == "one":
        return float(-ndtri_exp(log_p))
    if sided == "two":
        return float(max(0.0, -ndtri_exp(log_p - LOG2)))
    raise ValueError(f"sided must be 'one' or 'two', got {sided!r}")


def p_from_log_p(log_p: float) -> float:
    """``exp(log_p)``; underflows to 0.0 below about 1e-308 (keep log-p for those)."""
    return math.exp(log_p) if log_p > -745.0 else 0.0


def log10_p(log_p: float) -> float:
    return log_p / math.log(10.0)
