"""Printed precision: a reported number is an interval, not a point.

"2.24e-3" means [2.235e-3, 2.245e-3]; "4.2" means [4.15, 4.25]; "2e-10" means
[1.5e-10, 2.5e-10]; "91.2%" means [0.9115, 0.9125].  A recomputed quantity is
evaluated over the box of its inputs' intervals (``stats.ranges``) and agrees
with a printed one when the two intervals are no further apart than
``tolerance`` times the printed value (common practice: half a unit in the
last printed digit).
"""

from __future__ import annotations

import functools
import math
import re
from dataclasses import dataclass
from decimal import Context, Decimal
from typing import Callable, Sequence

# Plain decimal notation with an optional exponent and an optional percent
# sign.  No leading zeros before other digits (YAML 1.1 reads those as octal),
# no underscores, no base-60, no hexadecimal.
NUMBER_PATTERN = r"^[+-]?(0|[1-9][0-9]*)?(\.[0-9]*)?([eE][+-]?[0-9]+)?%?$"
_NUMBER = re.compile(NUMBER_PATTERN)
_HAS_DIGIT = re.compile(r"[0-9]")
# Powers of ten a printed number may reach: p-values far below the double
# range are read exactly (1000 sigma is p = 1e-217,000), but the arithmetic on
# the printed digits needs bounded exponents.  Beyond them the text is refused.
MAX_EXPONENT = 999_999
# The arithmetic on printed digits: enough precision for any printed interval's
# ends to reach a double exactly, and exponents well beyond MAX_EXPONENT.
_CONTEXT = Context(prec=60, Emax=10 * MAX_EXPONENT, Emin=-10 * MAX_EXPONENT)
_QUICK_CONTEXT = Context(prec=20, Emax=10 * MAX_EXPONENT, Emin=-10 * MAX_EXPONENT)


@dataclass(frozen=True)
class Printed:
    """A number as printed: its value and the interval its digits stand for."""

    value: float
    low: float
    high: float
    text: str
    # Natural logs of low and high, taken in decimal so that a printed
    # "3e-400" keeps its size although it underflows a double; -inf for zero
    # and nan for negative numbers.
    log_low: float = math.nan
    log_high: float = math.nan

    @property
    def exact(self) -> bool:
        return self.low == self.high

    @property
    def bounds(self) -> tuple[float, float]:
        return (self.low, self.high)


def is_number_text(text: str) -> bool:
    """True when ``text`` is a number in the plain notation claimcheck reads."""
    text = text.strip()
    mantissa = text.split("e")[0].split("E")[0]
    return bool(_NUMBER.match(text)) and bool(_HAS_DIGIT.search(mantissa))


@functools.lru_cache(maxsize=65536)  # pure, and a table repeats its texts (thresholds, counts, levels)
def parse_printed(text: str, exact: bool = False) -> Printed:
    """Read a printed number and the interval its digits stand for.

    Parameters
    ----------
    text : str
        "2.24e-3", "4.2", "91.2%", "25000000", "3e6".
    exact : bool
        Definitions (thresholds, levels) and fully written counts are exact.

    Returns
    -------
    Printed

    Raises
    ------
    ValueError
        When ``text`` is not a finite number in plain notation.
    """
    text = text.strip()
    if not is_number_text(text):
        raise ValueError(f"not a number: {text!r}")
    percent = text.endswith("%")
    body = text[:-1] if percent else text
    dec = Decimal(body)
    if not dec.is_finite():
        raise ValueError(f"not a finite number: {text!r}")
    if dec and abs(dec.adjusted()) > MAX_EXPONENT:
        raise ValueError(f"{text} is beyond the powers of ten claimcheck reads "
                         f"(10^-{MAX_EXPONENT:,} to 10^{MAX_EXPONENT:,})")
    c = _CONTEXT
    if percent:
        dec = c.divide(dec, Decimal(100))
    value = float(dec)
    if not math.isfinite(value):
        raise ValueError(f"{text} is beyond the range of double precision (about 1.8e308)")
    if exact:
        log_value = decimal_log(dec)
        return Printed(value, value, value, text, log_value, log_value)
    # Half a unit in the last printed digit, exactly in decimal.
    half = c.scaleb(Decimal(5), Decimal(Decimal(body).as_tuple().exponent - 1))
    if percent:
        half = c.divide(half, Decimal(100))
    lo, hi = sorted((c.subtract(dec, half), c.add(dec, half)))
    low, high = float(lo), float(hi)
    if not (math.isfinite(low) and math.isfinite(high)):
        raise ValueError(f"{text} is beyond the range of double precision (about 1.8e308)")
    return Printed(value, low, high, text, decimal_log(lo), decimal_log(hi))


