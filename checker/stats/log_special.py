"""Logs of the regularized incomplete beta and gamma functions, finite far
below the double-precision range.

``scipy.special.betainc`` and ``gammainc`` return the function itself, which
underflows to 0 in the deep tail (a Poisson tail of 2000 events over a
background of 3, a Student t of 200 on 399 degrees of freedom); SciPy has no
log-space versions, so below p = 1e-280 they are evaluated here with their
prefactor in log space:

- I_x(a, b) by the continued fraction of DLMF 8.17.22 (modified Lentz
  evaluation), which converges fast for x < (a + 1) / (a + b + 2), the side
  on which the function is small;
- P(a, z) = z^a e^(-z) sum_k z^k / Gamma(a + k + 1) (DLMF 8.7.1), whose terms
  all fall when z < a + 1, the side on which the function is small.

References
----------
NIST Digital Library of Mathematical Functions, eqs. 8.17.22 and 8.7.1.
W. H. Press et al., Numerical Recipes, 3rd ed. (2007), section 6.4 (the
continued fraction's coefficients and Lentz's method; from memory).
"""

from __future__ import annotations

import math

from scipy.special import betainc, betaln, gammainc, gammaln

# Above this the library's value is kept (its relative accuracy is full there).
LIBRARY_ABOVE = 1e-280
_TINY = 1e-300


def _betacf(a: float, b: float, x: float) -> float:
    """The continued fraction of I_x(a, b) (DLMF 8.17.22), by Lentz's method."""
    qab, qap, qam = a + b, a + 1.0, a - 1.0
    c, d = 1.0, 1.0 - qab * x / qap
    d = 1.0 / (d if abs(d) > _TINY else _TINY)
    h = d
    for m in range(1, 1_000_000):
        m2 = 2 * m
        aa = m * (b - m) * x / ((qam + m2) * (a + m2))
        d = 1.0 + aa * d
        d = 1.0 / (d if abs(d) > _TINY else _TINY)
        c = 1.0 + aa / c
        c = c if abs(c) > _TINY else _TINY
        h *= d * c
        aa = -(a + m) * (qab + m) * x / ((a + m2) * (qap + m2))
        d = 1.0 + aa * d
        d = 1.0 / (d if abs(d) > _TINY else _TINY)
        c = 1.0 + aa / c
        c = c if abs(c) > _TINY else _TINY
        delta = d * c
        h *= delta
        if abs(delta - 1.0) < 1e-15:
            return h
    raise ArithmeticError(f"continued fraction of I_x({a}, {b}) did not converge at x = {x}")


def log_betainc(a: float, b: float, x: float, log_x: float | None = None) -> float:
    """log I_x(a, b), the regularized incomplete beta function.

    Parameters
    ----------
    a, b : float
        Positive parameters.
    x : float
        In [0, 1].
    log_x : float, optional
        log x, when x itself underflows a double.

    Returns
    -------
    float
        -inf only for x = 0.
    """
    if log_x is None:
        if x <= 0.0:
            return -math.inf
        log_x = math.log(x)
    value = float(betainc(a, b, x)) if x > 0 else 0.0
    if value > LIBRARY_ABOVE:
        return math.log(value)
    if x >= (a + 1.0) / (a + b + 2.0):  # small only from the other side: 1 - I_{1-x}(b, a)
        return math.log1p(-math.exp(log_betainc(b, a, 1.0 - x)))
    front = a * log_x + b * math.log1p(-x) - float(betaln(a, b)) - math.log(a)
    return front + math.log(_betacf(a, b, x))


def log_gammainc_lower(a: float, z: float) -> float:
    """log P(a, z), the regularized lower incomplete gamma function
    (P(a, z) = P(N >= a) for a Poisson N of mean z and whole a)."""
    if z <= 0.0:
        return -math.inf
    value = float(gammainc(a, z))
    if value > LIBRARY_ABOVE:
        return math.log(value)
    if z >= a + 1.0:
        # P is near 1 here; the library's value is exact to double precision.
        return math.log(value) if value > 0 else -math.inf
    # Sum of t_k = z^k Gamma(a + 1) / Gamma(a + k + 1), t_0 = 1, all falling.
    total, term, k = 1.0, 1.0, 0
    while term > 1e-17 * total:
        k += 1
        term *= z / (a + k)
        total += term
    return a * math.log(z) - z - float(gammaln(a + 1.0)) + math.log(total)
