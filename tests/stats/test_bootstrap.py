"""The fast bootstrap against plain resampling on small data.

Statistical comparisons use fixed seeds; each states the fraction of seeds
expected to pass.  The plain bootstrap of a mean has exactly the variance
sigma_hat^2 / N (sigma_hat^2 the plug-in variance): Efron and Tibshirani,
"An Introduction to the Bootstrap" (1993), ch. 5 (from memory); several tests
hold replicates against that.
"""

import math

import numpy as np
import pytest
from scipy import stats

from checker.stats import bootstrap as boot


def _data(n=400, seed=1):
    rng = np.random.default_rng(seed)
    # Porter-Thomas mixture at F = 0.3: skewed like the x = D p the tool bootstraps.
    ideal = rng.random(n) < 0.3
    return np.where(ideal, rng.gamma(2.0, size=n), rng.exponential(size=n))


def _plugin_sd_of_mean(x):
    return float(np.std(x) / math.sqrt(x.size))


def test_binned_bootstrap_matches_plain_resampling_on_small_data():
    # Expected to pass for about 999 seeds in 1000: tolerances are 4 or more
    # Monte Carlo standard errors of each compared quantity (B = 20,000).
    x = _data()
    reps = 20_000
    fast = boot.binned_mean_bootstrap(boot.bin_values(x), reps, np.random.default_rng(2))
    plain = boot.plain_mean_bootstrap(x, reps, np.random.default_rng(3))
    exact_sd = _plugin_sd_of_mean(x)
    # sd of a bootstrap sd from B replicates: about sd / sqrt(2 B) = 0.5 %.
    assert fast.sd == pytest.approx(exact_sd, rel=0.025)
    assert plain.sd == pytest.approx(exact_sd, rel=0.025)
    assert fast.sd == pytest.approx(plain.sd, rel=0.03)
    # The tails: 2.5% and 97.5% quantiles agree within 0.12 sd (about 4 MC errors).
    for q in (0.025, 0.975):
        assert abs(np.quantile(fast.replicates, q) - np.quantile(plain.replicates, q)) < 0.12 * exact_sd
    # The skewness of the mean's bootstrap distribution (about 0.1 here) is kept.
    assert stats.skew(fast.replicates) == pytest.approx(stats.skew(plain.replicates), abs=0.08)
    assert stats.ks_2samp(fast.replicates, plain.replicates).pvalue > 1e-3


def test_coupled_replicates_stand_within_the_stated_bound():
    # Couple the two methods exactly as the bound's proof does: draw plain
    # multinomial weights over the samples, aggregate them by bin, and compare
    # the exact replicate with the binned one built from the same bin counts.
    # The observed RMS gap must be near sqrt(eps) sd (no Gaussian term), and
    # below the stated bound.  Passes for essentially every seed: 2,000
    # coupled pairs estimate the RMS to about 2 %.
    x = _data(n=600, seed=4)
    binned = boot.bin_values(x, groups=16)  # coarse on purpose: eps is measurable
    eps = binned.within_share()
    assert 1e-4 < eps < 0.05
    order = np.argsort(x, kind="stable")
    edges = np.cumsum(binned.counts).astype(int)
    bin_of = np.empty(x.size, dtype=int)
    bin_of[order] = np.searchsorted(edges, np.arange(x.size), side="right")
    means = binned.sums / binned.counts
    rng = np.random.default_rng(5)
    gaps = []
    for _ in range(2000):
        w = np.bincount(rng.integers(0, x.size, size=x.size), minlength=x.size)
        m = np.bincount(bin_of, weights=w, minlength=binned.counts.size)
        gaps.append((w @ x - m @ means) / x.size)
    rms = math.sqrt(np.mean(np.square(gaps)))
    sd = _plugin_sd_of_mean(x)
    assert rms == pytest.approx(math.sqrt(eps) * sd, rel=0.1)
    plain_binned = boot.binned_mean_bootstrap(binned, 10, rng, gaussian_within=False)
    assert rms <= plain_binned.error_bound * 1.1
    assert plain_binned.error_bound == pytest.approx(math.sqrt(eps) * sd)


@pytest.mark.parametrize("gaussian", [True, False])
def test_variance_is_exact_with_the_gaussian_term_and_short_by_eps_without(gaussian):
    # Var(replicates) / (sigma_hat^2 / N) is 1 with the Gaussian within-bin
    # term and exactly 1 - eps without it.  With B = 40,000 the ratio has a
    # Monte Carlo sd of sqrt(2 / B) = 0.7 %; 4 % is about 5.6 sd (always passes).
    x = _data(n=500, seed=6)
    binned = boot.bin_values(x, groups=8)
    eps = binned.within_share()
    assert eps > 0.05  # coarse bins so that the shortfall is visible
    result = boot.binned_mean_bootstrap(binned, 40_000, np.random.default_rng(7), gaussian_within=gaussian)
    ratio = np.var(result.replicates) / _plugin_sd_of_mean(x) ** 2
    assert ratio == pytest.approx(1.0 if gaussian else 1.0 - eps, abs=0.04)
    assert np.mean(result.replicates) == pytest.approx(x.mean(), abs=4 * _plugin_sd_of_mean(x) / 200)


