"""Planning formulas against worked cases and seeded simulations of the planned experiment."""

import math

import numpy as np
import pytest
from scipy.special import ndtri
from scipy.stats import binom

from checker.stats.binomial import heavy_output_minimum_mean
from checker.stats.planning import (best_sigma, expected_sigma, pass_probability, plan_experiment,
                                    required_count, smallest_detectable)


def binomial(f):
    return f * (1 - f)


def linear_xeb(f):
    # Boixo et al., Nature Physics 14, 595 (2018): Var x = 1 + 2F - F^2 (large D).
    return 1 + 2 * f - f * f


def test_textbook_sample_size_without_systematic():
    # Chow, Shao and Wang, "Sample Size Calculations in Clinical Research" (2008), section 3.1
    # (from memory): n = (z_alpha + z_beta)^2 sigma^2 / delta^2.  Proportion 0.6 against 0.5 at
    # 3 sigma with power 0.8 (z_beta = 0.8416212, Phi^-1(0.8)): 0.24 * 3.8416212^2 / 0.01 = 354.19.
    n = required_count(0.6, 0.5, binomial(0.6), 3.0, 0.8)
    assert n == pytest.approx(354.193, rel=1e-5)
    plan = plan_experiment(0.6, 0.5, binomial, 3.0, 0.8, highest=1.0)
    assert plan.count == 355 and plan.reachable
    assert pass_probability(0.6, 0.5, binomial(0.6), n, 3.0) == pytest.approx(0.8, abs=1e-12)


# Cross et al., Phys. Rev. A 100, 032328 (2019), via REFERENCES.md: the minimum passing mean
# heavy-output probability for h - 2 sigma > 2/3.
@pytest.mark.parametrize("circuits, minimum", [(100, 0.75293), (200, 0.72949), (500, 0.70736),
                                               (1000, 0.69576)])
def test_smallest_detectable_is_the_heavy_output_minimum(circuits, minimum):
    # At power 1/2 the smallest detectable value is where the expected experiment sits exactly
    # on the pass line, which is the criterion's minimum mean.
    found = smallest_detectable(2 / 3, binomial, circuits, 2.0, 0.5, 0.0, highest=1.0)
    assert found == pytest.approx(minimum, abs=5e-6)
    assert found == pytest.approx(heavy_output_minimum_mean(circuits), abs=1e-10)


def test_required_circuits_inverts_the_heavy_output_minimum():
    h = heavy_output_minimum_mean(100)
    assert required_count(h, 2 / 3, binomial(h), 2.0, 0.5) == pytest.approx(100, rel=1e-9)
    plan = plan_experiment(h, 2 / 3, binomial, 2.0, 0.5, highest=1.0)
    assert plan.count == 100


def test_systematic_caps_the_significance():
    # Common practice: with a systematic S in quadrature, z -> (F - T) / S as N grows.
    # F 2e-3, T 1e-3, S 3e-4: the ceiling is 3.333 sigma.
    assert best_sigma(2e-3, 1e-3, 3e-4) == pytest.approx(10 / 3)
    unreachable = plan_experiment(2e-3, 1e-3, linear_xeb, 4.0, 0.8, 3e-4, highest=1.0)
    assert not unreachable.reachable and unreachable.count is None
    assert unreachable.best_sigma == pytest.approx(10 / 3)
    assert "3.333 sigma" in unreachable.reason
    # The table approaches the ceiling from below and never passes it.
    sigmas = [r.expected_sigma for r in unreachable.table]
    assert sigmas == sorted(sigmas) and sigmas[-1] < 10 / 3
    assert sigmas[-1] > 0.98 * 10 / 3
    reachable = plan_experiment(2e-3, 1e-3, linear_xeb, 3.0, 0.8, 3e-4, highest=1.0)
    assert reachable.reachable
    assert pass_probability(2e-3, 1e-3, linear_xeb(2e-3), reachable.count, 3.0, 3e-4) >= 0.8
    assert pass_probability(2e-3, 1e-3, linear_xeb(2e-3), reachable.count - 1, 3.0, 3e-4) < 0.8


def test_exactly_at_the_ceiling_is_unreachable():
    assert math.isinf(required_count(0.6, 0.5, binomial(0.6), 2.0, 0.8, syst=0.05))


