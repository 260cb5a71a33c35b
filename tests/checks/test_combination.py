"""The ``combination`` check: printed combinations against the parts, the BCG
worked example, the details the renderers read, and printed-precision edges."""

from __future__ import annotations

import math
import subprocess
import sys
import textwrap

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import parse_text
from checker.stats.porter_thomas import linear_xeb_variance

# BCG vaccine trials: Colditz et al., JAMA 271, 698 (1994), counts as printed in W. Viechtbauer,
# J. Stat. Softw. 36(3) (2010); log relative risks with their large-sample standard errors.
BCG_COUNTS = [(4, 119, 11, 128), (6, 300, 29, 274), (3, 228, 11, 209), (62, 13536, 248, 12619),
              (33, 5036, 47, 5761), (180, 1361, 372, 1079), (8, 2537, 10, 619), (505, 87886, 499, 87892),
              (29, 7470, 45, 7232), (17, 1699, 65, 1600), (186, 50448, 141, 27197), (5, 2493, 3, 2338),
              (27, 16886, 29, 17825)]


def bcg_parts() -> str:
    a, b, c, d = (np.array(col, dtype=float) for col in zip(*BCG_COUNTS))
    y = np.log((a / (a + b)) / (c / (c + d)))
    s = np.sqrt(1 / a - 1 / (a + b) + 1 / c - 1 / (c + d))
    return "\n".join(f"  - {{label: trial {i + 1}, estimate: {float(yi)!r}, stat_error: {float(si)!r}}}"
                     for i, (yi, si) in enumerate(zip(y, s)))


def report(text: str, only=("combination",)):
    claim = claim_from_document(parse_text(textwrap.dedent(text), "claim.yaml", "yaml"))
    return run_checks(claim, list(only))


def bcg_claim(method: str, estimate: str, error: str, extra: str = "") -> str:
    return (f"title: BCG trials\nmetric: mean\nestimate: {estimate}\nstat_error: {error}\n{extra}"
            f"parts:\n{bcg_parts()}\ncombination:\n  method: {method}\n")


def only_finding(rep):
    (f,) = rep.findings
    return f


def test_bcg_random_effects_print_agrees():
    # Viechtbauer (2010): random effects (DerSimonian-Laird) -0.7141, se 0.1787.
    f = only_finding(report(bcg_claim("random-effects", "-0.7141", "0.1787")))
    assert f.status == "pass"
    assert f.message == ("Printed combination -0.7141 ± 0.1787 agrees with the random-effects mean "
                         "(DerSimonian-Laird) of the 13 parts, -0.71412 ± 0.17874.")


def test_bcg_fixed_effect_printed_as_random_effects_is_named():
    # Viechtbauer (2010): the fixed-effect result is -0.4303 (se 0.0405).
    f = only_finding(report(bcg_claim("random-effects", "-0.4303", "0.0405")))
    assert f.status == "fail"
    assert dict(f.reproduced_by) == {"method": "inverse-variance"}
    assert f.message == ("Printed combination -0.4303 ± 0.0405, but the random-effects mean "
                         "(DerSimonian-Laird) of the 13 parts, the stated method, is -0.71412 ± 0.1787; "
                         "the print is the inverse-variance mean, -0.43029 ± 0.04050.")


def test_details_follow_the_renderer_contract():
    f = only_finding(report(bcg_claim("random-effects", "-0.7141", "0.1787")))
    d = f.details
    assert d["summary"] is True and d["method"] == "random-effects"
    assert set(d["methods"]) == {"equal", "inverse-variance", "random-effects", "paule-mandel"}  # no samples
    for values in d["methods"].values():
        assert set(values) == {"estimate", "stat_error"}
    assert round(d["methods"]["inverse-variance"]["estimate"], 4) == -0.4303
    assert round(d["methods"]["random-effects"]["stat_error"], 4) == 0.1787
    assert dict(d["printed"]) == {"estimate": -0.7141, "stat_error": 0.1787}


def test_inverse_variance_error_scaled_by_the_birge_ratio_is_accepted():
    # PDG practice (Review of Particle Physics, "Averages and fits", from memory): the error of an
    # inverse-variance mean is scaled by S = sqrt(chi2/(N-1)) when S > 1. For BCG, S = sqrt(152.233/12)
    # = 3.5617 (Viechtbauer 2010's Q), so 0.0405 becomes 0.144.
    f = only_finding(report(bcg_claim("inverse-variance", "-0.4303", "0.144")))
    assert f.status == "pass"
    assert "scaled by the Birge ratio S = 3.56" in f.message


