"""Draft referee notes as plain text: the content of the Markdown notes
(render/markdown.py) with no markup at all, wrapped at 78 columns, for pasting
into a journal's plain-text review form, where Markdown's escapes (``\\*``,
``\\<``) would show as backslashes.

User-supplied strings are written as they are (their control characters shown
as escapes by :func:`checker.render.notes.one_line`); nothing here computes.
"""

from __future__ import annotations

import textwrap

from ..claim.model import Claim
from ..report import Report
from ..vocabulary import CAUTION, STATUS_WORDS
from ..wording import and_list
from .notes import (Point, SharedPoint, brief_passes, field_words, one_line, points, raised_points,
                    summary_lines, summary_tables)

WIDTH = 78


def _wrap(text: str, first: str = "", rest: str | None = None) -> list[str]:
    """``text`` filled to WIDTH columns after ``first`` (then ``rest``, the
    hanging indent).  A word longer than a line (a long file path) is broken,
    so no line is ever wider than WIDTH."""
    return textwrap.wrap(one_line(text), width=WIDTH, initial_indent=first,
                         subsequent_indent=rest if rest is not None else " " * len(first),
                         break_long_words=True, break_on_hyphens=False) or [first.rstrip()]


def _heading(text: str, rule: str) -> list[str]:
    lines = _wrap(text)
    return lines + [rule * max(len(line) for line in lines), ""]


def _facts(p: Point, indent: str) -> list[str]:
    lines = []
    if p.printed is not None:
        name = field_words(p.printed_field)
        what = f"{name} " if name else ""
        where = f" (field {p.printed_field})" if p.printed_field else ""
        lines += _wrap(f"Printed: {what}{p.printed}{where}.", indent + "- ", indent + "  ")
    if p.implied is not None:
        lines += _wrap(f"The claim's inputs imply: {p.implied}.", indent + "- ", indent + "  ")
    return lines


def _point(n: int, p: Point) -> list[str]:
    lead = f"{n}. "
    lines = _wrap(f"{p.heading} ({STATUS_WORDS[p.status]}). {p.message}", lead, " " * len(lead))
    lines.append("")
    indent = " " * len(lead)
    lines += _facts(p, indent)
    if p.reproduced is not None:
        lines += _wrap(f"The print would follow {p.reproduced}.", indent + "- ", indent + "  ")
    elif p.unmatched:
        lines += _wrap("No convention or method we tried reproduces the print.", indent + "- ", indent + "  ")
    if p.question:
        lines += _wrap(f"Suggested question: {p.question}", indent + "- ", indent + "  ")
    return lines + [""]


def _shared(n: int, s: SharedPoint) -> list[str]:
    lead = f"{n}. "
    indent = " " * len(lead)
    lines = _wrap(f"{s.heading} ({STATUS_WORDS[s.status]}). {s.opening}", lead, indent)
    lines.append("")
    named = len({p.heading for p in s.members}) > 1
    for p in s.members:
        lines += _wrap((f"{p.heading}: " if named else "") + p.message, indent + "- ", indent + "  ")
        lines += _facts(p, indent + "  ")
    lines += _wrap(f"Suggested question: {s.question}", indent + "- ", indent + "  ")
    return lines + [""]


def _table(headers: tuple[str, ...], rows: tuple[tuple[str, ...], ...]) -> list[str]:
    """Aligned columns when they fit in WIDTH; otherwise one wrapped line per
    row naming each cell's column."""
    cells = [[one_line(h) for h in headers]] + [[one_line(c) for c in row] for row in rows]
    widths = [max(len(r[i]) for r in cells) for i in range(len(headers))]
    if sum(widths) + 2 * (len(widths) - 1) <= WIDTH:
        out = ["  ".join(c.ljust(w) for c, w in zip(r, widths)).rstrip() for r in cells[:1]]
        out.append("  ".join("-" * w for w in widths))
        out += ["  ".join(c.ljust(w) for c, w in zip(r, widths)).rstrip() for r in cells[1:]]
        return out
    out = []
    for row in cells[1:]:
        out += _wrap("; ".join(f"{h}: {c}" for h, c in zip(cells[0], row)), "- ", "  ")
    return out


def render_plain_text(report: Report, claim: Claim) -> str:
    """Draft referee notes for one claim as plain text.

    Parameters
    ----------
    report : Report
        The findings of ``run_checks(claim)``.
    claim : Claim
        The claim, for its title, source and printed numbers.

    Returns
    -------
    str
        Text with no markup, no line wider than 78 columns, ending in a
        newline; the same content as :func:`checker.render.markdown.render_markdown`.
    """
    first, second = summary_lines(report)
    out = _heading(f"Referee notes: {claim.title}", "=")
    out += _wrap(first) + [""] + _wrap(second) + [""]
    where = f"Numbers as read from {report.file}"
    if claim.source:
        where += f" (source: {one_line(claim.source)})"
    headline = f"headline estimate {claim.estimate.text}" if claim.estimate else "no headline estimate"
    out += _wrap(where + f"; metric {claim.metric}, {headline}.") + [""]

    raised = raised_points(report, claim)
    if raised:
        out += _heading("Points to raise", "-")
        for n, p in enumerate(raised, 1):
            out += _shared(n, p) if isinstance(p, SharedPoint) else _point(n, p)
    for table in summary_tables(report):
        out += _heading(table.caption, "-")
        out += _table(table.headers, table.rows) + [""]
    agreed = list(points(report, claim, ("pass",)))
    if agreed:
        out += _heading("What agrees", "-")
        for label, messages, where_ in brief_passes(agreed):
            text = f"{label}: agrees for {and_list(list(where_))}." if where_ is not None \
                else f"{label}: " + " ".join(messages)
            out += _wrap(text, "- ", "  ")
        out.append("")
    for status, title in (("info", "For information"), ("skip", "Not checked")):
        listed = list(points(report, claim, (status,)))
        if listed:
            out += _heading(title, "-")
            for p in listed:
                out += _wrap(f"{p.heading}: {p.message}", "- ", "  ")
            out.append("")
    out += ["-" * WIDTH, ""] + _wrap(CAUTION) + [""]
    return "\n".join(out)

