"""checker/checks/spec.py and the registry: each check owns its title and its
questions, and a check added in one file plus one registry line shows in every
output with its own words, with no renderer edit (issue 10)."""

from __future__ import annotations

import io
import json

import pytest

from checker.checks import REGISTRY, SPECS, spec_for
from checker.checks.spec import WHOLE_CLAIM, CheckSpec, Statement
from checker.cli import run
from checker.report import Finding, Shown, Span


def test_one_registry_of_specs_with_their_own_ids():
    assert [s.id for s in SPECS] == list(REGISTRY)
    assert all(REGISTRY[s.id] is s for s in SPECS)
    assert len({s.title for s in SPECS}) == len(SPECS)  # no two checks share a heading


def test_every_raised_statement_can_be_asked_and_every_template_fills():
    for spec in SPECS:
        for sid, statement in spec.statements.items():
            for reproduced in (None, "under the two-sided convention"):
                asked = statement.ask("the printed estimate 2.24e-3", reproduced)
                if asked is not None:
                    assert "{" not in asked and asked.endswith(("?", ".")), (spec.id, sid, asked)


def test_statement_blanks_and_defaults():
    s = Statement(question="How was {what} made?", if_reproduced="Was {what} made {reproduced}?")
    assert s.ask("the printed p-value 0.01", None) == "How was the printed p-value 0.01 made?"
    assert s.ask("this number", "with Wilson's interval") == "Was this number made with Wilson's interval?"
    assert Statement().ask("x", None) is None
    with pytest.raises(ValueError):
        Statement(about="part")


def _tiny(claim):
    """Invented for this test: is the estimate printed with at least three figures?"""
    est = claim.estimate
    digits = len(est.text.lower().split("e")[0].replace(".", "").lstrip("-0"))
    yield Finding("warn" if digits < 3 else "pass", f"The estimate {est.text} is printed with {digits} figures.",
                  reported=est.value, recomputed=float(digits), field=est.path, statement="figures",
                  printed=Shown.of(est), recomputed_range=Span(3.0, 3.0), tolerance=0.0)


TINY = CheckSpec(
    id="tiny-figures", title="Figures printed in the headline (a check made up for this test)", run=_tiny,
    statements={"figures": Statement(question="Could the authors print {what} with one more figure, "
                                              "so readers can recompute from it?")})

CLAIM = ("title: Invented claim for the tiny check\nmetric: linear-xeb\nqubits: 20\nestimate: 2.2e-3\n"
         "stat_error: 0.21e-3\nsamples: 3e7\n")


def test_a_check_registered_in_a_test_shows_in_every_output(monkeypatch, tmp_path):
    monkeypatch.setitem(REGISTRY, TINY.id, TINY)
    assert spec_for("tiny-figures") is TINY
    path = tmp_path / "claim.yaml"
    path.write_text(CLAIM, encoding="utf-8")
    notes, page = tmp_path / "notes.md", tmp_path / "report.html"
    monkeypatch.chdir(tmp_path)

    text = io.StringIO()
    assert run(["check", "claim.yaml"], text, io.StringIO()) == 0
    line = next(x for x in text.getvalue().splitlines() if "tiny-figures" in x)
    assert line.startswith(" note tiny-figures") and line.endswith("The estimate 2.2e-3 is printed with 2 figures.")

    out = io.StringIO()
    run(["check", "claim.yaml", "--json", "--markdown", str(notes), "--html", str(page)], out, io.StringIO())
    tiny = [f for f in json.loads(out.getvalue())["findings"] if f["check"] == "tiny-figures"]
    assert len(tiny) == 1
    assert tiny[0]["title"] == TINY.title and tiny[0]["field"] == "estimate" and tiny[0]["statement"] == "figures"
    question = ("Could the authors print the printed estimate 2.2e-3 with one more figure, so readers can "
                "recompute from it?")
    assert tiny[0]["question"] == question

    md = notes.read_text(encoding="utf-8")
    assert f"**{TINY.title}** (note)" in md
    assert "- Printed: estimate `2.2e-3` (field `estimate`)." in md
    assert f"- Suggested question: {question}" in md

    html = page.read_text(encoding="utf-8")
    assert TINY.title in html and question in html
    assert '<code>2.2e-3</code> <span class="cc-field">(estimate)</span>' in html


