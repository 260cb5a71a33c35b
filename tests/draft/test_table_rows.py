"""claimcheck draft --table: one batch claim per row of a results table (invented tables)."""

from __future__ import annotations

import csv
import io

import pytest

from checker.draft import DraftError
from checker.draft.table_rows import draft_rows, render_csv
from checker.survey import run_batch

TEXT = r"""Invented survey of the Marsh-12 family of test devices: linear XEB on 12 qubits, each device
compared with the threshold of 0.25, one-sided.

\begin{tabular}{lccc}
\hline
Device & Fidelity & Significance & Qubits \\
\hline
Marsh-A & $0.31 \pm 0.02$ & $3.0\sigma$ & 12 \\
Marsh-B & $0.412(15)$ & $10.8\sigma$ & 5000 \\
Marsh-C & -- & -- & 12 \\
\hline
\end{tabular}
"""


def rows(text):
    draft = draft_rows(text, "survey.tex")
    table = list(csv.DictReader(line for line in io.StringIO(render_csv(draft)) if not line.startswith("# ")))
    return draft, table


def test_each_row_is_a_claim_with_the_shared_fields():
    draft, table = rows(TEXT)
    assert [r["title"] for r in table] == ["Marsh-A", "Marsh-B"]  # Marsh-C prints no value
    a, b = table
    assert (a["estimate"], a["stat_error"], a["significance.sigma"], a["qubits"]) == ("0.31", "0.02", "3.0", "12")
    assert (a["metric"], a["threshold"], a["significance.sided"]) == ("linear-xeb", "0.25", "one")
    assert (b["estimate"], b["stat_error"]) == ("0.412", "0.015")
    # 5000 qubits is refused by the claim builder: the cell is emptied and the reason kept.
    assert b["qubits"] == "" and "qubits 5000" in b["# dropped"]
    assert "Marsh-A & 0.31" in a["# words"] or "Marsh-A" in a["# words"]


def test_the_batch_reads_every_row():
    draft, _ = rows(TEXT)
    result = run_batch(draft.mappings())
    assert list(result.frame["verdict"]) != [] and "unusable" not in set(result.frame["verdict"])


def test_percent_column_and_markdown():
    text = ("| model | accuracy (%) | items |\n|---|---|---|\n| invented-1 | 91.3 ± 0.8 | 1,200 |\n"
            "| invented-2 | 89.0 ± 0.9 | 1,200 |\n")
    _, table = rows(text)
    assert [(r["estimate"], r["stat_error"], r["samples"]) for r in table] == [
        ("91.3%", "0.8%", "1200"), ("89.0%", "0.9%", "1200")]
    assert table[0]["metric"] == "proportion"


@pytest.mark.parametrize("text, message", [
    ("We measure 0.5 ± 0.1.", "holds no table"),
    ("| a | b |\n|---|---|\n| x | y |\n| z | w |\n", "no table with a column of results"),
])
def test_no_results_table(text, message):
    with pytest.raises(DraftError) as err:
        draft_rows(text, "t.txt")
    assert message in err.value.one_line()
