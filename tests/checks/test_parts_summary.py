"""checker.checks.parts_summary: the combinations shared by the combination,
heterogeneity and extrapolation checks."""

from __future__ import annotations

import textwrap

import pytest

from checker.checks.parts_summary import parts_summary, printed_combination
from checker.claim import claim_from_document
from checker.claim.load import parse_text


def claim(text: str):
    return claim_from_document(parse_text(textwrap.dedent(text), "claim.yaml", "yaml"))


BASE = """
    title: t
    metric: mean
    estimate: 2.0
    stat_error: 0.1
    parts:
      - {estimate: 1.9, stat_error: 0.10}
      - {estimate: 2.1, stat_error: 0.20}
"""


def test_printed_combination_is_the_block_or_else_the_headline():
    c = claim(BASE)
    est, err = printed_combination(c)
    assert (est.text, err.text) == ("2.0", "0.1")
    c = claim(BASE + "    combination: {method: equal, estimate: 2.05, stat_error: 0.11}\n")
    est, err = printed_combination(c)
    assert (est.text, err.text) == ("2.05", "0.11")
    # With an extrapolation between them, the headline is not the combination.
    c = claim(BASE + "    extrapolation: {factor: 0.9}\n")
    assert printed_combination(c) == (None, None)


def test_ranges_cover_the_printed_precision_of_the_parts():
    s = parts_summary(claim(BASE))
    eq = s.methods["equal"]
    # (1.9 + 2.1)/2 with each estimate printed to +-0.05: the mean moves by at most 0.05.
    assert eq.estimate == pytest.approx(2.0)
    assert eq.estimate_range == pytest.approx((1.95, 2.05))
    assert s.error_source == "printed"
    assert s.count == 2


def test_results_are_cached_per_claim():
    c = claim(BASE)
    assert parts_summary(c) is parts_summary(c)


def test_fewer_than_two_parts_give_no_summary():
    assert parts_summary(claim("title: t\nmetric: mean\nestimate: 1\nparts:\n  - {estimate: 1}\n")) is None


def test_model_errors_fill_in_for_missing_printed_errors():
    text = """
        title: t
        metric: proportion
        estimate: 0.5
        parts:
          - {estimate: 0.40, stat_error: 0.05}
          - {estimate: 0.60, samples: 100}
    """
    s = parts_summary(claim(text))
    assert s.error_source == "printed and model"
    # sqrt(0.6 x 0.4 / 100) = 0.049: the binomial error of the second part.
    assert s.methods["inverse-variance"].weights[0] == pytest.approx(0.049 ** 2 / (0.049 ** 2 + 0.05 ** 2),
                                                                     rel=1e-3)
