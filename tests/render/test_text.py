"""Terminal text: one line per finding, then the verdict; compared in full with
a committed golden file for a fixed report.

Refresh the golden file on purpose with
    CLAIMCHECK_REFRESH_GOLDEN=1 .venv/bin/python -m pytest tests/render/test_text.py
and read the diff before committing it.
"""

from __future__ import annotations

import os
from pathlib import Path

import pytest

from checker.render.text import render_text, render_verdict_line
from checker.vocabulary import CAUTION_SHORT as CAUTION
from checker.report import Finding, Report

GOLDEN = Path(__file__).resolve().parent / "golden" / "text_fixed_report.txt"

FIXED = Report("Invented 30-qubit claim", "claims/invented.yaml", (
    Finding("pass", "All 4 printed values checked lie in their physical ranges.").from_check("bounds"),
    Finding("warn", "Headline: 5.6x the sampling floor.").from_check("error-floor"),
    Finding("fail", "Printed p = 0.0253 is the two-sided value.", reported=0.0253, recomputed=0.0127,
            reproduced_by={"sided": "two"}).from_check("significance"),
    Finding("skip", "No look-elsewhere correction to check; needs trials or upcrossings.").from_check("look-elsewhere"),
    Finding("fail", "Part c2: printed stat_error 0.001 is below the floor.",
            details={"part": "c2"}).from_check("error-floor"),
    Finding("pass", "Consistent with the floor.", details={"part": "c3"}).from_check("error-floor"),
))


def test_golden_text():
    text = render_text(FIXED)
    if os.environ.get("CLAIMCHECK_REFRESH_GOLDEN"):
        GOLDEN.write_text(text, encoding="utf-8")
        pytest.skip(f"golden file rewritten: {GOLDEN.name}")
    assert text == GOLDEN.read_text(encoding="utf-8")


def test_one_line_per_finding_then_the_verdict():
    lines = render_text(FIXED).splitlines()
    assert lines[:3] == ["Invented 30-qubit claim", "  from claims/invented.yaml", ""]
    body = lines[3:3 + len(FIXED.findings)]
    for line, finding in zip(body, FIXED.findings):
        assert finding.check in line and finding.message in line
    assert lines[3 + len(FIXED.findings)] == ""
    assert lines[-2].startswith("verdict: inconsistent") and lines[-1] == CAUTION


def test_a_part_label_is_added_only_when_the_message_lacks_it():
    body = render_text(FIXED).splitlines()[3:9]
    assert body[4].endswith("below the floor.")  # "Part c2" already in the message
    assert body[5].endswith("Consistent with the floor. [c3]")


def test_the_caution_appears_only_with_a_flag_or_a_note():
    clean = Report("t", "c.yaml", (Finding("pass", "ok.").from_check("bounds"),))
    assert CAUTION not in render_text(clean)
    noted = Report("t", "c.yaml", (Finding("warn", "hm.").from_check("bounds"),))
    assert CAUTION in render_text(noted)
    assert "a question for the authors, not proof" in CAUTION


def test_verdict_line():
    assert render_verdict_line(FIXED) == "inconsistent (significance, error-floor); 2 flagged, 1 noted, 2 agree\n"
    empty = Report("t", "c.yaml", ())
    assert render_verdict_line(empty) == "incomplete; 0 flagged, 0 noted, 0 agree\n"
    assert "verdict: incomplete" in render_text(empty)
