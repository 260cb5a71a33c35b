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


# Invented claim (issue 16): sided: one, but the printed p is the two-sided one. z = (0.480 -
# 0.380)/0.036 = 2.778: one-sided p = 2.74e-3, two-sided 5.47e-3; the printed 2.78 sigma is
# two-sided p = 5.44e-3 (scipy.stats.norm.sf, times 2). One slip, two flags: sigma-vs-p and
# p-vs-inputs; the raw data (the fixture's, estimate 0.4804) flag on their own besides.
SLIP = ("# Invented scenario: made-up lab and numbers.\ntitle: Invented raw-data sidedness slip\n"
        "metric: linear-xeb\nqubits: 9\nestimate: 0.480\nstat_error: 0.036\nsamples: 2400\ncircuits: 3\n"
        "threshold: 0.380\nsignificance: {sigma: 2.78, p_value: 5.4e-3, sided: one}\n")


def test_one_slip_is_one_point_in_the_raw_notes(files):
    import re

    from scipy.stats import norm

    z = (0.480 - 0.380) / 0.036
    assert abs(norm.sf(z) - 2.74e-3) < 0.01e-3 and abs(2 * norm.sf(2.78) - 5.44e-3) < 0.01e-3
    folder, data, _ = files
    claim, out = folder / "slip.yaml", folder / "slip.md"
    claim.write_text(SLIP, encoding="utf-8")
    stdout = io.StringIO()
    status = run(["raw", str(data), "--claim", str(claim), "--markdown", str(out), "--bootstrap", "200",
                  "--fit-sample", "1000", "--json"], stdout, io.StringIO())
    assert status == 1
    import json

    findings = json.loads(stdout.getvalue())["findings"]
    slipped = [f for f in findings if f["status"] == "fail" and f["reproduced_by"] == {"sided": "two"}
               and f["details"].get("numbers") != "raw"]
    assert [f["statement"] for f in slipped] == ["sigma_vs_p", "p_vs_inputs"]
    text = out.read_text(encoding="utf-8")
    points = text.split("## Against the claim\n\n")[1].split("\n\nAgrees: ")[0]
    # Five flags shown (the rerun that repeats the printed sigma-vs-p is folded away): the slip's
    # two, and three from the raw numbers. The two the slip explains share one point: four points.
    shown = [f for f in findings if f["status"] == "fail"
             and not (f["details"].get("numbers") == "raw" and f["statement"] == "sigma_vs_p")]
    assert len(shown) == 5
    assert re.findall(r"^(\d+)\. ", points, flags=re.M) == ["1", "2", "3", "4"]
    assert ("1. **Significance** (flag). One slip explains 2 findings: the print would follow under the "
            "two-sided convention (both tails).") in points
    first = points.split("\n2. ")[0]
    assert first.count("Suggested question: ") == 1
    assert "   - Printed 2.78 sigma is p = 0.0027 to 0.0028 one-sided, but the printed p = 5.4e-3" in first
    assert "   - Printed p = 5.4e-3, but estimate, threshold and errors give p = 0.0023 to 0.0032" in first
    # The raw-number reruns no convention reproduces stay points of their own, named as such.
    assert "**Significance (with the raw data's numbers)** (flag)" in points.split("\n2. ", 1)[1]


def test_one_slip_is_one_card_in_the_raw_page(files):
    """The raw HTML page groups as the raw Markdown does: the sidedness slip's two flags
    (SLIP above) share one card with one question; the other flags have a card each."""
    folder, data, _ = files
    claim, out = folder / "slip_page.yaml", folder / "slip.html"
    claim.write_text(SLIP, encoding="utf-8")
    status = run(["raw", str(data), "--claim", str(claim), "--html", str(out), "--bootstrap", "200",
                  "--fit-sample", "1000"], io.StringIO(), io.StringIO())
    assert status == 1
    page = out.read_text(encoding="utf-8")
    cards = page.split('<article class="cc-point')[1:]
    assert len(cards) == 4  # five flags shown, two of them one slip
    first = cards[0]
    assert "One slip explains 2 findings: the print would follow under the two-sided convention" in first
    assert first.count("<dt>Ask the authors</dt>") == 1
    assert "Printed 2.78 sigma is p = 0.0027 to 0.0028 one-sided" in first
    assert "Printed p = 5.4e-3, but estimate, threshold and errors give p = 0.0023 to 0.0032" in first
    assert all(f'id="finding-{n}"' in page for n in range(1, 5)) and 'id="finding-5"' not in page