def test_paule_mandel_print_under_random_effects_is_a_note():
    from checker.stats.combine import random_effects

    a, b, c, d = (np.array(col, dtype=float) for col in zip(*BCG_COUNTS))
    y = np.log((a / (a + b)) / (c / (c + d)))
    s = np.sqrt(1 / a - 1 / (a + b) + 1 / c - 1 / (c + d))
    pm = random_effects(y, s, "pm")
    # Printed to 5 decimals so that DerSimonian-Laird (-0.71412 +- 0.17874) cannot match it.
    f = only_finding(report(bcg_claim("random-effects", f"{pm.estimate:.5f}", f"{pm.stat_error:.5f}",
                                      "tolerance: 0\n")))
    assert f.status == "warn"
    assert dict(f.reproduced_by) == {"method": "paule-mandel"}


CIRCUITS = """
    title: three circuits
    metric: linear-xeb
    estimate: {estimate}
    stat_error: {error}
    parts:
      - {{label: c1, estimate: 2.50e-3, stat_error: 0.50e-3, samples: 4.0e6}}
      - {{label: c2, estimate: 1.20e-3, stat_error: 0.90e-3, samples: 1.2e6}}
      - {{label: c3, estimate: 2.30e-3, stat_error: 0.50e-3, samples: 4.0e6}}
    combination: {{method: {method}}}
"""


def test_equal_weights_printed_as_inverse_variance():
    # Plain mean (2.5 + 1.2 + 2.3)/3 = 2.0e-3, error sqrt(0.25 + 0.81 + 0.25)/3 = 0.3815e-3; shown
    # with one significant figure more than the printed 0.38e-3.
    f = only_finding(report(CIRCUITS.format(estimate="2.00e-3", error="0.38e-3", method="inverse-variance")))
    assert f.status == "fail"
    assert dict(f.reproduced_by) == {"method": "equal"}
    assert "the print is the equal-weight mean, 2.000e-3 ± 0.382e-3" in f.message


def test_error_added_in_quadrature_but_not_divided_is_named_as_a_slip():
    # sqrt(0.25 + 0.81 + 0.25) = 1.1446e-3: the quadrature sum without the 1/K.
    f = only_finding(report(CIRCUITS.format(estimate="2.00e-3", error="1.14e-3", method="equal")))
    assert f.status == "fail"
    assert dict(f.reproduced_by) == {"method": "equal", "error": "quadrature"}


def test_without_a_stated_method_any_method_that_reproduces_the_print_passes():
    text = CIRCUITS.format(estimate="2.00e-3", error="0.38e-3", method="equal").replace(
        "combination: {method: equal}\n", "")
    f = only_finding(report(text))
    assert f.status == "pass"
    assert dict(f.reproduced_by) == {"method": "equal"}
    assert f.details["method"] is None


def test_part_errors_from_the_metric_model():
    # Parts with samples but no errors: each error is sqrt(Var x / N), with the linear-XEB variance
    # 1 + 2F - F^2 at large D (Boixo et al., Nature Physics 14, 595 (2018)).
    text = """
        title: samples only
        metric: linear-xeb
        estimate: 2.2e-3
        parts:
          - {label: c1, estimate: 2.5e-3, samples: 4.0e6}
          - {label: c2, estimate: 1.9e-3, samples: 3.0e6}
        combination: {method: inverse-variance}
    """
    f = only_finding(report(text))
    s = [np.sqrt(linear_xeb_variance(x) / n) for x, n in ((2.5e-3, 4.0e6), (1.9e-3, 3.0e6))]
    w = np.array([1 / v ** 2 for v in s])
    expected = float(np.dot(w, [2.5e-3, 1.9e-3]) / w.sum())
    assert f.details["error_source"] == "model"
    assert f.details["methods"]["inverse-variance"]["estimate"] == pytest.approx(expected, rel=1e-12)
    assert f.details["methods"]["inverse-variance"]["stat_error"] == pytest.approx(1 / np.sqrt(w.sum()), rel=1e-12)
    assert set(f.details["methods"]) == {"equal", "samples", "inverse-variance", "random-effects", "paule-mandel"}


@pytest.mark.parametrize("text, words", [
    ("title: t\nmetric: mean\nestimate: 1\n", "No parts are given"),
    ("title: t\nmetric: mean\nestimate: 1\nparts:\n  - {estimate: 1}\n", "Only one part is given"),
    ("title: t\nmetric: mean\nestimate: 1\nparts:\n  - {estimate: 1}\n  - {estimate: 2}\n"
     "combination: {method: inverse-variance}\n", "needs each part's stat_error"),
    ("title: t\nmetric: mean\nestimate: 1\nparts:\n  - {estimate: 1, stat_error: 0.1}\n"
     "  - {estimate: 2, stat_error: 0.1}\ncombination: {method: samples}\n", "needs each part's samples"),
])
def test_skips_say_what_is_missing(text, words):
    f = only_finding(report(text))
    assert f.status == "skip" and words in f.message