def test_value_below_threshold_is_unreachable():
    plan = plan_experiment(0.45, 0.5, binomial, 3.0, 0.8, highest=1.0)
    assert not plan.reachable and plan.best_sigma == -math.inf
    assert "does not exceed" in plan.reason


def test_smallest_detectable_tends_to_threshold_plus_z_syst():
    # Hand-derived: as N -> infinity, F - T = Z S, so the smallest detectable value is T + Z S.
    found = smallest_detectable(0.5, binomial, 1e12, 3.0, 0.8, 0.01, highest=1.0)
    assert found == pytest.approx(0.53, abs=1e-5)


def test_smallest_detectable_for_a_mean_has_a_closed_form():
    # Metric mean: v = sd^2 is constant, so F = T + (Z + z_P) sd / sqrt(N) (Chow, Shao and Wang 2008,
    # section 3.1, solved for delta).
    found = smallest_detectable(0.1, lambda f: 0.91 ** 2, 400, 3.0, 0.9)
    assert found == pytest.approx(0.1 + (3.0 + ndtri(0.9)) * 0.91 / 20, rel=1e-10)


def test_expected_sigma_and_power_rise_with_count():
    counts = [10, 100, 1000, 10000]
    sig = [expected_sigma(0.6, 0.5, 0.24, n) for n in counts]
    power = [pass_probability(0.6, 0.5, 0.24, n, 3.0) for n in counts]
    assert sig == sorted(sig) and power == sorted(power)


@pytest.mark.parametrize("bad", [dict(power=0.4), dict(power=1.0), dict(target_sigma=0.0), dict(syst=-1.0)])
def test_refuses_impossible_settings(bad):
    kwargs = dict(target_sigma=3.0, power=0.8, syst=0.0) | bad
    with pytest.raises(ValueError):
        required_count(0.6, 0.5, 0.24, **kwargs)


def test_simulated_proportion_experiment_passes_as_planned():
    # Seeded simulation of the planned experiment: k ~ Binomial(355, 0.6), the experiment prints
    # its own error sqrt(p(1 - p)/N) and passes when (p - 0.5)/se >= 3.  The plan promises 0.80;
    # the exact binomial pass rate (scipy.stats.binom) is 0.792.  With 4000 runs the simulated
    # rate has sd 0.0064, so it lies within 0.03 of the exact rate in all but ~1e-5 of seeds.
    plan = plan_experiment(0.6, 0.5, binomial, 3.0, 0.8, highest=1.0)
    n = plan.count
    k = np.arange(n + 1)
    ph = k / n
    with np.errstate(divide="ignore", invalid="ignore"):
        passing = (ph - 0.5) / np.sqrt(ph * (1 - ph) / n) >= 3.0
    exact = binom.pmf(k[passing], n, 0.6).sum()
    assert exact == pytest.approx(0.8, abs=0.02)
    rng = np.random.default_rng(20240611)
    draws = rng.binomial(n, 0.6, size=4000) / n
    rate = np.mean((draws - 0.5) / np.sqrt(draws * (1 - draws) / n) >= 3.0)
    assert rate == pytest.approx(exact, abs=0.03)


def test_simulated_heavy_output_experiment_passes_as_planned():
    # Single-shot circuits (the binomial model of Cross et al. 2019): each of K circuits gives a
    # heavy output with probability h = 0.75; pass when h_bar - 2 sqrt(h_bar(1 - h_bar)/K) > 2/3.
    # The plan promises 0.80 with K = 219; the exact binomial rate is 0.772 (the pass line falls
    # between lattice points k/219).  4000 seeded runs: within 0.03 of the exact rate except in
    # ~1e-5 of seeds.
    plan = plan_experiment(0.75, 2 / 3, binomial, 2.0, 0.8, highest=1.0)
    k_circuits = plan.count
    assert k_circuits == 219
    k = np.arange(k_circuits + 1)
    h = k / k_circuits
    exact = binom.pmf(k[h - 2 * np.sqrt(h * (1 - h) / k_circuits) > 2 / 3], k_circuits, 0.75).sum()
    assert exact == pytest.approx(0.8, abs=0.035)
    rng = np.random.default_rng(99)
    hb = rng.binomial(k_circuits, 0.75, size=4000) / k_circuits
    rate = np.mean(hb - 2 * np.sqrt(hb * (1 - hb) / k_circuits) > 2 / 3)
    assert rate == pytest.approx(exact, abs=0.03)