def test_cluster_bootstrap_has_the_plug_in_variance_of_circuit_means():
    # Equal circuit sizes: the pooled mean is the mean of the K circuit means,
    # whose resampling variance is exactly the plug-in variance of those means / K.
    # Expected to pass for about 999 seeds in 1000 (3 % is over 4 MC sd).
    rng = np.random.default_rng(8)
    means = rng.normal(1.3, 0.05, size=12)
    counts = np.full(12, 500.0)
    result = boot.cluster_ratio_bootstrap(means * counts, counts, 20_000, np.random.default_rng(9))
    assert result.method == "circuits"
    assert result.estimate == pytest.approx(means.mean())
    assert result.sd == pytest.approx(np.std(means) / math.sqrt(12), rel=0.03)


def test_cluster_bootstrap_weights_unequal_circuits_by_their_samples():
    sums = np.array([10.0, 30.0])
    counts = np.array([10.0, 20.0])
    result = boot.cluster_ratio_bootstrap(sums, counts, 5000, np.random.default_rng(10))
    # Each replicate is one of: both circuit 1 (1.0), both circuit 2 (1.5), or one of each (40/30).
    assert set(np.round(result.replicates, 12)) <= {1.0, 1.5, round(40 / 30, 12)}
    assert result.estimate == pytest.approx(40 / 30)
    with pytest.raises(ValueError):
        boot.cluster_ratio_bootstrap(sums[:1], counts[:1], 10, np.random.default_rng(0))


def test_binomial_bootstrap_equals_plain_resampling_of_zero_one_data():
    # Exact: resampling n 0/1 values gives Binomial(n, k/n) ones.  Passes for
    # about 999 seeds in 1000.
    values = np.r_[np.ones(70), np.zeros(130)]
    fast = boot.binomial_bootstrap(70, 200, 20_000, np.random.default_rng(11))
    plain = boot.plain_mean_bootstrap(values, 20_000, np.random.default_rng(12))
    assert fast.sd == pytest.approx(math.sqrt(0.35 * 0.65 / 200), rel=0.025)
    assert fast.sd == pytest.approx(plain.sd, rel=0.03)
    assert fast.within_share == 0.0 and fast.error_bound == 0.0


def test_percentile_and_basic_intervals_follow_their_definitions():
    # Basic interval: (2 theta - q(1 - a/2), 2 theta - q(a/2)), Davison and
    # Hinkley (1997) eq. 5.6 (from memory); percentile: (q(a/2), q(1 - a/2)).
    replicates = np.r_[np.linspace(0.0, 1.0, 101), np.full(100, 3.0)]  # skewed to the right
    lo, hi = boot.percentile_interval(replicates, 0.9)
    assert (lo, hi) == (pytest.approx(np.quantile(replicates, 0.05)), pytest.approx(np.quantile(replicates, 0.95)))
    blo, bhi = boot.basic_interval(1.0, replicates, 0.9)
    assert blo == pytest.approx(2.0 - hi) and bhi == pytest.approx(2.0 - lo)
    result = boot.BootstrapResult(1.0, replicates, "plain")
    assert result.basic_interval(0.9) == (pytest.approx(blo), pytest.approx(bhi))
    shifted = result.shifted(-1.0)
    assert shifted.estimate == 0.0 and shifted.percentile_interval(0.9)[0] == pytest.approx(lo - 1.0)


def test_coarsening_keeps_totals_and_order():
    rng = np.random.default_rng(13)
    x = np.sort(rng.exponential(size=50_000))
    fine = np.array_split(x, 5000)
    counts = np.array([len(a) for a in fine], dtype=float)
    sums = np.array([a.sum() for a in fine])
    sums_sq = np.array([(a * a).sum() for a in fine])
    coarse = boot.coarsen_bins(counts, sums, sums_sq, groups=256)
    assert coarse.counts.size <= 256
    assert coarse.counts.sum() == counts.sum()
    assert coarse.sums.sum() == pytest.approx(sums.sum())
    assert coarse.sums_sq.sum() == pytest.approx(sums_sq.sum())
    assert np.all(np.diff(coarse.sums / coarse.counts) > 0)
    # The union of equal-count and equal-width cuts keeps the tail bins narrow.
    assert coarse.within_share() < 1e-3


