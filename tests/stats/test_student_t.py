"""Student's t tails in log space: scipy where it is exact, the closed forms
for one and two degrees of freedom in the deep tail, round trips at 40 sigma
and p = 1e-300."""

from __future__ import annotations

import math

import pytest
from scipy import stats

from checker.stats.student_t import log_p, log_sf, t_from_log_p


@pytest.mark.parametrize("t, df", [(3.0, 4), (40.0, 399), (-1.5, 7), (0.0, 3), (12.0, 2.5)])
def test_tail_equals_scipy_where_it_is_representable(t, df):
    # scipy.stats.t.logsf
    assert log_sf(t, df) == pytest.approx(stats.t.logsf(t, df), rel=1e-12, abs=1e-15)


@pytest.mark.parametrize("t", [1e3, 1e50, 1e300])
def test_one_degree_of_freedom_is_the_cauchy_tail(t):
    # Student t with 1 dof is the Cauchy distribution: P(T > t) = arctan(1/t) / pi
    # (Abramowitz and Stegun 1964, 26.7.3; from memory)
    assert log_sf(t, 1) == pytest.approx(math.log(math.atan(1 / t) / math.pi), rel=1e-12)


@pytest.mark.parametrize("t", [1e20, 1e100])
def test_two_degrees_of_freedom_closed_form_in_the_deep_tail(t):
    # df = 2: P(T > t) = (1 - t / sqrt(t^2 + 2)) / 2 = 1 / (r (r + t)), r = sqrt(t^2 + 2)
    # (Abramowitz and Stegun 1964, 26.7.3; from memory); 1e100 is p ~ 1e-200
    r = math.sqrt(t * t + 2)
    assert log_sf(t, 2) == pytest.approx(-math.log(r) - math.log(r + t), rel=1e-12)


def test_library_underflows_where_this_does_not():
    assert stats.t.logsf(200, 399) == -math.inf
    assert math.isfinite(log_sf(200, 399))


@pytest.mark.parametrize("df", [1, 4, 30, 399, 1e4, 1e7])
@pytest.mark.parametrize("target", [math.log(1e-300), -2000.0, math.log(0.01)])
def test_log_p_round_trips(df, target):
    t = t_from_log_p(target, df)
    if math.isinf(t):  # df = 1: p = 1e-869 needs t ~ 1e868, beyond a double
        assert df == 1 and target < -700
        return
    assert log_sf(t, df) == pytest.approx(target, rel=1e-8)


def test_forty_sigma_round_trips():
    from checker.stats.tails import log_p_from_sigma
    target = log_p_from_sigma(40.0)  # p ~ 3.7e-350
    for df in (5, 399):
        assert log_sf(t_from_log_p(target, df), df) == pytest.approx(target, rel=1e-10)


def test_large_df_approaches_the_normal():
    from checker.stats.tails import log_p_from_sigma
    # t -> normal as df -> infinity (common practice)
    assert log_sf(3.0, 1e9) == pytest.approx(log_p_from_sigma(3.0), rel=1e-7)


def test_two_sided_doubles_the_tail():
    # scipy.stats.t.sf, doubled
    assert math.exp(log_p(-2.0, 9, "two")) == pytest.approx(2 * stats.t.sf(2.0, 9), rel=1e-12)