# Printed-precision edges. Parts printed to ten digits are points for all practical purposes; with
# tolerance 0 the printed combination's own interval must reach the recomputed value. The plain mean
# of the four parts is 4.94/4 = 1.235 and its error sqrt(4 x 0.219^2)/4 = 0.1095: both sit exactly on
# the edge between two printed values.
EDGE = """
    title: edge
    metric: mean
    tolerance: 0
    estimate: {estimate}
    parts:
      - {{estimate: 1.0000000000, stat_error: 0.2190000000}}
      - {{estimate: 1.5000000000, stat_error: 0.2190000000}}
      - {{estimate: 1.2000000000, stat_error: 0.2190000000}}
      - {{estimate: 1.2400000000, stat_error: 0.2190000000}}
    combination: {{method: equal, stat_error: {error}}}
"""


@pytest.mark.parametrize("estimate, error, status", [
    ("1.24", "0.110", "pass"),   # [1.235, 1.245] meets 1.235 at its lower edge
    ("1.23", "0.110", "pass"),   # [1.225, 1.235] meets it at its upper edge
    ("1.25", "0.110", "fail"),   # one digit beyond
    ("1.22", "0.110", "fail"),
    ("1.24", "0.109", "pass"),   # [0.1085, 0.1095] meets 0.1095
    ("1.24", "0.111", "fail"),   # one digit beyond
    ("1.24", "0.108", "fail"),
])
def test_printed_precision_edges(estimate, error, status):
    f = only_finding(report(EDGE.format(estimate=estimate, error=error)))
    assert f.status == status


def test_the_default_tolerance_widens_the_edge():
    # 2% of 1.25 is 0.025, more than the 0.01 gap of the case that fails at tolerance 0.
    text = EDGE.format(estimate="1.25", error="0.110").replace("    tolerance: 0\n", "")
    assert only_finding(report(text)).status == "pass"


def test_headline_without_parts_does_not_load_statsmodels():
    # Import cost: every `claimcheck check` runs this check, so a claim without parts must not pay
    # for statsmodels (about a second to import).
    code = textwrap.dedent("""
        import sys
        import checker
        checker.check({"title": "t", "metric": "mean", "estimate": 1.0, "stat_error": 0.1,
                       "sd": 1.0, "samples": 100, "threshold": 0.5})
        print("statsmodels" in sys.modules, "scipy.stats" in sys.modules)
    """)
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.split() == ["False", "False"]


def test_a_headline_that_differs_from_the_printed_combination():
    text = """
        title: t
        metric: heavy-output
        estimate: {headline}
        parts:
          - {{estimate: 0.70, circuits: 200}}
          - {{estimate: 0.73, circuits: 200}}
        combination: {{method: equal, estimate: 0.715, stat_error: 0.022}}
    """
    found = report(text.format(headline="0.690")).findings
    assert [f.status for f in found] == ["fail", "pass"]
    assert found[0].message == ("The headline differs from the printed combination (headline estimate 0.690 "
                                "against 0.715), and no extrapolation factor stands between them.")
    assert [f.status for f in report(text.format(headline="0.715")).findings] == ["pass"]
    # With an extrapolation between them the difference is the extrapolation check's business.
    extrapolated = text.format(headline="0.690") + "    extrapolation: {factor: 0.965}\n"
    assert [f.status for f in report(extrapolated).findings] == ["pass"]


NUMBER = st.one_of(st.floats(-2, 2, allow_nan=False).map(lambda x: f"{x:.3g}"),
                   st.sampled_from(["0", "1", "0.5", "1e-9", "-0.3", "2.5e-3", "99%"]))
POSITIVE = st.sampled_from(["0", "0.001", "0.2", "1", "3.5e-4", "-0.1"])
COUNT = st.sampled_from(["1", "2", "20", "1000", "2.5e4", "3e6"])


