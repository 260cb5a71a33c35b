"""When the count behind a printed error is missing, the finding says what the printed numbers
imply, through the real command line (issue 16, input side).

Linear XEB: Var x = 1 + 2F - F^2 per sample under the Porter-Thomas mixture (S. Boixo et al.,
"Characterizing quantum supremacy in near-term devices", Nature Physics 14, 595 (2018)), so
N = (1 + 2F - F^2) / stat_error^2.  Proportion: the binomial variance p(1 - p) (common practice).
"""

from __future__ import annotations

import io
import json

import pytest

from checker.cli import run


def floor_findings(path):
    out = io.StringIO()
    status = run(["check", str(path), "--json", "--only", "error-floor"], out, io.StringIO())
    return status, json.loads(out.getvalue())["findings"]


def test_a_linear_xeb_error_without_samples_implies_about_8_4e8(write_claim):
    text = ("title: Invented 53-qubit device (invented numbers)\nmetric: linear-xeb\nqubits: 53\n"
            "estimate: 3.66e-4\nstat_error: 0.345e-4\n")
    status, (f,) = floor_findings(write_claim(text))
    # By hand: (1 + 2 x 3.66e-4 - 3.66e-4^2) / (0.345e-4)^2 = 1.000732 / 1.190250e-9 = 8.408e8;
    # the printed 0.345e-4 stands for [0.3445e-4, 0.3455e-4], so 8.383e8 to 8.432e8.
    assert status == 0 and f["status"] == "info" and f["statement"] == "implied_count"
    assert f["field"] == "stat_error" and f["details"]["count_field"] == "samples"
    assert f["recomputed"] == pytest.approx(8.408e8, rel=1e-3)
    assert f["recomputed_range"]["low"] == pytest.approx(8.383e8, rel=1e-3)
    assert f["recomputed_range"]["high"] == pytest.approx(8.432e8, rel=1e-3)
    assert "implies about 8.4e8 samples" in f["message"] and "compare with what the paper" in f["message"]


def test_a_proportion_error_without_samples(write_claim):
    text = "title: t\nmetric: proportion\nestimate: 0.750\nstat_error: 0.010\n"
    status, (f,) = floor_findings(write_claim(text))
    # 0.75 x 0.25 / 0.01^2 = 1875 (binomial variance, common practice).
    assert f["status"] == "info" and f["recomputed"] == pytest.approx(1875)
    assert "about 1875 samples" in f["message"]


def test_with_samples_printed_the_floor_is_compared_as_before(write_claim):
    text = ("title: t\nmetric: linear-xeb\nqubits: 53\nestimate: 3.66e-4\nstat_error: 0.345e-4\n"
            "samples: 8.4e8\n")
    status, (f,) = floor_findings(write_claim(text))
    assert f["status"] == "pass" and f["statement"] == "within_floor"
