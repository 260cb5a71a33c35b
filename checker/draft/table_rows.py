"""``claimcheck draft --table``: each row of a results table becomes one claim
of a batch table (CSV) for ``claimcheck batch``.

A row's own cells give its estimate, errors, counts, sigma and p; the text
around the table gives what the rows share (metric, qubits, threshold,
sidedness, required sigma).  Every row is read back through the batch reader
and the claim schema, and a cell they refuse is emptied and named in the
row's ``# dropped`` note.
"""

from __future__ import annotations

import csv
import io
from dataclasses import dataclass

from ..claim import claim_from_document
from ..errors import ClaimcheckError
from .assemble import draft_text
from .columns import cell_numbers, read_columns
from .model import DraftError
from .normalize import normalize, printable, strip_control
from .tables import extract_tables
from .writer import scalar

ROW_FIELDS = ("estimate", "stat_error", "syst_error", "samples", "circuits", "sd", "threshold",
              "significance.sigma", "significance.p_value", "qubits", "trials")
SHARED = ("metric", "qubits", "threshold", "significance.sided", "significance.required_sigma")
COLUMN_ORDER = ("title", "metric", "qubits", "estimate", "stat_error", "syst_error", "samples", "circuits",
                "sd", "threshold", "significance.sigma", "significance.p_value", "significance.sided",
                "significance.required_sigma", "trials")
COUNTS = {"samples", "circuits", "qubits", "trials"}


@dataclass(frozen=True)
class RowsDraft:
    """A batch table drafted from a results table."""

    name: str
    header: tuple
    rows: tuple  # tuples of cell texts, one per header column
    notes: tuple

    def mappings(self) -> list[dict]:
        """The rows as claim mappings with dotted keys (notes left out)."""
        return [{h: c for h, c in zip(self.header, row) if c and not h.startswith("#")} for row in self.rows]


def _cell(value) -> str:
    text = scalar(value)
    return text[1:-1] if text.startswith('"') else text


def draft_rows(text: str, name: str) -> RowsDraft:
    """One claim per row of the first results table in ``text``.

    Raises
    ------
    DraftError
        No table, or no row with an estimate.
    """
    tables, _ = extract_tables(strip_control(text))
    chosen = None
    for table in tables:
        label, columns, guesses = read_columns(table)
        if any(c is not None and c.field == "estimate" for c in columns):
            chosen = (table, label, columns, guesses)
            break
    if chosen is None:
        raise DraftError(name, "holds no table of results" if not tables else
                         "holds no table with a column of results",
                         "--table reads a LaTeX tabular, a Markdown table or comma-separated lines whose "
                         "heading names the value (fidelity, accuracy, estimate, ...)")
    table, label, columns, guesses = chosen
    try:
        around = draft_text(text, name, require_estimate=False)
    except DraftError:
        around = None
    shared = {}
    if around is not None:
        for f in around.fields:
            key = ".".join(map(str, f.path))
            if key in SHARED:
                shared[key] = _cell(f.value)
    shared.setdefault("metric", "mean")
    caption = printable(normalize(table.caption), 80) if table.caption else ""
    records = []
    for number, (row, line) in enumerate(zip(table.rows, table.lines), start=1):
        cells: dict = {}
        for col, cell in zip(columns, row):
            if col is None or col.field not in ROW_FIELDS:
                continue
            value, stat, syst = cell_numbers(cell, col)
            if value is None:
                continue
            if col.field in COUNTS and not (value.value >= 1 and value.value == int(value.value)):
                continue
            cells.setdefault(col.field, _cell(value))
            if col.field == "estimate":
                if stat is not None:
                    cells.setdefault("stat_error", _cell(stat))
                if syst is not None:
                    cells.setdefault("syst_error", _cell(syst))
        if "estimate" not in cells:
            continue
        row_label = printable(normalize(row[label]), 80) if label is not None and label < len(row) else ""
        title = ": ".join(p for p in (caption, row_label) if p) or f"{name} row {number}"
        for key, value in shared.items():
            cells.setdefault(key, value)
        cells["title"] = title
        cells["# words"] = printable(normalize(line), 200)
        records.append(cells)
    if not records:
        raise DraftError(name, "holds a table whose rows print no value in the results column",
                         "check the table's heading and cells")
    used = [c for c in COLUMN_ORDER if any(c in r for r in records)]
    header = tuple(used) + ("# words", "# dropped")
    rows = [_loadable(header, r, name, i) for i, r in enumerate(records, start=1)]
    rows = [r for r in rows if r is not None]
    if not rows:
        raise DraftError(name, "gives batch rows the claim schema refuses", "write the table by hand")
    notes = tuple(guesses)
    return RowsDraft(name, header, tuple(rows), notes)


def _loadable(header: tuple, record: dict, name: str, number: int) -> tuple | None:
    from ..survey.columns import ColumnPlan

    plan = ColumnPlan(list(header), name)
    dropped = []
    for _ in range(len(header) + 1):
        cells = tuple(record.get(h, "") for h in header[:-1]) + ("; ".join(dropped),)
        try:
            doc, _ = plan.document(cells, f"{name} row {number}", None)
            claim_from_document(doc)
            return cells
        except ClaimcheckError as exc:
            key = exc.path
            if key in ("title", "metric", "estimate") or key not in record:
                return None
            dropped.append(f"{key} {record.pop(key)}: {exc.problem}")
    return None


def render_csv(draft: RowsDraft) -> str:
    """The batch table: comment lines, the header, one claim per row."""
    out = io.StringIO()
    out.write(f"# Batch table written by claimcheck draft --table from {printable(draft.name, 200)}: one claim per\n")
    out.write("# row of the table. Review every cell against the paper; '# words' quotes the row.\n")
    for note in draft.notes:
        out.write(f"# note: {printable(note, 300)}\n")
    writer = csv.writer(out, lineterminator="\n")
    writer.writerow(draft.header)
    writer.writerows(draft.rows)
    return out.getvalue()
