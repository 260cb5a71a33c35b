"""Porter-Thomas moments, held against numerical integration of the densities
they come from (never against the formulas restated)."""

from __future__ import annotations

import math
from decimal import Decimal

import numpy as np
import pytest
from scipy import integrate, optimize
from scipy.stats import beta

from checker.stats.porter_thomas import (EULER_GAMMA, dimension_of, fidelity_from_linear_xeb, linear_xeb_moments,
                                         linear_xeb_variance, log_xeb_variance)

# Boixo et al., "Characterizing quantum supremacy in near-term devices", Nature Physics 14,
# 595 (2018), arXiv:1608.00263: the ideal probability of one outcome of a random circuit is
# Beta(1, D - 1); the scaled probability x = D p of a sample has density e^-x (uniform
# sampling) or x e^-x (ideal sampling) for large D, and F x e^-x + (1 - F) e^-x at fidelity F.


def integrate_beta(g, dimension: int, ideal: bool) -> float:
    """E[g(x)] for x = D p, p ~ Beta(1, D - 1), sampled uniformly (density f(p)) or
    ideally (an outcome is drawn with its own probability: density D p f(p))."""
    d = dimension
    density = beta(1, d - 1).pdf
    weight = (lambda p: d * p) if ideal else (lambda p: 1.0)
    # The density lives on the scale 1/D: break the range there so quad sees it.
    points = [k / d for k in (1, 3, 10, 30) if k / d < 1]
    value, _ = integrate.quad(lambda p: g(d * p) * weight(p) * density(p), 0.0, 1.0,
                              points=points, limit=400, epsabs=0.0, epsrel=1e-11)
    return value


def mixture_moment(g, fidelity: float) -> float:
    """E[g(x)] under the large-D mixture density F x e^-x + (1 - F) e^-x."""
    def integrand(x):
        return g(x) * (fidelity * x + 1.0 - fidelity) * math.exp(-x)

    # Split at 1 so the log estimator's integrable singularity at 0 has its own piece.
    near, _ = integrate.quad(integrand, 0.0, 1.0, epsabs=0.0, epsrel=1e-11, limit=400)
    far, _ = integrate.quad(integrand, 1.0, math.inf, epsabs=0.0, epsrel=1e-11, limit=400)
    return near + far


@pytest.mark.parametrize("dimension", [2, 4, 16, 1024])
@pytest.mark.parametrize("fidelity", [0.0, 0.3, 1.0])
def test_finite_dimension_moments_by_integration_of_the_beta_density(dimension, fidelity):
    moments = {}
    for ideal in (False, True):
        moments[ideal] = [integrate_beta(lambda x, k=k: x ** k, dimension, ideal) for k in (1, 2)]
    mean = fidelity * moments[True][0] + (1 - fidelity) * moments[False][0]
    second = fidelity * moments[True][1] + (1 - fidelity) * moments[False][1]
    got_mean, got_var = linear_xeb_moments(fidelity, float(dimension))
    assert got_mean == pytest.approx(mean, rel=1e-9)
    assert got_var == pytest.approx(second - mean * mean, rel=1e-8)


def test_ideal_sampling_at_finite_dimension_is_not_one():
    # REFERENCES.md: at finite D ideal sampling gives E[x] - 1 = (D - 1)/(D + 1), not 1
    # (a derivation; here the integral of the size-biased Beta density says so).
    for d in (2, 16, 1024):
        assert integrate_beta(lambda x: x, d, ideal=True) - 1 == pytest.approx((d - 1) / (d + 1), rel=1e-9)


@pytest.mark.parametrize("dimension", [2, 16, None])
def test_fidelity_behind_an_expected_estimate(dimension):
    # The estimate mean(x) - 1 that the fidelity mixture produces, integrated, maps back to F.
    for fidelity in (0.1, 0.8):
        if dimension is None:
            mean = mixture_moment(lambda x: x, fidelity)
        else:
            mean = (fidelity * integrate_beta(lambda x: x, dimension, True)
                    + (1 - fidelity) * integrate_beta(lambda x: x, dimension, False))
        dim = None if dimension is None else float(dimension)
        assert fidelity_from_linear_xeb(mean - 1.0, dim) == pytest.approx(fidelity, rel=1e-9)


