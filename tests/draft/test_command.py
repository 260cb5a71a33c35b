"""claimcheck draft through the command line: input, output, exit status."""

from __future__ import annotations

import io
import subprocess
import sys

import pytest

from checker.claim import claim_from_document
from checker.claim.load import parse_text
from checker.cli import run

PARAGRAPH = ("Invented example. On the invented Kestrel-30 lattice we measure a linear XEB fidelity of "
             "(2.24 ± 0.21) × 10^-3 on 30 qubits from 2.5 × 10^7 samples over 10 circuits, above the "
             "threshold of 1.0 × 10^-3 at 5.9σ (p = 1.8 × 10^-9).\n")


def cli(*argv, stdin: bytes | None = None, monkeypatch=None):
    if stdin is not None:
        monkeypatch.setattr(sys, "stdin", io.TextIOWrapper(io.BytesIO(stdin), encoding="utf-8"))
    out, err = io.StringIO(), io.StringIO()
    status = run([str(a) for a in argv], out, err)
    return status, out.getvalue(), err.getvalue()


def test_file_to_stdout_loads(tmp_path):
    source = tmp_path / "abstract.txt"
    source.write_text(PARAGRAPH, encoding="utf-8")
    status, out, err = cli("draft", source)
    assert (status, err) == (0, "")
    claim = claim_from_document(parse_text(out, "draft.yaml", "yaml"))
    assert (claim.estimate.text, claim.stat_error.text, claim.samples.text) == ("2.24e-3", "0.21e-3", "2.5e7")
    assert "# sided: one    # guess:" in out


def test_standard_input(monkeypatch):
    status, out, _ = cli("draft", "-", stdin=PARAGRAPH.encode(), monkeypatch=monkeypatch)
    assert status == 0 and "estimate: 2.24e-3" in out
    status, out, _ = cli("draft", stdin=PARAGRAPH.encode(), monkeypatch=monkeypatch)
    assert status == 0 and "from <stdin>" in out


def test_out_writes_the_file_and_never_the_input(tmp_path):
    source = tmp_path / "abstract.txt"
    source.write_text(PARAGRAPH, encoding="utf-8")
    target = tmp_path / "claim.yaml"
    status, out, err = cli("draft", source, "--out", target)
    assert status == 0 and out.startswith("wrote a draft claim to") and target.exists()
    assert claim_from_document(parse_text(target.read_text(encoding="utf-8"), "c", "yaml")).qubits.text == "30"
    same = tmp_path / "same.yaml"
    same.write_text(PARAGRAPH, encoding="utf-8")
    status, _, err = cli("draft", same, "--out", same)
    assert status == 2 and "is one of the input files" in err
    assert same.read_text(encoding="utf-8") == PARAGRAPH
    status, _, err = cli("draft", source, "--out", tmp_path / "claim.txt")
    assert status == 2 and "ending in .yaml or .yml" in err


def test_check_runs_the_checks(tmp_path):
    source = tmp_path / "abstract.txt"
    source.write_text(PARAGRAPH, encoding="utf-8")
    status, out, _ = cli("draft", source, "--check")
    assert status == 0 and "# verdict: consistent" in out
    claim_from_document(parse_text(out, "draft.yaml", "yaml"))  # the report is comments
    flawed = tmp_path / "flawed.txt"
    flawed.write_text(PARAGRAPH.replace("5.9σ", "9.9σ"), encoding="utf-8")
    status, out, _ = cli("draft", flawed, "--check", "--out", tmp_path / "f.yaml")
    assert status == 1 and "verdict: inconsistent" in out


@pytest.mark.parametrize("content, message", [
    (b"No numbers here at all.\n", "holds no number"),
    (b"", "is empty"),
    (b"%PDF-1.7\n...", "is a PDF file"),
    (b"\xff\xfe\x00bad", "is not UTF-8 text"),
    (bytes(range(1, 32)) * 200, "holds binary data"),
    (b"We ran 12 circuits of 5000 shots.", "prints no number that reads as the estimate"),
])
def test_unusable_text_gets_one_line_and_exit_2(tmp_path, content, message):
    source = tmp_path / "t.txt"
    source.write_bytes(content)
    status, out, err = cli("draft", source)
    assert status == 2 and out == ""
    assert err.count("\n") == 1 and message in err and str(source) in err


def test_missing_and_directory(tmp_path):
    assert cli("draft", tmp_path / "nope.txt")[0] == 2
    status, _, err = cli("draft", tmp_path)
    assert status == 2 and "is a directory" in err


def test_too_large(tmp_path):
    source = tmp_path / "big.txt"
    source.write_bytes(b"0.5 " * 1_100_000)
    status, _, err = cli("draft", source)
    assert status == 2 and "is larger than" in err


TABLE = """Invented example: per-circuit results on the invented Tern-36 device, linear XEB, 36 qubits,
threshold 1.0e-3.

| circuit | XEB fidelity (×10^-3) | samples |
|---|---|---|
| c01 | 1.95 ± 0.71 | 2.0e6 |
| c02 | 1.73 ± 0.71 | 2.0e6 |
| c03 | 2.21 ± 0.71 | 2.0e6 |
"""


def test_table_gives_a_batch_csv_that_batch_reads(tmp_path):
    source = tmp_path / "table.md"
    source.write_text(TABLE, encoding="utf-8")
    target = tmp_path / "rows.csv"
    status, out, err = cli("draft", source, "--table", "--out", target)
    assert (status, err) == (0, "") and "wrote 3 claims" in out
    text = target.read_text(encoding="utf-8")
    assert "c01,linear-xeb,36,1.95e-3,0.71e-3,2.0e6,1.0e-3" in text
    status, out, err = cli("batch", target)
    assert status in (0, 1) and err == "" and "3 claims checked" in out
    status, out, err = cli("draft", source, "--table", "--check")
    assert status in (0, 1) and out.startswith("# Batch table") and "3 claims checked" in err
    status, _, err = cli("draft", source, "--table", "--out", tmp_path / "rows.yaml")
    assert status == 2 and "ending in .csv" in err


def test_building_the_parser_stays_light():
    """add_parser imports nothing heavy (the other commands' parsers are theirs)."""
    code = ("import argparse, sys; from checker.commands import draft; p = argparse.ArgumentParser(); "
            "draft.add_parser(p.add_subparsers()); "
            "print(*(m in sys.modules for m in ('numpy', 'scipy', 'checker.draft', 'yaml')))")
    result = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert result.stdout.split() == ["False", "False", "False", "False"]
