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
