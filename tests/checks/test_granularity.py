"""The ``granularity`` check: the GRIM rule for proportions of whole items
and for means of whole-number responses."""

from __future__ import annotations

import textwrap

import pytest

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import parse_text


def findings(text: str):
    claim = claim_from_document(parse_text(textwrap.dedent(text), "claim.yaml", "yaml"))
    return run_checks(claim, ["granularity"]).findings


def one(text: str):
    (f,) = findings(text)
    return f


MEAN = "title: t\nmetric: mean\nestimate: {m}\nsamples: {n}\ninteger_data: true\n{extra}"


def test_grim_examples_for_means():
    # Brown and Heathers, "The GRIM test", Social Psychological and Personality Science 8, 363 (2017)
    # (volume and pages from memory): 5.93 from 49 whole-number responses is impossible
    # (290/49 = 5.918, 291/49 = 5.939); 20 die rolls can average 3.45 but not 3.48.
    f = one(MEAN.format(m="5.93", n=49, extra=""))
    assert f.status == "fail"
    assert f.message.startswith("Headline: 5.93 cannot come from 49 whole-number responses: no whole count "
                                "fits, the nearest are 290/49 = 5.918 and 291/49 = 5.939")
    assert one(MEAN.format(m="3.48", n=20, extra="")).status == "fail"
    f = one(MEAN.format(m="3.45", n=20, extra=""))
    assert f.status == "pass" and f.recomputed == 69 / 20


def test_items_per_response_multiply_the_denominator():
    # Brown and Heathers (2017): for a scale of L items averaged per response, test with N x L.
    # 5.93 over 49 x 2 = 98 item scores: 581/98 = 5.9286 rounds to 5.93.
    f = one(MEAN.format(m="5.93", n=49, extra="items: 2\n"))
    assert f.status == "pass" and f.details["units"] == 98


def test_a_proportion_that_no_whole_count_gives():
    f = one("title: t\nmetric: proportion\nestimate: 0.913\nsamples: 250\n")
    assert f.status == "fail"
    # 228/250 = 0.912 and 229/250 = 0.916; 252 items would allow it (230/252 = 0.9127).
    assert (f.details["below"], f.details["above"]) == (228, 229)
    assert dict(f.reproduced_by) == {"samples": 252}
    assert one("title: t\nmetric: proportion\nestimate: 0.912\nsamples: 250\n").status == "pass"


@pytest.mark.parametrize("estimate, status", [
    # 1/8 = 0.125 is the edge between "0.12" and "0.13"; "0.11" and "0.14" are one digit beyond.
    ("0.12", "pass"), ("0.13", "pass"), ("0.11", "fail"), ("0.14", "fail"),
    ("12.5%", "pass"), ("12.6%", "fail"),
])
def test_printed_precision_edges(estimate, status):
    assert one(f"title: t\nmetric: proportion\nestimate: '{estimate}'\nsamples: 8\n").status == status


def test_the_claims_tolerance_does_not_widen_an_exact_rule():
    text = "title: t\nmetric: proportion\nestimate: 0.913\nsamples: 250\ntolerance: 0.5\n"
    assert one(text).status == "fail"


def test_parts_are_tested_and_labelled():
    text = """
        title: parts
        metric: proportion
        estimate: 0.500
        samples: 40
        parts:
          - {label: first half, estimate: 0.45, samples: 20}
          - {label: second half, estimate: 0.57, samples: 20}
        combination: {method: samples}
    """
    by_part = {f.details.get("part"): f for f in findings(text)}
    assert by_part[None].status == "pass"            # 20/40
    assert by_part["first half"].status == "pass"    # 9/20
    assert by_part["second half"].status == "fail"   # 11/20 = 0.55, 12/20 = 0.60


def test_what_cannot_be_tested_is_a_skip():
    assert "cannot bite" in one("title: t\nmetric: proportion\nestimate: 0.91\nsamples: 1250\n").message
    assert "limited precision" in one("title: t\nmetric: proportion\nestimate: 0.91\nsamples: 2e3\n").message
    assert "needs the number" in one("title: t\nmetric: proportion\nestimate: 0.91\n").message
    assert "integer_data: true" in one("title: t\nmetric: mean\nestimate: 0.91\nsamples: 20\n").message
    assert one("title: t\nmetric: linear-xeb\nestimate: 0.01\n").status == "skip"
    text = ("title: t\nmetric: proportion\nestimate: 0.5\nsamples: 40\nparts:\n  - {estimate: 0.4, samples: 20}\n"
            "  - {estimate: 0.6, samples: 20}\ncombination: {method: inverse-variance}\n")
    assert "weighted combination" in findings(text)[0].message


def test_each_part_gets_its_own_finding():
    # DESIGN.md: checks on parts report one finding per part, with the part's label in details.
    parts = "\n".join(f"  - {{estimate: 0.91{i}, samples: 4000}}" for i in range(3))
    fs = findings(f"title: t\nmetric: proportion\nestimate: 0.91\nparts:\n{parts}\n")
    assert [f.details.get("part") for f in fs] == [None, "part 1", "part 2", "part 3"]
    assert fs[1].message.startswith("Part 1: with 4000 items every value")


def test_no_nearest_count_for_a_proportion_outside_the_unit_interval():
    # No count of items gives a proportion of -0.5 (common practice), so no N is suggested; the
    # search used to walk 0.1 N candidates first (1e8 of them for samples of 1e9, minutes).  The
    # physical-range check flags the value, so granularity says it skipped it (issue 16).
    f = one("title: t\nmetric: proportion\nestimate: -0.5\nsamples: 1000000000\n")
    assert f.status == "skip" and f.reproduced_by is None
    assert "the nearest" not in f.message and "physical-range check flags it" in f.message


def test_the_nearest_count_is_still_found_close_by():
    # 0.30 cannot come from 11 items (3/11 = 0.273, 4/11 = 0.364); 10 items give 3/10.
    f = one("title: t\nmetric: proportion\nestimate: 0.30\nsamples: 11\n")
    assert f.status == "fail" and dict(f.reproduced_by) == {"samples": 10}
