"""The example claims do what claims_examples/README.md says they do."""

from __future__ import annotations

import io
import re
from pathlib import Path

import pytest

from checker.checks import run_checks
from checker.claim import read_claim
from checker.cli import run

EXAMPLES = Path(__file__).resolve().parent.parent / "claims_examples"
ROW = re.compile(r"^\| `([^`]+)` \|[^|]*\| (consistent|inconsistent|incomplete)(?:: ([a-z, -]+))? \|$")


def listed() -> dict[str, tuple[str, set[str]]]:
    rows = {}
    for line in (EXAMPLES / "README.md").read_text(encoding="utf-8").splitlines():
        m = ROW.match(line.strip())
        if m:
            failed = {c.strip() for c in (m.group(3) or "").split(",") if c.strip()}
            rows[m.group(1)] = (m.group(2), failed)
    return rows


def claim_files() -> list[str]:
    return sorted(p.name for p in EXAMPLES.iterdir() if p.suffix in (".yaml", ".yml", ".json"))


def test_every_example_is_listed_and_every_listed_file_exists():
    assert sorted(listed()) == claim_files()


def test_at_least_eight_examples_covering_every_metric():
    metrics = {read_claim(EXAMPLES / name).metric for name in claim_files()}
    assert len(claim_files()) >= 8
    assert metrics == {"linear-xeb", "log-xeb", "heavy-output", "proportion", "mean", "counts"}


def test_examples_say_they_are_invented():
    for name in claim_files():
        assert "invented" in (EXAMPLES / name).read_text(encoding="utf-8").lower(), name


@pytest.mark.parametrize("name", claim_files())
def test_example_verdict_and_failed_checks_match_the_list(name):
    verdict, failed = listed()[name]
    report = run_checks(read_claim(EXAMPLES / name))
    assert report.verdict == verdict
    assert set(report.failed_checks()) == failed
    # Through the command line too: exit 1 exactly when a check failed.
    out, err = io.StringIO(), io.StringIO()
    assert run(["check", str(EXAMPLES / name)], out, err) == (1 if failed else 0)
    assert err.getvalue() == ""


def test_each_planted_flaw_is_caught_by_a_different_check_or_slip():
    # One example per check, except that a check naming several slips (comparison: the baseline's
    # error ignored, unpairing; significance: sidedness, s/sqrt(b), the normal for t, ...) may have
    # one example per slip, told apart by the reproduced_by of its flags.
    flawed = {name: failed for name, (verdict, failed) in listed().items() if verdict == "inconsistent"}
    assert all(len(f) == 1 for f in flawed.values())
    caught = []
    for name, failed in flawed.items():
        check = next(iter(failed))
        flags = [f for f in run_checks(read_claim(EXAMPLES / name)).findings if f.status == "fail"]
        slips = frozenset((k, str(v)) for f in flags for k, v in (f.reproduced_by or {}).items())
        caught.append((check, slips))
    assert len(caught) == len(set(caught))
    assert len({check for check, _ in caught}) >= 4
