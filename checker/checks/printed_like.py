"""Writing a recomputed number the way the value it is compared with was
printed: the same notation (exponent, percent) and one significant figure more
(at least three), so that "printed 0.30e-3, recomputed 0.305e-3" reads at a
glance."""

from __future__ import annotations

import math
import re

from ..claim.model import Reported
from .common import num

_MANTISSA = re.compile(r"^[+-]?(?P<int>[0-9]*)(?:\.(?P<dec>[0-9]*))?(?:[eE](?P<exp>[+-]?[0-9]+))?$")
MAX_DECIMALS = 9


def significant_figures(text: str) -> int:
    """Significant figures of a printed number ("0.30e-3" -> 2, "2500" -> 4)."""
    body = text.strip().lstrip("<").strip().rstrip("%").lower().split("e")[0]
    digits = body.lstrip("+-").replace(".", "").lstrip("0")
    return max(1, len(digits))


def like(x: float | None, printed: Reported | None, figures: int | None = None) -> str:
    """``x`` in the notation of ``printed``, with one significant figure more
    (or ``figures`` of them)."""
    if x is None or not math.isfinite(x):
        return "n/a"
    if printed is None:
        return num(x, 3)
    text = printed.text.strip().lstrip("<").strip()
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
