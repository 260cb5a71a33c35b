"""The ``heterogeneity`` check: Cochran's Q across the parts and whether the
printed combined error allows for the scatter."""

from __future__ import annotations

import math
import textwrap

import numpy as np
import pytest

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import parse_text

# BCG vaccine trials: Colditz et al., JAMA 271, 698 (1994), counts as printed in W. Viechtbauer,
# J. Stat. Softw. 36(3) (2010).
BCG_COUNTS = [(4, 119, 11, 128), (6, 300, 29, 274), (3, 228, 11, 209), (62, 13536, 248, 12619),
              (33, 5036, 47, 5761), (180, 1361, 372, 1079), (8, 2537, 10, 619), (505, 87886, 499, 87892),
              (29, 7470, 45, 7232), (17, 1699, 65, 1600), (186, 50448, 141, 27197), (5, 2493, 3, 2338),
              (27, 16886, 29, 17825)]


def bcg_claim(method: str | None, estimate: str, error: str | None) -> str:
    a, b, c, d = (np.array(col, dtype=float) for col in zip(*BCG_COUNTS))
    y = np.log((a / (a + b)) / (c / (c + d)))
    s = np.sqrt(1 / a - 1 / (a + b) + 1 / c - 1 / (c + d))
    parts = "\n".join(f"  - {{label: trial {i + 1}, estimate: {float(yi)!r}, stat_error: {float(si)!r}}}"
                      for i, (yi, si) in enumerate(zip(y, s)))
    text = f"title: BCG trials\nmetric: mean\nestimate: {estimate}\n"
    if error is not None:
        text += f"stat_error: {error}\n"
    text += f"parts:\n{parts}\n"
    if method:
        text += f"combination:\n  method: {method}\n"
    return text


def finding(text: str):
    claim = claim_from_document(parse_text(textwrap.dedent(text), "claim.yaml", "yaml"))
    (f,) = run_checks(claim, ["heterogeneity"]).findings
    return f


def test_unscaled_fixed_effect_error_fails_and_says_what_the_scaled_one_would_be():
    f = finding(bcg_claim("inverse-variance", "-0.4303", "0.0405"))
    assert f.status == "fail"
    assert dict(f.reproduced_by) == {"method": "inverse-variance", "scaled": False}
    # Viechtbauer (2010): Q(12) = 152.2330, I^2 = 92.12%, DL tau^2 = 0.3088, RE se 0.1787;
    # S = sqrt(152.2330/12) = 3.5617 scales the fixed-effect 0.0405 to 0.1442.
    assert f.message == ("The parts disagree (Q = 152.2 on 12 degrees of freedom, p_Q = 2e-26, I^2 = 92%), "
                         "yet the printed combined error 0.0405 is the inverse-variance mean's error, not "
                         "scaled for the scatter; scaled by S = 3.56 it would be 0.1442, and a random-effects "
                         "fit gives 0.1787.")


def test_details_follow_the_renderer_contract():
    from scipy.stats import chi2

    d = finding(bcg_claim("inverse-variance", "-0.4303", "0.0405")).details
    assert {"Q", "df", "p_Q", "I2", "H", "scale_factor", "tau2"} <= set(d)
    # Viechtbauer (2010), J. Stat. Softw. 36(3).
    assert round(d["Q"], 4) == 152.2330 and d["df"] == 12
    assert round(d["I2"] * 100, 2) == 92.12
    assert round(d["tau2"], 4) == 0.3088
    assert d["p_Q"] == pytest.approx(float(chi2.sf(d["Q"], 12)), rel=1e-9)
    assert d["H"] == d["scale_factor"] == pytest.approx(math.sqrt(d["Q"] / 12))


@pytest.mark.parametrize("method, error, words", [
    ("random-effects", "0.1787", "random-effects mean (DerSimonian-Laird)"),  # Viechtbauer (2010)
    ("inverse-variance", "0.144", "scaled by S = 3.56"),
    (None, "0.1787", "random-effects"),
])
def test_errors_that_allow_for_the_scatter_pass(method, error, words):
    f = finding(bcg_claim(method, "-0.7141", error))
    assert f.status == "pass" and words in f.message


def test_no_printed_error_is_a_note_unless_the_fit_is_random_effects():
    assert finding(bcg_claim("inverse-variance", "-0.4303", None)).status == "warn"
    assert finding(bcg_claim("random-effects", "-0.7141", None)).status == "pass"


