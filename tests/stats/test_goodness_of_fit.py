"""Goodness of fit to the Porter-Thomas fidelity mixture.

The mixture F x e^-x + (1 - F) e^-x is from Boixo et al., Nature Physics 14,
595 (2018), arXiv:1608.00263; its finite-D form is the Beta(1, D - 1) /
Beta(2, D - 1) mixture, checked here against scipy.stats.beta.  The
Kolmogorov-Smirnov critical value at n = 1000, alpha 0.05 is 0.04301 as
printed in the NIST/SEMATECH e-Handbook, section 1.3.5.16 (1.36/sqrt(n)); the
exact value scipy.stats.kstwo.ppf(0.95, 1000) = 0.042777 (REFERENCES.md).
"""


import numpy as np
import pytest
from scipy import integrate, stats

from checker.stats import goodness_of_fit as gof


def _mixture(n, fidelity, rng):
    ideal = rng.random(n) < fidelity
    return np.where(ideal, rng.gamma(2.0, size=n), rng.exponential(size=n))


@pytest.mark.parametrize("dimension", [None, 8.0, 64.0])
@pytest.mark.parametrize("fidelity", [0.0, 0.35, 1.0])
def test_cdf_is_the_integral_of_the_pdf(dimension, fidelity):
    top = 8.0 if dimension is None else dimension
    assert integrate.quad(lambda t: float(gof.mixture_pdf(t, fidelity, dimension)), 0, top, limit=200)[0] \
        == pytest.approx(1.0 if dimension else float(gof.mixture_cdf(8.0, fidelity)), abs=1e-8)
    for x in (0.1, 0.9, 2.5, 6.0):
        value, _ = integrate.quad(lambda t: float(gof.mixture_pdf(t, fidelity, dimension)), 0, x, limit=200)
        assert float(gof.mixture_cdf(x, fidelity, dimension)) == pytest.approx(value, abs=1e-9)


@pytest.mark.parametrize("d", [4.0, 32.0, 1024.0])
def test_finite_dimension_cdf_is_the_beta_mixture(d):
    f = 0.4
    x = np.linspace(0.0, min(d, 12.0), 50)
    reference = (1 - f) * stats.beta(1, d - 1).cdf(x / d) + f * stats.beta(2, d - 1).cdf(x / d)
    assert np.allclose(gof.mixture_cdf(x, f, d), reference, atol=1e-12)


def test_finite_dimension_forms_tend_to_large_dimension():
    x = np.linspace(0, 10, 41)
    assert np.allclose(gof.mixture_cdf(x, 0.6, 2.0 ** 30), gof.mixture_cdf(x, 0.6), atol=1e-7)
    assert np.allclose(gof.mixture_pdf(x, 0.6, 2.0 ** 30), gof.mixture_pdf(x, 0.6), atol=1e-7)
    # ... and differ visibly at a few qubits: the finite-D correction matters there.
    assert np.max(np.abs(gof.mixture_cdf(x, 0.6, 8.0) - gof.mixture_cdf(x, 0.6))) > 0.02


def _sample_with_ks_statistic(c, n, fidelity):
    """n values whose empirical CDF sits exactly c above the model's at each
    step: u_(i) = (i - 1)/n + c, so the Kolmogorov-Smirnov statistic is c."""
    u = np.minimum(np.arange(n) / n + c, 1.0 - 1e-13)
    lo, hi = np.zeros(n), np.full(n, 60.0)
    for _ in range(200):  # bisection of G(x) = u, vectorised
        mid = 0.5 * (lo + hi)
        below = gof.mixture_cdf(mid, fidelity) < u
        lo, hi = np.where(below, mid, lo), np.where(below, hi, mid)
    return 0.5 * (lo + hi)


def test_ks_p_value_at_the_nist_critical_value():
    n = 1000
    exact = _sample_with_ks_statistic(0.042777, n, 0.3)
    ks, _ = gof.fit_tests(exact, 0.3)
    assert ks.statistic == pytest.approx(0.042777, abs=1e-6)
    assert ks.p_value == pytest.approx(0.05, abs=2e-4)
    # NIST's printed asymptotic value 0.04301 (= 1.36/sqrt(1000)) is slightly
    # beyond the exact critical value, so its exact p is a little under 0.05.
    nist = _sample_with_ks_statistic(0.04301, n, 0.3)
    ks, _ = gof.fit_tests(nist, 0.3)
    assert 0.044 < ks.p_value < 0.05