@pytest.mark.parametrize("fidelity", [0.0, 0.002, 0.3, 0.7, 1.0])
def test_large_dimension_limit_by_integration_of_the_mixture(fidelity):
    mean = mixture_moment(lambda x: x, fidelity)
    var = mixture_moment(lambda x: x * x, fidelity) - mean * mean
    assert linear_xeb_moments(fidelity) == pytest.approx((mean, var), rel=1e-9)
    assert linear_xeb_variance(fidelity, math.inf) == pytest.approx(var, rel=1e-9)
    # The finite-D moments approach the limit (60 qubits: below double precision).
    assert linear_xeb_moments(fidelity, 2.0 ** 60) == pytest.approx((mean, var), rel=1e-12)


@pytest.mark.parametrize("fidelity", [0.0, 0.1, 0.32247, 0.6, 1.0])
def test_log_xeb_variance_by_integration_of_the_mixture(fidelity):
    def log_estimator(x):
        return math.log(x) + EULER_GAMMA

    mean = mixture_moment(log_estimator, fidelity)
    var = mixture_moment(lambda x: log_estimator(x) ** 2, fidelity) - mean * mean
    assert mean == pytest.approx(fidelity, abs=1e-9)  # the log estimator is unbiased for F
    assert log_xeb_variance(fidelity) == pytest.approx(var, rel=1e-8, abs=1e-10)


def test_euler_gamma():
    assert EULER_GAMMA == pytest.approx(float(np.euler_gamma), rel=1e-16)


def test_the_two_variances_cross_at_0_32247():
    # REFERENCES.md: the linear and log XEB variances cross at F = (pi^2/6 - 1)/2 = 0.32247.
    crossing = optimize.brentq(lambda f: linear_xeb_variance(f) - log_xeb_variance(f), 0.0, 1.0, xtol=1e-14)
    assert Decimal(f"{crossing:.5f}") == Decimal("0.32247")
    assert linear_xeb_variance(0.1) < log_xeb_variance(0.1)
    assert linear_xeb_variance(0.9) > log_xeb_variance(0.9)


def test_dimension_of():
    assert dimension_of(None) is None
    assert dimension_of(1) == 2.0
    assert dimension_of(30) == 2.0 ** 30
    assert dimension_of(60) == 2.0 ** 60
    assert dimension_of(61) == math.inf
    assert dimension_of(1000) == math.inf


# --- finite-D log XEB and the circuit-to-circuit terms --------------------------------------

from checker.stats.porter_thomas import (fidelity_from_log_xeb, linear_xeb_circuit_variance,  # noqa: E402
                                         log_xeb_circuit_variance, log_xeb_mean, log_xeb_variance_finite,
                                         variance_of_mean)


@pytest.mark.parametrize("qubits, fidelity", [(1, 0.5), (2, 0.0), (3, 0.5), (3, 1.0), (4, 0.3), (10, 0.7)])
def test_finite_dimension_log_xeb_variance_by_integration(qubits, fidelity):
    # The per-sample variance of ln(D p) + gamma under the finite-D mixture, by numerical
    # integration of the Beta(1, D - 1) density and its size-biased form (Boixo et al. 2018).
    d = 2 ** qubits

    def y(x):
        return math.log(x) + EULER_GAMMA

    moments = [fidelity * integrate_beta(lambda x, k=k: y(x) ** k, d, True)
               + (1 - fidelity) * integrate_beta(lambda x, k=k: y(x) ** k, d, False) for k in (1, 2)]
    exact = moments[1] - moments[0] ** 2
    assert log_xeb_variance_finite(fidelity, float(d)) == pytest.approx(exact, rel=1e-7)
    assert log_xeb_mean(fidelity, float(d)) == pytest.approx(moments[0], rel=1e-8, abs=1e-10)
    assert fidelity_from_log_xeb(moments[0], float(d)) == pytest.approx(fidelity, abs=1e-8)


def test_finite_dimension_log_xeb_variance_at_three_qubits():
    # The figure, from numerical integration of the finite-D mixture density:
    # 1.211 at 3 qubits and F = 0.5 against pi^2/6 - F^2 = 1.395 (large D).
    assert round(log_xeb_variance_finite(0.5, 8.0), 3) == 1.211
    assert round(log_xeb_variance(0.5), 3) == 1.395
    # It joins the large-D limit: 1.5e-3 relative at 10 qubits, below 1e-6 at 22.
    assert log_xeb_variance_finite(0.5, 2.0 ** 22) == pytest.approx(log_xeb_variance(0.5), rel=1e-6)


def _simplex_expectation(g, d):
    """E[g(p)] over the flat Dirichlet on D = 2 or 3 outcomes, by numerical integration
    (the density is (D - 1)! on the simplex)."""
    if d == 2:
        value, _ = integrate.quad(lambda a: g((a, 1.0 - a)), 0.0, 1.0, epsabs=0.0, epsrel=1e-11, limit=400)
        return value
    value, _ = integrate.dblquad(lambda b, a: 2.0 * g((a, b, 1.0 - a - b)), 0.0, 1.0, 0.0, lambda a: 1.0 - a,
                                 epsabs=1e-13, epsrel=1e-10)
    return value


