"""Look-elsewhere corrections, in log-p so that tiny local p-values survive.

References
----------
Z. Sidak, "Rectangular confidence regions for the means of multivariate normal
distributions", J. Am. Stat. Assoc. 62, 626 (1967): p_global = 1 - (1 - p)^N.
Bonferroni bound: p_global <= min(1, N p).
E. Gross and O. Vitells, "Trial factors for the look elsewhere effect in high
energy physics", Eur. Phys. J. C 70, 525 (2010), eq. (2) for one degree of
freedom: p_global ~ p_local + N(c0) exp(-(c - c0)/2) with c = Z_local^2.
"""

from __future__ import annotations

import math

import numpy as np


def log_sidak(log_p: float, trials: float) -> float:
    """log of 1 - (1 - p)^N, accurate from p = 1 down to log p beyond the float range."""
    if trials < 1:
        raise ValueError(f"trials must be at least 1, got {trials}")
    if log_p >= 0.0:
        return 0.0
    p = math.exp(log_p)
    if p >= 1.0:  # log p within 1e-16 of 0: 1 - p rounds to 0, so 1 - (1 - p)^N is 1
        return 0.0
    if trials * p < 1e-12:
        # 1 - (1 - p)^N = N p (1 - (N - 1) p / 2 + ...); the correction is below 1e-12.
        return math.log(trials) + log_p + math.log1p(-(trials - 1) * p / 2)
    log_q = trials * _log1mexp(log_p)  # log (1 - p)^N, even when p rounds to 1
    return _log1mexp(log_q)


def _log1mexp(log_x: float) -> float:
    """log(1 - x) from log x < 0, accurate at both ends (Maechler, "Accurately computing
    log(1 - exp(-|a|))", Rmpfr vignette, 2012): expm1 near x = 1, log1p near x = 0."""
    if log_x > -math.log(2.0):
        return math.log(-math.expm1(log_x))
    return math.log1p(-math.exp(log_x))


def sidak_trials(log_p_local: float, log_p_global: float) -> float:
    """The number of independent trials N that turns a local p into a global one under
    Sidak's rule, the inverse of :func:`log_sidak`:

        N = log(1 - p_global) / log(1 - p_local),

    each logarithm of 1 - p taken from log p (log1p for small p, expm1 near 1), so that
    N = p_global / p_local holds to double precision when both are tiny and a local
    p = 1e-300 still gives a finite N.  N < 1 when the global p is below the local one;
    +inf when the global p is 1 (nothing significant remains).

    Parameters
    ----------
    log_p_local, log_p_global : float
        Natural logs of the two p-values, each <= 0.
    """
    if log_p_local > 0 or log_p_global > 0:
        raise ValueError(f"log p must be <= 0, got {log_p_local}, {log_p_global}")
    if log_p_local == 0.0:
        return 1.0 if log_p_global == 0.0 else 0.0  # a local p of 1: one trial or none reproduces it
    if log_p_global == 0.0:
        return math.inf
    log_q_local = _log1mexp(log_p_local)    # log(1 - p_local) < 0
    log_q_global = _log1mexp(log_p_global)
    if log_q_local == 0.0:
        # p_local below the smallest double: -log(1 - p) = p to within p, so
        # log N = log(-log(1 - p_global)) - log p_local (and log p_global - log p_local when
        # p_global underflows too).
        log_n = (log_p_global if log_q_global == 0.0 else math.log(-log_q_global)) - log_p_local
        return math.exp(log_n) if log_n < 709.0 else math.inf
    return log_q_global / log_q_local


def log_bonferroni(log_p: float, trials: float) -> float:
    """log of min(1, N p)."""
    return min(0.0, math.log(trials) + log_p)


def log_gross_vitells(log_p_local: float, z_local: float, upcrossings: float,
                      reference_sigma: float) -> float:
    """log of p_local + N0 exp(-(Z^2 - c0)/2), with c0 = reference_sigma^2.

    Parameters
    ----------
    log_p_local : float
        log of the local p-value, under the sidedness the claim states.
    z_local : float
        The local significance Z (c = Z^2).
    upcrossings : float
        N0, the mean number of upcrossings of the scan at level c0.
    reference_sigma : float
        The reference level in sigma; c0 = reference_sigma ** 2.
    """
    c = z_local * z_local
    c0 = reference_sigma * reference_sigma
    if upcrossings <= 0:
        return log_p_local
    log_term = math.log(upcrossings) - (c - c0) / 2.0
    return min(0.0, float(np.logaddexp(log_p_local, log_term)))
