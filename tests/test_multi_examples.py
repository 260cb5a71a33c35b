"""The multi-part example claims do what claims_examples/MULTI_NOTES.md says.

Once the lead has merged those rows into claims_examples/README.md (and removed
MULTI_NOTES.md), tests/test_examples.py covers the same ground and this file
skips."""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from checker.checks import run_checks
from checker.claim import read_claim

EXAMPLES = Path(__file__).resolve().parent.parent / "claims_examples"
NOTES = EXAMPLES / "MULTI_NOTES.md"
ROW = re.compile(r"^\| `([^`]+)` \|[^|]*\| (consistent|inconsistent|incomplete)(?:: ([a-z, -]+))? \|$")


def listed() -> dict[str, tuple[str, set[str]]]:
    if not NOTES.exists():
        return {}
    rows = {}
    for line in NOTES.read_text(encoding="utf-8").splitlines():
        m = ROW.match(line.strip())
        if m:
            rows[m.group(1)] = (m.group(2), {c.strip() for c in (m.group(3) or "").split(",") if c.strip()})
    return rows


pytestmark = pytest.mark.skipif(not NOTES.exists(), reason="merged into claims_examples/README.md")


def test_the_notes_list_the_multi_part_checks_each_once():
    rows = listed()
    assert len(rows) >= 4
    caught = [next(iter(f)) for v, f in rows.values() if v == "inconsistent"]
    assert all(len(f) == 1 for v, f in rows.values() if v == "inconsistent")
    assert sorted(caught) == sorted(set(caught))
    assert {"combination", "heterogeneity", "extrapolation"} <= set(caught)
    for name in rows:
        assert (EXAMPLES / name).exists(), name


@pytest.mark.parametrize("name", sorted(listed()))
def test_example_verdict_and_failed_checks(name):
    verdict, failed = listed()[name]
    text = (EXAMPLES / name).read_text(encoding="utf-8")
    assert "invented" in text.lower()
    report = run_checks(read_claim(EXAMPLES / name))
    assert report.verdict == verdict
    assert set(report.failed_checks()) == failed
    if verdict == "consistent" and name != "error_budget_optimistic.yaml":
        assert report.counts()["warn"] == 0, [f.message for f in report.findings if f.status == "warn"]


def test_the_budget_example_is_noted_by_error_budget_only():
    report = run_checks(read_claim(EXAMPLES / "error_budget_optimistic.yaml"))
    assert [f.check for f in report.findings if f.status == "warn"] == ["error-budget"]
