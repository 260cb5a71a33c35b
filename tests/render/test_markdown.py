"""Tests of checker/render/markdown.py: golden files for two example claims,
escaping of hostile strings, reproducibility, and the CLI's --markdown.

Golden files live in tests/render/golden/.  They change only on purpose:

    CLAIMCHECK_REFRESH_GOLDEN=1 .venv/bin/python -m pytest tests/render/test_markdown.py

rewrites them (those tests then report "skipped: golden file rewritten"); read
the diff before committing it.
"""

from __future__ import annotations

import io
import re

import pytest

from checker.cli import run
from checker.claim import read_claim
from checker.render.markdown import md, render_markdown
from checker.report import Finding, Report

from render_fixtures import (BASE_CHECKS, CLAIMS, GOLDEN, four_parts_report, refresh_requested,
                             sidedness_report)

EXAMPLES = {"sidedness_slip": sidedness_report, "four_parts": four_parts_report}


@pytest.mark.parametrize("name", sorted(EXAMPLES))
def test_golden(name, monkeypatch):
    report, claim = EXAMPLES[name](monkeypatch)
    text = render_markdown(report, claim)
    path = GOLDEN / f"{name}.md"
    if refresh_requested():
        path.parent.mkdir(exist_ok=True)
        path.write_text(text, encoding="utf-8")
        pytest.skip(f"golden file rewritten: {path.name}")
    assert path.exists(), f"missing golden file {path}; create it with CLAIMCHECK_REFRESH_GOLDEN=1"
    assert text == path.read_text(encoding="utf-8")


def test_shape_of_the_notes(monkeypatch):
    report, claim = four_parts_report(monkeypatch)
    text = render_markdown(report, claim)
    lines = text.splitlines()
    # The two-line summary: the first two paragraphs after the title.
    assert lines[0].startswith("# Referee notes: ")
    assert lines[1] == "" and lines[3] == "" and lines[4].startswith("Verdict: inconsistent.")
    # One numbered point per flag or note, in report order, each with a question.
    raised = [f for f in report.findings if f.status in ("fail", "warn")]
    numbered = re.findall(r"^(\d+)\. \*\*", text, flags=re.M)
    assert numbered == [str(i) for i in range(1, len(raised) + 1)]
    assert text.count("- Suggested question: ") == len(raised)
    # Passes come after the points, briefly: one line per check; the caution closes.
    assert text.index("## Points to raise") < text.index("## What agrees") < text.index("## Not checked")
    agreed = text.split("## What agrees\n\n")[1].split("\n\n")[0].splitlines()
    assert len(agreed) == len({f.check for f in report.findings if f.status == "pass"})
    assert ("- Statistical error against the sampling floor: agrees for the headline, part family A, "
            "part family B, part family C and part family D.") in agreed
    assert lines[-1].startswith("*A flag is a question for the authors, not an accusation")


def test_point_names_the_method_that_reproduces_the_print(monkeypatch):
    report, claim = four_parts_report(monkeypatch)
    text = render_markdown(report, claim)
    block = text.split("1. **Combination of the parts** (flag).")[1].split("\n2. ")[0]
    assert "- Printed: combined error `0.16e-3` (field `combination.stat_error`)." in block
    assert "- The claim's inputs imply: `0.320e-3`." in block  # like the printed 0.16e-3
    assert "- The print would follow with inverse-variance weights." in block