def _circuit_mean(p, fidelity, log):
    d = len(p)
    xs = [d * pi for pi in p]
    values = [math.log(x) + EULER_GAMMA for x in xs] if log else xs
    return sum((fidelity * pi + (1.0 - fidelity) / d) * v for pi, v in zip(p, values))


@pytest.mark.parametrize("d", [2, 3])
@pytest.mark.parametrize("fidelity", [0.0, 0.4, 1.0])
@pytest.mark.parametrize("log", [False, True])
def test_circuit_variance_by_integration_over_the_simplex(d, fidelity, log):
    # Var over circuits of each circuit's own mean, E mu^2 - (E mu)^2 with mu = sum_s q_s y_s,
    # q = F p + (1 - F)/D, by numerical integration over the flat Dirichlet (Porter-Thomas:
    # Boixo et al. 2018); against the closed forms of porter_thomas.
    m1 = _simplex_expectation(lambda p: _circuit_mean(p, fidelity, log), d)
    m2 = _simplex_expectation(lambda p: _circuit_mean(p, fidelity, log) ** 2, d)
    exact = m2 - m1 * m1
    got = (log_xeb_circuit_variance if log else linear_xeb_circuit_variance)(fidelity, float(d))
    assert got == pytest.approx(exact, rel=1e-6, abs=1e-12)


@pytest.mark.parametrize("qubits, seed", [(6, 41), (10, 42)])
def test_circuit_variance_by_monte_carlo_over_dirichlet_circuits(qubits, seed):
    # 3000 flat-Dirichlet circuits: the sample variance of each one's exact mean has a relative
    # standard error of about sqrt(2/3000) = 2.6% (a little more for the skewed linear term);
    # the 12% band is over 4 of those, so about 99.99% of seeds pass (the seeds are fixed).
    rng = np.random.default_rng(seed)
    d = 2 ** qubits
    p = rng.exponential(size=(3000, d))
    p /= p.sum(axis=1, keepdims=True)
    x = d * p
    for fidelity in (0.05, 0.5, 0.9):
        q = fidelity * p + (1.0 - fidelity) / d
        lin = (q * x).sum(axis=1)
        log = (q * (np.log(x) + EULER_GAMMA)).sum(axis=1)
        assert lin.var(ddof=1) == pytest.approx(linear_xeb_circuit_variance(fidelity, d), rel=0.12)
        assert log.var(ddof=1) == pytest.approx(log_xeb_circuit_variance(fidelity, d), rel=0.12)


def test_circuit_variances_large_dimension():
    # Linear: 4 F^2 / D to leading order; log: (pi^2/6 - 1 - 2F + (pi^2/6) F^2)/D, which at
    # F = 0 is (pi^2/6 - 1)/D and does not vanish (derivations in porter_thomas).
    z2 = math.pi ** 2 / 6
    d = 2.0 ** 20
    for f in (0.0, 0.3, 1.0):
        assert linear_xeb_circuit_variance(f, d) * d == pytest.approx(4 * f * f, rel=1e-5, abs=1e-12)
        assert log_xeb_circuit_variance(f, d) * d == pytest.approx(z2 - 1 - 2 * f + z2 * f * f, rel=1e-5)
        # The exact branch and the series branch meet at their switch (2^22).
        below = log_xeb_circuit_variance(f, 2.0 ** 22) * 2.0 ** 22
        above = log_xeb_circuit_variance(f, 2.0 ** 22 * (1 + 1e-9)) * 2.0 ** 22
        assert below == pytest.approx(above, rel=1e-5)
    assert linear_xeb_circuit_variance(0.5, None) == 0.0 == log_xeb_circuit_variance(0.5, math.inf)


def test_variance_of_mean():
    # Law of total variance (common practice): V/N + B (1/K - 1/N).
    assert variance_of_mean(2.0, 0.5, 100, 10) == pytest.approx(2.0 / 100 + 0.5 * (1 / 10 - 1 / 100))
    assert variance_of_mean(2.0, 0.5, 100, None) == 2.0 / 100  # K unknown: the smallest, K = N
    assert variance_of_mean(2.0, 0.5, 100, 100) == 2.0 / 100
    assert variance_of_mean(2.0, 0.5, 100, 1000) == 2.0 / 100  # more circuits than samples: K = N
    assert variance_of_mean(2.0, 0.5, 0, 10) == math.inf
