"""The ``error-floor`` check on parts: each part's printed error against the
error its own samples allow, labelled with the part."""

from __future__ import annotations

import math
import textwrap

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import parse_text


def findings(text: str):
    claim = claim_from_document(parse_text(textwrap.dedent(text), "claim.yaml", "yaml"))
    return {f.details.get("part", "headline"): f for f in run_checks(claim, ["error-floor"]).findings}


def test_each_part_is_held_against_its_own_samples():
    # Binomial floor sqrt(p (1 - p) / n) (common practice): part a sqrt(0.9 x 0.1 / 1000) = 0.0095;
    # part b's printed 0.002 is below sqrt(0.8 x 0.2 / 1000) = 0.0126.
    text = """
        title: parts
        metric: proportion
        estimate: 0.85
        parts:
          - {label: a, estimate: 0.900, stat_error: 0.0095, samples: 1000}
          - {label: b, estimate: 0.800, stat_error: 0.0020, samples: 1000}
          - {label: c, estimate: 0.850}
    """
    found = findings(text)
    assert found["a"].status == "pass"
    assert found["b"].status == "fail"
    assert found["b"].message.startswith("Part b: printed stat_error 0.0020")
    assert math.isclose(found["b"].recomputed, math.sqrt(0.16 / 1000), rel_tol=1e-3)
    assert "c" not in found  # no error printed for c: nothing to compare
    assert found["headline"].status == "skip"


def test_heavy_output_parts_count_circuits():
    # Cross et al., Phys. Rev. A 100, 032328 (2019): sigma = sqrt(h (1 - h) / circuits).
    text = """
        title: hop
        metric: heavy-output
        estimate: 0.75
        parts:
          - {label: width 5, estimate: 0.760, stat_error: 0.030, circuits: 200}
    """
    f = findings(text)["width 5"]
    assert f.status == "pass"
    assert math.isclose(f.recomputed, math.sqrt(0.76 * 0.24 / 200), rel_tol=1e-3)


def test_a_linear_xeb_estimate_printed_as_zero_does_not_break_the_model():
    # "0" stands for [-0.5, 0.5]; below F = 1 - sqrt(2) the large-D variance 1 + 2F - F^2 (Boixo et
    # al., Nature Physics 14, 595 (2018)) would be negative, so it is held at 0 there.
    text = "title: t\nmetric: linear-xeb\nestimate: 0\nstat_error: 0.001\nsamples: 1000000\n"
    f = findings(text)["headline"]
    assert f.status == "pass"
    assert f.details["floor_low"] == 0.0
