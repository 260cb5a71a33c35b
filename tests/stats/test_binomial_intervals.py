"""checker.stats.binomial_intervals: the five interval methods against
Newcombe's Table I, their definitions, and exact coverage."""

from __future__ import annotations

import math

import numpy as np
import pytest

from checker.stats.binomial_intervals import INTERVAL_METHODS, proportion_interval

# R. G. Newcombe, "Two-sided confidence intervals for the single proportion: comparison of seven
# methods", Stat. Med. 17, 857 (1998), Table I (from memory; statsmodels agrees to 4 decimals).
NEWCOMBE_TABLE_I = [
    (81, 263, "wilson", (0.2553, 0.3662)),
    (81, 263, "clopper-pearson", (0.2527, 0.3676)),
    (81, 263, "wald", (0.2522, 0.3638)),
    (15, 148, "wilson", (0.0624, 0.1605)),
    (15, 148, "clopper-pearson", (0.0578, 0.1617)),
    (0, 20, "wilson", (0.0, 0.1611)),
    (0, 20, "clopper-pearson", (0.0, 0.1684)),
    (1, 29, "wilson", (0.0061, 0.1718)),
    (1, 29, "clopper-pearson", (0.0009, 0.1776)),
]


@pytest.mark.parametrize("k, n, method, expected", NEWCOMBE_TABLE_I)
def test_newcombe_table_one(k, n, method, expected):
    low, high = proportion_interval(k, n, 0.95, method)
    assert (round(low, 4), round(high, 4)) == expected


def test_wilson_is_the_score_interval():
    # E. B. Wilson, J. Am. Stat. Assoc. 22, 209 (1927): centre (k + z^2/2)/(n + z^2),
    # half-width z sqrt(p(1-p)/n + z^2/(4 n^2)) / (1 + z^2/n).
    from scipy.stats import norm

    k, n = 37, 90
    z = norm.ppf(0.975)
    p = k / n
    centre = (p + z * z / (2 * n)) / (1 + z * z / n)
    half = z * math.sqrt(p * (1 - p) / n + z * z / (4 * n * n)) / (1 + z * z / n)
    assert proportion_interval(k, n, 0.95, "wilson") == pytest.approx((centre - half, centre + half), rel=1e-12)


def test_jeffreys_and_clopper_pearson_are_beta_quantiles():
    # Brown, Cai and DasGupta, Statist. Sci. 16, 101 (2001) (from memory): Jeffreys is the
    # Beta(k + 1/2, n - k + 1/2) equal-tailed interval; Clopper-Pearson uses Beta(k, n - k + 1)
    # and Beta(k + 1, n - k).
    from scipy.stats import beta

    k, n = 12, 50
    assert proportion_interval(k, n, 0.9, "jeffreys") == pytest.approx(
        (beta.ppf(0.05, k + 0.5, n - k + 0.5), beta.ppf(0.95, k + 0.5, n - k + 0.5)), rel=1e-10)
    assert proportion_interval(k, n, 0.9, "clopper-pearson") == pytest.approx(
        (beta.ppf(0.05, k, n - k + 1), beta.ppf(0.95, k + 1, n - k)), rel=1e-10)


def test_agresti_coull_is_wald_about_the_adjusted_proportion():
    # Agresti and Coull, Am. Stat. 52, 119 (1998) (from memory): n~ = n + z^2,
    # p~ = (k + z^2/2)/n~, interval p~ +- z sqrt(p~(1 - p~)/n~).
    from scipy.stats import norm

    k, n = 7, 40
    z = norm.ppf(0.975)
    nt = n + z * z
    pt = (k + z * z / 2) / nt
    half = z * math.sqrt(pt * (1 - pt) / nt)
    assert proportion_interval(k, n, 0.95, "agresti-coull") == pytest.approx((pt - half, pt + half), rel=1e-10)


def test_clopper_pearson_covers_at_least_its_level_everywhere():
    # Clopper and Pearson, Biometrika 26, 404 (1934) (from memory): the exact interval's coverage
    # never falls below the nominal level. Coverage is computed exactly from the binomial pmf on
    # a grid of true proportions, so no randomness enters.
    from scipy.stats import binom

    n = 30
    bounds = [proportion_interval(k, n, 0.95, "clopper-pearson") for k in range(n + 1)]
    for p in np.linspace(0.01, 0.99, 99):
        covered = sum(binom.pmf(k, n, p) for k, (lo, hi) in enumerate(bounds) if lo <= p <= hi)
        assert covered >= 0.95 - 1e-12