def two_parts(difference: str, printed_error: str) -> str:
    # Two parts with errors 1: Q = d^2 / 2 on 1 degree of freedom. p_Q = 0.01 at Q = 6.6349
    # (chi-square 1-dof upper 1% point, scipy.stats.chi2.isf(0.01, 1)), that is d = 3.6428.
    return f"""
        title: two parts
        metric: mean
        estimate: 0
        stat_error: {printed_error}
        parts:
          - {{estimate: 0.0000000000, stat_error: 1.0000000000}}
          - {{estimate: {difference}, stat_error: 1.0000000000}}
        combination: {{method: inverse-variance}}
    """


@pytest.mark.parametrize("difference, status", [("3.6000000000", "pass"), ("3.7000000000", "fail")])
def test_the_one_percent_line(difference, status):
    # The unscaled inverse-variance error is 1/sqrt(2) = 0.7071.
    assert finding(two_parts(difference, "0.7071")).status == status


def test_rounding_that_could_bring_p_q_above_the_line_is_given_the_benefit():
    # Printed as "3.7" the difference may be anything in [3.65, 3.75]; and printed as "1" each error
    # may be as large as 1.5, where Q = 3.65^2 / (2 x 2.25) = 2.96 and p_Q = 0.085.
    text = two_parts("3.7", "0.7071").replace("1.0000000000", "1")
    assert finding(text).status == "pass"


# Q = 11^2 / 2 = 60.5 on 1 df, S = sqrt(60.5) = 7.778: the inverse-variance error 1/sqrt(2) scaled
# by S is exactly 5.5, as are the DerSimonian-Laird random-effects error (tau^2 = 59.5,
# sqrt((1 + 59.5)/2)) and the error from the scatter (11/sqrt(2)/sqrt(2)). 5.5 is the edge between
# the printed values "5" and "6".
SCALED_EDGE = """
    title: scaled edge
    metric: mean
    tolerance: 0
    estimate: 5.5
    parts:
      - {{estimate: 0.0000000000, stat_error: 1.0000000000}}
      - {{estimate: 11.0000000000, stat_error: 1.0000000000}}
    combination: {{method: inverse-variance, stat_error: {error}}}
"""


@pytest.mark.parametrize("error, status", [("6", "pass"), ("5", "pass"), ("7", "fail"), ("4", "fail"),
                                           ("5.5", "pass"), ("5.6", "fail")])
def test_printed_precision_edge_of_the_scaled_error(error, status):
    f = finding(SCALED_EDGE.format(error=error))
    assert f.status == status
    if status == "fail":
        assert "scaled by S = 7.78 it would be" in f.message


def test_parts_that_agree_pass():
    text = """
        title: agreeing
        metric: mean
        estimate: 1.0
        stat_error: 0.06
        parts:
          - {estimate: 0.95, stat_error: 0.1}
          - {estimate: 1.05, stat_error: 0.1}
          - {estimate: 1.00, stat_error: 0.1}
    """
    f = finding(text)
    assert f.status == "pass"
    assert f.message.startswith("The 3 parts agree within their errors (Q = 0.5 on 2 degrees of freedom")


@pytest.mark.parametrize("text, words", [
    ("title: t\nmetric: mean\nestimate: 1\n", "Fewer than two parts"),
    ("title: t\nmetric: mean\nestimate: 1\nparts:\n  - {estimate: 1}\n  - {estimate: 2}\n", "needs each part's"),
])
def test_skips(text, words):
    f = finding(text)
    assert f.status == "skip" and words in f.message


# --- issue 11, item 1: Q's minimum over the printed box is a convex problem ----------------------

FOUR_PARTS = """\
title: Invented four-part claim (issue 11 audit case)
metric: proportion
estimate: 0.52
stat_error: 0.01
combination: {method: inverse-variance}
parts:
  - {estimate: 0.50, stat_error: 0.02}
  - {estimate: 0.58, stat_error: 0.02}
  - {estimate: 0.45, stat_error: 0.02}
  - {estimate: 0.55, stat_error: 0.02}
"""


def test_four_scattered_parts_with_an_unscaled_error_are_flagged(check_claim):
    from scipy.stats import chi2

    (f,) = check_claim(FOUR_PARTS, only=["heterogeneity"]).findings
    # Q = 24.5 on 3 degrees of freedom at the printed values; over the printed box its minimum is
    # 12.96 (hand calculation: estimates 0.005 toward each other, errors at 0.025), where
    # scipy.stats.chi2 gives p = 0.0047, below 0.01 however the digits are rounded.
    assert f.details["Q"] == pytest.approx(24.5)
    assert f.details["Q_low"] == pytest.approx(12.96)
    assert chi2.sf(f.details["Q_low"], 3) < 0.01
    assert f.status == "fail"
    assert f.reproduced_by == {"method": "inverse-variance", "scaled": False}