def test_simulated_xeb_experiment_with_systematic_passes_as_planned():
    # Porter-Thomas mixture (Boixo et al. 2018): with probability F a sample's x = D p is
    # Gamma(2, 1), otherwise Exp(1).  Plan F 0.2 against 0.1 at 3 sigma, power 0.8, systematic 0.01
    # in quadrature; each simulated experiment prints mean(x) - 1 and its own error std(x)/sqrt(N).
    # Expected pass rate 0.80; 2000 seeded runs have sd 0.009, and the test accepts 0.76-0.84,
    # which a correct plan misses in well under 1e-4 of seeds.
    plan = plan_experiment(0.2, 0.1, linear_xeb, 3.0, 0.8, 0.01, highest=1.0)
    n = plan.count
    rng = np.random.default_rng(11)
    runs = 2000
    ideal = rng.random((runs, n)) < 0.2
    x = np.where(ideal, rng.gamma(2.0, 1.0, (runs, n)), rng.exponential(1.0, (runs, n)))
    estimate = x.mean(axis=1) - 1
    se = x.std(axis=1, ddof=1) / math.sqrt(n)
    rate = np.mean((estimate - 0.1) / np.sqrt(se ** 2 + 0.01 ** 2) >= 3.0)
    assert rate == pytest.approx(0.8, abs=0.04)


def test_simulated_xeb_experiment_over_few_circuits_passes_as_planned():
    # The project's simulator: K = 5 circuits at 8 qubits, whose own means scatter by
    # B = 4F^2/D each (porter_thomas).  Plan F 0.3 against 0.2 at 3 sigma, power 0.8, counting the
    # circuits; each simulated experiment prints mean(x) - 1 and its honest error at the truth.
    # Expected pass rate 0.80; 1500 seeded runs have sd 0.010 and the test accepts 0.76-0.84
    # (4 sd, missed by a correct plan in about 1e-4 of seeds).
    from checker.metrics import METRICS, ModelInputs
    from checker.raw.simulate_circuits import simulate_dataset

    model, k, d = METRICS["linear-xeb"], 5, 256.0
    inputs = ModelInputs(dimension=d)
    plan = plan_experiment(0.3, 0.2, lambda f: model.within_variance(f, inputs), 3.0, 0.8, highest=1.0,
                           spread_at=lambda f: model.circuit_variance(f, inputs) / k, circuits=k)
    assert plan.reachable and plan.spread > 0
    naive = plan_experiment(0.3, 0.2, lambda f: model.variance(f, inputs), 3.0, 0.8, highest=1.0)
    assert plan.count > 1.3 * naive.count  # the circuits' spread costs samples
    per_circuit = math.ceil(plan.count / k)
    se = math.sqrt(plan.variance / (k * per_circuit) + plan.spread)
    rng = np.random.default_rng(12)
    runs = 1500
    hits = 0
    for _ in range(runs):
        data = simulate_dataset(8, k, per_circuit, 0.3, rng)
        estimate = (data.probability * d).mean() - 1.0
        hits += (estimate - 0.2) / se >= 3.0
    # The plan's value is the printed estimate's expectation: pass 0.3 as the estimate itself.
    assert hits / runs == pytest.approx(0.8, abs=0.06)


def test_too_few_circuits_cannot_reach_the_target():
    from checker.metrics import METRICS, ModelInputs

    model, inputs = METRICS["linear-xeb"], ModelInputs(dimension=1024.0)
    plan = plan_experiment(0.5, 0.48, lambda f: model.within_variance(f, inputs), 3.0, 0.8, highest=1.0,
                           spread_at=lambda f: model.circuit_variance(f, inputs) / 10, circuits=10)
    assert not plan.reachable and plan.count is None
    assert "circuits' own spread" in plan.reason
    # At the needed error se, B / se^2 circuits: 36 (se = 0.02 / (3 + 0.8416) = 0.00521).
    assert math.ceil(plan.circuits_needed) == 36
