"""Printed precision: a printed number is the interval its digits stand for,
and agreement is tested exactly on that interval's edges."""

from __future__ import annotations

import math
from decimal import Decimal

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from checker.stats.precision import (agrees, agrees_log, count_is_exact, gap, is_number_text, over_box,
                                     parse_printed, relative_gap)

# The printed-interval rule is DESIGN.md's ("2.24e-3" means [2.235e-3, 2.245e-3]);
# half a unit in the last printed digit is common practice.
INTERVALS = [
    ("2.24e-3", 2.24e-3, 2.235e-3, 2.245e-3),
    ("4.2", 4.2, 4.15, 4.25),
    ("2e-10", 2e-10, 1.5e-10, 2.5e-10),
    ("91.2%", 0.912, 0.9115, 0.9125),
    ("2.50", 2.5, 2.495, 2.505),  # a trailing zero is a printed digit
    ("-4.2", -4.2, -4.25, -4.15),
    ("3e6", 3e6, 2.5e6, 3.5e6),
    ("2.5e7", 2.5e7, 2.45e7, 2.55e7),
    (".5", 0.5, 0.45, 0.55),
    ("1E-3", 1e-3, 0.5e-3, 1.5e-3),
    ("+0.020", 0.02, 0.0195, 0.0205),
    ("100%", 1.0, 0.995, 1.005),
]


@pytest.mark.parametrize("text, value, low, high", INTERVALS)
def test_printed_interval(text, value, low, high):
    printed = parse_printed(text)
    assert printed.value == value
    # The edges are computed in decimal, so they are the nearest doubles exactly.
    assert (printed.low, printed.high) == (low, high)
    assert printed.text == text
    assert not printed.exact


def test_log_edges_survive_below_the_double_range():
    printed = parse_printed("3e-400")
    assert printed.value == 0.0 and printed.low == 0.0  # the double underflows ...
    # ... but the logs of the edges keep the printed size: ln(2.5e-400), ln(3.5e-400).
    assert printed.log_low == pytest.approx(math.log(2.5) - 400 * math.log(10), rel=1e-15)
    assert printed.log_high == pytest.approx(math.log(3.5) - 400 * math.log(10), rel=1e-15)


def test_log_edges_of_zero_and_negative_numbers():
    zero = parse_printed("0.0")
    assert zero.log_high == pytest.approx(math.log(0.05)) and math.isnan(zero.log_low)
    assert math.isnan(parse_printed("-1").log_high)
    assert parse_printed("0", exact=True).log_low == -math.inf


def test_exact_definitions_have_no_width():
    for text in ("0.5", "3", "2.24e-3", "95%"):
        printed = parse_printed(text, exact=True)
        assert printed.exact and printed.low == printed.high == printed.value
    assert parse_printed("95%", exact=True).value == 0.95


@pytest.mark.parametrize("text, exact", [
    ("25000000", True), ("30", True), ("1", True),
    ("3e6", False), ("2.5e7", False), ("30.0", False), ("1e0", False), ("91%", False),
])
def test_counts_written_with_all_their_digits_are_exact(text, exact):
    assert count_is_exact(text) is exact


@pytest.mark.parametrize("text", [
    "", " ", ".", "%", "e5", "1e", "+", "-", "--1", "1.2.3", "abc", "0x1F", "017", "00.5", "1_000",
    "1:30", "1,000", ".nan", "nan", ".inf", "inf", "Infinity", "1e400", "1%%", "%5", "1 000", "5 %",
])
def test_texts_that_are_not_plain_finite_numbers_are_refused(text):
    with pytest.raises(ValueError):
        parse_printed(text)


@pytest.mark.parametrize("text, ok", [("2.24e-3", True), ("0", True), ("0.0", True), ("5.", True),
                                      ("017", False), ("0x1F", False), ("1:30", False), ("yes", False),
                                      ("", False), ("-.5e-2%", True)])
def test_is_number_text(text, ok):
    assert is_number_text(text) is ok


# --- agreement, exactly on the edges ------------------------------------------

FOUR_TWO = parse_printed("4.2").bounds  # [4.15, 4.25]


def test_a_value_on_the_upper_edge_agrees_and_the_next_double_does_not():
    assert agrees(FOUR_TWO, (4.25, 4.25), 0.0)
    assert not agrees(FOUR_TWO, (math.nextafter(4.25, math.inf),) * 2, 0.0)


def test_a_value_on_the_lower_edge_agrees_and_the_next_double_does_not():
    assert agrees(FOUR_TWO, (4.15, 4.15), 0.0)
    assert not agrees(FOUR_TWO, (math.nextafter(4.15, -math.inf),) * 2, 0.0)


def test_one_digit_beyond_the_printed_interval_does_not_agree():
    # "4.2" against a recomputed 4.26 (one unit further in the next digit), no tolerance.
    assert not agrees(FOUR_TWO, (4.26, 4.26), 0.0)
    assert not agrees(FOUR_TWO, (4.14, 4.14), 0.0)


def test_design_examples_with_the_default_tolerance():
    # DESIGN.md: flagging "4.2" against a recomputed 4.25 is wrong; so is accepting it against 4.6.
    assert agrees(FOUR_TWO, (4.25, 4.25), 0.02)
    assert not agrees(FOUR_TWO, (4.6, 4.6), 0.02)


