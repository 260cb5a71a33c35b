"""Differences against a baseline: statsmodels' McNemar and z tests, scipy's
binomial test, and a textbook McNemar example."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from checker.stats import comparison


def test_textbook_mcnemar_example():
    # A. Agresti, "An Introduction to Categorical Data Analysis", 2nd ed. (2007), Table 8.1:
    # presidential approval of 1600 people in two surveys, (approve, approve) 794,
    # (approve, disapprove) 150, (disapprove, approve) 86, (disapprove, disapprove) 570;
    # McNemar z = (86 - 150) / sqrt(86 + 150) = -4.17 and the difference 0.55 - 0.59 = -0.04
    # with standard error 0.0095 (from memory)
    got = comparison.mcnemar(86, 150, 1600, "z", "two")
    assert f"{got.sigma:.2f}" == "-4.17"
    assert f"{got.difference:.2f}" == "-0.04" and f"{got.error:.4f}" == "0.0095"


@pytest.mark.parametrize("n10, n01", [(58, 30), (12, 4), (150, 86), (7, 7)])
@pytest.mark.parametrize("correction", [False, True])
def test_chi_square_equals_statsmodels(n10, n01, correction):
    from statsmodels.stats.contingency_tables import mcnemar
    table = np.array([[500, n10], [n01, 600]])
    ref = mcnemar(table, exact=False, correction=correction)
    test = "chi-square-corrected" if correction else "chi-square"
    got = comparison.mcnemar(n10, n01, 1100 + n10 + n01, test, "two")
    if correction and n10 == n01:
        # statsmodels squares |0| - 1 = -1; the corrected statistic is taken as 0 here
        assert got.sigma == 0.0 and got.p_value == 1.0
        return
    assert got.sigma ** 2 == pytest.approx(ref.statistic, rel=1e-12)
    assert got.p_value == pytest.approx(ref.pvalue, rel=1e-9)


@pytest.mark.parametrize("n10, n01", [(58, 30), (12, 4), (3, 0), (20, 21)])
def test_exact_two_sided_equals_statsmodels(n10, n01):
    from statsmodels.stats.contingency_tables import mcnemar
    ref = mcnemar(np.array([[10, n10], [n01, 10]]), exact=True)
    assert comparison.mcnemar(n10, n01, 20 + n10 + n01, "exact", "two").p_value == pytest.approx(ref.pvalue, rel=1e-9)


@pytest.mark.parametrize("n10, n01", [(58, 30), (12, 4), (9, 1)])
def test_exact_one_sided_equals_scipy_binomtest(n10, n01):
    ref = stats.binomtest(n10, n10 + n01, 0.5, alternative="greater").pvalue
    assert comparison.mcnemar(n10, n01, 1200, "exact", "one").p_value == pytest.approx(ref, rel=1e-9)


def test_exact_deep_tail_stays_finite():
    got = comparison.mcnemar(3000, 0, 10000, "exact", "one")
    assert got.log_p == pytest.approx(-3000 * math.log(2), rel=1e-12) and got.sigma > 40


def test_unpaired_equals_statsmodels_ztest_with_unpooled_errors():
    a, se_a, b, se_b = 0.913, 0.008, 0.890, 0.009
    got = comparison.unpaired(a, se_a, b, se_b, "one")
    # the z of two independent estimates, errors in quadrature (common practice)
    assert got.sigma == pytest.approx(0.023 / math.sqrt(0.008**2 + 0.009**2), rel=1e-12)
    assert got.p_value == pytest.approx(stats.norm.sf(got.sigma), rel=1e-12)


def test_unpaired_proportions_equal_statsmodels_proportions_ztest_unpooled():
    from statsmodels.stats.proportion import proportions_ztest
    k, n = np.array([1096, 1068]), np.array([1200, 1200])
    z_ref, p_ref = proportions_ztest(k, n, alternative="larger", prop_var=False)
    # statsmodels with prop_var=False pools the proportions; compare against the unpooled
    # form computed by hand (common practice) and check the pooled one is close
    pa, pb = k / n
    got = comparison.unpaired(pa, comparison.proportion_error(pa, 1200), pb, comparison.proportion_error(pb, 1200))
    unpooled = (pa - pb) / math.sqrt(pa * (1 - pa) / 1200 + pb * (1 - pb) / 1200)
    assert got.sigma == pytest.approx(unpooled, rel=1e-12)
    assert got.sigma == pytest.approx(z_ref, rel=0.02)


def test_unpaired_equals_statsmodels_ttest_ind_on_large_samples():
    from statsmodels.stats.weightstats import ttest_ind
    rng = np.random.default_rng(3)
    x, y = rng.normal(1.0, 1.0, 4000), rng.normal(0.95, 1.2, 4000)
    t_ref, _, _ = ttest_ind(x, y, usevar="unequal")
    got = comparison.unpaired(x.mean(), x.std(ddof=1) / 63.245553203367585, y.mean(), y.std(ddof=1) / 63.245553203367585)
    assert got.sigma == pytest.approx(t_ref, rel=1e-10)


def test_discordant_range_by_brute_force():
    # every split of 1200 items with 1096 right for ours and 1068 for the baseline
    n, ka, kb = 1200, 1096, 1068
    zs = []
    for n11 in range(0, n + 1):
        n10, n01 = ka - n11, kb - n11
        n00 = n - n11 - n10 - n01
        if min(n10, n01, n00) < 0:
            continue
        zs.append((n10 - n01) / math.sqrt(n10 + n01))
    got = comparison.discordant_range(ka, kb, n)
    assert got.sigma_low == pytest.approx(min(zs)) and got.sigma_high == pytest.approx(max(zs))
    assert got.net == 28


def test_paired_error_is_the_multinomial_standard_error():
    # seeded simulation: 20,000 paired experiments of 1200 items with p10 = 0.05, p01 = 0.025;
    # the spread of d = (n10 - n01) / N matches the formula within 2% (all seeds tried pass)
    rng = np.random.default_rng(11)
    cells = rng.multinomial(1200, [0.05, 0.025, 0.925], size=20000)
    d = (cells[:, 0] - cells[:, 1]) / 1200
    _, se = comparison.paired_difference(0.05 * 1200, 0.025 * 1200, 1200)
    assert d.std() == pytest.approx(se, rel=0.02)
