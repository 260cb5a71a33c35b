"""A survey's results as terminal text, CSV and JSON.  Pure functions of the
summary frame and counts; the statistics were computed before."""

from __future__ import annotations

import math
import re

from ..vocabulary import CAUTION_SHORT
from ..wording import plural
from .json import dumps

SHOW_AT_MOST = 20


def verb(n: int, many: str, one: str | None = None) -> str:
    """The verb agreeing with a count: "1 claim states", "2 claims state"."""
    return (one or many + "s") if n == 1 else many


def look_elsewhere_sentence(summary: dict) -> str:
    """Which significance the required-sigma count and the adjustment used, for
    the claims that state trials or upcrossings; "" when none does."""
    n = summary.get("look_elsewhere_corrected", 0)
    if not n:
        return ""
    methods = summary.get("look_elsewhere_methods", {})
    which = []
    for key, what, how in (("sidak", "trials", "Sidak"), ("gross-vitells", "upcrossings", "Gross-Vitells")):
        k = methods.get(key, 0)
        if k:
            noun = plural(k, "claim") if not which else f"{k:,}"
            which.append(f"{noun} that {verb(k, 'state')} {what} ({how})")
    rest = summary.get("tested", 0) - n
    return ("the required-sigma count and the adjustment use the look-elsewhere-corrected (global) "
            f"significance for {' and '.join(which)}"
            + (f", the local one for the other {rest:,}" if rest > 0 else ""))


def render_batch_text(frame, summary: dict) -> str:
    """The summary a person reads first: counts, the adjusted tally, and the
    claims that were flagged."""
    v = summary["verdicts"]
    unit = summary.get("unit", "row")
    lines = [f"{summary['table']}: {plural(summary['rows'], unit)}; "
             f"{plural(summary['checked'], 'claim')} checked"
             + (f", {plural(summary['unusable'], unit)} could not be used" if summary["unusable"] else ""),
             f"verdicts: {v['consistent']:,} consistent, {v['inconsistent']:,} inconsistent, "
             f"{v['incomplete']:,} incomplete"]
    need = summary["with_required_sigma"]
    clear = summary["clear_required_sigma"]
    if need:
        lines.append(f"required sigma: {plural(need, 'claim')} {verb(need, 'state')} one and "
                     f"{verb(need, 'have', 'has')} a recomputed significance; {clear['recomputed']:,} "
                     f"{verb(clear['recomputed'], 'clear')} it as recomputed, {clear['holm']:,} after Holm and "
                     f"{clear['bh']:,} after Benjamini-Hochberg adjustment across "
                     f"{plural(summary['tested'], 'recomputed p-value')}")
    elif summary["tested"]:
        lines.append(f"adjusted across {plural(summary['tested'], 'recomputed p-value')}; "
                     "no claim states a required_sigma to hold them against")
    corrected = look_elsewhere_sentence(summary)
    if corrected:
        lines.append(f"look-elsewhere: {corrected}")
    flagged = frame[frame["verdict"] == "inconsistent"]
    if len(flagged):
        lines += ["", "inconsistent:"]
        width = max(len(s) for s in flagged["source"].head(SHOW_AT_MOST))
        for source, title, failed in flagged[["source", "title", "failed_checks"]].head(SHOW_AT_MOST).itertuples(
                index=False, name=None):
            short = title if len(title) <= 60 else title[:57] + "..."
            lines.append(f"  {source:<{width}}  {short}  [{failed.replace(';', ', ')}]")
        # a streamed batch passes only the first flagged rows; the summary counts them all
        n = max(len(flagged), v["inconsistent"])
        if n > SHOW_AT_MOST:
            lines.append(f"  ... and {n - SHOW_AT_MOST:,} more (write them all with --out)")
    if v["inconsistent"]:
        lines += ["", CAUTION_SHORT]
    return "\n".join(lines) + "\n"


def render_problems(problems, limit: int = SHOW_AT_MOST, total: int | None = None) -> str:
    """The rows that could not be used, one line each (at most ``limit``);
    ``total`` is how many there are when ``problems`` holds only the first."""
    lines = list(problems[:limit])
    total = len(problems) if total is None else total
    if total > limit:
        lines.append(f"... and {total - limit:,} more that could not be used "
                     "(each is in the table written with --out)")
    return "".join(line + "\n" for line in lines)


def frame_records(frame) -> list[dict]:
    """Rows as plain dicts: NaN and missing become None."""
    out = []
    columns = list(frame.columns)
    for values in frame.astype(object).itertuples(index=False, name=None):
        row = {}
        for key, value in zip(columns, values):
            if value is None or (isinstance(value, float) and not math.isfinite(value)):
                value = None
            elif type(value).__name__ == "NAType":
                value = None
            elif hasattr(value, "item"):  # numpy scalar
                value = value.item()
            row[key] = value
        out.append(row)
    return out


def render_batch_json(frame, summary: dict) -> str:
    return dumps({"summary": summary, "claims": frame_records(frame)})


def _csv_texts(series) -> list[str]:
    """One column's cells: floats as their shortest round-trip text, missing
    values (NaN, NA) as empty cells, text cells neutralised for spreadsheets."""
    values = series.astype(object).tolist()
    if series.dtype.kind == "f":
        return [repr(v) if v == v else "" for v in values]
    return [inert_cell("" if v is None or type(v).__name__ == "NAType" else str(v)) for v in values]


_FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")
_PLAIN_NUMBER = re.compile(r"[+-]?([0-9]+\.?[0-9]*|\.[0-9]+)([eE][+-]?[0-9]+)?")


def inert_cell(text: str) -> str:
    """A text cell a spreadsheet will not run: one that starts with = + - @, a
    tab or a carriage return (the starts of a formula) gets a leading
    apostrophe, the usual neutralisation (OWASP, "CSV Injection"); a cell that
    is a plain number ("-3.2", a printed sigma) stays as written."""
    if text.startswith(_FORMULA_STARTS) and not _PLAIN_NUMBER.fullmatch(text):
        return "'" + text
    return text


def render_batch_csv(frame, header: bool = True) -> str:
    # The csv module over pre-formatted columns: a third faster than DataFrame.to_csv for
    # 100,000 claims, and the same text.  Without ``header``, the rows only (a streamed
    # batch writes its table a chunk at a time).
    import csv
    import io

    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    if header:
        writer.writerow(frame.columns)
    writer.writerows(zip(*(_csv_texts(frame[c]) for c in frame.columns)))
    return buffer.getvalue()