def test_p_values_are_uniform_when_the_model_is_right():
    # 300 datasets of 400 samples at F = 0.5, tested at the true F.  For each
    # test the share below 0.05 lies in [0.015, 0.09] (about +-2.8 binomial
    # sd: 995 seeds in 1000) and a KS test of the p-values against uniform
    # gives p > 0.001.
    rng = np.random.default_rng(31)
    ps = np.array([[t.p_value for t in gof.fit_tests(_mixture(400, 0.5, rng), 0.5, at="threshold")]
                   for _ in range(300)])
    for column in ps.T:
        assert 0.015 <= np.mean(column < 0.05) <= 0.09
        assert stats.kstest(column, "uniform").pvalue > 1e-3


def test_p_values_at_the_fitted_fidelity_are_conservative():
    # Fitting F to the same data makes the test conservative: over 200
    # datasets no more than 8% fall below 0.05 (expected about 1%; passes for
    # essentially every seed).
    from checker.stats.fidelity_fit import max_likelihood_fidelity

    rng = np.random.default_rng(41)
    ps = []
    for _ in range(200):
        x = _mixture(400, 0.5, rng)
        ps.append(gof.fit_tests(x, max_likelihood_fidelity(x).fidelity)[0].p_value)
    assert np.mean(np.array(ps) < 0.05) <= 0.08


@pytest.mark.parametrize("wrong", [0.0, 0.2, 0.8])
def test_p_values_are_tiny_when_the_fidelity_is_wrong(wrong):
    # 5,000 samples at F = 0.5 against a model 0.3 or more away: both tests
    # reject below 1e-6 (the KS statistic is near 0.06-0.1, over 8 of its sd).
    x = _mixture(5000, 0.5, np.random.default_rng(51))
    ks, cvm = gof.fit_tests(x, wrong, at="zero" if wrong == 0 else "threshold")
    assert ks.p_value < 1e-6 and cvm.p_value < 1e-6
    assert ks.test == "kolmogorov-smirnov" and cvm.test == "cramer-von-mises"


def test_finite_dimension_model_matters_at_three_qubits():
    # At D = 8 the large-D law is visibly wrong: 20,000 exact finite-D samples
    # reject it and accept the finite-D one (p > 0.001 for 999 seeds in 1000).
    rng = np.random.default_rng(61)
    d, f, n = 8.0, 0.5, 20_000
    p = np.where(rng.random(n) < f, rng.beta(2, d - 1, size=n), rng.beta(1, d - 1, size=n))
    x = d * p
    assert gof.fit_tests(x, f, d)[0].p_value > 1e-3
    assert gof.fit_tests(x, f, None)[0].p_value < 1e-6


def test_fidelity_outside_the_unit_interval_is_clipped():
    x = _mixture(500, 0.5, np.random.default_rng(71))
    ks_low, _ = gof.fit_tests(x, -0.2)
    assert ks_low.fidelity == 0.0
    assert np.all(np.diff(gof.mixture_cdf(np.linspace(0, 10, 100), 1.7)) >= 0)
    with pytest.raises(ValueError):
        gof.fit_tests(np.array([1.0]), 0.5)


def test_histogram_densities_are_comparable():
    x = _mixture(50_000, 0.4, np.random.default_rng(81))
    h = gof.mixture_histogram(x, 0.4, None, bins=30)
    width = np.diff(h.edges)
    assert np.sum(h.observed_density * width) + h.beyond == pytest.approx(1.0)
    assert h.beyond == pytest.approx(0.001, abs=5e-4)
    # Bin-mean densities integrate to G(top) exactly.
    assert np.sum(h.density_fitted * width) == pytest.approx(float(gof.mixture_cdf(h.edges[-1], 0.4)))
    assert np.sum(h.density_zero * width) == pytest.approx(float(gof.mixture_cdf(h.edges[-1], 0.0)))
    # The observed density follows the fitted one, not F = 0 (a few percent of noise).
    assert np.max(np.abs(h.observed_density - h.density_fitted)[:10]) < 0.05
    assert np.max(np.abs(h.observed_density - h.density_zero)[:10]) > 0.1
    d = h.to_dict()
    assert set(d) >= {"edges", "observed_density", "density_fitted", "density_zero", "fidelity_fitted"}
    assert len(d["edges"]) == 31


# --- the Cramer-von Mises far tail ----------------------------------------------------------

import math  # noqa: E402


@pytest.mark.parametrize("n", [20, 1000, 100_000])
def test_cramer_von_mises_p_falls_as_the_statistic_rises(n):
    # scipy's own p-value rises again beyond T of about 4 (7.6e-12 at T = 6, 8.7e-9 at 19.6).
    grid = np.concatenate([np.linspace(0.01, 3.0, 120), np.geomspace(3.0, 5000.0, 120)])
    logs = [gof.cramer_von_mises_log_p(t, n) for t in grid]
    assert all(b <= a + 1e-12 for a, b in zip(logs, logs[1:]))
    assert logs[-1] < -10_000  # far below double precision, still finite in log space
    if n >= 1000:
        assert gof.cramer_von_mises_log_p(6.0, n) < math.log(1e-13)
        assert gof.cramer_von_mises_log_p(19.6, n) < gof.cramer_von_mises_log_p(6.0, n)


