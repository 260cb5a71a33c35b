"""The ``extrapolation`` check: headline = combined x factor, with the errors
propagated, and the common slips named."""

from __future__ import annotations

import textwrap

import pytest

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import parse_text


def findings(text: str):
    claim = claim_from_document(parse_text(textwrap.dedent(text), "claim.yaml", "yaml"))
    return {f.details.get("quantity", "none"): f for f in run_checks(claim, ["extrapolation"]).findings}


def claim(estimate="1.85e-3", stat="0.19e-3", syst="0.039e-3", factor="0.95", factor_error="0.02",
          error_to="syst", extra=""):
    lines = ["title: extrapolated", "metric: linear-xeb", f"estimate: {estimate}"]
    if stat is not None:
        lines.append(f"stat_error: {stat}")
    if syst is not None:
        lines.append(f"syst_error: {syst}")
    lines.append("combination: {method: inverse-variance, estimate: 1.95e-3, stat_error: 0.20e-3}")
    ex = f"extrapolation: {{factor: {factor}, error_to: {error_to}"
    if factor_error is not None:
        ex += f", factor_error: {factor_error}"
    lines.append(ex + "}")
    return "\n".join(lines) + "\n" + extra


# Common practice (JCGM 100:2008, eq. 10): for H = c f, s_H(stat) = |f| s_c and the factor's error
# s_f adds |c| s_f. Here c = 1.95e-3 +- 0.20e-3, f = 0.95 +- 0.02: H = 1.8525e-3, stat 0.190e-3,
# syst 0.039e-3.
def test_a_correct_extrapolation_passes_on_every_number():
    found = findings(claim())
    assert {q: f.status for q, f in found.items()} == {"estimate": "pass", "stat_error": "pass",
                                                        "syst_error": "pass"}
    assert found["estimate"].message == ("Headline 1.85e-3 agrees with the combined 1.95e-3 times the factor "
                                         "0.95, 1.852e-3.")


@pytest.mark.parametrize("kwargs, quantity, slip", [
    (dict(estimate="2.05e-3"), "estimate", {"factor": "divided"}),         # 1.95 / 0.95 = 2.053
    (dict(estimate="1.95e-3"), "estimate", {"factor": "not applied"}),
    (dict(stat="0.20e-3", factor="0.80", estimate="1.56e-3", syst="0.039e-3"), "stat_error",
     {"stat_error": "not scaled"}),                                         # f = 0.80: 0.16 expected
    (dict(stat="0.25e-3", factor="0.80", estimate="1.56e-3"), "stat_error",
     {"stat_error": "divided"}),                                            # 0.20 / 0.80 = 0.25
    (dict(syst="0.02"), "syst_error", {"factor_error": "not multiplied"}),
])
def test_slips_are_named(kwargs, quantity, slip):
    f = findings(claim(**kwargs))[quantity]
    assert f.status == "fail"
    assert dict(f.reproduced_by) == slip


def test_divided_message():
    f = findings(claim(estimate="2.05e-3"))["estimate"]
    assert f.message == ("Headline 2.05e-3, but the combined 1.95e-3 times the factor 0.95 gives 1.852e-3; "
                         "the print is the combined value divided by the factor instead of multiplied "
                         "(2.053e-3).")


def test_factor_error_left_out_of_the_systematic_error():
    f = findings(claim(syst=None))["syst_error"]
    assert f.status == "fail"
    assert dict(f.reproduced_by) == {"factor_error": "left out"}
    assert "prints no systematic error" in f.message


def test_factor_error_in_the_statistical_error():
    # error_to stat: sqrt((0.95 x 0.20)^2 + (1.95 x 0.10)^2) = 0.2723e-3 with factor_error 0.10.
    found = findings(claim(stat="0.272e-3", syst=None, factor_error="0.10", error_to="stat"))
    assert found["stat_error"].status == "pass"
    assert "syst_error" not in found
    # The same print under error_to syst is the factor's error put in the statistical error.
    f = findings(claim(stat="0.272e-3", syst="0.195e-3", factor_error="0.10"))["stat_error"]
    assert f.status == "fail" and dict(f.reproduced_by) == {"factor_error": "in stat"}
    # And under error_to stat, a print without it is the factor's error left out.
    f = findings(claim(stat="0.190e-3", syst=None, factor_error="0.10", error_to="stat"))["stat_error"]
    assert f.status == "fail" and dict(f.reproduced_by) == {"factor_error": "left out"}


def test_a_larger_systematic_error_is_a_note():
    f = findings(claim(syst="0.10e-3"))["syst_error"]
    assert f.status == "warn" and "other systematic errors" in f.message


def test_combined_value_from_the_parts_when_none_is_printed():
    text = """
        title: from parts
        metric: mean
        estimate: 1.80
        stat_error: 0.071
        parts:
          - {estimate: 1.90, stat_error: 0.100}
          - {estimate: 2.10, stat_error: 0.100}
        combination: {method: inverse-variance}
        extrapolation: {factor: 0.9}
    """
    found = findings(text)
    # Inverse-variance mean 2.00 +- 0.0707; x 0.9 = 1.80 +- 0.0636. The printed 0.071 is the
    # combined error left unscaled.
    assert found["estimate"].status == "pass"
    assert found["estimate"].details["combined_from"].startswith("recomputed")
    assert found["stat_error"].status == "fail"
    assert dict(found["stat_error"].reproduced_by) == {"stat_error": "not scaled"}


@pytest.mark.parametrize("text, words", [
    ("title: t\nmetric: mean\nestimate: 1\n", "No extrapolation factor"),
    ("title: t\nmetric: mean\nestimate: 1\nextrapolation: {factor: 0.9}\n", "needs the combined value"),
])
def test_skips(text, words):
    (f,) = findings(text).values()
    assert f.status == "skip" and words in f.message


# Printed-precision edge: c = 2.0000000000e-3 and f = 0.9250000000 give H = 1.85e-3, the edge
# between the printed values "1.8e-3" and "1.9e-3".
EDGE = """
    title: edge
    metric: mean
    tolerance: 0
    estimate: {estimate}
    combination: {{method: equal, estimate: 2.0000000000e-3}}
    extrapolation: {{factor: 0.9250000000}}
"""


@pytest.mark.parametrize("estimate, status", [("1.8e-3", "pass"), ("1.9e-3", "pass"), ("1.7e-3", "fail"),
                                              ("2.0e-3", "fail"), ("1.85e-3", "pass"), ("1.86e-3", "fail")])
def test_printed_precision_edge(estimate, status):
    assert findings(EDGE.format(estimate=estimate))["estimate"].status == status


def test_a_printed_combined_value_takes_its_error_from_the_parts():
    text = """
        title: t
        metric: mean
        estimate: 1.80
        stat_error: 0.0636
        parts:
          - {estimate: 1.90, stat_error: 0.100}
          - {estimate: 2.10, stat_error: 0.100}
        combination: {method: inverse-variance, estimate: 2.00}
        extrapolation: {factor: 0.9}
    """
    f = findings(text)["stat_error"]
    # 0.9 x 0.1/sqrt(2) = 0.0636.
    assert f.status == "pass"
    assert f.details["combined_from"] == "printed (error recomputed from the parts)"
