"""Helpers the checks share: the log interval of a printed p-value (how
numbers are written is tests/test_wording.py's)."""

from __future__ import annotations

import math

import pytest

from checker.checks.common import finite_or_none, is_probability, log_bounds
from checker.claim.model import Reported
from checker.stats.precision import parse_printed


def reported(text: str) -> Reported:
    p = parse_printed(text)
    return Reported(p.value, p.low, p.high, text, "significance.p_value", None, p.log_low, p.log_high)


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


def test_finite_or_none():
    assert finite_or_none(math.inf) is None and finite_or_none(None) is None and finite_or_none(2) == 2.0
