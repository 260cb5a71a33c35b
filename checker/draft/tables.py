"""Tables in pasted text: a LaTeX ``tabular``, a Markdown table, or lines of
comma- or tab-separated cells.

:func:`extract_tables` finds them in the text (before normalisation, since
``&``, ``\\\\`` and ``|`` mark their cells), returns each as a heading row and
body rows of cell texts, and the text with the tables cut out.  Which column
holds which field is decided in :mod:`.assemble` by the ``COLUMNS`` rules.
"""

from __future__ import annotations

import csv
import re
from dataclasses import dataclass

MAX_ROWS = 100_000


@dataclass(frozen=True)
class Table:
    """One table as printed.

    Attributes
    ----------
    header : tuple of str
        The heading cells (raw text).
    rows : tuple of tuple of str
        Body rows, one tuple of raw cell texts each.
    caption : str
        ``\\caption{...}`` or a "Table N: ..." line next to it, raw.
    kind : str
        ``latex``, ``markdown`` or ``delimited``.
    lines : tuple of str
        Each body row as one line of text, for the quotes in a draft.
    """

    header: tuple
    rows: tuple
    caption: str
    kind: str
    lines: tuple


_BEGIN = re.compile(r"\\begin\s*\{(tabular[x*]?|longtable|array)\}")
_RULE_LINES = re.compile(r"\\(?:hline|toprule|midrule|bottomrule|endhead|endfirsthead|endfoot|addlinespace)\b"
                         r"|\\(?:cline|cmidrule)\s*(?:\([^)]*\))?\s*\{[^{}]*\}")
_MULTICOLUMN = re.compile(r"\\multi(?:column|row)\s*\{[^{}]*\}\s*\{[^{}]*\}\s*\{((?:[^{}]|\{[^{}]*\})*)\}")
_CELL_SPLIT = re.compile(r"(?<!\\)&")
_ROW_SPLIT = re.compile(r"\\\\(?:\s*\[[^\]]*\])?|\\tabularnewline")
_CAPTION = re.compile(r"\\caption\s*(?:\[[^\]]*\])?\s*\{((?:[^{}]|\{(?:[^{}]|\{[^{}]*\})*\})*)\}")
_TABLE_ENV = re.compile(r"\\(?:begin|end)\s*\{table\*?\}")
_MD_LINE = re.compile(r"^\s*\|?(?:[^|\n]*\|)+[^|\n]*$")
_MD_SEPARATOR = re.compile(r"^\s*\|?\s*:?-+:?\s*(?:\|\s*:?-+:?\s*)*\|?\s*$")
_CAPTION_LINE = re.compile(r"^\s*(?:\*\*|__)?(?:table|tab\.)\s*[A-Z]?\d*[A-Za-z]?\s*[:.]", re.I)
_NUMERIC_CELL = re.compile(r"\d")


def _skip_braces(text: str, pos: int, groups: int) -> int:
    """Position after ``groups`` brace groups (nested) starting at ``pos``."""
    for _ in range(groups):
        while pos < len(text) and text[pos] in " \t\n":
            pos += 1
        if pos >= len(text) or text[pos] != "{":
            return pos
        depth = 0
        while pos < len(text):
            char = text[pos]
            if char == "{":
                depth += 1
            elif char == "}":
                depth -= 1
                if depth == 0:
                    pos += 1
                    break
            pos += 1
    return pos


def _latex_tables(text: str) -> list[tuple[int, int, Table]]:
    found = []
    pos = 0
    while True:
        m = _BEGIN.search(text, pos)
        if not m:
            return found
        env = m.group(1)
        body_start = _skip_braces(text, m.end(), 2 if env == "tabularx" else 1)
        end_pattern = re.compile(r"\\end\s*\{" + re.escape(env) + r"\}")
        end = end_pattern.search(text, body_start)
        if not end:
            return found
        body = text[body_start:end.start()]
        rows = []
        for raw in _ROW_SPLIT.split(body):
            raw = _RULE_LINES.sub(" ", raw)
            raw = _MULTICOLUMN.sub(lambda c: c.group(1), raw)
            if not raw.strip():
                continue
            rows.append(tuple(c.strip() for c in _CELL_SPLIT.split(raw)))
            if len(rows) > MAX_ROWS:
                break
        # The table environment around it: cut it all, keep the caption.
        start, stop = m.start(), end.end()
        outer_start = start
        caption = ""
        env_open = [x for x in _TABLE_ENV.finditer(text, max(0, start - 2000), start) if "begin" in x.group()]
        if env_open:
            outer_start = env_open[-1].start()
        close = _TABLE_ENV.search(text, stop, stop + 2000)
        outer_stop = close.end() if close and "end" in close.group() else stop
        cap = _CAPTION.search(text, outer_start, outer_stop)
        if cap:
            caption = cap.group(1)
        if len(rows) >= 2:
            found.append((outer_start, outer_stop, Table(rows[0], tuple(rows[1:]), caption, "latex",
                                                         tuple(" & ".join(r) for r in rows[1:]))))
        pos = end.end()


