"""Draft referee notes in Markdown: a two-line summary, numbered points in
plain words, the passes in brief, and the standing caution.

Readable pasted as plain text into a journal's review form and rendered as
Markdown alike.  Every user-supplied string (title, source, labels, component
names, and the findings' messages that quote them) is escaped so that it
shows as written and cannot add markup.
"""

from __future__ import annotations

import re

from ..claim.model import Claim
from ..report import Report
from ..vocabulary import CAUTION, STATUS_WORDS
from ..wording import and_list
from .notes import (Point, SharedPoint, brief_passes, field_words, is_plain_number, one_line, points,
                    raised_points, summary_lines, summary_tables)

# CommonMark lets a backslash escape any ASCII punctuation.  Escape what could
# start markup mid-line; leave intraword underscores ("stat_error") alone, since
# they never make emphasis and escaping them would clutter the plain text.
_ALWAYS = re.compile(r"([\\`*\[\]<>|~])")
_LOOSE_UNDERSCORE = re.compile(r"(?<![0-9A-Za-z])_|_(?![0-9A-Za-z])")
_ENTITY = re.compile(r"&(?=#?[0-9A-Za-z]+;)")
_CLOSING_HASHES = re.compile(r"(^|\s)(#+)$")  # would close an ATX heading and vanish


def md(text: object) -> str:
    """A user-supplied string as Markdown text that shows exactly as written."""
    s = one_line(text)
    s = _ALWAYS.sub(r"\\\1", s)
    s = _LOOSE_UNDERSCORE.sub(r"\\_", s)
    s = _ENTITY.sub(r"\\&", s)
    s = _CLOSING_HASHES.sub(lambda m: m.group(1) + "\\" + "\\".join(m.group(2)), s)
    return s


def _code(text: str) -> str:
    """Inline code for a printed number or field path; the fence outgrows any backtick run."""
    text = one_line(text)
    longest = max((len(m) for m in re.findall(r"`+", text)), default=0)
    fence = "`" * (longest + 1)
    pad = " " if text.startswith("`") or text.endswith("`") else ""
    return f"{fence}{pad}{text}{pad}{fence}"


def _facts(p: Point, indent: str) -> list[str]:
    """What was printed, what the inputs imply, what would reproduce it."""
    lines = []
    if p.printed is not None:
        name = field_words(p.printed_field)
        what = f"{md(name)} " if name else ""
        where = f" (field {_code(p.printed_field)})" if p.printed_field else ""
        lines.append(f"{indent}- Printed: {what}{_code(p.printed)}{where}.")
    if p.implied is not None:
        shown = _code(p.implied) if is_plain_number(p.implied) else md(p.implied)
        lines.append(f"{indent}- The claim's inputs imply: {shown}.")
    return lines


def _point_block(n: int, p: Point) -> list[str]:
    mark = STATUS_WORDS[p.status]
    lines = [f"{n}. **{md(p.heading)}** ({mark}). {md(p.message)}", ""]
    indent = "   "
    lines += _facts(p, indent)
    if p.reproduced is not None:
        lines.append(f"{indent}- The print would follow {md(p.reproduced)}.")
    elif p.unmatched:
        lines.append(f"{indent}- No convention or method we tried reproduces the print.")
    if p.question:
        lines.append(f"{indent}- Suggested question: {md(p.question)}")
    lines.append("")
    return lines


def _shared_block(n: int, s: SharedPoint) -> list[str]:
    """One slip that explains several findings: one point, what it explains, one question."""
    mark = STATUS_WORDS[s.status]
    lines = [f"{n}. **{md(s.heading)}** ({mark}). {md(s.opening)}", ""]
    indent = "   "
    named = len({p.heading for p in s.members}) > 1
    for p in s.members:
        label = f"{md(p.heading)}: " if named else ""
        lines.append(f"{indent}- {label}{md(p.message)}")
        lines += _facts(p, indent + "  ")
    lines.append(f"{indent}- Suggested question: {md(s.question)}")
    lines.append("")
    return lines


def _brief_passes(agreed: list[Point]) -> list[str]:
    """One line per check: its one message, or for a check that agreed on the
    headline and on every part, which ones, without repeating the sentence."""
    lines = []
    for label, messages, where in brief_passes(agreed):
        if where is not None:
            lines.append(f"- {md(label)}: agrees for {md(and_list(list(where)))}.")
        else:
            lines.append(f"- {md(label)}: " + " ".join(md(m) for m in messages))
    return lines



def render_markdown(report: Report, claim: Claim) -> str:
    """Draft referee notes for one claim.

    Parameters
    ----------
    report : Report
        The findings of ``run_checks(claim)``.
    claim : Claim
        The claim, for its title, source and printed numbers.

    Returns
    -------
    str
        Markdown text ending in a newline; the same input always gives the
        same bytes.
    """
    first, second = summary_lines(report)
    out = [f"# Referee notes: {md(claim.title)}", ""]
    out += [md(first), "", md(second), ""]
    where = f"Numbers as read from {_code(report.file)}"
    if claim.source:
        where += f" (source: {md(claim.source)})"
    headline = f"headline estimate {_code(claim.estimate.text)}" if claim.estimate else "no headline estimate"
    out += [where + f"; metric {_code(claim.metric)}, {headline}.", ""]

    raised = raised_points(report, claim)
    if raised:
        out += ["## Points to raise", ""]
        for n, p in enumerate(raised, 1):
            out += _shared_block(n, p) if isinstance(p, SharedPoint) else _point_block(n, p)
    for table in summary_tables(report):
        out += [f"## {md(table.caption)}", ""]
        out.append("| " + " | ".join(md(h) for h in table.headers) + " |")
        out.append("|" + "---|" * len(table.headers))
        out += ["| " + " | ".join(md(c).replace("|", "\\|") for c in row) + " |" for row in table.rows]
        out.append("")
    agreed = list(points(report, claim, ("pass",)))
    if agreed:
        out += ["## What agrees", ""]
        out += _brief_passes(agreed)
        out.append("")
    informed = list(points(report, claim, ("info",)))
    if informed:
        # Values recomputed where the claim printed none: neither agreement nor a flag.
        out += ["## For information", ""]
        out += [f"- {md(p.heading)}: {md(p.message)}" for p in informed]
        out.append("")
    skipped = list(points(report, claim, ("skip",)))
    if skipped:
        out += ["## Not checked", ""]
        out += [f"- {md(p.heading)}: {md(p.message)}" for p in skipped]
        out.append("")
    out += ["---", "", f"*{md(CAUTION)}*", ""]
    return "\n".join(out)
