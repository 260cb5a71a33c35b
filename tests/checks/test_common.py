"""Helpers the checks share: how numbers and p-values are written in findings,
and the log interval of a printed p-value."""

from __future__ import annotations

import math

import pytest

from checker.checks.common import (convention_text, finite_or_none, is_probability, log_bounds, num, num_range,
                                   p_range_text, p_text)
from checker.claim.model import Reported
from checker.stats.precision import parse_printed


def reported(text: str) -> Reported:
    p = parse_printed(text)
    return Reported(p.value, p.low, p.high, text, "significance.p_value", None, p.log_low, p.log_high)


@pytest.mark.parametrize("x, digits, text", [
    (2.2139141, 3, "2.21"), (0.000400, 2, "0.0004"), (1.3e-5, 2, "1.3e-5"), (123456.0, 3, "1.23e5"),
    (0.0, 3, "0"), (None, 3, "n/a"), (math.inf, 3, "n/a"), (math.nan, 3, "n/a"), (-4.03, 3, "-4.03"),
])
def test_num(x, digits, text):
    assert num(x, digits) == text


def test_num_range():
    assert num_range((4.25, 7.09)) == "4.25 to 7.09"
    assert num_range((2.23606, 2.23608)) == "2.24"


@pytest.mark.parametrize("log10_p, text", [
    (-349.437, "3.7e-350"), (-8688.5898, "2.6e-8689"), (-349.0001, "1.0e-349"),  # 9.998e-350 rounds up
    (-2.0, "0.01"), (-800 / math.log(10), "3.7e-348"),
])
def test_p_text_below_the_double_range(log10_p, text):
    assert p_text(log10_p * math.log(10)) == text


def test_p_range_text():
    assert p_range_text((math.log(0.0004), math.log(0.00061))) == "0.0004 to 0.00061"
    assert p_range_text((math.log(0.013), math.log(0.013))) == "0.013"


def test_log_bounds_of_printed_p_values():
    assert log_bounds(reported("2.9e-7")) == pytest.approx((math.log(2.85e-7), math.log(2.95e-7)))
    low, high = log_bounds(reported("3.7e-350"))
    assert high == pytest.approx(math.log(3.75) - 350 * math.log(10), rel=1e-14)
    assert log_bounds(reported("1")) == (pytest.approx(math.log(0.5)), 0.0)  # capped at p = 1
    bound = Reported(0.001, 0.0, 0.001, "< 0.001", "p", None, -math.inf, math.log(0.001))
    assert log_bounds(bound) == (-math.inf, pytest.approx(math.log(0.001)))


# A printed "0" reaches up to 0.5, so it may stand for a small positive p (bounds asks for a "<").
@pytest.mark.parametrize("text, ok", [("0.05", True), ("1", True), ("1e-400", True), ("1.5", False),
                                      ("0", True), ("-0.1", False), ("-0.0", True)])
def test_is_probability(text, ok):
    assert is_probability(reported(text)) is ok


def test_convention_text():
    assert convention_text({"sided": "two"}) == "two-sided"
    assert convention_text({"systematics": "quadrature", "error_at": "threshold"}) == \
        "systematic error added in quadrature, error taken at the threshold"
    assert convention_text({"method": "none"}) == "no correction"


def test_finite_or_none():
    assert finite_or_none(math.inf) is None and finite_or_none(None) is None and finite_or_none(2) == 2.0