def _md_cells(line: str) -> tuple:
    line = line.strip()
    if line.startswith("|"):
        line = line[1:]
    if line.endswith("|") and not line.endswith("\\|"):
        line = line[:-1]
    return tuple(c.strip() for c in re.split(r"(?<!\\)\|", line))


def _line_tables(text: str) -> list[tuple[int, int, Table]]:
    """Markdown tables and delimited (CSV/TSV) blocks, found line by line."""
    lines = text.split("\n")
    offsets = []
    at = 0
    for line in lines:
        offsets.append(at)
        at += len(line) + 1
    found = []
    i = 0
    while i < len(lines):
        # Markdown: a heading line, a separator line, then body lines.
        if i + 1 < len(lines) and "|" in lines[i] and _MD_SEPARATOR.match(lines[i + 1]) and "-" in lines[i + 1]:
            header = _md_cells(lines[i])
            j = i + 2
            body = []
            while j < len(lines) and "|" in lines[j] and _MD_LINE.match(lines[j]) and len(body) <= MAX_ROWS:
                body.append(_md_cells(lines[j]))
                j += 1
            if body:
                start, caption = _caption_before(lines, i)
                if not caption and j < len(lines) and _CAPTION_LINE.match(lines[j]):
                    caption = lines[j]
                    j += 1
                found.append((offsets[start], offsets[j - 1] + len(lines[j - 1]),
                              Table(header, tuple(body), caption, "markdown", tuple(lines[i + 2:i + 2 + len(body)]))))
                i = j
                continue
        delimiter = "\t" if "\t" in lines[i] else ("," if "," in lines[i] else None)
        if delimiter:
            block = _delimited_block(lines, i, delimiter)
            if block is not None:
                j, header, body = block
                start, caption = _caption_before(lines, i)
                found.append((offsets[start], offsets[j - 1] + len(lines[j - 1]),
                              Table(header, tuple(body), caption, "delimited", tuple(lines[i + 1:j]))))
                i = j
                continue
        i += 1
    return found


def _caption_before(lines, i) -> tuple[int, str]:
    """A "Table N: ..." line just above a table (a blank line between allowed)."""
    for back in (1, 2):
        if i - back < 0:
            break
        line = lines[i - back]
        if _CAPTION_LINE.match(line):
            return i - back, line
        if line.strip():
            break
    return i, ""


def _split(line: str, delimiter: str) -> list[str]:
    try:
        return next(csv.reader([line], delimiter=delimiter, skipinitialspace=True))
    except (csv.Error, StopIteration):
        return []


def _delimited_block(lines, i, delimiter):
    """Three or more lines with the same number (two or more) of cells: a
    heading of words over rows that hold numbers, and no sentences."""
    header = _split(lines[i], delimiter)
    width = len(header)
    if width < 2 or any(_NUMERIC_CELL.search(c) and not re.search(r"[A-Za-z]", c) for c in header):
        return None
    if lines[i].rstrip().endswith(".") or re.search(r"\. [A-Z]", lines[i]):
        return None
    body = []
    j = i + 1
    while j < len(lines) and len(body) <= MAX_ROWS:
        line = lines[j]
        if not line.strip() or delimiter not in line or line.rstrip().endswith(".") and ". " in line:
            break
        cells = _split(line, delimiter)
        if len(cells) != width:
            break
        body.append(tuple(c.strip() for c in cells))
        j += 1
    if len(body) < 2 or not all(any(_NUMERIC_CELL.search(c) for c in row) for row in body):
        return None
    return j, tuple(c.strip() for c in header), body


def extract_tables(text: str) -> tuple[list[Table], str]:
    """The tables of ``text`` and the text without them (each table replaced
    by a paragraph break; its caption is kept on the Table)."""
    spans = _latex_tables(text)
    rest = _cut(text, spans)
    line_spans = _line_tables(rest)
    rest = _cut(rest, line_spans)
    return [t for _, _, t in spans] + [t for _, _, t in line_spans], rest


def _cut(text: str, spans) -> str:
    if not spans:
        return text
    out = []
    at = 0
    for start, stop, table in sorted(spans, key=lambda s: s[0]):
        if start < at:
            continue
        out.append(text[at:start])
        out.append("\n\n")
        at = stop
    out.append(text[at:])
    return "".join(out)
