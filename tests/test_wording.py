"""checker/wording.py: how numbers are written in findings and reports (one
formatter: plain numbers, ranges, p-values, numbers like the print, counts)."""

from __future__ import annotations

import math

import pytest

from checker.claim.model import Reported
from checker.wording import (like, like_range, num, num_range, p_cell, p_equals, p_range_text, p_text, plural,
                             significant_figures, span_text)


@pytest.mark.parametrize("x, digits, text", [
    (2.2139141, 3, "2.21"), (0.000400, 2, "0.0004"), (1.3e-5, 2, "1.3e-5"), (123456.5, 3, "1.23e5"), (123456.0, 3, "123456"), (1200.0, 3, "1200"), (2.5e7, 3, "2.5e7"),
    (0.0, 3, "0"), (None, 3, "n/a"), (math.inf, 3, "n/a"), (math.nan, 3, "n/a"), (-4.03, 3, "-4.03"),
])
def test_num(x, digits, text):
    assert num(x, digits) == text


def test_num_range():
    assert span_text((4.25, 7.09)) == "4.25 to 7.09"
    assert span_text((2.23606, 2.23608)) == "2.24"


@pytest.mark.parametrize("log10_p, text", [
    (-349.437, "3.7e-350"), (-8688.5898, "2.6e-8689"), (-349.0001, "1.0e-349"),  # 9.998e-350 rounds up
    (-2.0, "0.01"), (-800 / math.log(10), "3.7e-348"),
])
def test_p_text_below_the_double_range(log10_p, text):
    assert p_text(log10_p * math.log(10)) == text


def test_p_range_text():
    assert p_range_text((math.log(0.0004), math.log(0.00061))) == "0.0004 to 0.00061"
    assert p_range_text((math.log(0.013), math.log(0.013))) == "0.013"


def test_num_range_collapses_equal_ends():
    assert num_range(5.741, 6.07) == "5.74 to 6.07"
    assert num_range(5.5512, 5.5549) == "5.55"


@pytest.mark.parametrize("p, cell, sentence", [(0.037, "0.037", "p = 0.037"), (0.0, "< 1e-300", "p < 1e-300"),
                                               (None, "n/a", "p n/a")])
def test_plain_p_values(p, cell, sentence):
    assert p_cell(p) == cell and p_equals(p) == sentence


def test_plural():
    assert plural(1, "row") == "1 row" and plural(12000, "row") == "12,000 rows"
    assert plural(2, "claim checked", "claims checked") == "2 claims checked"


def test_like_takes_text_or_a_printed_value():
    assert like(0.000305, "0.30e-3") == like(0.000305, Reported(0.0, 0.0, 0.0, "0.30e-3")) == "0.305e-3"
    assert like_range(1.9e-4, 2.1e-4, "0.30e-3") == "0.190e-3 to 0.210e-3"
    assert like_range(0.2e-3, 0.2e-3, "0.30e-3") == "0.200e-3"


def rep(text):
    return Reported(0.0, 0.0, 0.0, text)


@pytest.mark.parametrize("x, printed, shown", [
    (0.002271, "2.24e-3", "2.271e-3"),
    (0.000305, "0.30e-3", "0.305e-3"),
    (0.9123, "91.2%", "91.23%"),
    (0.0405, "0.0405", "0.04050"),
    (-0.71412, "-0.7141", "-0.71412"),
    (1234567.0, "1.2e6", "1.23e6"),
    (0.055413, "1.85e-3", "55.41e-3"),
    (5.0, "5", "5.00"),
])
def test_same_notation_one_figure_more(x, printed, shown):
    assert like(x, rep(printed)) == shown


def test_fallbacks():
    assert like(None, rep("1")) == "n/a"
    assert like(float("nan"), rep("1")) == "n/a"
    assert like(0.1234, None) == "0.123"
    assert like(1e-15, rep("0.5")) == "1e-15"
    assert like(0.0123, rep("2"), figures=2) == "0.012"


@pytest.mark.parametrize("text, n", [("0.30e-3", 2), ("2500", 4), ("91.2%", 3), ("< 0.001", 1), ("0", 1)])
def test_significant_figures(text, n):
    assert significant_figures(text) == n
