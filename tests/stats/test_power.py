"""Sample sizes: statsmodels' power solvers, and seeded simulations that the
stated power is reached."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from checker.stats import power
from checker.stats.counts import poisson_log_sf


def test_two_proportions_equals_statsmodels_normal_power():
    from statsmodels.stats.power import NormalIndPower
    p1, p2 = 0.913, 0.890
    # the unpooled test is NormalIndPower with effect size delta / sqrt((p1 q1 + p2 q2) / 2)
    es = (p1 - p2) / math.sqrt((p1 * (1 - p1) + p2 * (1 - p2)) / 2)
    ref = NormalIndPower().solve_power(effect_size=es, alpha=stats.norm.sf(3), power=0.8, alternative="larger")
    assert power.two_proportions(p1, p2, 3, 0.8).count == math.ceil(ref)


def test_pooled_two_proportions_equals_statsmodels():
    from statsmodels.stats.proportion import samplesize_proportions_2indep_onetail
    ref = samplesize_proportions_2indep_onetail(0.023, 0.890, 0.8, alpha=stats.norm.sf(3), alternative="larger")
    assert power.two_proportions(0.913, 0.890, 3, 0.8, pooled=True).count == math.ceil(ref)


def test_mean_runs_equals_statsmodels_t_power():
    from statsmodels.stats.power import TTestPower
    ref = TTestPower().solve_power(effect_size=1.3 / 1.2, alpha=stats.norm.sf(2), power=0.8, alternative="larger")
    got = power.mean_runs(1.3, 1.2, 2, 0.8)
    assert got.count == math.ceil(ref)
    assert power.mean_runs_power(1.3, 1.2, got.count - 1, 2) < 0.8 <= got.achieved_power


def test_two_proportions_power_is_reached_in_simulation():
    # seeded: 4000 simulated pairs of arms at the planned n; the unpaired z clears 3 sigma
    # in 0.80 of them within 3 standard errors (0.019); the normal approximation is good here
    p1, p2 = 0.913, 0.890
    n = power.two_proportions(p1, p2, 3, 0.8).count
    rng = np.random.default_rng(5)
    a, b = rng.binomial(n, p1, 4000) / n, rng.binomial(n, p2, 4000) / n
    z = (a - b) / np.sqrt(a * (1 - a) / n + b * (1 - b) / n)
    assert abs((z >= 3).mean() - 0.8) < 0.019


def test_paired_power_is_reached_in_simulation():
    # seeded: Connor (1987) n for p10 = 0.05, p01 = 0.025; McNemar's z clears 3 sigma in
    # 0.80 of 4000 simulated experiments within 3 standard errors (0.019)
    n = power.paired_proportions(0.05, 0.025, 3, 0.8).count
    rng = np.random.default_rng(6)
    cells = rng.multinomial(n, [0.05, 0.025, 0.925], size=4000)
    z = (cells[:, 0] - cells[:, 1]) / np.sqrt(cells[:, 0] + cells[:, 1])
    assert abs((z >= 3).mean() - 0.8) < 0.019


def test_mean_runs_power_is_reached_in_simulation():
    # seeded: 20000 experiments of normal runs; the t test's pass rate equals the
    # noncentral-t power within 3 standard errors (0.008)
    got = power.mean_runs(1.3, 1.2, 2, 0.8)
    rng = np.random.default_rng(7)
    runs = rng.normal(71.3, 1.2, size=(20000, got.count))
    t = (runs.mean(axis=1) - 70.0) / (runs.std(axis=1, ddof=1) / math.sqrt(got.count))
    passed = stats.t.sf(t, got.count - 1) <= stats.norm.sf(2)
    assert abs(passed.mean() - got.achieved_power) < 0.008


def test_counting_exposure_power_is_reached_in_simulation():
    # seeded: 20000 Poisson counts at the planned exposure; the exact tail clears 3 sigma
    # in the stated fraction within 3 standard errors (0.009)
    got = power.counting_exposure(16.8, 30.2, 3, 0.8)
    mu_b, mu = 30.2 * got.count, (16.8 + 30.2) * got.count
    rng = np.random.default_rng(8)
    n = rng.poisson(mu, 20000)
    alpha = stats.norm.sf(3)
    crit = next(k for k in range(1, 10000) if math.exp(poisson_log_sf(k, mu_b)) <= alpha)
    assert got.achieved_power == pytest.approx(0.8, abs=1e-9)
    assert abs((n >= crit).mean() - 0.8) < 0.009


def test_counting_exposure_is_the_first_that_reaches_the_power():
    # brute force over a fine grid of exposures: none below the answer reaches the power
    got = power.counting_exposure(2.0, 1.5, 3, 0.8)
    grid = np.linspace(got.count / 400, got.count * (1 - 1e-9), 400)
    assert all(power.counting_power(2.0, 1.5, t, 3) < 0.8 for t in grid)
    assert power.counting_power(2.0, 1.5, got.count, 3) >= 0.8 - 1e-9


@pytest.mark.parametrize("s, b", [(2.0, 1.5), (16.8, 30.2), (0.5, 40.0)])
def test_segment_ends_reach_the_power_once(s, b):
    # the search assumes the power at each segment's right end rises with the critical count
    from scipy.special import gammainc, gammaincinv
    alpha = stats.norm.sf(3)
    ends = [gammainc(n, (1 + s / b) * gammaincinv(n, alpha)) for n in range(1, 400)]
    assert all(x <= y + 1e-12 for x, y in zip(ends, ends[1:]))


def test_no_effect_is_unreachable():
    assert not power.two_proportions(0.8, 0.8, 3, 0.8).reachable
    assert not power.paired_proportions(0.02, 0.03, 3, 0.8).reachable
    assert not power.mean_runs(0.0, 1.0, 3, 0.8).reachable
    assert not power.counting_exposure(0.0, 1.0, 3, 0.8).reachable
