"""The YAML writer and the loadable guarantee: values written as the claim loader reads them,
comments that cannot break the document, refused fields moved to the Dropped list."""

from __future__ import annotations

import pytest

from checker.claim import claim_from_document
from checker.claim.load import parse_text
from checker.draft import DraftError, draft_text, make_loadable
from checker.draft.model import Draft, Field
from checker.draft.notation import Number, number
from checker.draft.writer import render_yaml, scalar


@pytest.mark.parametrize("value, text", [
    (number("2.24", -3), "2.24e-3"),
    (number("0.21", -3), "0.21e-3"),
    (number("1200"), "1200"),
    (number("91.3", None, True), '"91.3%"'),
    (Number("< 1e-5", 0.0), '"< 1e-5"'),
    (True, "true"),
    ("linear-xeb", "linear-xeb"),
    ("yes", '"yes"'),          # a YAML 1.1 true/false word stays text
    ("circuit: a # b", '"circuit: a # b"'),
    ((number("58"), number("30")), "[58, 30]"),
])
def test_scalars(value, text):
    assert scalar(value) == text


def minimal(**extra) -> Draft:
    fields = [Field(("title",), "t", "", "heading"), Field(("metric",), "mean", "", "metric-mean"),
              Field(("estimate",), number("0.5"), "of 0.5", "estimate-words")]
    fields += [Field(tuple(k.split(".")), v, "q", "test") for k, v in extra.items()]
    return Draft("x.txt", tuple(fields))


def test_hostile_quotes_and_titles_never_break_the_document():
    nasty = "a\nb\x85c\u2028d # e: [f] {g} 'h' \"i\" \\ \x00 \ud800 \ufeff"
    draft = Draft("x\ny.txt", (Field(("title",), nasty, nasty, "heading", nasty),
                               Field(("metric",), "mean", nasty, "metric-mean"),
                               Field(("estimate",), number("0.5"), nasty, "estimate-words", nasty)),
                  unplaced=((nasty, nasty, nasty),), notes=(nasty,))
    doc = parse_text(render_yaml(draft), "d.yaml", "yaml")
    assert doc.data["estimate"] == 0.5 and "\n" not in doc.data["title"]


def test_refused_fields_are_dropped_with_the_reason():
    draft, text = make_loadable(minimal(**{"samples": number("2.5"), "sd": number("0.1")}))
    assert [f.path for f, _ in draft.dropped] == [("samples",)]
    assert "whole number" in draft.dropped[0][1]
    assert "# Dropped" in text and "samples: 2.5" in text
    claim = claim_from_document(parse_text(text, "d.yaml", "yaml"))
    assert claim.sd.text == "0.1" and claim.samples is None


def test_a_refused_metric_stops_with_one_line():
    draft = Draft("x.txt", (Field(("title",), "t", "", "heading"), Field(("metric",), "bogus", "", "m"),
                            Field(("estimate",), number("0.5"), "", "e")))
    with pytest.raises(DraftError) as err:
        make_loadable(draft)
    assert "reads as a bogus claim" in err.value.one_line()


def test_same_text_same_bytes():
    text = "We measure a linear XEB fidelity of (2.24 ± 0.21) × 10^-3 above 1e-3 at 5.9σ on 30 qubits."
    assert make_loadable(draft_text(text, "a"))[1] == make_loadable(draft_text(text, "a"))[1]
