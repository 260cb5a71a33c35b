"""Tests of checker/render/plain_text.py through ``claimcheck check --plain-text``:
no markup, no line over 78 columns, the content of the Markdown notes, written
by temporary file and rename."""

from __future__ import annotations

import io
import re

from checker.cli import run

from render_fixtures import CLAIMS

# Invented claim whose title and part labels hold Markdown's special characters.
HOSTILE = ("# Invented scenario: made-up numbers.\n"
           'title: "Fidelity **bold** <b>x</b> [link](y) on a_b_c (invented)"\n'
           "source: 'Slides, #14 | table'\nmetric: linear-xeb\nqubits: 20\n"
           "estimate: 2.24e-3\nstat_error: 0.21e-3\nsamples: 3e7\nthreshold: 1.0e-3\n"
           "significance: {sigma: 5.9, p_value: 3.6e-9, sided: one}\n")


def _notes(tmp_path, source, *extra):
    plain, markdown = tmp_path / "notes.txt", tmp_path / "notes.md"
    stderr = io.StringIO()
    status = run(["check", str(source), "--plain-text", str(plain), "--markdown", str(markdown), *extra],
                 io.StringIO(), stderr)
    return status, plain.read_text(encoding="utf-8"), markdown.read_text(encoding="utf-8")


def _words(text: str) -> str:
    return " ".join(text.split())


def test_plain_text_notes_have_no_escapes_fit_78_columns_and_say_what_the_markdown_says(tmp_path):
    source = tmp_path / "hostile.yaml"
    source.write_text(HOSTILE, encoding="utf-8")
    status, plain, markdown = _notes(tmp_path, source)
    assert status == 1  # 5.9 sigma one-sided is p = 1.8e-9 (scipy.stats.norm.sf), not 3.6e-9
    assert max(len(line) for line in plain.splitlines()) <= 78
    assert "\\" not in plain and "`" not in plain and "**Significance**" not in plain
    assert "(source: Slides, #14 | table)" in _words(plain)
    # The title as written, where the Markdown had to escape it.
    assert "Referee notes: Fidelity **bold** <b>x</b> [link](y) on a_b_c (invented)" in _words(plain)
    assert r"\*\*bold\*\* \<b\>" in markdown
    # Same content: every sentence of the Markdown, with its markup taken off, is in the text.
    flat = _words(plain)
    for line in markdown.splitlines():
        body = re.sub(r"^\s*(#+ |- |\d+\. )", "", line).strip()
        body = re.sub(r"\\(.)", r"\1", body.replace("**", "")).replace("`", "")
        body = body.strip("*")
        if body and body != "---":
            assert _words(body) in flat, body
    assert len(re.findall(r"^\d+\. ", plain, flags=re.M)) == len(re.findall(r"^\d+\. ", markdown, flags=re.M)) == 1


def test_plain_text_refuses_the_input_and_leaves_it_untouched(tmp_path):
    source = tmp_path / "claim.yaml"
    source.write_bytes((CLAIMS / "sidedness_slip.yaml").read_bytes())
    before = source.read_bytes()
    stderr = io.StringIO()
    assert run(["check", str(source), "--plain-text", str(source)], io.StringIO(), stderr) == 2
    assert "is one of the input files" in stderr.getvalue() and source.read_bytes() == before
    # Written by rename: no temporary file is left beside the report.
    assert run(["check", str(source), "--plain-text", str(tmp_path / "n.txt")], io.StringIO(), io.StringIO()) == 1
    assert sorted(p.name for p in tmp_path.iterdir()) == ["claim.yaml", "n.txt"]
