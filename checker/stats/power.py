"""How large an experiment must be to detect an effect at ``target_sigma``
(one-sided, alpha = 1 - Phi(target_sigma)) with probability ``power``.

- Two proportions, independent items (the difference's errors in quadrature,
  the test the ``comparison`` check recomputes):
  n per arm = (z_a + z_b)^2 (p1 q1 + p2 q2) / (p1 - p2)^2; with ``pooled`` the
  null variance uses the pooled proportion,
  n = (z_a sqrt(2 pbar qbar) + z_b sqrt(p1 q1 + p2 q2))^2 / (p1 - p2)^2
  (Fleiss, Levin and Paik 2003, Eq. 4.14 without the continuity correction).
- Two proportions on the same items (McNemar's z), with discordance rate
  psi = p10 + p01 and difference delta = p10 - p01 (Connor 1987):
  n = (z_a sqrt(psi) + z_b sqrt(psi - delta^2))^2 / delta^2.
- A mean over runs, tested with Student's t on n - 1 degrees of freedom: the
  smallest n whose power under the noncentral t, noncentrality
  delta sqrt(n) / sd, reaches the target.
- A counting experiment at background rate b and signal rate s per unit of
  exposure: the smallest exposure T at which P(N >= n_c | (s + b) T) reaches
  the power, n_c being the smallest count whose Poisson tail under b T is at
  most alpha.  The power of a discrete test is a sawtooth in T (it drops each
  time n_c steps up), so the answer is the first T at which it is reached.

References
----------
J. L. Fleiss, B. Levin and M. C. Paik, "Statistical Methods for Rates and
Proportions", 3rd ed., Wiley (2003), section 4.2 (from memory).
R. J. Connor, "Sample size for testing differences in proportions for the
paired-sample design", Biometrics 43, 207 (1987).
J. Cohen, "Statistical Power Analysis for the Behavioral Sciences", 2nd ed.
(1988), chapter 2 (power of the t test through the noncentral t; from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from scipy.optimize import brentq
from scipy.special import gammainc, gammaincinv, ndtri

from .tails import log_p_from_sigma


@dataclass(frozen=True)
class SampleSize:
    """The size needed and what it delivers."""

    kind: str
    count: float            # items per arm, items, runs, or exposure (in the claim's units)
    target_sigma: float
    power: float
    achieved_power: float    # at ``count`` (the rounded-up whole count, or the exposure)
    reachable: bool = True


def _z(power: float) -> float:
    return float(ndtri(power))


def two_proportions(p1: float, p2: float, target_sigma: float, power: float,
                    pooled: bool = False) -> SampleSize:
    """Items per arm to detect p1 > p2 with independent items."""
    delta = p1 - p2
    if delta <= 0:
        return SampleSize("two-proportions", math.inf, target_sigma, power, 0.0, False)
    var_alt = p1 * (1 - p1) + p2 * (1 - p2)
    z_b = _z(power)
    if pooled:
        pbar = (p1 + p2) / 2
        root = target_sigma * math.sqrt(2 * pbar * (1 - pbar)) + z_b * math.sqrt(var_alt)
    else:
        root = (target_sigma + z_b) * math.sqrt(var_alt)
    n = (root / delta) ** 2
    whole = math.ceil(n - 1e-9)
    achieved = two_proportions_power(p1, p2, whole, target_sigma, pooled)
    return SampleSize("two-proportions", whole, target_sigma, power, achieved)


def two_proportions_power(p1: float, p2: float, n: float, target_sigma: float, pooled: bool = False) -> float:
    """Normal-approximation power of the unpaired test with ``n`` items per arm."""
    from scipy.special import ndtr
    var_alt = p1 * (1 - p1) + p2 * (1 - p2)
    null_sd = math.sqrt(2 * ((p1 + p2) / 2) * (1 - (p1 + p2) / 2)) if pooled else math.sqrt(var_alt)
    return float(ndtr(((p1 - p2) * math.sqrt(n) - target_sigma * null_sd) / math.sqrt(var_alt)))


def paired_proportions(p10: float, p01: float, target_sigma: float, power: float) -> SampleSize:
    """Items (scored by both) to detect p10 > p01 with McNemar's z (Connor 1987)."""
    delta, psi = p10 - p01, p10 + p01
    if delta <= 0 or psi <= 0:
        return SampleSize("paired-proportions", math.inf, target_sigma, power, 0.0, False)
    root = target_sigma * math.sqrt(psi) + _z(power) * math.sqrt(max(psi - delta * delta, 0.0))
    n = (root / delta) ** 2
    whole = math.ceil(n - 1e-9)
    return SampleSize("paired-proportions", whole, target_sigma, power,
                      paired_proportions_power(p10, p01, whole, target_sigma))


