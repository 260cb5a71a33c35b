"""Table columns to claim fields: which column is the parts' label, which
field each heading names (the ``COLUMNS`` rules), how a heading's
``(×10^-3)`` or ``(%)`` scales its cells, and the numbers one cell prints."""

from __future__ import annotations

import re
from dataclasses import dataclass

from . import rules as R
from .normalize import normalize
from .notation import Number, find_mentions, number
from .tables import Table


def rescale(n: Number, power: int, percent: bool) -> Number:
    """A table cell scaled by its column heading's 10^power or percent sign."""
    text = n.text
    pct = text.endswith("%") or percent
    body = text.rstrip("%")
    mantissa, _, exp = body.partition("e")
    return number(mantissa, (int(exp) if exp else 0) + power or None, pct)


_SCALE_BRACKETED = re.compile(r"[(\[]\s*(?:×|x)?\s*10\s*\^\s*([-+]?\d+)\s*[)\]]|in\s+units\s+of\s+10\s*\^\s*([-+]?\d+)", re.I)
_SCALE_TIMES = re.compile(r"×\s*10\s*\^\s*([-+]?\d+)")
_SCALE_PERCENT = re.compile(r"[(\[]\s*%\s*[)\]]|\bin\s+%|\(percent\)|\bpercent\b", re.I)


@dataclass(frozen=True)
class Column:
    field: str
    power: int
    percent: bool
    heading: str


def read_columns(table: Table) -> tuple[int | None, list[Column | None], list[str]]:
    """The label column and each column's field (None when unknown)."""
    headers = [normalize(h) for h in table.header]
    label = None
    if table.rows:
        first = [row[0] if row else "" for row in table.rows]
        lettered = sum(bool(re.search(r"[A-Za-z]", c)) for c in first)
        ids = all(re.fullmatch(r"\s*#?\d{1,6}\s*", c) for c in first) and bool(headers) and bool(
            R.LABEL_HEADING.match(headers[0]))
        if lettered * 2 >= len(first) or not any(re.search(r"\d", c) for c in first) or ids:
            label = 0
    columns: list[Column | None] = []
    used: set = set()
    guesses = []
    for i, heading in enumerate(headers):
        if i == label:
            columns.append(None)
            continue
        power, percent = 0, False
        m = _SCALE_BRACKETED.search(heading)
        if m:
            power = int(m.group(1) or m.group(2))
            guesses.append(f"column {heading!r}: cells read in units of 10^{power}")
            plain = heading[:m.start()] + heading[m.end():]
        else:
            t = _SCALE_TIMES.search(heading)
            if t:
                power = -int(t.group(1))
                guesses.append(f"column {heading!r}: the cells are the value times 10^{t.group(1)}")
                plain = heading[:t.start()] + heading[t.end():]
            else:
                plain = heading
        if _SCALE_PERCENT.search(plain):
            percent = True
            plain = _SCALE_PERCENT.sub(" ", plain)
        low = plain.strip().lower()
        chosen = None
        for name, pattern in R.COLUMNS:
            if re.search(pattern, low, re.I) and name not in used:
                chosen = name
                break
        if chosen:
            used.add(chosen)
        columns.append(Column(chosen, power, percent, heading) if chosen else None)
    return label, columns, guesses


def cell_numbers(cell: str, column: Column) -> tuple[Number | None, Number | None, Number | None]:
    """(value, stat error, syst error) printed in one cell."""
    text = normalize(cell)
    found = [m for m in find_mentions(text, limit=3) if m.kind in (R.VALUE, R.MEASUREMENT, R.SIGMA)]
    if not found:
        return None, None, None
    m = found[0]
    scale = (lambda n: rescale(n, column.power, column.percent) if n is not None else None)
    stat = syst = None
    if m.errors:
        for err, label in m.errors:
            if label == "syst" and syst is None:
                syst = err
            elif stat is None:
                stat = err
    elif m.minus is not None:
        stat = m.minus
    return scale(m.value), scale(stat), scale(syst)
