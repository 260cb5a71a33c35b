"""Gaussian tails in log space: published tail areas, and round trips far
beyond the double-precision range of p itself."""

from __future__ import annotations

import math
from decimal import Decimal

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from checker.stats.tails import log10_p, log_p_from_sigma, p_from_log_p, sigma_from_log_p


def same_digits(value: float, printed: str) -> bool:
    """True when ``value`` rounds to ``printed`` at the printed number of
    significant figures (how a table's entry is compared with a computation)."""
    digits = len(Decimal(printed).as_tuple().digits)
    return Decimal(f"{value:.{digits - 1}e}") == Decimal(printed)


def asymptotic_log_tail(z: float) -> float:
    """log of the upper tail area by the asymptotic series of the Mills ratio,
    1 - Phi(z) ~ phi(z)/z (1 - 1/z^2 + 3/z^4 - 15/z^6 + 105/z^8).

    Abramowitz and Stegun, Handbook of Mathematical Functions (1964), eq. 26.2.12.
    Written out here as a reference independent of scipy's log_ndtr; the
    truncation error is below 1e-15 relative for z >= 40.
    """
    series = 1 - 1 / z**2 + 3 / z**4 - 15 / z**6 + 105 / z**8
    return -z * z / 2 - math.log(z * math.sqrt(2 * math.pi)) + math.log(series)


# Particle Data Group, Review of Particle Physics, chapter "Statistics" (G. Cowan),
# table of two-sided Gaussian tail areas (table text from memory, per REFERENCES.md).
PDG_TWO_SIDED = [(1, "0.3173"), (2, "4.55e-2"), (3, "2.7e-3"), (4, "6.3e-5"), (5, "5.7e-7"), (6, "2.0e-9")]

# Same PDG table, the other direction: two-sided tail area alpha -> z.
PDG_ALPHA_TO_Z = [("0.2", "1.28"), ("0.1", "1.64"), ("0.05", "1.96"), ("0.01", "2.58"),
                  ("0.001", "3.29"), ("1e-4", "3.89")]


@pytest.mark.parametrize("z, printed", PDG_TWO_SIDED)
def test_two_sided_tail_areas_match_the_pdg_table(z, printed):
    assert same_digits(math.exp(log_p_from_sigma(z, "two")), printed)


@pytest.mark.parametrize("alpha, printed", PDG_ALPHA_TO_Z)
def test_two_sided_critical_values_match_the_pdg_table(alpha, printed):
    assert same_digits(sigma_from_log_p(math.log(float(alpha)), "two"), printed)


def test_one_sided_five_sigma():
    p = math.exp(log_p_from_sigma(5.0, "one"))
    # PDG, Review of Particle Physics, "Statistics": one-sided 5 sigma is 2.87e-7.
    assert same_digits(p, "2.87e-7")
    # OEIS A239386 (decimal expansion of the one-sided 5-sigma tail): 2.8665157e-7.
    assert same_digits(p, "2.8665157e-7")


def test_the_two_sided_area_is_twice_the_one_sided_area():
    for z in (0.5, 3.0, 12.0, 40.0, 200.0):
        assert log_p_from_sigma(z, "two") == pytest.approx(math.log(2) + log_p_from_sigma(z, "one"), rel=1e-14)
        assert log_p_from_sigma(-z, "two") == log_p_from_sigma(z, "two")


@pytest.mark.parametrize("z", [40.0, 200.0])
@pytest.mark.parametrize("sided", ["one", "two"])
def test_round_trip_far_in_the_tail(z, sided):
    log_p = log_p_from_sigma(z, sided)
    expected = asymptotic_log_tail(z) + (math.log(2) if sided == "two" else 0.0)
    # Abramowitz and Stegun 26.2.12 (see asymptotic_log_tail).
    assert log_p == pytest.approx(expected, rel=1e-13)
    assert sigma_from_log_p(log_p, sided) == pytest.approx(z, rel=1e-12)


def test_p_of_1e_minus_300_round_trips():
    log_p = math.log(1e-300)
    z = sigma_from_log_p(log_p, "one")
    # common practice: 1e-300 is about 37.05 sigma one-sided (asymptotic series above).
    assert asymptotic_log_tail(z) == pytest.approx(log_p, rel=1e-12)
    assert log_p_from_sigma(z, "one") == pytest.approx(log_p, rel=1e-13)
    assert p_from_log_p(log_p_from_sigma(z, "one")) == pytest.approx(1e-300, rel=1e-10)


@pytest.mark.parametrize("sided", ["one", "two"])
def test_log_p_beyond_the_float_range(sided):
    # log p = -1e5 is p = 10^-43429.4..., far below the smallest double.
    z = sigma_from_log_p(-1e5, sided)
    assert 447.0 < z < 447.3
    reference = asymptotic_log_tail(z) + (math.log(2) if sided == "two" else 0.0)
    # ndtri_exp resolves z to about 5e-13 here, so log p comes back to ~1e-12.
    assert reference == pytest.approx(-1e5, rel=1e-11)
    assert log_p_from_sigma(z, sided) == pytest.approx(-1e5, rel=1e-11)
    assert p_from_log_p(-1e5) == 0.0  # the plain p underflows: why log-p is kept
    assert log10_p(-1e5) == pytest.approx(-1e5 / math.log(10), rel=1e-15)


def test_p_of_one_is_zero_sigma_two_sided():
    assert sigma_from_log_p(0.0, "two") == 0.0
    assert log_p_from_sigma(0.0, "two") == 0.0
    assert log_p_from_sigma(0.0, "one") == pytest.approx(math.log(0.5), rel=1e-15)


@pytest.mark.parametrize("bad", ["three", "One", ""])
def test_unknown_sidedness_is_refused(bad):
    with pytest.raises(ValueError):
        log_p_from_sigma(1.0, bad)
    with pytest.raises(ValueError):
        sigma_from_log_p(-1.0, bad)


def test_positive_log_p_is_refused():
    with pytest.raises(ValueError):
        sigma_from_log_p(0.1)


@settings(max_examples=200, deadline=None)
@given(z=st.floats(min_value=-8.0, max_value=1000.0, allow_nan=False), sided=st.sampled_from(["one", "two"]))
def test_sigma_to_log_p_round_trip(z, sided):
    expected = abs(z) if sided == "two" else z
    back = sigma_from_log_p(log_p_from_sigma(z, sided), sided)
    assert math.isclose(back, expected, rel_tol=1e-9, abs_tol=1e-12)


@settings(max_examples=200, deadline=None)
@given(log_p=st.floats(min_value=-1e6, max_value=-1e-12), sided=st.sampled_from(["one", "two"]))
def test_log_p_to_sigma_round_trip(log_p, sided):
    if sided == "two":
        log_p = min(log_p, -1e-6)  # near p = 1 the two-sided z is ~0 and loses relative digits
    back = log_p_from_sigma(sigma_from_log_p(log_p, sided), sided)
    assert math.isclose(back, log_p, rel_tol=1e-9)


@settings(max_examples=200, deadline=None)
@given(a=st.floats(min_value=-8.0, max_value=1000.0), b=st.floats(min_value=-8.0, max_value=1000.0))
def test_a_larger_sigma_is_a_smaller_tail(a, b):
    if a < b:
        assert log_p_from_sigma(a) >= log_p_from_sigma(b)
