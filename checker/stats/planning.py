"""Planning an experiment: how many samples (or circuits) a claim needs.

The planned claim is "the estimate exceeds the threshold T at Z sigma", with
the significance computed as the claims here compute it,

    z = (F_hat - T) / sqrt(se^2 + S^2),    se = sqrt(v(F) / N),

where v is the metric model's per-sample variance at the true value F, N the
count (samples; circuits for heavy output) and S a systematic error added in
quadrature.  The estimate scatters by its statistical error alone: the
systematic is a fixed, unknown offset of the apparatus, already inside F.  So

    P(pass) = Phi( (F - T - Z sqrt(se^2 + S^2)) / se ).

Setting P(pass) to the wanted power P, with z_P = Phi^-1(P), gives the count:

    F - T = Z sqrt(se^2 + S^2) + z_P se,

which for S = 0 is the textbook one-sample formula N = v (Z + z_P)^2 / (F - T)^2.
As N grows, se -> 0 and z -> (F - T) / S: a systematic caps the significance,
and Z is out of reach at any N when (F - T) <= Z S.

Read the other way, at a given N the smallest detectable value is the F that
solves the same equation with v = v(F); for heavy output at power 1/2 and
Z = 2 it is the minimum passing mean of Cross et al.

Circuits.  When the N samples come from a fixed number K of random circuits,
each circuit's own mean scatters about the ensemble's by B (the metric
model's circuit variance), and the variance of the estimate is
se^2 = (v - B)/N + B/K (checker.stats.porter_thomas.variance_of_mean): the
``spread`` c = B/K is statistical (it scatters the estimate) but no number of
samples removes it.  Then N = (v - B)/(se^2 - c) for the se that solves the
equation above, which exists only when se^2 > c: otherwise more circuits are
needed, at least B/se^2 of them even with unlimited samples.  As N grows the
expected significance tends to (F - T)/sqrt(c + S^2).

References
----------
S.-C. Chow, J. Shao and H. Wang, "Sample Size Calculations in Clinical
Research", 2nd ed., Chapman & Hall/CRC (2008), section 3.1 (one-sample mean,
one-sided test: n = (z_alpha + z_beta)^2 sigma^2 / delta^2; from memory).
J. Cohen, "Statistical Power Analysis for the Behavioral Sciences", 2nd ed.
(1988): power 0.8 as the customary target (from memory).
A. W. Cross et al., "Validating quantum computers using randomized model
circuits", Phys. Rev. A 100, 032328 (2019), arXiv:1811.12926: heavy-output
criterion h - 2 sqrt(h (1 - h) / n) > 2/3.
The systematic ceiling (F - T) / S: common practice.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable

from scipy.optimize import brentq
from scipy.special import ndtr, ndtri

VarianceAt = Callable[[float], float]


@dataclass(frozen=True)
class PlanRow:
    """What an experiment with ``count`` samples (or circuits) delivers."""

    count: int
    standard_error: float
    expected_sigma: float
    pass_probability: float
    smallest_detectable: float | None


@dataclass(frozen=True)
class Plan:
    """The count needed to reach ``target_sigma`` with ``power``, and why not when
    it cannot be reached.

    Attributes
    ----------
    count : int or None
        Samples (circuits) needed; None when no count reaches the target.
    reachable : bool
    best_sigma : float
        The significance's ceiling (F - T) / S as N grows; +inf without a
        systematic.
    table : tuple of PlanRow
        A short table over a range of counts.
    """

    value: float
    threshold: float
    target_sigma: float
    power: float
    syst: float
    variance: float
    count: int | None
    reachable: bool
    best_sigma: float
    reason: str
    table: tuple[PlanRow, ...]
    spread: float = 0.0  # c = B/K: the estimate's variance that no number of samples removes
    circuits_needed: float | None = None  # with spread: the fewest circuits that could reach it (unlimited samples)


def _check(target_sigma: float, power: float, syst: float) -> None:
    if not (math.isfinite(target_sigma) and target_sigma > 0):
        raise ValueError(f"target sigma must be a positive number, got {target_sigma}")
    if not 0.5 <= power < 1.0:
        raise ValueError(f"power must lie in [0.5, 1), got {power}")
    if not (math.isfinite(syst) and syst >= 0):
        raise ValueError(f"the systematic error must be zero or more, got {syst}")


def standard_error(variance: float, count: float, spread: float = 0.0) -> float:
    """sqrt(v / N + c), c the variance no number of samples removes (B/K)."""
    return math.sqrt(variance / count + spread)


def expected_sigma(value: float, threshold: float, variance: float, count: float,
                   syst: float = 0.0, spread: float = 0.0) -> float:
    """z = (F - T) / sqrt(v / N + c + S^2) at the true value."""
    return (value - threshold) / math.sqrt(variance / count + spread + syst * syst)


def best_sigma(value: float, threshold: float, syst: float, spread: float = 0.0) -> float:
    """The limit of the expected significance as N -> infinity: (F - T) / sqrt(c + S^2),
    +inf (or -inf) without a systematic or a circuit spread c."""
    delta = value - threshold
    floor = syst * syst + spread
    if floor > 0:
        return delta / math.sqrt(floor)
    return math.inf if delta > 0 else (-math.inf if delta < 0 else 0.0)


def pass_probability(value: float, threshold: float, variance: float, count: float,
                     target_sigma: float, syst: float = 0.0, spread: float = 0.0) -> float:
    """P(pass) = Phi((F - T - Z sqrt(se^2 + S^2)) / se), se = sqrt(v / N + c).

    Parameters
    ----------
    value : float
        The true value F the experiment measures.
    threshold : float
        T, the value the claim must exceed.
    variance : float
        Per-sample variance v at F (from the metric model).
    count : float
        N, samples (circuits for heavy output).
    target_sigma : float
        Z, the significance the claim must reach.
    syst : float
        S, a systematic error added in quadrature.
    spread : float
        c = B/K, the variance of the estimate that K circuits leave (0 when
        the circuits are not fixed); ``variance`` is then v - B.

    Returns
    -------
    float
        The probability that the experiment's z reaches Z.

    References
    ----------
    Chow, Shao and Wang (2008), section 3.1; the systematic term is common
    practice.
    """
    se = standard_error(variance, count, spread)
    if se == 0:
        return 1.0 if value - threshold > target_sigma * syst else 0.0
    return float(ndtr((value - threshold - target_sigma * math.hypot(se, syst)) / se))


def required_error(value: float, threshold: float, target_sigma: float, power: float = 0.8,
                   syst: float = 0.0) -> float:
    """The standard error se at which P(pass) equals ``power``; 0 when none does.

    Solves F - T = Z sqrt(se^2 + S^2) + z_P se.  The left side minus the right
    falls steadily with se, from F - T - Z S at se = 0 to below zero at
    se = (F - T) / (Z + z_P), so the root is bracketed there.
    """
    _check(target_sigma, power, syst)
    delta = value - threshold
    z_power = float(ndtri(power))
    if delta <= target_sigma * syst or delta <= 0:
        return 0.0
    high = delta / (target_sigma + z_power)
    if syst == 0:
        return high

    def gap(se: float) -> float:
        return delta - target_sigma * math.hypot(se, syst) - z_power * se

    return float(brentq(gap, 0.0, high, xtol=1e-15 * high, rtol=1e-15, maxiter=200))


def required_count(value: float, threshold: float, variance: float, target_sigma: float,
                   power: float = 0.8, syst: float = 0.0, spread: float = 0.0) -> float:
    """The (real-valued) N at which P(pass) equals ``power``; +inf when no N does.

    Solves F - T = Z sqrt(se^2 + S^2) + z_P se for se (:func:`required_error`),
    then N = v / (se^2 - c); none when se^2 <= c (the circuits' own spread
    alone exceeds it).  Without a systematic or spread it is
    N = v (Z + z_P)^2 / (F - T)^2.

    Parameters
    ----------
    value, threshold, variance, target_sigma, syst
        As in :func:`pass_probability`.
    power : float
        Wanted probability of reaching Z, in [0.5, 1).

    Returns
    -------
    float

    References
    ----------
    Chow, Shao and Wang (2008), section 3.1 (the S = 0 case).
    """
    se = required_error(value, threshold, target_sigma, power, syst)
    if not se > 0:
        return math.inf
    room = se * se - spread
    if not room > 0:
        return math.inf
    if variance <= 0:
        return 1.0
    if syst == 0 and spread == 0:
        z_power = float(ndtri(power))
        return variance * (target_sigma + z_power) ** 2 / (value - threshold) ** 2
    return variance / room


def smallest_detectable(threshold: float, variance_at: VarianceAt, count: float,
                        target_sigma: float, power: float = 0.8, syst: float = 0.0,
                        highest: float = math.inf, spread_at: VarianceAt | None = None) -> float | None:
    """The smallest true value that reaches Z with ``power`` at N = ``count``.

    Solves F - T = Z sqrt(v(F)/N + S^2) + z_P sqrt(v(F)/N) for the smallest
    F > T.  For heavy output with z_P = 0 (power 1/2) this is the root above
    2/3 of (h - t)^2 = Z^2 h (1 - h) / N, the minimum passing mean of Cross et
    al. (2019).

    Parameters
    ----------
    threshold : float
        T.
    variance_at : callable
        v(F), the metric model's per-sample variance at a value.
    count : float
        N.
    target_sigma, power, syst
        As in :func:`required_count`.
    highest : float
        The largest value the metric can take (1 for fidelities and
        proportions); None comes back when even that does not suffice.
    spread_at : callable, optional
        c(F) = B(F)/K, the variance K circuits leave (``variance_at`` then
        gives v - B).

    Returns
    -------
    float or None

    References
    ----------
    Cross et al. (2019), section on the heavy-output criterion; Chow, Shao and
    Wang (2008), section 3.1.
    """
    _check(target_sigma, power, syst)
    z_power = float(ndtri(power))

    def gap(f: float) -> float:
        c = max(spread_at(f), 0.0) if spread_at is not None else 0.0
        se = math.sqrt(max(variance_at(f), 0.0) / count + c)
        return f - threshold - target_sigma * math.hypot(se, syst) - z_power * se

    if math.isfinite(highest):
        # The gap need not be monotone where v(F) changes fast (small N), so the
        # first sign change on a grid is refined, not a single bracket.
        steps = 512
        previous = threshold
        for i in range(1, steps + 1):
            f = threshold + (highest - threshold) * i / steps
            if gap(f) >= 0:
                return float(brentq(gap, previous, f, xtol=1e-14, rtol=1e-15, maxiter=200))
            previous = f
        return None
    c0 = max(spread_at(threshold), 0.0) if spread_at is not None else 0.0
    width = target_sigma * syst + (target_sigma + z_power) * math.sqrt(max(variance_at(threshold), 0.0) / count + c0)
    high = threshold + max(width, 1e-300)
    for _ in range(200):
        if gap(high) >= 0:
            return float(brentq(gap, threshold, high, xtol=1e-14, rtol=1e-15, maxiter=200))
        high = threshold + 2 * (high - threshold)
    return None


def _round2(x: float) -> int:
    """A count to two significant figures, at least 1."""
    return max(1, int(float(f"{x:.2g}")))


def plan_experiment(value: float, threshold: float, variance_at: VarianceAt, target_sigma: float,
                    power: float = 0.8, syst: float = 0.0, highest: float = math.inf,
                    counts: tuple[int, ...] = (), spread_at: VarianceAt | None = None,
                    circuits: float | None = None) -> Plan:
    """The count that reaches ``target_sigma`` with ``power``, the significance's
    ceiling, and a short table over a range of counts.

    Parameters
    ----------
    value : float
        The true value F expected.
    threshold : float
        T.
    variance_at : callable
        The metric model's per-sample variance v(F).
    target_sigma, power, syst
        Z, P and S as in :func:`required_count`.
    highest : float
        The metric's largest value (for the smallest detectable value).
    counts : tuple of int
        Counts to include in the table besides the generated range.
    spread_at : callable, optional
        c(F) = B(F)/K for samples from K fixed circuits; ``variance_at`` then
        gives the within-circuit variance v - B.
    circuits : float, optional
        K, to say how many circuits would be needed when K cannot reach it.

    Returns
    -------
    Plan

    References
    ----------
    Chow, Shao and Wang (2008), section 3.1; Cross et al. (2019).
    """
    _check(target_sigma, power, syst)
    variance = max(float(variance_at(value)), 0.0)
    spread = max(float(spread_at(value)), 0.0) if spread_at is not None else 0.0
    delta = value - threshold
    n_real = required_count(value, threshold, variance, target_sigma, power, syst, spread)
    reachable = math.isfinite(n_real)
    count = max(1, math.ceil(n_real * (1 - 1e-12))) if reachable else None
    ceiling = best_sigma(value, threshold, syst, spread)
    needed = None
    if reachable:
        reason = ""
        grid = {_round2(count * k) for k in (0.25, 0.5, 2.0, 4.0)} | {count}
    elif delta <= 0:
        reason = "the expected value does not exceed the threshold"
        grid = {10 ** k for k in range(2, 8)}
    elif spread > 0 and delta > target_sigma * syst:
        se = required_error(value, threshold, target_sigma, power, syst)
        needed = spread * (circuits or 1.0) / (se * se)
        reason = (f"the circuits' own spread alone gives the estimate a standard error of "
                  f"sqrt(B/K) = {math.sqrt(spread):.3g}, above the {se:.3g} the target needs; "
                  f"it takes at least {math.ceil(needed):,} circuits")
        grid = {_round2(variance / (k * spread)) for k in (4.0, 2.0, 1.0, 0.5, 0.25, 0.125)} if variance > 0 \
            else {10 ** k for k in range(2, 8)}
    else:
        reason = (f"the systematic error caps the significance at (F - T) / S = {delta / syst:.4g} sigma, "
                  f"which does not exceed the target {target_sigma:g}")
        # Where the statistical error is 4x, 2x, 1x, 1/2, 1/4 and 1/8 of the systematic.
        grid = {_round2(variance / (k * syst) ** 2) for k in (4.0, 2.0, 1.0, 0.5, 0.25, 0.125)} if variance > 0 \
            else {10 ** k for k in range(2, 8)}
    grid |= {int(c) for c in counts}
    rows = []
    for n in sorted(grid):
        rows.append(PlanRow(
            count=n,
            standard_error=standard_error(variance, n, spread),
            expected_sigma=expected_sigma(value, threshold, variance, n, syst, spread)
            if variance > 0 or syst > 0 or spread > 0 else best_sigma(value, threshold, 0.0),
            pass_probability=pass_probability(value, threshold, variance, n, target_sigma, syst, spread),
            smallest_detectable=smallest_detectable(threshold, variance_at, n, target_sigma, power,
                                                    syst, highest, spread_at),
        ))
    return Plan(value, threshold, target_sigma, power, syst, variance, count, reachable, ceiling,
                reason, tuple(rows), spread, needed)
