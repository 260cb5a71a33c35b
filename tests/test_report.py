"""Findings and the report: frozen data, the verdict rule of DESIGN.md, and the
table view."""

from __future__ import annotations

import dataclasses

import pytest

from checker.report import STATUSES, Finding, Report


def report(*statuses, checks=None):
    checks = checks or [f"check-{i}" for i in range(len(statuses))]
    return Report("Invented", "claim.yaml", tuple(Finding(s, f"sentence {i}.").from_check(c)
                                                  for i, (s, c) in enumerate(zip(statuses, checks))))


@pytest.mark.parametrize("statuses, verdict, exit_status", [
    (("pass", "fail", "skip"), "inconsistent", 1),
    (("fail",), "inconsistent", 1),
    (("pass", "warn"), "consistent", 0),
    (("warn",), "consistent", 0),
    (("skip", "skip"), "incomplete", 0),
    ((), "incomplete", 0),
])
def test_verdict(statuses, verdict, exit_status):
    # DESIGN.md: consistent (no fail), inconsistent (a fail), incomplete (nothing could be checked).
    r = report(*statuses)
    assert (r.verdict, r.exit_status) == (verdict, exit_status)


def test_counts_and_failed_checks_in_order_without_repeats():
    r = report("fail", "pass", "fail", "warn", "fail", checks=["b", "a", "b", "c", "a"])
    assert r.counts() == {"pass": 1, "warn": 1, "fail": 3, "skip": 0, "info": 0}
    assert r.failed_checks() == ("b", "a")


def test_findings_are_frozen_and_their_mappings_read_only():
    f = Finding("fail", "x.", reported=1.0, recomputed=2.0, reproduced_by={"sided": "two"}, details={"a": 1})
    with pytest.raises(dataclasses.FrozenInstanceError):
        f.status = "pass"
    with pytest.raises(TypeError):
        f.details["a"] = 2
    with pytest.raises(TypeError):
        f.reproduced_by["sided"] = "one"
    assert f.from_check("significance").check == "significance" and f.check == ""


def test_a_status_outside_the_five_is_refused():
    assert STATUSES == ("pass", "warn", "fail", "skip", "info")
    with pytest.raises(ValueError):
        Finding("ok", "x.")


def test_to_frame_has_one_row_per_finding():
    r = Report("t", "c.yaml", (Finding("pass", "a.", details={"part": "c1"}).from_check("bounds"),
                               Finding("fail", "b.", reproduced_by={"sided": "two"}).from_check("significance")))
    frame = r.to_frame()
    assert list(frame["check"]) == ["bounds", "significance"]
    assert list(frame["status"]) == ["pass", "fail"]
    assert frame.loc[1, "reproduced_by"] == {"sided": "two"}
    assert frame.loc[0, "details.part"] == "c1"


def test_str_is_the_verdict_in_one_line():
    # The terminal report is render.text's; report.py imports no renderer (tests/test_imports.py).
    r = report("pass")
    assert str(r) == "Invented: consistent (0 flagged, 0 noted, 1 agree, 0 not checked)"


def test_counts_are_written_whole_while_their_digits_are_true():
    from checker.wording import count

    assert count(14_817_027) == "14,817,027"
    assert count(10**300) == "1e300" and count(1e300) == "1e300"
    assert count(float("nan")) == "n/a"
