"""Batch columns for the kinds of claim of issue 14: the kind, a comparison's difference with its
error and significance, a counting experiment's and a few runs' recomputed significance, and the
trials that local and global significances imply.  Reference values from statsmodels and scipy."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from checker.survey import run_batch

CLAIMS = [
    {"title": "unpaired (invented)", "metric": "proportion", "estimate": "0.913", "samples": "1000",
     "baseline": {"estimate": "0.890", "samples": "1000"}},
    {"title": "paired (invented)", "metric": "proportion", "estimate": "0.913", "samples": "1200",
     "baseline": {"estimate": "0.890", "samples": "1200"}, "comparison": {"paired": True, "discordant": [58, 30]}},
    {"title": "counts (invented)", "metric": "counts", "observed": 12, "background": "4.1"},
    {"title": "runs (invented)", "metric": "mean", "estimate": "71.3", "sd": "1.2", "samples": 5, "threshold": "70.0"},
    {"title": "local and global (invented)", "metric": "mean", "significance": {"sigma": "3.9", "global_sigma": "2.3"}},
    {"title": "threshold (invented)", "metric": "mean", "estimate": "1.0", "stat_error": "0.2", "threshold": "0.5"},
]


@pytest.fixture(scope="module")
def frame():
    return run_batch(CLAIMS).frame


def test_kinds(frame):
    assert list(frame["kind"]) == ["comparison", "comparison", "counts", "runs", "significances", "threshold"]


def test_unpaired_difference_equals_statsmodels_wald(frame):
    # statsmodels test_proportions_2indep, method "wald" (unpooled errors in quadrature), 913/1000
    # against 890/1000
    from statsmodels.stats.proportion import test_proportions_2indep
    ref = test_proportions_2indep(913, 1000, 890, 1000, method="wald", compare="diff", alternative="larger")
    row = frame.iloc[0]
    assert row["difference_recomputed"] == pytest.approx(0.023, rel=1e-12)
    assert row["sigma_difference"] == pytest.approx(ref.statistic, rel=1e-9)
    assert row["difference_error_recomputed"] == pytest.approx(0.023 / ref.statistic, rel=1e-9)
    assert 10 ** row["log10_p_difference"] == pytest.approx(ref.pvalue, rel=1e-9)


def test_paired_difference_equals_statsmodels_mcnemar(frame):
    # statsmodels mcnemar (chi-square, no continuity correction) on the discordant cells 58 and 30:
    # chi2 = 28^2 / 88 = 8.909, McNemar's z its root, 2.985
    from statsmodels.stats.contingency_tables import mcnemar
    ref = mcnemar(np.array([[0, 58], [30, 0]]), exact=False, correction=False)
    assert f"{ref.statistic:.3f}" == "8.909"
    row = frame.iloc[1]
    assert row["sigma_difference"] == pytest.approx(math.sqrt(ref.statistic), rel=1e-12)
    assert row["difference_recomputed"] == pytest.approx(28 / 1200, rel=1e-12)


def test_counts_significance_is_the_exact_poisson_tail(frame):
    # scipy.stats.poisson.sf(11, 4.1) = P(N >= 12 | 4.1), as a one-sided normal sigma
    p = stats.poisson.sf(11, 4.1)
    row = frame.iloc[2]
    assert row["p_recomputed"] == pytest.approx(p, rel=1e-9)
    assert row["sigma_recomputed"] == pytest.approx(stats.norm.isf(p), rel=1e-9)


def test_runs_significance_is_the_t_test(frame):
    # scipy.stats.t.sf(1.3 / (1.2 / sqrt 5), 4) = 0.0363, one-sided; sigma its normal equivalent
    p = stats.t.sf(1.3 / (1.2 / math.sqrt(5)), 4)
    row = frame.iloc[3]
    assert row["p_recomputed"] == pytest.approx(p, rel=1e-9)
    assert row["sigma_recomputed"] == pytest.approx(stats.norm.isf(p), rel=1e-9)


def test_implied_trials(frame):
    # log1p(-norm.sf(2.3)) / log1p(-norm.sf(3.9)) = 224.2 (scipy.stats.norm.sf)
    ref = math.log1p(-stats.norm.sf(2.3)) / math.log1p(-stats.norm.sf(3.9))
    assert frame.iloc[4]["implied_trials"] == pytest.approx(ref, rel=1e-9)
    assert frame["implied_trials"].isna().sum() == len(CLAIMS) - 1
    assert frame.iloc[5][["difference_recomputed", "sigma_difference"]].isna().all()
