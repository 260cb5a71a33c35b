"""A mean over a few runs: the t test against scipy, and the issue's
worked numbers."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from checker.stats.runs import error_readings, mean_test


def test_t_test_equals_scipy_ttest_1samp():
    runs = np.array([72.1, 70.4, 71.9, 70.8, 71.3])
    ref = stats.ttest_1samp(runs, 70.0, alternative="greater")
    got = mean_test(runs.mean(), runs.std(ddof=1) / math.sqrt(5), 70.0, 5)
    assert got.statistic == pytest.approx(ref.statistic, rel=1e-12)
    assert math.exp(got.log_p) == pytest.approx(ref.pvalue, rel=1e-10)
    assert got.df == 4


def test_five_seeds_example():
    # 71.3 with sd 1.2 over 5 seeds above 70.0: t = 2.42 on 4 dof, p = 0.036 one-sided;
    # the normal tail of the same ratio is 0.0077 (scipy.stats.t.sf / norm.sf)
    t = mean_test(71.3, 1.2 / math.sqrt(5), 70.0, 5)
    z = mean_test(71.3, 1.2 / math.sqrt(5), 70.0, 5, "normal")
    assert f"{math.exp(t.log_p):.3f}" == "0.036" and f"{math.exp(z.log_p):.4f}" == "0.0077"
    assert t.sigma == pytest.approx(stats.norm.isf(stats.t.sf(2.4224, 4)), rel=1e-4)


def test_many_runs_t_and_normal_agree():
    t = mean_test(0.874, 0.0026, 0.86, 400)
    z = mean_test(0.874, 0.0026, 0.86, 400, "normal")
    assert t.sigma == pytest.approx(z.sigma, rel=0.05)


def test_readings():
    got = error_readings(1.2, 4)
    assert got == {"error of the mean": 0.6, "sd": 1.2, "sd times root n": 2.4}


def test_one_run_is_refused():
    with pytest.raises(ValueError):
        mean_test(1.0, 0.1, 0.0, 1)