def paired_proportions_power(p10: float, p01: float, n: float, target_sigma: float) -> float:
    from scipy.special import ndtr
    delta, psi = p10 - p01, p10 + p01
    spread = math.sqrt(max(psi - delta * delta, 1e-300))
    return float(ndtr((delta * math.sqrt(n) - target_sigma * math.sqrt(psi)) / spread))


def mean_runs_power(delta: float, sd: float, runs: int, target_sigma: float) -> float:
    """Power of the one-sided t test of a mean over ``runs`` runs at the alpha
    of ``target_sigma``."""
    from scipy import stats  # noqa: PLC0415  (heavy import, only for planning)
    df = runs - 1
    alpha = math.exp(log_p_from_sigma(target_sigma, "one"))
    critical = float(stats.t.isf(alpha, df))
    return float(stats.nct.sf(critical, df, delta * math.sqrt(runs) / sd))


def mean_runs(delta: float, sd: float, target_sigma: float, power: float, most: int = 10_000_000) -> SampleSize:
    """Runs needed for a mean to clear its threshold by ``delta`` (t test)."""
    if delta <= 0 or sd <= 0:
        return SampleSize("mean-runs", math.inf, target_sigma, power, 0.0, False)
    # The normal answer is a lower bound (t's tails are heavier); step up from it.
    start = max(2, math.floor(((target_sigma + _z(power)) * sd / delta) ** 2))
    lo = start
    while mean_runs_power(delta, sd, lo, target_sigma) >= power and lo > 2:
        lo = max(2, lo // 2)
    hi = max(lo, start)
    while mean_runs_power(delta, sd, hi, target_sigma) < power:
        hi *= 2
        if hi > most:
            return SampleSize("mean-runs", math.inf, target_sigma, power, 0.0, False)
    while hi - lo > 1:  # power rises with the runs
        mid = (lo + hi) // 2
        if mean_runs_power(delta, sd, mid, target_sigma) >= power:
            hi = mid
        else:
            lo = mid
    if mean_runs_power(delta, sd, lo, target_sigma) >= power:
        hi = lo
    return SampleSize("mean-runs", hi, target_sigma, power, mean_runs_power(delta, sd, hi, target_sigma))


def _critical_count(mu_b: float, alpha: float) -> int:
    """Smallest n with P(N >= n | mu_b) <= alpha."""
    n = max(1, math.floor(mu_b))
    while gammainc(n, mu_b) > alpha:
        n = max(n + 1, int(n * 1.1))
    while n > 1 and gammainc(n - 1, mu_b) <= alpha:
        n -= 1
    return n


def counting_power(signal_rate: float, background_rate: float, exposure: float, target_sigma: float) -> float:
    """P(reaching target_sigma by the exact Poisson tail) at ``exposure``."""
    alpha = math.exp(log_p_from_sigma(target_sigma, "one"))
    n_c = _critical_count(background_rate * exposure, alpha)
    return float(gammainc(n_c, (signal_rate + background_rate) * exposure))


def counting_exposure(signal_rate: float, background_rate: float, target_sigma: float, power: float,
                      most_events: int = 100_000_000) -> SampleSize:
    """The smallest exposure at which the exact Poisson test reaches the power.

    While the critical count n is fixed, exposure T lies in
    (mu_{n-1}/b, mu_n/b], mu_n solving P(N >= n | mu) = alpha, and the power
    P(N >= n | (s + b) T) rises with T; the answer is in the first segment whose
    right end reaches the power.
    """
    if signal_rate <= 0 or background_rate <= 0:
        return SampleSize("counting-exposure", math.inf, target_sigma, power, 0.0, False)
    alpha = math.exp(log_p_from_sigma(target_sigma, "one"))
    ratio = 1.0 + signal_rate / background_rate

    def mu(n):  # background mean at which n events have tail alpha
        return float(gammaincinv(n, alpha))

    def reached(n):
        return gammainc(n, ratio * mu(n)) >= power

    lo, hi = 1, 1
    while not reached(hi):
        lo, hi = hi, hi * 2
        if hi > most_events:
            return SampleSize("counting-exposure", math.inf, target_sigma, power, 0.0, False)
    while hi - lo > 1:  # reached(n) turns true once and stays (the segments' right ends)
        mid = (lo + hi) // 2
        if reached(mid):
            hi = mid
        else:
            lo = mid
    n = 1 if reached(1) else hi
    left = mu(n - 1) / background_rate if n > 1 else 0.0
    right = mu(n) / background_rate
    f = lambda t: gammainc(n, (signal_rate + background_rate) * t) - power  # noqa: E731
    exposure = right if f(right) <= 0 else (brentq(f, left, right, xtol=1e-12 * right) if f(left) < 0 else left)
    return SampleSize("counting-exposure", exposure, target_sigma, power,
                      float(gammainc(n, (signal_rate + background_rate) * exposure)))
