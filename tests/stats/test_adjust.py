"""Holm and Benjamini-Hochberg adjustment against hand-worked examples."""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from checker.stats.adjust import adjust_log_p_values, adjust_p_values

# Benjamini and Hochberg, "Controlling the false discovery rate", J. R. Stat. Soc. B 57, 289
# (1995), section 4.3: the 15 p-values of their worked example (from memory).  With q = 0.05 the
# step-up procedure rejects the four smallest; Bonferroni-type procedures reject three.
BH_EXAMPLE = [0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459,
              0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.000]
# Hand-worked here: BH adjusted p_(i) = min_{j >= i} m p_(j) / j, m = 15 (e.g. the fourth,
# 0.0095 * 15 / 4 = 0.035625; the sixth, min(0.0278 * 15/6, 0.0298 * 15/7) = 0.0638571).
BH_ADJUSTED = [0.0015, 0.003, 0.0095, 0.035625, 0.0603, 0.0638571, 0.0638571, 0.0645, 0.0765,
               0.486, 0.5811818, 0.714875, 0.7532308, 0.8132143, 1.0]
# Hand-worked here: Holm adjusted p_(i) = max_{j <= i} min(1, (m - j + 1) p_(j)) (Holm 1979):
# 15 * 0.0001, 14 * 0.0004, 13 * 0.0019, 12 * 0.0095, 11 * 0.0201, 10 * 0.0278, then the running
# maximum 0.278 twice, 7 * 0.0459 = 0.3213, and 6 * 0.3240 > 1.
HOLM_ADJUSTED = [0.0015, 0.0056, 0.0247, 0.114, 0.2211, 0.278, 0.278, 0.278, 0.3213,
                 1, 1, 1, 1, 1, 1]


def test_benjamini_hochberg_worked_example():
    adjusted = adjust_p_values(BH_EXAMPLE, "bh")
    np.testing.assert_allclose(adjusted, BH_ADJUSTED, rtol=1e-6)
    assert int((adjusted <= 0.05).sum()) == 4  # the paper's four rejections


def test_holm_worked_example():
    adjusted = adjust_p_values(BH_EXAMPLE, "holm")
    np.testing.assert_allclose(adjusted, HOLM_ADJUSTED, rtol=1e-9)
    assert int((adjusted <= 0.05).sum()) == 3  # the paper's three for Bonferroni-type methods


def test_holm_is_holm_not_holm_sidak():
    # statsmodels' default is Holm-Sidak, 1 - (1 - p)^m: 0.00149895 for the smallest p here.
    # Holm's own first step is m p = 15 * 0.0001 = 0.0015 exactly (Holm 1979).
    assert adjust_p_values(BH_EXAMPLE, "holm")[0] == pytest.approx(0.0015, rel=1e-12)
    assert 1 - (1 - 0.0001) ** 15 == pytest.approx(0.00149895, rel=1e-5)


def test_order_is_kept_and_nan_left_out():
    rng = np.random.default_rng(7)
    order = rng.permutation(len(BH_EXAMPLE))
    shuffled = np.asarray(BH_EXAMPLE)[order]
    with_gaps = np.insert(shuffled, [0, 5, 15], np.nan)
    adjusted = adjust_p_values(with_gaps, "bh")
    assert np.isnan(adjusted[[0, 6, 17]]).all()
    kept = adjusted[~np.isnan(with_gaps)]
    np.testing.assert_allclose(kept, np.asarray(BH_ADJUSTED)[order], rtol=1e-6)


def test_log_p_adjustment_matches_linear_and_bounds_underflow():
    log_p = np.log(BH_EXAMPLE)
    adj = adjust_log_p_values(np.append(log_p, np.nan))
    assert adj.tested == 15
    np.testing.assert_allclose(adj.p_holm[:15], HOLM_ADJUSTED, rtol=1e-9)
    np.testing.assert_allclose(np.exp(adj.log_p_bh[:15]), BH_ADJUSTED, rtol=1e-6)
    assert math.isnan(adj.p_bh[15])
    # 40 sigma and beyond: p underflows, but the adjustment is made in log space, so it stays exact.
    # By hand from Holm (1979) and Benjamini-Hochberg (1995) with m = 3: Holm multiplies the
    # smallest (e^-900) by 3 and the next (e^-800) by 2; BH multiplies e^-900 by 3/1.
    deep = adjust_log_p_values([-800.0, -900.0, math.log(0.2)])
    assert deep.p_holm[0] == 0.0
    assert deep.log_p_holm[0] == pytest.approx(math.log(2) - 800.0, rel=1e-15)
    assert deep.log_p_holm[1] == pytest.approx(math.log(3) - 900.0, rel=1e-15)
    assert deep.log_p_bh[1] == pytest.approx(math.log(3) - 900.0, rel=1e-15)
    assert deep.log_p_bh[0] == pytest.approx(math.log(1.5) - 800.0, rel=1e-15)
    assert deep.p_holm[2] == pytest.approx(0.2)  # the largest keeps its raw value under Holm


@pytest.mark.parametrize("seed", range(5))
@pytest.mark.parametrize("method, theirs", [("holm", "holm"), ("bh", "fdr_bh")])
def test_matches_statsmodels_multipletests(seed, method, theirs):
    # Reference: statsmodels.stats.multitest.multipletests, on random families with ties and
    # exact 0 and 1 (seeded; every seed must pass).
    from statsmodels.stats.multitest import multipletests

    rng = np.random.default_rng(seed)
    raw = rng.uniform(0, 1, 200) ** 4
    raw[:20] = raw[20:40]  # ties
    raw[40], raw[41] = 0.0, 1.0
    np.testing.assert_allclose(adjust_p_values(raw, method), multipletests(raw, method=theirs)[1],
                               rtol=1e-12, atol=1e-300)


@pytest.mark.parametrize("bad", [[0.2, 1.2], [-0.1]])
def test_refuses_impossible_p(bad):
    with pytest.raises(ValueError):
        adjust_p_values(bad, "holm")


def test_refuses_unknown_method():
    with pytest.raises(ValueError):
        adjust_p_values([0.1], "hommel")


p_lists = st.lists(st.one_of(st.floats(0.0, 1.0), st.sampled_from([0.0, 1.0, 1e-300, 0.05])),
                   min_size=1, max_size=40)


@settings(max_examples=150, deadline=None)
@given(p=p_lists)
def test_adjusted_stay_in_unit_interval_and_keep_the_order(p):
    # Common practice: both procedures give values in [0, 1], never below the raw p, and never
    # reverse the order of the raw p-values.
    raw = np.asarray(p)
    for method in ("holm", "bh"):
        adjusted = adjust_p_values(raw, method)
        assert np.all((adjusted >= 0) & (adjusted <= 1))
        assert np.all(adjusted >= raw - 1e-15)
        order = np.argsort(raw, kind="stable")
        assert np.all(np.diff(adjusted[order]) >= -1e-15)
