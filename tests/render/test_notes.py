"""Tests of checker/render/notes.py: findings turned into points a referee
raises, and the printed numbers they are about."""

from __future__ import annotations

import math

import pytest

from checker.render.notes import make_point, printed_numbers, summary_lines
from checker.wording import num
from checker.report import Finding, Report, Shown, Span

from render_fixtures import four_parts_report, load, sidedness_report


@pytest.mark.parametrize("x, text", [
    (0.0, "0"), (2.4578e-9, "2.46e-9"), (0.000157, "0.000157"), (4.6849, "4.68"), (1200.0, "1200"),
    (2.5e7, "2.5e7"), (-3.0, "-3"), (math.nan, "n/a"), (math.inf, "n/a"), (None, "n/a"), (True, "n/a"),
])
def test_num(x, text):
    assert num(x) == text


def test_printed_numbers_keep_their_text(monkeypatch):
    claim = load("four_parts.yaml", monkeypatch)
    by_path = {r.path: r.text for r in printed_numbers(claim)}
    assert by_path["stat_error"] == "0.19e-3"
    assert by_path["parts.1.estimate"] == "1.25e-3"
    assert by_path["error_budget.1.count"] == "1200"
    assert by_path["combination.stat_error"] == "0.16e-3"


def test_the_point_names_the_field_the_finding_names(monkeypatch):
    claim = load("four_parts.yaml", monkeypatch)
    rep = claim.parts[3].stat_error
    f = Finding("warn", "m", reported=rep.value, field=rep.path, printed=Shown.of(rep),
                statement="above_floor", check="error-floor")
    p = make_point(f, claim)
    assert (p.printed, p.printed_field) == ("0.33e-3", "parts.3.stat_error")
    # No guessing from values: a finding that names no field has no "printed" line.
    assert make_point(Finding("warn", "m", reported=rep.value, check="error-floor"), claim).printed is None


def test_flag_without_a_reproducing_convention(monkeypatch):
    claim = load("sidedness_slip.yaml", monkeypatch)
    sigma = claim.significance.sigma
    f = Finding("fail", "Printed 5.9 sigma, but ... no convention reproduces it.", reported=5.9,
                recomputed=4.1, details={"quantity": "sigma", "sigma_low": 4.0, "sigma_high": 4.2},
                check="significance", field=sigma.path, printed=Shown.of(sigma), statement="sigma_vs_inputs",
                recomputed_range=Span(4.0, 4.2))
    p = make_point(f, claim)
    assert p.printed == "5.9" and p.printed_field == "significance.sigma"
    assert p.implied == "4 to 4.2"
    assert p.reproduced is None and p.unmatched
    assert p.question.startswith("How was the significance computed")


def test_heterogeneity_point_reads_the_contract(monkeypatch):
    report, claim = four_parts_report(monkeypatch)
    het = next(f for f in report.findings if f.check == "heterogeneity")
    p = make_point(het, claim)
    assert p.implied.startswith("Cochran's Q = 11.9 on 3 degrees of freedom, p = 0.0079")
    assert not p.unmatched  # disagreeing parts are not a print to reproduce
    assert "Birge ratio" in p.question


def test_part_label_not_repeated_when_the_message_names_it(monkeypatch):
    report, claim = four_parts_report(monkeypatch)
    floors = [make_point(f, claim) for f in report.findings if f.check == "error-floor"]
    assert all(p.heading == "Statistical error against the sampling floor" for p in floors)
    other = make_point(Finding("pass", "fine", details={"part": "family B"}, check="combination"), claim)
    assert other.heading == "Combination of the parts, part family B"


def test_summary_lines(monkeypatch):
    report, _ = sidedness_report(monkeypatch)
    first, second = summary_lines(report)
    assert first == ("claimcheck held this claim's printed numbers against what its own inputs imply, "
                     "in 7 comparisons: 1 does not follow and 6 agree.")
    assert second == "Verdict: inconsistent. Worth raising with the authors: significance."
    empty = Report("t", "f", (Finding("skip", "needs threshold", check="significance"),))
    assert summary_lines(empty) == (
        "claimcheck could compare none of this claim's printed numbers with its inputs (1 check lacks "
        "its inputs).",
        "Verdict: incomplete. The claim would need the inputs listed under 'Not checked'.")


def test_required_sigma_point_shows_the_recomputed_range(monkeypatch):
    claim = load("sidedness_slip.yaml", monkeypatch)
    need = claim.significance.required_sigma
    f = Finding("fail", "Recomputed 3.1 to 3.4 sigma falls short of the required 5 sigma.", reported=5.0,
                recomputed=3.25, details={"quantity": "required_sigma", "sigma_low": 3.1, "sigma_high": 3.4,
                                          "required": 5.0}, check="significance", field=need.path,
                printed=Shown.of(need), statement="required_sigma", recomputed_range=Span(3.1, 3.4))
    p = make_point(f, claim)
    assert (p.printed, p.printed_field, p.implied) == ("5", "significance.required_sigma", "3.1 to 3.4")
    assert not p.unmatched and p.question.startswith("On what basis does the claim reach")