def test_degenerate_samples():
    constant = boot.bin_values(np.full(10, 2.5))
    assert constant.counts.size == 1 and constant.within_share() == 0.0
    result = boot.binned_mean_bootstrap(constant, 100, np.random.default_rng(0))
    assert np.all(result.replicates == 2.5) and result.error_bound == 0.0
    with pytest.raises(ValueError):
        boot.bin_values(np.empty(0))
    with pytest.raises(ValueError):
        boot.coarsen_bins(np.zeros(3), np.zeros(3), np.zeros(3))


def test_replicate_histogram_is_a_density():
    edges, density = boot.histogram(np.random.default_rng(14).normal(size=5000), bins=30)
    assert edges.size == 31 and density.size == 30
    assert np.sum(density * np.diff(edges)) == pytest.approx(1.0)
    edges, density = boot.histogram(np.full(5, 1.0))
    assert np.all(np.isfinite(density)) and edges[0] < 1.0 < edges[-1]


# --- few circuits: the t interval, and the grouped bootstrap ---------------------------------

@pytest.mark.parametrize("k", [2, 3, 5])
def test_t_interval_over_few_circuits_holds_its_level(k):
    # 2000 seeded datasets from the project's simulator (6 qubits, F = 0.5, 300 samples per
    # circuit): the nominal-95% t interval on K - 1 degrees of freedom covers the expected
    # linear XEB F (D - 1)/(D + 1) within 2 points (binomial sd 0.49 points: a correct interval
    # passes for about 9999 seeds in 10000).  The percentile interval of the cluster bootstrap
    # undercovers there (issue "Right at the edges", item 6: 52/78/82% at 2/3/5 circuits).
    from checker.raw.simulate_circuits import simulate_dataset

    rng = np.random.default_rng(600 + k)
    d = 64.0
    truth = 0.5 * (d - 1) / (d + 1)
    t_hits = p_hits = 0
    runs = 2000
    for _ in range(runs):
        data = simulate_dataset(6, k, 300, 0.5, rng)
        sums = np.bincount(data.circuit, weights=data.probability * d - 1.0, minlength=k)
        counts = np.full(k, 300.0)
        iv = boot.cluster_t_interval(sums, counts, 0.95)
        t_hits += iv.low <= truth <= iv.high
        lo, hi = boot.cluster_ratio_bootstrap(sums, counts, 200, rng).percentile_interval(0.95)
        p_hits += lo <= truth <= hi
    assert t_hits / runs == pytest.approx(0.95, abs=0.02)
    assert p_hits / runs < 0.90


def test_t_interval_is_the_one_sample_t_interval_for_equal_circuits():
    # Equal n_c: R +- t_{K-1} s / sqrt(K) of the circuit means, as scipy.stats.t.interval gives.
    from scipy import stats

    means = np.array([1.31, 1.27, 1.35, 1.29])
    iv = boot.cluster_t_interval(means * 100, np.full(4, 100.0), 0.9)
    low, high = stats.t.interval(0.9, 3, loc=means.mean(), scale=stats.sem(means))
    assert (iv.low, iv.high) == (pytest.approx(low, rel=1e-12), pytest.approx(high, rel=1e-12))
    assert iv.dof == 3


def test_grouped_cluster_bootstrap_matches_the_exact_one():
    # 5000 unequal circuits: grouped (about 1024 value groups) against exact per-circuit
    # resampling: the same sd within the Monte Carlo error of 4000 replicates (1.1%) plus the
    # stated bound; 4% is over 3 of those (about 998 seeds in 1000).
    rng = np.random.default_rng(21)
    k = 5000
    counts = rng.integers(200, 800, k).astype(float)
    sums = counts * rng.normal(1.5, 0.2, k) + rng.normal(0, 5, k)
    grouped = boot.cluster_ratio_bootstrap(sums, counts, 4000, np.random.default_rng(22))
    exact = boot.cluster_ratio_bootstrap(sums, counts, 4000, np.random.default_rng(23), groups=k)
    assert grouped.method == "circuits, grouped" and exact.method == "circuits"
    ratio = sums.sum() / counts.sum()
    plain_sd = math.sqrt(np.sum((sums - ratio * counts) ** 2)) / counts.sum()
    assert grouped.sd == pytest.approx(exact.sd, rel=0.04)
    assert grouped.sd == pytest.approx(plain_sd, rel=0.04)
    assert grouped.error_bound < 0.05 * plain_sd
    assert grouped.replicates.mean() == pytest.approx(ratio, abs=3 * plain_sd / math.sqrt(4000))
