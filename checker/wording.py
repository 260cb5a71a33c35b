"""How numbers are written in findings and reports: one place, so that the
terminal, the JSON messages, the Markdown and the figures agree digit for digit.
A leaf module: it imports nothing of ours."""

from __future__ import annotations

import math


def num(x: float | None, digits: int = 3) -> str:
    """``digits`` significant figures; ``n/a`` for a missing or non-finite value;
    exponents written without padding (``2.4e-9``, not ``2.4e-09``)."""
    if x is None or isinstance(x, bool) or not isinstance(x, (int, float)):
        return "n/a"
    if not math.isfinite(x):
        return "n/a"
    if x == 0:
        return "0"
    text = f"{x:.{digits}g}"
    if "e" in text:
        mantissa, exponent = text.split("e")
        return f"{mantissa}e{int(exponent)}"
    return text


def num_range(low: float | None, high: float | None, digits: int = 3) -> str:
    """``a to b``, or a single number when both ends print the same."""
    a, b = num(low, digits), num(high, digits)
    return a if a == b else f"{a} to {b}"


# Beyond this a count held as a double no longer shows its digits truly.
EXACT_COUNT_DIGITS = 10 ** 15


def count(n: int | float) -> str:
    """A whole count with thousands separators (``14,817,027``); a count too
    large for its digits to mean anything is written like :func:`num`
    (``1e300``, not three hundred digits of floating-point noise)."""
    if isinstance(n, bool) or not isinstance(n, (int, float)) or not math.isfinite(n):
        return "n/a"
    if abs(n) < EXACT_COUNT_DIGITS:
        return f"{int(n):,}"
    return num(float(n), 3)
