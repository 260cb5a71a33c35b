"""checker.stats.granularity: the GRIM rule, on Brown and Heathers' examples
and exactly on the edges of printed precision."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from checker.stats.granularity import granularity
from checker.stats.precision import parse_printed


def interval(text):
    p = parse_printed(text)
    return p.low, p.high


def test_grim_examples():
    # Brown and Heathers, "The GRIM test", Social Psychological and Personality Science 8, 363
    # (2017) (volume and pages from memory): a mean of 5.93 from 49 whole-number responses is
    # impossible, 290/49 = 5.918 and 291/49 = 5.939 being the nearest.
    g = granularity(*interval("5.93"), 49)
    assert not g.possible and (g.below, g.above) == (290, 291)
    # Same source: 20 die rolls cannot average 3.48, can average 3.45 (69/20).
    assert not granularity(*interval("3.48"), 20).possible
    g = granularity(*interval("3.45"), 20)
    assert g.possible and g.counts == (69,)


def test_the_rule_bites_only_below_ten_to_the_decimals():
    # Brown and Heathers (2017): with d decimals the test can only fail when N < 10^d.
    assert granularity(*interval("0.57"), 99).can_bite
    assert not granularity(*interval("0.57"), 100).can_bite
    assert granularity(*interval("0.57"), 100).possible


def test_a_count_exactly_on_the_edge_of_the_printed_interval_fits():
    # 1/8 = 0.125 is the edge of both "0.12" [0.115, 0.125] and "0.13" [0.125, 0.135]; one digit
    # further, "0.11" [0.105, 0.115], no k/8 fits (common practice: round half either way).
    assert granularity(*interval("0.12"), 8, 0, 8).counts == (1,)
    assert granularity(*interval("0.13"), 8, 0, 8).counts == (1,)
    g = granularity(*interval("0.11"), 8, 0, 8)
    assert not g.possible and (g.below, g.above) == (0, 1)


def test_float_products_do_not_lose_an_edge_count():
    # 0.345 * 200 is 69.00000000000001 in binary floating point; 69/200 is still found.
    assert granularity(0.345, 0.355, 200, 0, 200).counts == (69, 70, 71)


def test_counts_stay_within_their_range():
    g = granularity(*interval("1.00"), 8, 0, 8)
    assert g.counts == (8,) and g.above is None
    assert granularity(-0.5, -0.4, 10).counts == (-5, -4)


def test_bad_units_are_refused():
    with pytest.raises(ValueError):
        granularity(0.1, 0.2, 0)
    with pytest.raises(ValueError):
        granularity(0.3, 0.2, 10)


@settings(max_examples=200, deadline=None)
@given(st.integers(1, 5000), st.integers(0, 5000), st.integers(1, 4))
def test_a_rounded_true_proportion_is_always_possible(n, k, decimals):
    k = min(k, n)
    text = f"{k / n:.{decimals}f}"
    g = granularity(*interval(text), n, 0, n, keep=n + 1)
    assert g.possible and k in g.counts


@pytest.mark.parametrize("low, high, units", [
    # Where the double's spacing exceeds one step, and where units x bounds leave the double range.
    (1e20 - 5e18, 1e20 + 5e18, 10**9), (0.45, 0.55, 10**160), (0.5, 0.5, 10**320), (-1e300, -0.9e300, 7),
    (1.0e300, 1.0e300, 10**9),
])
def test_huge_values_and_counts_are_exact_and_quick(low, high, units):
    from fractions import Fraction

    g = granularity(low, high, units)
    assert g.possible
    for k in g.counts:
        assert low <= k / units <= high
    # The neighbours lie outside the interval exactly (as doubles, k/units may round onto its
    # edge when the double's spacing is wider than one step).
    assert Fraction(g.below, units) < Fraction(low) and Fraction(g.above, units) > Fraction(high)


def test_a_count_exactly_representable_beyond_two_to_the_53():
    # 2**60 + 1 items, one of them a success: 1/(2**60 + 1) prints as 8.67e-19.
    units = 2**60 + 1
    g = granularity(*interval("8.67e-19"), units, 0, units)
    assert g.possible and g.counts[0] == 1


# The quick paths in doubles against the exact fractions they stand in for
# (exact_round_plain, step_wider_plain): every printed bound of a grid of printed
# numbers times every denominator up to 3,000, products next to whole numbers
# (k / units and its neighbouring doubles), huge and subnormal sizes.
def _bounds_grid():
    from checker.stats.precision import parse_printed

    texts = [f"{v:.{d}f}" for d in (1, 2, 3, 4) for v in (0.005, 0.0345, 0.1, 0.125, 0.345, 0.5, 0.91, 0.9115)]
    texts += ["91.2%", "2.24e-3", "1e-300", "5e-324", "0", "1", "0.999999999"]
    out = []
    for t in texts:
        p = parse_printed(t)
        out += [p.low, p.high, p.value]
    return out


def test_quick_rounding_equals_the_exact_fractions_on_a_grid():
    import math

    from checker.stats.granularity import exact_round, exact_round_plain, step_wider, step_wider_plain

    bounds = _bounds_grid()
    for units in list(range(1, 400)) + [1000, 1250, 2999, 10 ** 6, 10 ** 15, 2 ** 53 + 1, 10 ** 300]:
        for b in bounds:
            for up in (True, False):
                assert exact_round(b, units, up) == exact_round_plain(b, units, up), (b, units, up)
        for k in (1, 3, 7, units // 3, units - 1):
            edge = k / units
            for b in (edge, math.nextafter(edge, 0), math.nextafter(edge, 1), -edge):
                for up in (True, False):
                    assert exact_round(b, units, up) == exact_round_plain(b, units, up), (b, units, up)
        for i, low in enumerate(bounds):
            for high in bounds[i:i + 6] + [low, low + 1.0 / units, math.nextafter(low + 1.0 / units, 2)]:
                if high >= low:
                    assert step_wider(low, high, units) == step_wider_plain(low, high, units), (low, high, units)


@settings(max_examples=300, deadline=None)
@given(st.floats(-1e6, 1e6, allow_nan=False), st.integers(1, 10 ** 18), st.booleans())
def test_quick_rounding_equals_the_exact_fractions(bound, units, up):
    from checker.stats.granularity import exact_round, exact_round_plain

    assert exact_round(bound, units, up) == exact_round_plain(bound, units, up)
