"""Tests of checker/render/raw_markdown.py and ``claimcheck raw --markdown``:
the summary holds the result's numbers, the flag against the claim and the
standing caution, and a hostile title shows as written."""

from __future__ import annotations

import io

import pytest

from checker.cli import run
from checker.raw.analysis import analyse
from checker.vocabulary import CAUTION
from checker.wording import num
from checker.render.raw_markdown import render_raw_markdown

TITLE = "Invented <b>chip</b> *fidelity* [link](x)"


@pytest.fixture(scope="module")
def files(tmp_path_factory):
    folder = tmp_path_factory.mktemp("raw-md")
    data = folder / "sim.npz"
    assert run(["simulate", "--qubits", "9", "--circuits", "3", "--samples", "800", "--fidelity", "0.5",
                "--seed", "2", "--out", str(data)], io.StringIO(), io.StringIO()) == 0
    claim = folder / "claim.yaml"
    # Invented claim printing an estimate the data cannot give.
    claim.write_text(f'title: "{TITLE}"\nmetric: linear-xeb\nqubits: 9\nestimate: 0.2\nstat_error: 0.03\n'
                     "samples: 2400\ncircuits: 3\n", encoding="utf-8")
    return folder, data, claim


def test_summary_without_a_claim(files):
    _, data, _ = files
    result = analyse(str(data), "linear-xeb", 9, bootstrap=200, fit_sample=1000, seed=1)
    text = render_raw_markdown(result)
    assert text.startswith("# Raw data: ")
    assert f"estimate is {num(result.headline.estimate, 4)} ± {num(result.headline.stat_error)}" in text
    assert f"interval {num(result.bootstrap.low, 4)} to {num(result.bootstrap.high, 4)}" in text
    assert "Kolmogorov-Smirnov test of the Porter-Thomas mixture at the fitted F = " in text
    assert "Against the claim" not in text


def test_cli_writes_the_summary_with_the_flag(files):
    folder, data, claim = files
    out = folder / "notes.md"
    status = run(["raw", str(data), "--claim", str(claim), "--markdown", str(out), "--bootstrap", "200",
                  "--fit-sample", "1000"], io.StringIO(), io.StringIO())
    assert status == 1
    text = out.read_text(encoding="utf-8")
    assert text.splitlines()[0] == r"# Invented \<b\>chip\</b\> \*fidelity\* \[link\](x)"
    assert "Verdict: inconsistent." in text
    assert "**Printed estimate against the raw data** (flag)" in text
    # The summary names the flagged check by its spec's title, as the point does (it read
    # "raw estimate" before the raw-data checks had specs), and the point asks its question.
    assert "Worth raising with the authors: printed estimate against the raw data, " in text
    assert ("   - Suggested question: The raw data give a different value from the printed estimate 0.2. "
            "Are these the data behind the print, and which estimator does the claim use?") in text
    assert CAUTION in text
