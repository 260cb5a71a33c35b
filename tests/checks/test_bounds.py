"""The ``bounds`` check on parts: each part's values get their own findings,
labelled with the part."""

from __future__ import annotations

import textwrap

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import parse_text


def findings(text: str):
    claim = claim_from_document(parse_text(textwrap.dedent(text), "claim.yaml", "yaml"))
    return run_checks(claim, ["bounds"]).findings


def test_an_impossible_part_is_flagged_with_its_label():
    text = """
        title: parts
        metric: proportion
        estimate: 0.9
        parts:
          - {label: run 1, estimate: 0.91, stat_error: 0.01}
          - {label: run 2, estimate: 1.02, stat_error: 0.01}
          - {label: run 3, estimate: 0.88, stat_error: 0}
    """
    failed = [f for f in findings(text) if f.status == "fail"]
    assert {f.details["part"] for f in failed} == {"run 2", "run 3"}
    assert all(f.message.startswith(f"Part {f.details['part']}:") for f in failed)


def test_clean_parts_pass():
    text = """
        title: parts
        metric: linear-xeb
        estimate: 2.0e-3
        parts:
          - {label: a, estimate: 2.1e-3, stat_error: 0.5e-3}
          - {label: b, estimate: 1.9e-3, stat_error: 0.5e-3}
    """
    (f,) = findings(text)
    assert f.status == "pass"
