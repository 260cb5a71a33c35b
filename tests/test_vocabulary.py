"""checker/vocabulary.py: the words every output shares."""

from __future__ import annotations

import pytest

from checker.vocabulary import (CAUTION, CAUTION_SHORT, COUNT_WORDS, STATUS_MARKS, STATUS_WORDS, TALLY_WORDS,
                                VERDICT_SENTENCES, convention_text, convention_words, verdict_line)
from checker.report import STATUSES


def test_every_status_has_its_words_and_a_mark_of_one_width():
    for table in (STATUS_WORDS, STATUS_MARKS, COUNT_WORDS, TALLY_WORDS):
        assert set(table) == set(STATUSES)
    assert {len(m) for m in STATUS_MARKS.values()} == {5}


def test_verdict_lines_and_the_caution():
    assert set(VERDICT_SENTENCES) == {"consistent", "inconsistent", "incomplete"}
    assert verdict_line("inconsistent") == ("inconsistent: some printed numbers do not follow from the claim's "
                                            "own inputs")
    assert all("a question for the authors" in c for c in (CAUTION, CAUTION_SHORT))


def test_convention_text():
    assert convention_text({"sided": "two"}) == "two-sided"
    assert convention_text({"systematics": "quadrature", "error_at": "threshold"}) == \
        "systematic error added in quadrature, error taken at the threshold"
    assert convention_text({"method": "none"}) == "no correction"


def test_convention_text_names_students_degrees_of_freedom_when_given():
    t = {"sided": "one", "distribution": "t"}
    assert convention_text(t) == "one-sided, Student's t, its p given as the equivalent normal sigma"
    assert convention_text(t, 9) == \
        "one-sided, Student's t on 9 degrees of freedom, its p given as the equivalent normal sigma"
    assert "on 2 degrees" in convention_text(t, 2.0)
    # Degrees of freedom name only Student's t: a normal reference is unchanged by them.
    assert convention_text({"distribution": "normal"}, 9) == "the normal distribution"


@pytest.mark.parametrize("conv, words", [
    ({"sided": "two"}, "under the two-sided convention (both tails)"),
    ({"systematics": "quadrature"}, "with the systematic error added in quadrature"),
    ({"error_at": "threshold"}, "with the standard error taken at the threshold (under the null)"),
    ({"method": "inverse-variance"}, "with inverse-variance weights"),
    ({"method": "wilson"}, "with the Wilson interval"),
    ({"samples": 26000000}, "with about 2.6e7 samples"),
    ({"sided": "two", "systematics": "none"},
     "under the two-sided convention (both tails) and with the systematic error left out of the significance"),
    ({"unheard_of": "x"}, "with unheard of x"),
    (None, None), ({}, None),
])
def test_convention_words(conv, words):
    assert convention_words(conv) == words