def test_cramer_von_mises_limiting_tail_against_scipy_where_scipy_is_accurate():
    # Smirnov's integral for the upper tail against 1 - F of scipy's limiting law
    # (scipy.stats._hypotests._cdf_cvm_inf, Anderson-Darling's series), where both are accurate.
    from scipy.stats import _hypotests

    for t in (0.05, 0.2, 0.4617, 1.0, 2.0):
        expected = 1.0 - float(_hypotests._cdf_cvm_inf(np.array([t]))[0])
        assert gof._cvm_limit_tail(t) == pytest.approx(expected, rel=1e-9)


def test_cramer_von_mises_tail_joins_its_leading_term():
    # Far out the tail is 2 sqrt(2) Phi(-pi sqrt(t)) (1 + O(1/t)) (Durbin 1973, from memory:
    # the first eigenvalue 1/pi^2 and the product of the others, sqrt(2)).
    for t in (5.0, 10.0, 19.9):
        ratio = math.log(gof._cvm_limit_tail(t)) - gof._cvm_leading_log(t)
        assert abs(ratio) < 0.2 / t
    # Continuous across both switches.
    for t in (gof._CVM_SWITCH, gof._CVM_SERIES):
        below, above = (gof.cramer_von_mises_log_p(t * (1 + s), 100_000) for s in (-1e-9, 1e-9))
        assert below == pytest.approx(above, abs=1e-6)


@pytest.mark.parametrize("statistic, p", [(0.347, 0.10), (0.461, 0.05), (0.743, 0.01), (1.168, 0.001)])
def test_cramer_von_mises_critical_values(statistic, p):
    # Upper-tail points of the limiting W^2 law: T. W. Anderson and D. A. Darling, Ann. Math.
    # Statist. 23, 193 (1952), and M. A. Stephens, JASA 69, 730 (1974), Table 1A (from memory).
    assert math.exp(gof.cramer_von_mises_log_p(statistic, 100_000)) == pytest.approx(p, rel=0.02)


def test_fit_tests_report_the_far_tail_in_log_space():
    # Data at F = 0.5 tested against F = 0: a statistic in the hundreds, whose p underflows.
    x = _mixture(100_000, 0.5, np.random.default_rng(8))
    _, cvm = gof.fit_tests(x, 0.0, at="zero")
    assert cvm.statistic > 100 and cvm.p_value == 0.0
    assert cvm.to_dict()["log10_p_value"] < -300


# --- calibration for the circuits' own finite distributions ---------------------------------

def test_data_from_the_model_rarely_fail_the_calibrated_tests():
    # The project's simulator at the true F = 0.3: 12 qubits with one circuit and 14 qubits with
    # five, 200 datasets of 20,000 samples each.  Against the continuous law alone the KS test
    # rejects at p < 0.01 in most of the 12-qubit runs; calibrated for the K D outcomes it should
    # reject in about 1% (benchmarks/fit_false_alarms.py: 12-20 qubits, 1-20 circuits).  Over
    # 400 runs a 1% rate has sd 0.5 points; the bound 3% is 4 sd (about 99.997% of seeds).
    from checker.raw.simulate_circuits import simulate_dataset

    rng = np.random.default_rng(812)
    alarms = plain_alarms = runs = 0
    for qubits, k in ((12, 1), (14, 5)):
        d = 2.0 ** qubits
        for _ in range(200):
            x = simulate_dataset(qubits, k, 20_000 // k, 0.3, rng).probability * d
            x = x[rng.permutation(x.size)]
            ks, cvm = gof.fit_tests(x, 0.3, d, reference=k * d)
            alarms += ks.p_value < 0.01
            plain_alarms += gof.fit_tests(x, 0.3, d)[0].p_value < 0.01 if qubits == 12 else 0
            runs += 1
    assert alarms / runs < 0.03
    assert plain_alarms / 200 > 0.3


def test_tested_and_effective_sizes():
    assert gof.tested_size(100_000, None) == 100_000
    assert gof.tested_size(100_000, 4096.0) == 512  # K D / 8
    assert gof.effective_size(512, 0.0, None) == 512.0
    assert gof.effective_size(512, 1.0, 4096.0) == pytest.approx(1 / (1 / 512 + 0.5 * 2 / 4096))
