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
