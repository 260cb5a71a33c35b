"""checker.checks.printed_like: recomputed numbers written like the print."""

from __future__ import annotations

import pytest

from checker.checks.printed_like import like, significant_figures
from checker.claim.model import Reported


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
