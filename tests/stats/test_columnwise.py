"""Whole-column sigma from log p against published tail areas."""

import math

import numpy as np
import pytest

from checker.stats.columnwise import sigma_from_log_p
from checker.stats.tails import log_p_from_sigma


def test_forty_sigma_round_trips_in_log_space():
    # DESIGN.md: 40 sigma and p = 1e-300 round-trip through log_ndtr / ndtri_exp.
    assert sigma_from_log_p([log_p_from_sigma(40.0, "one")], [False])[0] == pytest.approx(40.0, rel=1e-12)
    assert sigma_from_log_p([math.log(1e-300)], [False])[0] == pytest.approx(37.0471, rel=1e-5)
    assert sigma_from_log_p([-math.inf, math.nan], [False, True]).tolist()[0] == math.inf


def test_two_sided_inverse():
    # PDG "Statistics": two-sided alpha 0.05 -> 1.96, 0.01 -> 2.58.
    got = sigma_from_log_p(np.log([0.05, 0.01, 1.0]), [True, True, True])
    np.testing.assert_allclose(got, [1.96, 2.58, 0.0], atol=0.005)
