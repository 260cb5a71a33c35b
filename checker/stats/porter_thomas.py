"""Moments of the scaled probability x = D p under Porter-Thomas statistics.

Under uniform (fully depolarized) sampling x is Exp(1) for large D; under ideal
sampling its density is x e^-x.  A device with fidelity F samples from the
mixture F x e^-x + (1 - F) e^-x, so E x = 1 + F and Var x = 1 + 2F - F^2.  For
the log estimator ln x + gamma the mean is F and the variance pi^2/6 - F^2.

For finite D the ideal probabilities of a random circuit follow Beta(1, D - 1)
and the exact moments are E_u[x] = 1, E_u[x^2] = 2D/(D + 1),
E_ideal[x] = 2D/(D + 1), E_ideal[x^2] = 6D^2/((D + 1)(D + 2)).

References
----------
S. Boixo et al., "Characterizing quantum supremacy in near-term devices",
Nature Physics 14, 595 (2018), arXiv:1608.00263, sections on cross-entropy
benchmarking and Porter-Thomas statistics.

The fidelity (or estimate) given to the variance functions may be a float or a
numpy array: an array is taken elementwise by the float's operations in the
same order (``checker.stats.elementwise`` for max and the square), so the
per-circuit table of ``raw`` and the metric models share one formula and agree
bit for bit.
"""

from __future__ import annotations

import math
from functools import lru_cache
from types import MappingProxyType

from .elementwise import at_least_zero, python_square

EULER_GAMMA = 0.5772156649015329
LOG_XEB_VARIANCE_IDEAL_ZERO = math.pi ** 2 / 6.0


def linear_xeb_moments(fidelity: float, dimension: float | None = None) -> tuple[float, float]:
    """Mean and variance of one sample's x = D p under the fidelity mixture.

    Parameters
    ----------
    fidelity : float
        Mixture weight F of the ideal distribution.
    dimension : float, optional
        Hilbert-space dimension D; ``None`` for the large-D limit.

    Returns
    -------
    (mean, variance) of x.
    """
    f = fidelity
    if dimension is None or math.isinf(dimension):
        return 1.0 + f, at_least_zero(1.0 + 2.0 * f - f * f)  # negative below F = 1 - sqrt(2)
    d = float(dimension)
    m_uniform_1, m_uniform_2 = 1.0, 2.0 * d / (d + 1.0)
    m_ideal_1, m_ideal_2 = 2.0 * d / (d + 1.0), 6.0 * d * d / ((d + 1.0) * (d + 2.0))
    mean = f * m_ideal_1 + (1.0 - f) * m_uniform_1
    second = f * m_ideal_2 + (1.0 - f) * m_uniform_2
    return mean, at_least_zero(second - mean * mean)


def fidelity_from_linear_xeb(estimate: float, dimension: float | None = None) -> float:
    """The mixture weight F behind an expected estimate mean(x) - 1.

    At finite D, E x - 1 = F (D - 1)/(D + 1) (from E_ideal[x] = 2D/(D + 1)), so
    the printed estimate is not F itself; in the large-D limit it is.
    """
    if dimension is None or math.isinf(dimension):
        return estimate
    d = float(dimension)
    return estimate * (d + 1.0) / (d - 1.0)


def linear_xeb_variance(fidelity: float, dimension: float | None = None) -> float:
    """Per-sample variance of the linear XEB estimator mean(x) - 1."""
    return linear_xeb_moments(fidelity, dimension)[1]


def log_xeb_variance(fidelity: float) -> float:
    """Per-sample variance of ln x + gamma under the mixture, large-D limit."""
    return at_least_zero(LOG_XEB_VARIANCE_IDEAL_ZERO - fidelity * fidelity)


def dimension_of(qubits: int | None) -> float | None:
    """D = 2**qubits, or ``None`` when the number of qubits is not known.  Above
    about 60 qubits the finite-D correction is below double precision."""
    if qubits is None:
        return None
    if qubits > 60:
        return math.inf
    return float(2 ** int(qubits))


