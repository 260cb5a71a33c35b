"""Fidelity fits: maximum likelihood against scipy's optimiser, seeded
coverage at a known fidelity, and the finite-D factors against integration.

Sources: the mixture F p + (1 - F)/D and the Porter-Thomas moments
E_ideal[x] = 2D/(D + 1) are from Boixo et al., "Characterizing quantum
supremacy in near-term devices", Nature Physics 14, 595 (2018),
arXiv:1608.00263 (as restated in REFERENCES.md).
"""

import math

import numpy as np
import pytest
from scipy import integrate, optimize, special, stats

from checker.stats import fidelity_fit as ff


def _mixture(n, fidelity, rng):
    ideal = rng.random(n) < fidelity
    return np.where(ideal, rng.gamma(2.0, size=n), rng.exponential(size=n))


def test_max_likelihood_agrees_with_scipy_minimiser():
    x = _mixture(3000, 0.4, np.random.default_rng(1))
    fit = ff.max_likelihood_fidelity(x)
    ref = optimize.minimize_scalar(lambda f: -np.sum(np.log1p(f * (x - 1.0))), bounds=(-0.05, 1.5),
                                   method="bounded", options={"xatol": 1e-12})
    assert fit.fidelity == pytest.approx(ref.x, abs=1e-7)
    # Observed information = minus the second derivative of the log-likelihood.
    h = 1e-4
    ll = lambda f: np.sum(np.log1p(f * (x - 1.0)))  # noqa: E731
    second = (ll(fit.fidelity + h) - 2 * ll(fit.fidelity) + ll(fit.fidelity - h)) / h ** 2
    assert fit.stat_error == pytest.approx(1.0 / math.sqrt(-second), rel=1e-4)
    assert not fit.at_boundary


def test_weights_stand_for_repeated_values():
    x = np.array([0.2, 0.7, 1.4, 2.9, 0.05, 3.3])
    w = np.array([3, 1, 2, 5, 1, 2])
    assert ff.max_likelihood_fidelity(x, w).fidelity == pytest.approx(
        ff.max_likelihood_fidelity(np.repeat(x, w)).fidelity, abs=1e-10)


def test_boundary_when_every_sample_is_below_one():
    fit = ff.max_likelihood_fidelity(np.array([0.5, 0.2, 0.9]))
    assert fit.at_boundary and fit.fidelity == pytest.approx(-1.0)


def test_open_end_where_a_sample_sits_at_zero():
    # x = 0 makes 1 - F + F x = 0 at F = 1: the search stays strictly below.
    fit = ff.max_likelihood_fidelity(np.array([0.0, 3.0, 4.0, 2.5]))
    assert fit.fidelity < 1.0 and math.isfinite(fit.stat_error)


@pytest.mark.parametrize("method", ["moment", "maximum-likelihood"])
def test_seeded_coverage_at_known_fidelity(method):
    # 400 datasets of 2,000 samples at F = 0.3 (large D).  The mean of the
    # estimates lies within 3 standard errors of F (fails for about 3 seeds in
    # 1000), and the +-1 sigma interval covers F in 68% of datasets; the band
    # [0.62, 0.74] is +-2.6 binomial sd, so about 99 seeds in 100 pass.
    rng = np.random.default_rng(20240 + len(method))
    truth, n, runs = 0.3, 2000, 400
    estimates, errors = [], []
    for _ in range(runs):
        x = _mixture(n, truth, rng)
        if method == "moment":
            fit = ff.moment_fidelity(float(x.mean()), float(x.var(ddof=1)), n)
        else:
            fit = ff.max_likelihood_fidelity(x)
        estimates.append(fit.fidelity)
        errors.append(fit.stat_error)
    estimates, errors = np.array(estimates), np.array(errors)
    assert abs(estimates.mean() - truth) < 3 * estimates.std(ddof=1) / math.sqrt(runs)
    coverage = np.mean(np.abs(estimates - truth) <= errors)
    assert 0.62 <= coverage <= 0.74


def test_max_likelihood_is_more_precise_than_the_moment_estimator():
    # Both are consistent; the likelihood uses the whole distribution, so its
    # error is smaller (the efficiency gain is a property of the MLE: common practice).
    x = _mixture(20_000, 0.5, np.random.default_rng(3))
    ml = ff.max_likelihood_fidelity(x)
    mo = ff.moment_fidelity(float(x.mean()), float(x.var(ddof=1)), x.size)
    assert ml.stat_error < mo.stat_error
    assert abs(ml.fidelity - mo.fidelity) < 3 * mo.stat_error


@pytest.mark.parametrize("qubits", [1, 2, 3, 5])
def test_finite_dimension_factor_from_beta_moments(qubits):
    # (E_ideal[x] - 1) with p ~ Beta(2, D - 1) (ideal sampling of Beta(1, D - 1)
    # probabilities), computed by scipy.stats.beta; Boixo et al. give 2D/(D + 1).
    d = 2.0 ** qubits
    ideal_mean = d * stats.beta(2, d - 1).mean()
    assert ff.finite_dimension_factor(d) == pytest.approx(ideal_mean - 1.0, rel=1e-12)
    assert ideal_mean == pytest.approx(2 * d / (d + 1))


def test_finite_dimension_factor_vanishes_at_many_qubits():
    assert ff.finite_dimension_factor(None) == 1.0
    assert ff.finite_dimension_factor(math.inf) == 1.0
    assert abs(ff.finite_dimension_factor(2.0 ** 40) - 1.0) < 1e-11
    fit = ff.moment_fidelity(1.5, 1.6, 100, 4.0)
    assert fit.fidelity == pytest.approx(0.5 * 5 / 3)


@pytest.mark.parametrize("d", [2.0, 4.0, 16.0, 1000.0])
def test_log_xeb_offsets_against_numerical_integration(d):
    # E[ln(D p)] + gamma for p ~ Beta(1, D - 1) and Beta(2, D - 1), by quad.
    gamma = 0.5772156649015329  # Euler's constant (DLMF 5.2.3)

    def mean_log(a):
        dist = stats.beta(a, d - 1)
        value, _ = integrate.quad(lambda p: math.log(d * p) * dist.pdf(p), 0.0, 1.0, limit=200)
        return value + gamma

    u, i = ff.log_xeb_offsets(d)
    assert u == pytest.approx(mean_log(1), abs=1e-8)
    assert i == pytest.approx(mean_log(2), abs=1e-8)


def test_log_xeb_offsets_series_branch_joins_the_digamma_branch():
    d = 1e6
    direct = math.log(d) - float(special.digamma(d))
    u, i = ff.log_xeb_offsets(d * (1 + 1e-12))  # just above the switch: series
    assert u == pytest.approx(direct, rel=1e-6)
    assert ff.log_xeb_offsets(None) == (0.0, 1.0)
    assert ff.log_xeb_finite_dimension(0.4, None) == 0.4
