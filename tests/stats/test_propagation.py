"""checker.stats.propagation: first-order worst-case propagation against the
corner evaluation of precision.over_box."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from checker.stats.precision import over_box
from checker.stats.propagation import ranges_one_at_a_time


def test_linear_functions_are_exact():
    # A weighted sum is linear, so moving one input at a time and adding the deviations gives the
    # same range as evaluating every corner (common practice: interval arithmetic).
    bounds = [(0.95, 1.05), (1.95, 2.05), (-0.5, 0.5)]
    centre = [1.0, 2.0, 0.0]
    fn = lambda x, y, z: 0.2 * x + 0.5 * y - 0.3 * z  # noqa: E731
    (got,) = ranges_one_at_a_time(lambda v: [fn(*v)], centre, bounds)
    assert got == pytest.approx(over_box(fn, bounds), rel=1e-12)


def test_smooth_functions_agree_with_the_corners_to_second_order():
    # x y / z over half-widths of 0.1%: the neglected terms are of order (0.001)^2.
    bounds = [(2.998, 3.002), (0.4995, 0.5005), (1.4985, 1.5015)]
    centre = [3.0, 0.5, 1.5]
    fn = lambda x, y, z: x * y / z  # noqa: E731
    (got,) = ranges_one_at_a_time(lambda v: [fn(*v)], centre, bounds)
    ref = over_box(fn, bounds)
    width = ref[1] - ref[0]
    assert got[0] == pytest.approx(ref[0], abs=1e-2 * width)
    assert got[1] == pytest.approx(ref[1], abs=1e-2 * width)


def test_outputs_that_cannot_be_computed():
    assert ranges_one_at_a_time(lambda v: None, [1.0], [(0.5, 1.5)]) is None
    got = ranges_one_at_a_time(lambda v: [math.nan, v[0]], [1.0], [(0.5, 1.5)])
    assert math.isnan(got[0][0]) and got[1] == (0.5, 1.5)
    # A point where the function fails contributes nothing.
    got = ranges_one_at_a_time(lambda v: [None if v[0] > 1 else v[0]], [1.0], [(0.5, 1.5)])
    assert got[0] == (0.5, 1.0)
    with pytest.raises(ValueError):
        ranges_one_at_a_time(lambda v: [v[0]], [1.0, 2.0], [(0.5, 1.5)])


@settings(max_examples=100, deadline=None)
@given(st.lists(st.tuples(st.floats(-100, 100), st.floats(0, 1)), min_size=1, max_size=6))
def test_the_range_holds_the_centre_value(items):
    centre = [c for c, _ in items]
    bounds = [(c - h, c + h) for c, h in items]
    (got,) = ranges_one_at_a_time(lambda v: [sum(x * x for x in v)], centre, bounds)
    value = sum(x * x for x in centre)
    assert got[0] <= value <= got[1]
