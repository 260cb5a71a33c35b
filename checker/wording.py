"""How numbers are written in findings and reports: one place, so that the
terminal, the JSON messages, the Markdown and the figures agree digit for digit.

* :func:`num` and :func:`num_range` (or :func:`span_text` for a ``(low, high)``
  pair): three significant figures, whole numbers below a million whole;
* :func:`like` and :func:`like_range`: a recomputed value in the notation of
  the printed number it is compared with;
* :func:`p_text` and :func:`p_range_text`: a p-value from its natural log,
  correct below the double range; :func:`p_equals` and :func:`p_cell` for a
  plain p-value ("p = 0.037", "p < 1e-300");
* :func:`count`: a count with thousands separators.

The words that go with the numbers (statuses, verdicts, method names) live in
:mod:`checker.vocabulary`.  A leaf module: it imports nothing of ours."""

from __future__ import annotations

import math
import re


WHOLE_BELOW = 1e6  # whole numbers below this are written with all their digits: 1200, not 1.2e3


def num(x: float | None, digits: int = 3) -> str:
    """``digits`` significant figures; whole numbers below a million whole
    (counts read better so: ``1200``); ``n/a`` for a missing or non-finite
    value; exponents written without padding (``2.4e-9``, not ``2.4e-09``)."""
    if x is None or isinstance(x, bool) or not isinstance(x, (int, float)):
        return "n/a"
    if not math.isfinite(x):
        return "n/a"
    if x == 0:
        return "0"
    if abs(x) < WHOLE_BELOW and float(x).is_integer():
        return str(int(x))
    text = f"{x:.{digits}g}"
    if "e" in text:
        mantissa, exponent = text.split("e")
        return f"{mantissa}e{int(exponent)}"
    return text


def num_range(low: float | None, high: float | None, digits: int = 3) -> str:
    """``a to b``, or a single number when both ends print the same."""
    a, b = num(low, digits), num(high, digits)
    return a if a == b else f"{a} to {b}"


def span_text(bounds: tuple[float, float], digits: int = 3) -> str:
    """:func:`num_range` of a ``(low, high)`` pair."""
    return num_range(bounds[0], bounds[1], digits)


LN10 = math.log(10.0)


def p_text(log_p: float, digits: int = 2) -> str:
    """A p-value from its natural log, correct below the double-precision range."""
    if not math.isfinite(log_p):  # sigma of 1e300: log p itself overflows
        return "0" if log_p == -math.inf else "n/a"
    if log_p > -700:
        return num(math.exp(log_p), digits)
    log10 = log_p / LN10
    exponent = math.floor(log10)
    mantissa = 10 ** (log10 - exponent)
    if float(f"{mantissa:.{digits - 1}f}") >= 10.0:  # 9.996 would print as "10.0e-350"
        mantissa, exponent = mantissa / 10.0, exponent + 1
    return f"{mantissa:.{digits - 1}f}e{exponent}"


def p_range_text(log_bounds: tuple[float, float]) -> str:
    """A range of p-values from their natural logs; one value when both ends print the same."""
    a, b = p_text(log_bounds[0]), p_text(log_bounds[1])
    return a if a == b else f"{a} to {b}"


def p_cell(p: float | None, digits: int = 2) -> str:
    """A plain p-value for a table cell: ``0.037``, ``< 1e-300`` where it
    underflowed to zero, ``n/a`` when there is none."""
    if p is None:
        return "n/a"
    return "< 1e-300" if p == 0 else num(p, digits)


def p_equals(p: float | None, digits: int = 2) -> str:
    """A plain p-value in a sentence: ``p = 0.037``, ``p < 1e-300``, ``p n/a``."""
    cell = p_cell(p, digits)
    return f"p {cell}" if cell.startswith(("<", "n/a")) else f"p = {cell}"


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


def like(x: float | None, printed, figures: int | None = None) -> str:
    """``x`` written the way ``printed`` was: the same notation (exponent,
    percent) and one significant figure more (at least three), or ``figures``
    of them, so that "printed 0.30e-3, recomputed 0.305e-3" reads at a glance.

    ``printed`` is the printed text, or anything with a ``text`` (a claim's
    Reported value); without one, :func:`num` with three figures."""
    if x is None or isinstance(x, bool) or not isinstance(x, (int, float)) or not math.isfinite(x):
        return "n/a"
    if printed is not None and not isinstance(printed, str):
        printed = printed.text
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


def at_one_sigma(text: str, level_words: str, one_sigma: float) -> str:
    """A printed error at another level, with its one standard error:
    ``"0.4e-3 (95% half-width: 0.204e-3 at one sigma)"``.  The claim's messages
    and the referee notes both say it this way."""
    return f"{text} ({level_words}: {like(one_sigma, text)} at one sigma)"


def like_range(low: float | None, high: float | None, printed) -> str:
    """``a to b`` in the notation of ``printed``, one number when both ends print the same."""
    a, b = like(low, printed), like(high, printed)
    return a if a == b else f"{a} to {b}"


def and_list(items: list[str]) -> str:
    """'a', 'a and b', 'a, b and c' ('' for none)."""
    if len(items) <= 1:
        return "".join(items)
    return ", ".join(items[:-1]) + " and " + items[-1]


def plural(n: int, one: str, many: str | None = None) -> str:
    """``1 row``, ``12,000 rows``: a count with its noun."""
    return f"{n:,} {one if n == 1 else (many or one + 's')}"