# --- circuit-to-circuit spread and the exact finite-D log-XEB moments ----------
#
# Linear XEB.  One circuit has ideal probabilities p_1..p_D, a flat Dirichlet
# draw (Porter-Thomas), and the device samples s with q_s = F p_s + (1 - F)/D.
# That circuit's own mean of x = D p is
#
#     mu_c = sum_s q_s D p_s = F D sum_s p_s^2 + (1 - F),
#
# so Var over circuits of mu_c is F^2 D^2 Var(sum_s p_s^2).  For the flat
# Dirichlet, E[prod p_i^k_i] = Gamma(D) prod k_i! / Gamma(D + sum k_i), hence
# E p^2 = 2/(D(D+1)), E p^4 = 24/(D(D+1)(D+2)(D+3)), E p_i^2 p_j^2 =
# 4/(D(D+1)(D+2)(D+3)) and
#
#     E[(sum p^2)^2] = (24 D + 4 D (D - 1)) / (D (D+1)(D+2)(D+3)) = 4 (D + 5)/((D+1)(D+2)(D+3)),
#     Var(sum p^2)   = 4 (D + 5)/((D+1)(D+2)(D+3)) - 4/(D+1)^2 = 4 (D - 1)/((D+1)^2 (D+2)(D+3)),
#
#     B_lin = 4 F^2 D^2 (D - 1) / ((D + 1)^2 (D + 2)(D + 3))  ->  4 F^2 / D.
#
# Log XEB.  With y = ln(D p) + gamma, mu_c = F A + (1 - F) U, A = sum_s p_s y_s,
# U = (1/D) sum_s y_s.  The same Dirichlet moments differentiated in their
# exponents give every term exactly: with M(a, b) = E[p_1^a p_2^b] = a! b! /
# (D (D + 1) ... (D + a + b - 1)) and s = D + a + b,
#
#     E[p_1^a p_2^b ln p_1]         = M (psi(1 + a) - psi(s)),
#     E[p_1^a p_2^b ln^2 p_1]       = M ((psi(1 + a) - psi(s))^2 + psi'(1 + a) - psi'(s)),
#     E[p_1^a p_2^b ln p_1 ln p_2]  = M ((psi(1 + a) - psi(s)) (psi(1 + b) - psi(s)) - psi'(s)),
#
# and Var A, Var U, Cov(A, U) follow from E[A] = D E[p_1 y_1], E[A^2] = D E[p_1^2 y_1^2]
# + D (D - 1) E[p_1 p_2 y_1 y_2], E[U^2] = E[y_1^2]/D + (D - 1)/D E[y_1 y_2] and
# E[A U] = E[p_1 y_1^2] + (D - 1) E[p_1 y_1 y_2].  For large D the same result
# follows from p_s = e_s / sum e (e_s ~ Exp(1)) to first order in the mean of e:
# mu_c - E mu_c ~ mean over s of h(e_s), h = F (e l - 2 e) + (1 - F)(l - e),
# l = ln e + gamma, whose variance with Var l = pi^2/6, Cov(e, l) = 1,
# Var(e l) = 1 + pi^2/3, Cov(e l, e) = 2 and Cov(e l, l) = pi^2/6 is
#
#     D B_log -> pi^2/6 - 1 - 2 F + (pi^2/6) F^2,
#
# (pi^2/6 - 1)/D at F = 0: it does not vanish as F -> 0, unlike the linear term.
#
# The per-sample variance of y at finite D follows from the same moments:
# E y^k = F D E[p_1 y_1^k] + (1 - F) E[y_1^k] (an ideal draw picks outcome s
# with probability p_s, which size-biases the marginal by D p).
#
# With S samples from each of K circuits (N = K S), the law of total variance
# gives the variance of the mean of all N values:
#
#     Var = E_c[Var within c] / N + B / K = V / N + B (1/K - 1/N),
#
# V the per-sample (ensemble) variance and B the between-circuit one; with
# unequal samples n_c, Var = (V - B)/N + B sum n_c^2 / N^2.

# Above this D the exact log-XEB circuit term would lose digits to cancellation
# (terms of order 1 cancelling to order 1/D): the large-D series takes over.
EXACT_LOG_DIMENSION = 2.0 ** 22


def linear_xeb_circuit_variance(fidelity: float, dimension: float | None) -> float:
    """Var over random circuits of one circuit's own mean of x = D p.

    4 F^2 D^2 (D - 1) / ((D + 1)^2 (D + 2)(D + 3)), about 4 F^2 / D (module
    comment above for the derivation); 0 in the large-D limit.

    References
    ----------
    Dirichlet moments: N. L. Johnson, S. Kotz and N. Balakrishnan, "Continuous
    Multivariate Distributions", vol. 1, 2nd ed., Wiley (2000), ch. 49 (from
    memory); the mixture: Boixo et al. (2018).
    """
    if dimension is None or math.isinf(dimension):
        return 0.0
    d = float(dimension)
    f = fidelity
    return 4.0 * f * f * d * d * (d - 1.0) / ((d + 1.0) ** 2 * (d + 2.0) * (d + 3.0))


@lru_cache(maxsize=64)
def log_xeb_moments(d: float) -> MappingProxyType:
    """The Dirichlet log moments of y = ln(D p) + gamma that the log-XEB
    variances need (module comment), exact at finite D.

    They depend on D alone, so they are kept per D (read-only): ``raw`` asks
    for them twice per circuit, 200,000 times over 100,000 circuits, and each
    costs 18 scipy.special calls (about 0.3 ms)."""
    from scipy.special import digamma, polygamma

    def psi(x):
        return float(digamma(x))

    def psi1(x):
        return float(polygamma(1, x))

    c = math.log(d) + EULER_GAMMA

    def m(a, b):
        rising = 1.0
        for k in range(a + b):
            rising *= d + k
        return math.factorial(a) * math.factorial(b) / rising

    def single(a, b):
        """E[p1^a p2^b y1] and E[p1^a p2^b y1^2]."""
        s = d + a + b
        mm = m(a, b)
        g = psi(1 + a) - psi(s)
        l1 = mm * g
        l2 = mm * (g * g + psi1(1 + a) - psi1(s))
        return l1 + c * mm, l2 + 2 * c * l1 + c * c * mm

    def pair(a, b):
        """E[p1^a p2^b y1 y2]."""
        s = d + a + b
        mm = m(a, b)
        ga, gb = psi(1 + a) - psi(s), psi(1 + b) - psi(s)
        return mm * (ga * gb - psi1(s)) + c * mm * (ga + gb) + c * c * mm

    y1, y1_2 = single(0, 0)
    p_y1, p_y1_2 = single(1, 0)
    _, p2_y1_2 = single(2, 0)
    return MappingProxyType({"y": y1, "y2": y1_2, "yy": pair(0, 0), "py": p_y1, "py2": p_y1_2,
                             "pyy": pair(1, 0), "p2y2": p2_y1_2, "ppyy": pair(1, 1)})


