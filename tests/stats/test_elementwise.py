"""checker.stats.elementwise: each array form equals the loop of the scalar form
over the elements bit for bit (compared by repr, so NaN, -0.0 and infinities
count), and the scalar form is Python's own expression."""

import math

import numpy as np
import pytest

from checker.stats.elementwise import at_least_zero, clip_unit, is_array, python_square

# Values on and around every edge the choices have: NaN, both zeros, 1, the infinities,
# subnormals, and random doubles of every magnitude (seeded).
EDGES = [math.nan, -0.0, 0.0, 1.0, -1.0, 0.5, 1.0 + 2.0 ** -52, -(2.0 ** -1074), 2.0 ** -1074, math.inf,
         -math.inf, 1e308, -1e308, 1e-200]
RANDOM = np.random.default_rng(5).standard_normal(2000) * 10.0 ** np.random.default_rng(6).integers(-160, 160, 2000)
VALUES = np.array(EDGES + RANDOM.tolist())


@pytest.mark.parametrize("function, scalar", [
    (at_least_zero, lambda x: max(0.0, x)),
    (clip_unit, lambda x: min(max(x, 0.0), 1.0)),
    # Python's float power raises OverflowError past 1e154 squared; the formulas square 1 - F, F in [0, 1].
    (python_square, lambda x: x ** 2),
])
def test_the_array_form_is_the_scalar_loop_exactly(function, scalar):
    values = VALUES[~(np.abs(VALUES) > 1e150)] if function is python_square else VALUES
    got = function(values)
    assert isinstance(got, np.ndarray) and got.shape == values.shape
    loop = [function(v) for v in values.tolist()]
    assert [repr(float(v)) for v in got] == [repr(v) for v in loop]
    assert [repr(v) for v in loop] == [repr(scalar(v)) for v in values.tolist()]


def test_nan_and_negative_zero_pick_what_python_picks():
    # max(0.0, nan) is 0.0 (nan > 0.0 is False); max(nan, 0.0) would be nan: the order matters.
    assert repr(at_least_zero(np.array([math.nan, -0.0]))) == repr(np.array([0.0, 0.0]))
    assert repr(clip_unit(np.array([math.nan, -0.0, -3.0, 7.0]))) == repr(np.array([math.nan, -0.0, 0.0, 1.0]))


def test_scalars_stay_python_numbers():
    assert type(at_least_zero(0.25)) is float and at_least_zero(-2.0) == 0.0
    assert type(clip_unit(1.5)) is float and clip_unit(1.5) == 1.0
    assert type(python_square(3.0)) is float and python_square(3.0) == 9.0
    assert not is_array(2.0) and not is_array(np.float64(2.0)) and is_array(np.zeros(3))


def test_a_two_dimensional_array_keeps_its_shape():
    x = RANDOM[:12].clip(-1e100, 1e100).reshape(3, 4)
    assert python_square(x).shape == (3, 4)
    assert repr(python_square(x).ravel().tolist()) == repr([v ** 2 for v in x.ravel().tolist()])
