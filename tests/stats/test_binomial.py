"""The heavy-output criterion and the binomial variance."""

from __future__ import annotations

import math
from decimal import Decimal

import pytest
from scipy.optimize import brentq
from scipy.special import ndtr

from checker.stats.binomial import (HEAVY_OUTPUT_IDEAL, HEAVY_OUTPUT_THRESHOLD, binomial_variance,
                                    heavy_output_minimum_mean)


def same_digits(value: float, printed: str) -> bool:
    """``value`` rounded to the printed number of significant figures equals ``printed``."""
    digits = len(Decimal(printed).as_tuple().digits)
    return Decimal(f"{value:.{digits - 1}e}") == Decimal(printed)


# Cross et al., "Validating quantum computers using randomized model circuits", Phys. Rev. A
# 100, 032328 (2019), arXiv:1811.12926: the smallest mean heavy-output probability that passes
# h - 2 sigma > 2/3, sigma = sqrt(h (1 - h) / n_circuits) (table as quoted in REFERENCES.md).
MINIMUM_MEAN = [(100, "0.75293"), (200, "0.72949"), (500, "0.70736"), (1000, "0.69576")]


@pytest.mark.parametrize("circuits, printed", MINIMUM_MEAN)
def test_minimum_passing_mean_matches_the_published_table(circuits, printed):
    h = heavy_output_minimum_mean(circuits)
    assert same_digits(h, printed)
    # And it sits exactly on the criterion's edge (solved independently with brentq).
    edge = brentq(lambda x: x - 2 * math.sqrt(x * (1 - x) / circuits) - 2 / 3, 2 / 3, 1.0, xtol=1e-15)
    assert h == pytest.approx(edge, abs=1e-12)


def test_ideal_heavy_output_probability():
    # Cross et al. (2019): the ideal Porter-Thomas value (1 + ln 2)/2 = 0.846574.
    assert same_digits(HEAVY_OUTPUT_IDEAL, "0.846574")
    assert HEAVY_OUTPUT_THRESHOLD == 2 / 3


def test_two_sigma_is_the_published_confidence():
    # Cross et al. (2019): the 2-sigma criterion is a one-sided confidence of 0.97725.
    assert same_digits(float(ndtr(2.0)), "0.97725")


def test_more_circuits_lower_the_bar_toward_two_thirds():
    bars = [heavy_output_minimum_mean(n) for n in (100, 1000, 10**4, 10**6)]
    assert bars == sorted(bars, reverse=True)
    assert bars[-1] == pytest.approx(2 / 3, abs=1e-3)


def test_other_z_and_threshold():
    # z = 0: the bar is the threshold itself.
    assert heavy_output_minimum_mean(100, z=0.0) == pytest.approx(2 / 3, abs=1e-15)
    assert heavy_output_minimum_mean(50, z=3.0, threshold=0.5) == pytest.approx(
        brentq(lambda x: x - 3 * math.sqrt(x * (1 - x) / 50) - 0.5, 0.5, 1.0, xtol=1e-15), abs=1e-12)


@pytest.mark.parametrize("p, expected", [(0.0, 0.0), (0.5, 0.25), (1.0, 0.0), (0.9, 0.09),
                                         (-0.1, 0.0), (1.2, 0.0)])
def test_binomial_variance_is_clipped_to_the_unit_interval(p, expected):
    assert binomial_variance(p) == pytest.approx(expected, abs=1e-15)
