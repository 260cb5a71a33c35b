"""The ``error-budget`` check: the component error model against the measured
value, with the factor-of-2 and combined-uncertainty notes."""

from __future__ import annotations

import math
import textwrap

import pytest

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import parse_text


def finding(text: str):
    claim = claim_from_document(parse_text(textwrap.dedent(text), "claim.yaml", "yaml"))
    (f,) = run_checks(claim, ["error-budget"]).findings
    return f


BUDGET = """
    title: budget
    metric: linear-xeb
    estimate: {estimate}
    {error}
    error_budget:
      - {{name: two-qubit gates, count: 200, error: 0.0050, error_sd: 0.0005}}
      - {{name: readout, count: 20, error: 0.020}}
"""


def expected():
    # Common practice: the digital error model, prod (1 - e)^n, and its delta-method uncertainty
    # P * n * sd / (1 - e) for the one component with an uncertainty (JCGM 100:2008, eq. 10).
    p = 0.995 ** 200 * 0.98 ** 20
    return p, p * 200 * 0.0005 / 0.995


def test_details_follow_the_renderer_contract():
    p, sd = expected()
    f = finding(BUDGET.format(estimate="0.25", error="stat_error: 0.01"))
    d = f.details
    assert [c["name"] for c in d["components"]] == ["two-qubit gates", "readout"]
    assert d["components"][0]["survival"] == pytest.approx(0.995 ** 200)
    assert d["components"][1] == {"name": "readout", "count": 20, "error": 0.02,
                                  "survival": pytest.approx(0.98 ** 20)}
    assert d["predicted"] == pytest.approx(p)
    assert d["predicted_sd"] == pytest.approx(sd)
    assert d["predicted_exponential"] == pytest.approx(math.exp(-200 * 0.005 - 20 * 0.02))
    assert d["measured"] == 0.25
    assert d["ratio"] == pytest.approx(0.25 / p)


def test_a_measured_value_within_the_uncertainty_passes():
    # P = 0.995^200 0.98^20 = 0.2450 +- 0.0246; measured 0.25 +- 0.01.
    f = finding(BUDGET.format(estimate="0.25", error="stat_error: 0.01"))
    assert f.status == "pass"
    assert f.message == ("The error budget of 2 components predicts 0.245 ± 0.0246 (exponential "
                         "approximation 0.247); the measured 0.25 is 1 times that, within their combined "
                         "uncertainty 0.0266.")


def test_more_than_a_factor_of_two_is_a_note():
    f = finding(BUDGET.format(estimate="0.10", error="stat_error: 0.01"))
    assert f.status == "warn" and "more than a factor of 2 below" in f.message


def test_more_than_the_combined_uncertainty_is_a_note():
    # 0.18 is 0.73 times 0.245, within a factor of 2, but 0.06 away even at the edges of the printed
    # digits: more than sqrt(0.01^2 + 0.0246^2) = 0.0266.
    f = finding(BUDGET.format(estimate="0.18", error="stat_error: 0.01"))
    assert f.status == "warn" and "more than their combined uncertainty" in f.message


FACTOR_EDGE = """
    title: factor edge
    metric: proportion
    tolerance: 0
    estimate: {estimate}
    error_budget:
      - {{name: the one step, count: 1, error: 0.7475000000}}
"""


@pytest.mark.parametrize("estimate, status", [
    # P = 1 - 0.7475 = 0.2525, so twice P is 0.505: the lower edge of the printed "0.51".
    ("0.51", "pass"),
    ("0.52", "warn"),   # one digit beyond: [0.515, 0.525] lies wholly above 0.505
    ("0.13", "pass"),   # half of P is 0.12625; [0.125, 0.135] reaches below it
    ("0.12", "warn"),
])
def test_printed_precision_edge_of_the_factor_of_two(estimate, status):
    # No errors anywhere, so only the factor-of-2 rule applies.
    assert finding(FACTOR_EDGE.format(estimate=estimate)).status == status


def test_skips():
    f = finding("title: t\nmetric: mean\nestimate: 1\n")
    assert f.status == "skip" and "No error budget" in f.message
    f = finding("title: t\nmetric: mean\nestimate: 1\nerror_budget:\n  - {name: x, error: 1.5}\n")
    assert f.status == "skip"