def log_xeb_mean(fidelity: float, dimension: float | None = None) -> float:
    """E[ln x + gamma] at mixture weight F: F in the large-D limit, else
    u + F (i - u) with the finite-D offsets of :func:`log_xeb_offsets`."""
    u, i = log_xeb_offsets(dimension)
    return u + fidelity * (i - u)


def log_xeb_offsets(dimension: float | None) -> tuple[float, float]:
    """E[ln x] + gamma under uniform and under ideal sampling at finite D.

    With p ~ Beta(1, D - 1) (uniform) and Beta(2, D - 1) (ideal),
    E ln p = psi(a) - psi(a + b), so the offsets are ln D - psi(D) and
    1 + ln D - psi(D + 1) = 1 + (ln D - psi(D)) - 1/D; they tend to 0 and 1.
    """
    if dimension is None or math.isinf(dimension):
        return 0.0, 1.0
    d = float(dimension)
    if d > 1e6:
        # ln D - psi(D) = 1/(2D) + 1/(12 D^2) + O(D^-4): the difference of two
        # nearly equal numbers would lose every digit in double precision.
        g = 1.0 / (2.0 * d) + 1.0 / (12.0 * d * d)
    else:
        from scipy.special import digamma

        g = math.log(d) - float(digamma(d))
    return g, 1.0 + g - 1.0 / d


def fidelity_from_log_xeb(estimate: float, dimension: float | None = None) -> float:
    """The mixture weight F behind an expected log XEB (the offsets removed)."""
    u, i = log_xeb_offsets(dimension)
    return (estimate - u) / (i - u)


def log_xeb_variance_finite(fidelity: float, dimension: float | None) -> float:
    """Per-sample variance of ln x + gamma under the mixture at dimension D.

    Exact for the flat-Dirichlet (Porter-Thomas) ensemble (module comment);
    pi^2/6 - F^2 in the large-D limit.  At D = 8 and F = 0.5 it is 1.211
    against the limit's 1.395.
    """
    if dimension is None or math.isinf(dimension) or dimension > EXACT_LOG_DIMENSION:
        return log_xeb_variance(fidelity)
    d = float(dimension)
    f = fidelity
    mo = log_xeb_moments(d)
    mean = f * d * mo["py"] + (1.0 - f) * mo["y"]
    second = f * d * mo["py2"] + (1.0 - f) * mo["y2"]
    return at_least_zero(second - mean * mean)


def log_xeb_circuit_variance(fidelity: float, dimension: float | None) -> float:
    """Var over random circuits of one circuit's own mean of ln x + gamma.

    Exact at finite D (module comment); above D = 2^22 the large-D series
    (pi^2/6 - 1 - 2 F + (pi^2/6) F^2) / D, whose relative error is O(1/D).
    """
    if dimension is None or math.isinf(dimension):
        return 0.0
    d = float(dimension)
    f = fidelity
    if d > EXACT_LOG_DIMENSION:
        z2 = math.pi ** 2 / 6.0
        return at_least_zero((z2 - 1.0 - 2.0 * f + z2 * f * f) / d)
    mo = log_xeb_moments(d)
    mean_a, mean_u = d * mo["py"], mo["y"]
    var_a = d * mo["p2y2"] + d * (d - 1.0) * mo["ppyy"] - mean_a * mean_a
    var_u = mo["y2"] / d + (d - 1.0) / d * mo["yy"] - mean_u * mean_u
    cov = mo["py2"] + (d - 1.0) * mo["pyy"] - mean_a * mean_u
    return at_least_zero(f * f * var_a + python_square(1.0 - f) * var_u + 2.0 * f * (1.0 - f) * cov)


def variance_of_mean(per_sample: float, between: float, samples: float,
                     circuits: float | None = None) -> float:
    """Variance of the mean of ``samples`` values drawn evenly from ``circuits``.

    V / N + B (1/K - 1/N) (module comment): the ensemble variance V over N,
    plus the circuit-to-circuit variance B of each circuit's own mean that
    averaging K circuits leaves.  Without K it is V / N, the smallest any K
    allows (K = N, one sample per circuit).
    """
    if samples <= 0:
        return math.inf
    v = per_sample / samples
    if circuits is None or not circuits > 0:
        return v
    k = min(float(circuits), float(samples))
    return v + between * (1.0 / k - 1.0 / samples)
