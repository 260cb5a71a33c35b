"""Whole-column significance against published tail areas and the scalar tails."""

import math

import numpy as np
import pytest

from checker.stats.columnwise import error_from_interval, sigma_from_log_p, significance_columns
from checker.stats.tails import log_p_from_sigma


def test_tail_areas_match_the_pdg_table():
    # Particle Data Group, Review of Particle Physics, "Statistics", table of two-sided Gaussian
    # tail areas (from memory): 3 sigma 2.7e-3, 5 sigma 5.7e-7; one-sided 5 sigma 2.87e-7.
    cols = significance_columns([3.0, 5.0, 5.0, 3.0], [0, 0, 0, 0], [1, 1, 1, 1], [0, 0, 0, 0],
                                [True, True, False, False])
    assert cols.p[0] == pytest.approx(2.7e-3, rel=0.01)
    assert cols.p[1] == pytest.approx(5.7e-7, rel=0.01)
    assert cols.p[2] == pytest.approx(2.87e-7, rel=0.002)
    assert cols.p[3] == pytest.approx(2.7e-3 / 2, rel=0.01)
    np.testing.assert_allclose(cols.sigma, [3, 5, 5, 3])


def test_quadrature_and_sidedness_agree_with_the_scalar_tails():
    # The scalar functions in checker.stats.tails, one claim at a time, as the reference.
    est = np.array([1.85e-3, 0.081, 0.40, 0.62])
    thr = np.array([1.0e-3, 0.03, 0.5, 0.5])
    stat = np.array([0.20e-3, 0.012, 0.02, 0.005])
    syst = np.array([0.0, 0.008, 0.0, 0.0])
    two = np.array([False, False, True, False])
    cols = significance_columns(est, thr, stat, syst, two)
    for i in range(4):
        z = (est[i] - thr[i]) / math.hypot(stat[i], syst[i])
        sided = "two" if two[i] else "one"
        assert cols.log_p[i] == pytest.approx(log_p_from_sigma(z, sided), rel=1e-12)
        assert cols.sigma[i] == pytest.approx(abs(z) if two[i] else z, rel=1e-12)


def test_missing_or_zero_error_gives_nan():
    cols = significance_columns([1.0, 1.0, 1.0], [0.0, math.nan, 0.0], [math.nan, 1.0, 0.0],
                                [0.0, 0.0, 0.0], [False] * 3)
    assert np.isnan(cols.sigma).all() and np.isnan(cols.p).all()


def test_forty_sigma_round_trips_in_log_space():
    # DESIGN.md: 40 sigma and p = 1e-300 round-trip through log_ndtr / ndtri_exp.
    cols = significance_columns([40.0], [0.0], [1.0], [0.0], [False])
    assert cols.p[0] == 0.0 or cols.p[0] < 1e-300
    assert sigma_from_log_p(cols.log_p, [False])[0] == pytest.approx(40.0, rel=1e-12)
    assert sigma_from_log_p([math.log(1e-300)], [False])[0] == pytest.approx(37.0471, rel=1e-5)
    assert sigma_from_log_p([-math.inf, math.nan], [False, True]).tolist()[0] == math.inf


def test_two_sided_inverse():
    # PDG "Statistics": two-sided alpha 0.05 -> 1.96, 0.01 -> 2.58.
    got = sigma_from_log_p(np.log([0.05, 0.01, 1.0]), [True, True, True])
    np.testing.assert_allclose(got, [1.96, 2.58, 0.0], atol=0.005)


def test_error_from_interval():
    # Half-width / 1.96 at 95% (PDG "Statistics": alpha 0.05 -> 1.96).
    se = error_from_interval([1.5e-3], [2.2e-3], [0.95])
    assert se[0] == pytest.approx(0.35e-3 / 1.959964, rel=1e-6)