def test_jeffreys_ends_at_zero_and_one_at_the_extreme_counts():
    # Brown, Cai and DasGupta (2001) (from memory): the Jeffreys interval's lower end is set to 0
    # at k = 0 and its upper end to 1 at k = n.
    assert proportion_interval(0, 20, 0.95, "jeffreys")[0] == 0.0
    assert proportion_interval(20, 20, 0.95, "jeffreys")[1] == 1.0


def test_every_method_brackets_the_estimate_and_stays_in_range():
    for method in INTERVAL_METHODS:
        for k, n in ((0, 10), (3, 10), (10, 10), (2.5, 10)):
            lo, hi = proportion_interval(k, n, 0.95, method)
            assert 0.0 <= lo <= k / n + 1e-12 and k / n - 1e-12 <= hi <= 1.0


@pytest.mark.parametrize("args", [(5, 0, 0.95, "wilson"), (11, 10, 0.95, "wilson"), (3, 10, 1.0, "wilson"),
                                  (3, 10, 0.95, "exact")])
def test_unusable_requests_are_refused(args):
    with pytest.raises(ValueError):
        proportion_interval(*args)


@pytest.mark.parametrize("method", INTERVAL_METHODS)
def test_many_counts_in_one_call_match_one_at_a_time(method):
    from checker.stats.binomial_intervals import proportion_intervals

    counts = [0, 1, 7, 19, 20]
    together = [b for pair in proportion_intervals(counts, 20, 0.9, method) for b in pair]
    apart = [b for k in counts for b in proportion_interval(k, 20, 0.9, method)]
    assert together == pytest.approx(apart, abs=1e-12)


# statsmodels' own names for the five methods.
_STATSMODELS = {"wald": "normal", "wilson": "wilson", "clopper-pearson": "beta",
                "agresti-coull": "agresti_coull", "jeffreys": "jeffreys"}


@pytest.mark.parametrize("method", INTERVAL_METHODS)
@pytest.mark.parametrize("n", [1, 2, 7, 42, 78, 263, 10_000, 10**6])
@pytest.mark.parametrize("level", [0.5, 0.9, 0.95, 0.99, 1 - 1e-9])
def test_every_method_matches_statsmodels(method, n, level):
    # Reference: statsmodels.stats.proportion.proportion_confint (the library the formulas were
    # taken out of for speed). Its Clopper-Pearson and Jeffreys ends at k = 0 and k = n are NaN or
    # inside (0, 1) for some versions; Brown, Cai and DasGupta (2001) set them to 0 and 1, as we do.
    from statsmodels.stats.proportion import proportion_confint

    from checker.stats.binomial_intervals import interval_arrays

    counts = np.unique(np.linspace(0, n, min(n + 1, 40)).round())
    low, high = interval_arrays(counts, n, level, method)
    ref_low, ref_high = (np.asarray(b, dtype=float) for b in
                         proportion_confint(counts, n, alpha=1 - level, method=_STATSMODELS[method]))
    ref_low = np.clip(np.where(counts == 0, 0.0, np.nan_to_num(ref_low, nan=0.0)), 0, 1)
    ref_high = np.clip(np.where(counts == n, 1.0, np.nan_to_num(ref_high, nan=1.0)), 0, 1)
    if method in ("wald", "wilson", "agresti-coull"):
        ref_low, ref_high = np.clip(np.asarray(proportion_confint(counts, n, alpha=1 - level,
                                                                   method=_STATSMODELS[method]), float), 0, 1)
    np.testing.assert_allclose(low, ref_low, rtol=1e-10, atol=1e-13)
    np.testing.assert_allclose(high, ref_high, rtol=1e-10, atol=1e-13)


def test_one_count_per_denominator_broadcasts():
    from checker.stats.binomial_intervals import interval_arrays

    low, high = interval_arrays([35, 35], [42, 78], 0.95, "wald")
    assert (low[0], high[0]) == pytest.approx(proportion_interval(35, 42, 0.95, "wald"))
    assert (low[1], high[1]) == pytest.approx(proportion_interval(35, 78, 0.95, "wald"))


@pytest.mark.parametrize("method", INTERVAL_METHODS)
def test_the_plain_float_path_matches_the_array_path(method):
    from checker.stats.binomial_intervals import interval_arrays

    for n in (1, 3, 42, 1000, 10**6):
        counts = np.unique(np.linspace(0, n, 25).round())
        low, high = interval_arrays(counts, n, 0.95, method)
        for k, lo, hi in zip(counts, low, high):
            assert proportion_interval(k, n, 0.95, method) == pytest.approx((lo, hi), rel=1e-12, abs=1e-15)