def test_an_unregistered_check_still_renders_with_plain_words(monkeypatch):
    from checker.render.notes import make_point

    p = make_point(Finding("warn", "Something odd.", check="made-up-check"))
    assert p.heading == "Made up check" and p.question == "Could the authors say how this number was obtained?"
    assert WHOLE_CLAIM == "claim"


# --- the raw-data registry --------------------------------------------------------------------

def test_the_raw_registry_beside_the_claim_registry():
    from checker.checks import RAW_REGISTRY, RAW_SPECS

    assert [s.id for s in RAW_SPECS] == list(RAW_REGISTRY)
    assert not set(RAW_REGISTRY) & set(REGISTRY)  # --only never names a raw-data check
    titles = [s.title for s in SPECS + RAW_SPECS]
    assert len(set(titles)) == len(titles)
    assert all(spec_for(s.id) is s for s in RAW_SPECS)
    for spec in RAW_SPECS:
        for sid, statement in spec.statements.items():
            for reproduced in (None, "with estimator maximum likelihood"):
                asked = statement.ask("the printed estimate 0.606", reproduced)
                if asked is not None:
                    assert "{" not in asked and asked.endswith(("?", ".")), (spec.id, sid, asked)


def _tiny_raw(claim, result):
    """Invented for this test: does the printed sample count name every row's worth of circuits?"""
    rows = claim.samples
    per = result.rows / max(result.circuit_count, 1)
    yield Finding("warn", f"The data hold {per:,.0f} samples per circuit.", reported=rows.value,
                  recomputed=per, field=rows.path, statement="per_circuit", printed=Shown.of(rows),
                  recomputed_range=Span(per, per), tolerance=0.0)


TINY_RAW = CheckSpec(
    id="tiny-per-circuit", title="Samples per circuit in the raw data (a check made up for this test)",
    run=_tiny_raw,
    statements={"per_circuit": Statement(question="Could the authors print how {what} splits over the circuits?")})


def test_a_raw_data_check_registered_in_a_test_shows_in_every_output(monkeypatch, tmp_path):
    from pathlib import Path

    from checker.checks import RAW_REGISTRY

    monkeypatch.setitem(RAW_REGISTRY, TINY_RAW.id, TINY_RAW)
    examples = Path(__file__).resolve().parents[2] / "claims_examples"
    data, claim = examples / "simulated_raw_lattice.csv", examples / "simulated_raw_lattice.yaml"
    notes, page = tmp_path / "raw.md", tmp_path / "raw.html"
    base = ["raw", str(data), "--claim", str(claim), "--bootstrap", "100", "--fit-sample", "1000"]

    text = io.StringIO()
    assert run(base + ["--markdown", str(notes), "--html", str(page)], text, io.StringIO()) == 0
    line = next(x for x in text.getvalue().splitlines() if "tiny-per-circuit" in x)
    assert line.startswith(" note tiny-per-circuit") and line.endswith("The data hold 500 samples per circuit.")

    out = io.StringIO()
    run(base + ["--json"], out, io.StringIO())
    tiny = [f for f in json.loads(out.getvalue())["findings"] if f["check"] == "tiny-per-circuit"]
    assert len(tiny) == 1 and tiny[0]["title"] == TINY_RAW.title and tiny[0]["field"] == "samples"
    question = "Could the authors print how the printed number of samples 4000 splits over the circuits?"
    assert tiny[0]["question"] == question

    md = notes.read_text(encoding="utf-8")
    assert f"**{TINY_RAW.title}** (note). The data hold 500 samples per circuit." in md
    assert f"   - Suggested question: {question}" in md

    html = page.read_text(encoding="utf-8")
    assert TINY_RAW.title in html and question in html