def test_consistent_claim_has_no_points(monkeypatch, tmp_path):
    claim_file = tmp_path / "fine.yaml"
    # Invented numbers: 5.9 sigma one-sided is p = 1.8e-9 (PDG "Statistics" tail
    # table gives 2.87e-7 at 5 sigma; 1.8e-9 is scipy.stats.norm.sf(5.9)).
    claim_file.write_text("title: Invented fine claim\nmetric: linear-xeb\nqubits: 20\n"
                          "estimate: 2.24e-3\nstat_error: 0.21e-3\nsamples: 3e7\nthreshold: 1.0e-3\n"
                          "significance: {sigma: 5.9, p_value: 1.8e-9}\n", encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    claim = read_claim("fine.yaml")
    from checker.checks import run_checks

    report = run_checks(claim, BASE_CHECKS)
    assert report.verdict == "consistent"
    text = render_markdown(report, claim)
    assert "## Points to raise" not in text
    assert "Verdict: consistent. Nothing in the arithmetic needs raising." in text


def test_incomplete_claim_says_what_is_missing(monkeypatch, tmp_path):
    (tmp_path / "bare.yaml").write_text("title: Invented bare claim\nmetric: mean\nestimate: 3.2\n",
                                        encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    claim = read_claim("bare.yaml")
    report = Report(claim.title, claim.file, (
        Finding("skip", "Cannot recompute the significance; needs threshold.", check="significance"),))
    text = render_markdown(report, claim)
    assert "Verdict: incomplete." in text
    assert "## Not checked\n\n- Significance: Cannot recompute the significance; needs threshold." in text


HOSTILE = [
    "<script>alert(1)</script>",
    "[click](javascript:alert(1))",
    "**bold** _under_ `code` | pipe",
    "Title #",
    "line one\n\n# not a heading",
    "&lt;b&gt; entity",
    "back\\slash",
]


@pytest.mark.parametrize("text", HOSTILE)
def test_md_escapes_markup(text):
    out = md(text)
    assert "\n" not in out
    for raw in ("<", ">", "[", "]", "`", "|", "*"):
        assert raw not in out.replace("\\" + raw, "")
    assert "&lt;" not in out.replace("\\&lt;", "")
    # Stripping the escapes gives back the text as written (on one line).
    assert re.sub(r"\\(.)", r"\1", out) == " ".join(text.split())


def test_md_leaves_intraword_underscores():
    assert md("stat_error and p_value") == "stat_error and p_value"
    assert md("_lead trail_") == r"\_lead trail\_"


def test_hostile_title_and_labels_in_the_notes(tmp_path, monkeypatch):
    (tmp_path / "h.yaml").write_text(
        'title: "<script>alert(1)</script> ## [x](javascript:y)"\n'
        'source: "<img src=x onerror=alert(2)>"\n'
        "metric: linear-xeb\nqubits: 20\nestimate: 2.0e-3\nstat_error: 0.1e-3\nsamples: 1e3\n"
        "parts:\n  - {label: '<b>bold</b>', estimate: 2.0e-3, stat_error: 0.1e-3, samples: 1e3}\n",
        encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    claim = read_claim("h.yaml")
    from checker.checks import run_checks

    text = render_markdown(run_checks(claim, BASE_CHECKS), claim)
    assert not re.search(r"(?<!\\)[<>]", text), "an unescaped angle bracket"
    assert r"\<script\>alert(1)\</script\>" in text
    assert r"\[x\](javascript:y)" in text


def test_same_input_same_bytes(monkeypatch):
    first = render_markdown(*four_parts_report(monkeypatch))
    second = render_markdown(*four_parts_report(monkeypatch))
    assert first.encode() == second.encode()


def test_cli_writes_markdown_and_refuses_the_input(tmp_path, monkeypatch):
    source = CLAIMS / "sidedness_slip.yaml"
    out = tmp_path / "notes.md"
    stdout, stderr = io.StringIO(), io.StringIO()
    status = run(["check", str(source), "--only", ",".join(BASE_CHECKS), "--markdown", str(out)],
                 stdout, stderr)
    assert status == 1  # the claim has a flag
    assert out.read_text(encoding="utf-8").startswith("# Referee notes: Cross-entropy fidelity")
    before = source.read_bytes()
    status = run(["check", str(source), "--markdown", str(source)], io.StringIO(), stderr)
    assert status == 2 and "is one of the input files" in stderr.getvalue()
    assert source.read_bytes() == before


def test_the_extrapolation_point_names_syst_error_and_quotes_its_own_number(monkeypatch, tmp_path):
    # The example of issue 10 (invented numbers): the factor's error 0.100 times the
    # combined 2.00e-3 is 0.200e-3 of systematic error (JCGM 100:2008, eq. (10)).
    from checker.checks import run_checks

    path = tmp_path / "extrapolation.yaml"
    path.write_text("title: Invented extrapolation\nmetric: linear-xeb\nestimate: 2.00e-3\nstat_error: 0.30e-3\n"
                    "syst_error: 0.30e-3\ncombination: {method: inverse-variance, estimate: 2.00e-3, "
                    "stat_error: 0.30e-3}\nextrapolation: {factor: 1.000, factor_error: 0.100}\n", encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    claim = read_claim("extrapolation.yaml")
    report = run_checks(claim, ["extrapolation"])
    syst = next(f for f in report.findings if f.status == "warn")
    assert syst.field == "syst_error" and "0.200e-3" in syst.message
    text = render_markdown(report, claim)
    assert "- Printed: systematic error `0.30e-3` (field `syst_error`)." in text
    assert "- The claim's inputs imply: `0.200e-3`." in text


# Invented claim (issue 16): sided: one, but the printed p is the two-sided one. The
# inputs give z = (0.004200 - 0.001000)/0.000900 = 3.556, one-sided p = 1.88e-4 and
# two-sided 3.77e-4 (scipy.stats.norm.sf); the printed 3.56 sigma is two-sided p = 3.71e-4
# (scipy.stats.norm.sf(3.56) * 2). So one slip makes two flags: sigma-vs-p and p-vs-inputs.
ONE_SLIP = ("# Invented scenario: made-up lab and numbers.\n"
            "title: Invented two-flag sidedness slip\nmetric: log-xeb\nqubits: 40\n"
            "estimate: 0.004200\nstat_error: 0.000900\nthreshold: 0.001000\n"
            "significance: {sigma: 3.56, p_value: 3.73e-4, sided: one}\n")


def test_one_slip_is_one_point_listing_what_it_explains(tmp_path):
    from scipy.stats import norm

    assert abs(2 * norm.sf(3.56) - 3.73e-4) < 0.05e-4 and abs(norm.sf(3.556) - 1.88e-4) < 0.01e-4
    claim = tmp_path / "slip.yaml"
    claim.write_text(ONE_SLIP, encoding="utf-8")
    notes, page = tmp_path / "notes.md", tmp_path / "report.html"
    stdout = io.StringIO()
    status = run(["check", str(claim), "--markdown", str(notes), "--html", str(page), "--json"],
                 stdout, io.StringIO())
    assert status == 1
    import json

    flags = [f for f in json.loads(stdout.getvalue())["findings"] if f["status"] == "fail"]
    assert [f["statement"] for f in flags] == ["sigma_vs_p", "p_vs_inputs"]
    assert all(f["reproduced_by"] == {"sided": "two"} for f in flags)
    text = notes.read_text(encoding="utf-8")
    points = text.split("## Points to raise\n\n")[1].split("\n## ")[0]
    assert re.findall(r"^(\d+)\. ", points, flags=re.M) == ["1"]
    assert points.count("Suggested question: ") == 1
    assert ("1. **Significance** (flag). One slip explains 2 findings: the print would follow "
            "under the two-sided convention (both tails).") in points
    # Each finding it explains is listed with its own numbers.
    assert "   - Printed 3.56 sigma is p = 0.00018 to 0.00019 one-sided" in points
    assert "   - Printed p = 3.73e-4, but estimate, threshold and errors give p = 0.00019" in points
    assert points.count("     - Printed: p-value `3.73e-4` (field `significance.p_value`).") == 2
    # The HTML report's points: one card, the same question once.
    html = page.read_text(encoding="utf-8")
    assert len(re.findall(r'<article class="cc-point', html)) == 1
    assert html.count("Ask the authors") == 1 and "One slip explains 2 findings" in html
