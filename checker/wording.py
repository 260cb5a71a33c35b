"""How numbers are written in findings and reports: one place, so that the
terminal, the JSON messages, the Markdown and the figures agree digit for digit.
A leaf module: it imports nothing of ours."""

from __future__ import annotations

import math
import re


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


_MANTISSA = re.compile(r"^[+-]?(?P<int>[0-9]*)(?:\.(?P<dec>[0-9]*))?(?:[eE](?P<exp>[+-]?[0-9]+))?$")
MAX_DECIMALS = 9


def significant_figures(text: str) -> int:
    """Significant figures of a printed number ("0.30e-3" -> 2, "2500" -> 4)."""
    body = text.strip().lstrip("<").strip().rstrip("%").lower().split("e")[0]
    digits = body.lstrip("+-").replace(".", "").lstrip("0")
    return max(1, len(digits))


def like(x: float | None, printed: str | None, figures: int | None = None) -> str:
    """``x`` written the way ``printed`` was: the same notation (exponent,
    percent) and one significant figure more (at least three), or ``figures``
    of them, so that "printed 0.30e-3, recomputed 0.305e-3" reads at a glance.
    Without a printed text, :func:`num` with three figures."""
    if x is None or isinstance(x, bool) or not isinstance(x, (int, float)) or not math.isfinite(x):
        return "n/a"
    if printed is None:
        return num(x, 3)
    text = printed.strip().lstrip("<").strip()
    percent = text.endswith("%")
    m = _MANTISSA.match(text[:-1] if percent else text)
    if not m:
        return num(x, 3)
    figures = figures or max(3, significant_figures(text) + 1)
    exp = int(m.group("exp")) if m.group("exp") is not None else None
    if exp is not None and abs(exp) > 300:
        return num(x, figures)  # 10**exp itself leaves the double range
    shown = x * 100 if percent else (x / 10.0 ** exp if exp is not None else x)
    if not math.isfinite(shown):
        return num(x, figures)
    if shown == 0:
        decimals = len(m.group("dec") or "")
    else:
        decimals = max(0, figures - 1 - math.floor(math.log10(abs(shown))))
    if decimals > MAX_DECIMALS or abs(shown) >= 1e7:
        return num(x, figures)
    out = f"{shown:.{decimals}f}"
    if percent:
        return out + "%"
    return f"{out}e{exp}" if exp is not None else out


def like_range(low: float | None, high: float | None, printed: str | None) -> str:
    """``a to b`` in the notation of ``printed``, one number when both ends print the same."""
    a, b = like(low, printed), like(high, printed)
    return a if a == b else f"{a} to {b}"