@st.composite
def multi_part_claims(draw):
    metric = draw(st.sampled_from(["linear-xeb", "log-xeb", "heavy-output", "proportion", "mean"]))
    lines = ["title: fuzz", f"metric: {metric}", f"estimate: '{draw(NUMBER)}'"]
    for field in ("stat_error", "syst_error", "sd"):
        if draw(st.booleans()):
            lines.append(f"{field}: '{draw(POSITIVE)}'")
    if draw(st.booleans()):
        lines.append(f"samples: '{draw(COUNT)}'")
    parts = []
    for i in range(draw(st.integers(0, 5))):
        fields = [f"estimate: '{draw(NUMBER)}'"]
        if draw(st.booleans()):
            fields.append(f"stat_error: '{draw(POSITIVE)}'")
        if draw(st.booleans()):
            fields.append(f"samples: '{draw(COUNT)}'")
        parts.append("  - {" + ", ".join(fields) + "}")
    if parts:
        lines += ["parts:"] + parts
    if draw(st.booleans()):
        method = draw(st.sampled_from(["equal", "samples", "inverse-variance", "random-effects"]))
        lines.append(f"combination: {{method: {method}, estimate: '{draw(NUMBER)}', stat_error: '{draw(POSITIVE)}'}}")
    if draw(st.booleans()):
        lines.append(f"extrapolation: {{factor: '{draw(NUMBER)}', factor_error: '{draw(POSITIVE)}', "
                     f"error_to: {draw(st.sampled_from(['syst', 'stat']))}}}")
    if draw(st.booleans()):
        lines.append(f"interval: {{low: '{draw(NUMBER)}', high: '{draw(NUMBER)}'}}")
    if draw(st.booleans()):
        lines += ["error_budget:", f"  - {{name: gates, count: {draw(COUNT)}, error: '{draw(NUMBER)}', "
                                   f"error_sd: '{draw(POSITIVE)}'}}"]
    if draw(st.booleans()):
        lines += ["integer_data: true", f"items: {draw(st.sampled_from([1, 3]))}"]
    return "\n".join(lines) + "\n"


@settings(max_examples=150, deadline=None)
@given(multi_part_claims())
def test_random_multi_part_claims_only_ever_give_findings(text):
    from checker.errors import ClaimcheckError

    try:
        claim = claim_from_document(parse_text(text, "fuzz.yaml", "yaml"))
    except ClaimcheckError:
        return  # unusable input is the loader's business, reported as one line
    new = ["combination", "heterogeneity", "extrapolation", "error-budget", "interval", "granularity"]
    rep = run_checks(claim, new)
    assert rep.findings and {f.check for f in rep.findings} == set(new)
    from checker.render.json import render_json

    render_json(rep)  # no NaN or Infinity reaches the JSON


def test_parts_do_not_load_statsmodels_either():
    # The random-effects fits and Cochran's Q are computed without statsmodels or scipy.stats
    # (statsmodels is only the tests' reference), so a claim with parts starts as fast as one without.
    code = textwrap.dedent("""
        import sys
        import checker
        report = checker.check({"title": "t", "metric": "mean", "estimate": 1.0, "stat_error": 0.1,
                                "parts": [{"estimate": 0.9, "stat_error": 0.1}, {"estimate": 1.3, "stat_error": 0.1}],
                                "combination": {"method": "random-effects"}})
        assert {f.check for f in report.findings} >= {"combination", "heterogeneity"}
        print("statsmodels" in sys.modules, "scipy.stats" in sys.modules)
    """)
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.split() == ["False", "False"]


# --- issue 11, item 1: exact ranges over the printed box ----------------------------------------

EIGHT_PARTS = """\
title: Invented eight-part claim (issue 11 audit case)
metric: linear-xeb
estimate: 1.08e-3
stat_error: 0.087e-3
combination: {method: inverse-variance}
parts:
""" + "".join(f"  - {{estimate: {x}, stat_error: 0.2e-3}}\n"
              for x in ("1.1e-3", "1.3e-3", "0.9e-3", "1.2e-3", "1.0e-3", "1.1e-3", "0.9e-3", "1.1e-3"))


def test_eight_one_digit_errors_give_the_exact_inverse_variance_range(check_claim, write_claim):
    from checker.checks.parts_summary import parts_summary
    from checker.claim import read_claim

    summary = parts_summary(read_claim(write_claim(EIGHT_PARTS)))
    # 1/sqrt(sum 1/s^2) rises with every s_i, so over s_i in [0.15e-3, 0.25e-3] it runs from
    # 0.15e-3/sqrt(8) to 0.25e-3/sqrt(8) (hand calculation; issue 11: [0.0530e-3, 0.0884e-3]).
    low, high = summary.methods["inverse-variance"].stat_error_range
    assert low == pytest.approx(0.15e-3 / math.sqrt(8)) and high == pytest.approx(0.25e-3 / math.sqrt(8))
    assert (round(low, 7), round(high, 7)) == (0.0530e-3, 0.0884e-3)
    (f,) = [f for f in check_claim(EIGHT_PARTS, only=["combination"]).findings]
    # The printed 0.087e-3 lies inside: it agrees with the stated method, and no other method is
    # named as reproducing it.
    assert f.status == "pass"
    assert f.reproduced_by is None
    assert "equal" not in f.message