def test_tolerance_widens_by_a_fraction_of_the_printed_magnitude():
    # Binary-exact numbers so that the edge is exact: "2" is [1.5, 2.5]; the slack is 0.25 times the
    # printed value 2 (README, "Printed precision"), 0.5, not 0.25 x 2.5 (the interval's upper end).
    two = parse_printed("2").bounds
    assert agrees(two, (3.0, 4.0), 0.25)
    assert not agrees(two, (math.nextafter(3.0, math.inf), 4.0), 0.25)
    assert agrees(two, (-1.0, 1.0), 0.25)
    assert not agrees(two, (-1.0, math.nextafter(1.0, -math.inf)), 0.25)


def test_log_agreement_on_the_edge():
    printed = (math.log(2.85e-7), math.log(2.95e-7))
    assert agrees_log(printed, (printed[1], printed[1] + 1.0), 0.0)
    assert not agrees_log(printed, (math.nextafter(printed[1], math.inf), 0.0), 0.0)


@pytest.mark.parametrize("log_p", [math.log(2.87e-7), -800.0, -1e5])
def test_a_factor_of_two_in_p_never_agrees(log_p):
    # DESIGN.md: compare p-values as p-values; a factor of 2 is a sidedness slip at any sigma.
    printed = (log_p - 0.005, log_p + 0.005)  # about three printed digits
    assert agrees_log(printed, (log_p, log_p), 0.02)
    assert not agrees_log(printed, (log_p + math.log(2),) * 2, 0.02)


def test_log_tolerance_is_relative_in_p():
    printed = (-3.0, -2.0)
    # 2% in p, not 2% of log p: p 1.99% above the printed edge agrees, 2.01% does not.
    assert agrees_log(printed, (-2.0 + math.log1p(0.0199),) * 2, 0.02)
    assert not agrees_log(printed, (-2.0 + math.log1p(0.0201),) * 2, 0.02)


def test_gap_and_relative_gap():
    assert gap((1.0, 2.0), (1.5, 3.0)) == 0.0
    assert gap((1.0, 2.0), (3.0, 4.0)) == 1.0
    assert gap((3.0, 4.0), (1.0, 2.0)) == 1.0
    # Relative to the printed value, the interval's midpoint 1.5.
    assert relative_gap((1.0, 2.0), (3.0, 4.0)) == pytest.approx(1 / 1.5)
    assert relative_gap((0.0, 0.0), (1.0, 1.0)) == math.inf


def test_over_box_takes_the_corners():
    assert over_box(lambda a, b: a / b, [(1.0, 2.0), (4.0, 8.0)]) == (0.125, 0.5)
    assert over_box(lambda a: a, [(3.0, 3.0)]) == (3.0, 3.0)


def test_over_box_skips_non_finite_corners_and_reports_none_left():
    assert over_box(lambda a: 1.0 / a if a else math.inf, [(0.0, 2.0)]) == (0.5, 0.5)
    assert over_box(lambda a: None if a == 0 else a, [(0.0, 2.0)]) == (2.0, 2.0)
    low, high = over_box(lambda a: math.nan, [(0.0, 1.0)])
    assert math.isnan(low) and math.isnan(high)


# --- properties -------------------------------------------------------------------

@settings(max_examples=200, deadline=None)
@given(x=st.floats(min_value=1e-300, max_value=1e300), figures=st.integers(1, 12),
       sign=st.sampled_from([1.0, -1.0]))
def test_a_rounded_value_lies_inside_its_printed_interval(x, figures, sign):
    x *= sign
    text = f"{x:.{figures - 1}e}"
    printed = parse_printed(text)
    assert printed.low <= x <= printed.high
    assert printed.low <= printed.value <= printed.high


@settings(max_examples=200, deadline=None)
@given(mantissa=st.integers(1, 10**9), exponent=st.integers(-290, 290))
def test_the_interval_is_one_unit_of_the_last_digit_wide(mantissa, exponent):
    text = f"{mantissa}e{exponent}"
    printed = parse_printed(text)
    unit = float(Decimal(1).scaleb(exponent))
    assert printed.high - printed.low == pytest.approx(unit, rel=1e-6)
    assert (printed.low + printed.high) / 2 == pytest.approx(printed.value, rel=1e-12)


@settings(max_examples=200, deadline=None)
@given(a=st.floats(-1e6, 1e6), b=st.floats(-1e6, 1e6), c=st.floats(-1e6, 1e6), d=st.floats(-1e6, 1e6),
       t1=st.floats(0, 1), t2=st.floats(0, 1))
def test_agreement_properties(a, b, c, d, t1, t2):
    r, q = (min(a, b), max(a, b)), (min(c, d), max(c, d))
    if max(r[0], q[0]) <= min(r[1], q[1]):  # overlapping intervals always agree
        assert agrees(r, q, 0.0)
    lo, hi = sorted((t1, t2))
    if agrees(r, q, lo):  # more tolerance never turns agreement into disagreement
        assert agrees(r, q, hi)


@settings(max_examples=200, deadline=None)
@given(a=st.floats(-1e4, 0), w=st.floats(0, 1), b=st.floats(-1e4, 0), v=st.floats(0, 1),
       shift=st.floats(-100, 100))
def test_log_agreement_is_unchanged_by_scaling_both_p_values(a, w, b, v, shift):
    r, q = (a, a + w), (b, b + v)
    shifted = agrees_log((a + shift, a + w + shift), (b + shift, b + v + shift), 0.02)
    exact_gap = gap(r, q) - math.log1p(0.02)
    if abs(exact_gap) > 1e-9:  # away from the edge, where rounding of the shift could tip it
        assert shifted == agrees_log(r, q, 0.02)
