"""checker/render/survey_text.py: the batch summary as text, CSV and JSON."""

import io
import json
from pathlib import Path

import pandas as pd
import pytest

from checker.render.survey_text import (SHOW_AT_MOST, render_batch_csv, render_batch_json,
                                        render_batch_text, render_problems)
from checker.survey import COLUMNS, run_batch

EXAMPLE = Path(__file__).resolve().parents[2] / "claims_examples" / "survey_table.csv"


@pytest.fixture(scope="module")
def example():
    return run_batch(EXAMPLE)


def test_text_summary_of_the_example(example):
    text = render_batch_text(example.frame, example.summary)
    lines = text.splitlines()
    assert lines[0] == f"{EXAMPLE}: 11 rows; 10 claims checked, 1 row could not be used"
    assert lines[1] == "verdicts: 7 consistent, 3 inconsistent, 0 incomplete"
    assert lines[2] == ("required sigma: 10 claims state one and have a recomputed significance; 9 clear it "
                        "as recomputed, 7 after Holm and 9 after Benjamini-Hochberg adjustment across 10 "
                        "recomputed p-values")
    # Row 7 states trials: the count and the adjustment use its global significance, and say so.
    assert lines[3] == ("look-elsewhere: the required-sigma count and the adjustment use the look-elsewhere-"
                        "corrected (global) significance for 1 claim that states trials (Sidak), the local one "
                        "for the other 9")
    assert "inconsistent:" in lines
    assert "  row 6  Linear XEB of an invented 24-qubit ring  [significance]" in lines
    assert lines[-1].startswith("A flag is a question for the authors")


def test_long_lists_are_cut(example):
    frame = pd.concat([example.frame] * 10, ignore_index=True)
    text = render_batch_text(frame, example.summary)
    assert f"  ... and {30 - SHOW_AT_MOST} more (write them all with --out)" in text
    problems = [f"row {i}: bad" for i in range(25)]
    out = render_problems(problems).splitlines()
    assert len(out) == SHOW_AT_MOST + 1 and out[-1].startswith("... and 5 more that could not be used")


def test_csv_round_trips(example):
    back = pd.read_csv(io.StringIO(render_batch_csv(example.frame)), keep_default_na=False, dtype=str)
    assert list(back.columns) == list(COLUMNS)
    assert len(back) == 11
    assert back.loc[5, "failed_checks"] == "significance"
    assert float(back.loc[1, "p_recomputed"]) == example.frame.loc[1, "p_recomputed"]  # full precision
    assert back.loc[10, "p_recomputed"] == "" and back.loc[10, "clears_holm"] == ""


def test_json_is_strict_and_complete(example):
    def refuse(token):
        raise ValueError(token)

    data = json.loads(render_batch_json(example.frame, example.summary), parse_constant=refuse)
    assert data["summary"] == json.loads(json.dumps(example.summary))
    assert len(data["claims"]) == 11
    assert data["claims"][10]["sigma_recomputed"] is None
    assert data["claims"][10]["clears_required"] is None
    assert data["claims"][0]["clears_required"] is True
    assert set(data["claims"][0]) == set(COLUMNS)
