"""Exact fractions where definitions are exact (``threshold: 2/3``), through
the command line."""

from __future__ import annotations

import io
import json

import pytest

from checker.cli import run

CLAIM = """\
title: Invented proportion claim against a two-thirds threshold
metric: proportion
estimate: 0.700000
stat_error: 0.0100000
threshold: {threshold}
tolerance: 0
significance: {{sigma: 3.33333}}
"""


def check_json(path):
    out, err = io.StringIO(), io.StringIO()
    status = run(["check", str(path), "--json", "--only", "significance"], out, err)
    return status, json.loads(out.getvalue()) if out.getvalue() else None, err.getvalue()


def test_a_fraction_threshold_is_exact(write_claim):
    # z = (0.7 - 2/3) / 0.01 = 10/3 = 3.33333...: hand arithmetic of the usual z
    # (estimate - threshold) / standard error (common practice).
    status, report, err = check_json(write_claim(CLAIM.format(threshold="2/3")))
    assert (status, err) == (0, "")
    (finding,) = [f for f in report["findings"] if f["details"].get("quantity") == "sigma"]
    assert finding["status"] == "pass" and finding["recomputed"] == pytest.approx(10 / 3, rel=1e-9)
    # The printed 0.667 is not 2/3: z = 0.033/0.01 = 3.30, outside 3.33333 at the printed digits.
    status, report, _ = check_json(write_claim(CLAIM.format(threshold="0.667")))
    assert status == 1


@pytest.mark.parametrize("field_text", ["interval: {low: 0.68, high: 0.72, level: 19/20}",
                                        "significance: {required_sigma: 5/2}"])
def test_other_definitions_take_fractions(write_claim, field_text):
    text = "title: t\nmetric: proportion\nestimate: 0.7\nstat_error: 0.01\n" + field_text + "\n"
    out, err = io.StringIO(), io.StringIO()
    assert run(["check", str(write_claim(text))], out, err) in (0, 1) and err.getvalue() == ""


@pytest.mark.parametrize("text, line", [
    ("estimate: 2/3", "estimate (line 3): 2/3 is a fraction, which claimcheck reads only where a definition "
                      "is exact (threshold, tolerance, interval.level, significance.required_sigma, "
                      "significance.upcrossing_sigma); write the value with the digits the paper printed"),
    ("estimate: 0.7\nthreshold: 2/0", "threshold (line 4): 2/0 is not a fraction claimcheck reads; write "
                                      "whole numbers without spaces and a denominator of at least 1"),
])
def test_a_fraction_elsewhere_is_one_line(write_claim, text, line):
    path = write_claim(f"title: t\nmetric: proportion\n{text}\n")
    out, err = io.StringIO(), io.StringIO()
    assert run(["check", str(path)], out, err) == 2
    assert err.getvalue().startswith(f"{path}: {line}")


def test_a_fraction_in_a_batch_cell(tmp_path):
    path = tmp_path / "t.csv"
    path.write_text("title,metric,estimate,stat_error,threshold,tolerance,significance.sigma\n"
                    "x,proportion,0.700000,0.0100000,2/3,0,3.33333\n", encoding="utf-8")
    out, err = io.StringIO(), io.StringIO()
    assert run(["batch", str(path)], out, err) == 0 and err.getvalue() == ""