def decimal_log_plain(dec: Decimal) -> float:
    """ln(dec) from the 60-digit decimal logarithm alone (the reference of the quick path)."""
    if dec > 0:
        return float(_CONTEXT.ln(dec))
    return -math.inf if dec == 0 else math.nan


def decimal_log(dec: Decimal) -> float:
    """ln(dec) as the double nearest the 60-digit decimal logarithm; -inf at 0, nan below.

    First at 20 digits (five times faster: the 60-digit ln was half of building a
    1,000-part claim): decimal's ln is correctly rounded, so the true logarithm,
    and the 60-digit one with it, lies within half a unit of the 20-digit result's
    last digit; when both ends of two units either side round to one double
    (rounding is monotone), that double is the answer, else the 60-digit ln
    decides.  tests/stats/test_precision_log.py holds the two to the same doubles,
    also on numbers whose logarithm lies next to a midpoint between two doubles."""
    if dec > 0:
        quick = _QUICK_CONTEXT.ln(dec)
        unit = _CONTEXT.scaleb(Decimal(2), Decimal(quick.adjusted() - (_QUICK_CONTEXT.prec - 1)))
        low, high = float(_CONTEXT.subtract(quick, unit)), float(_CONTEXT.add(quick, unit))
        if low == high:
            return low
    return decimal_log_plain(dec)


def error_of_the_mean(spread: tuple[float, float], runs: tuple[float, float]) -> tuple[float, float]:
    """The range of sd / sqrt(n), the error of a mean over n runs of spread sd, over the
    printed intervals of both (rises with sd, falls with n: :func:`over_box` is exact)."""
    return over_box(lambda sd, n: sd / math.sqrt(n), [spread, runs])


def count_is_exact(text: str) -> bool:
    """A count written with all its digits (no exponent, no point) is exact."""
    return bool(re.fullmatch(r"[+-]?[0-9]+", text.strip()))


def over_box(fn: Callable[..., float], boxes: Sequence[tuple[float, float]]) -> tuple[float, float]:
    """The range of ``fn`` over the vertices of a box of input intervals
    (``stats.ranges.vertex_range``): exact for a function monotone in each
    input with the others held fixed, which every caller's formula is (z from
    estimate, threshold and errors; products; tail probabilities).  A formula
    that is not (a binomial variance near 1/2) goes through ``stats.ranges``'
    other methods instead.  Non-finite vertices are skipped; (nan, nan) when
    none is finite."""
    from .ranges import vertex_range  # numpy: not loaded by validation alone

    return vertex_range(fn, boxes)


def gap(a: tuple[float, float], b: tuple[float, float]) -> float:
    """Distance between two intervals (0 when they meet)."""
    return max(0.0, max(a[0], b[0]) - min(a[1], b[1]))


def printed_scale(reported: tuple[float, float]) -> float:
    """The printed value's magnitude from its interval: a printed interval is
    the value plus and minus half a unit in its last digit, so its midpoint is
    the printed value."""
    return abs(0.5 * (reported[0] + reported[1]))


def agrees(reported: tuple[float, float], recomputed: tuple[float, float], tolerance: float) -> bool:
    """True when the intervals are no further apart than ``tolerance`` x the
    printed value (README, "Printed precision")."""
    return gap(reported, recomputed) <= tolerance * printed_scale(reported)


def agrees_log(reported_log: tuple[float, float], recomputed_log: tuple[float, float],
               tolerance: float) -> bool:
    """Agreement of p-values compared as p-values: relative, in log space.

    A factor of 2 in p is a sidedness slip at any sigma the printed digits can
    resolve; comparing after a conversion to sigma would hide it beyond about
    7 sigma.
    """
    return gap(reported_log, recomputed_log) <= math.log1p(tolerance)


def relative_gap(reported: tuple[float, float], recomputed: tuple[float, float]) -> float:
    scale = printed_scale(reported)
    return gap(reported, recomputed) / scale if scale > 0 else math.inf
