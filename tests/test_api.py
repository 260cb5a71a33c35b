"""The notebook API: checker.check, Report.to_frame, checker.batch."""

from pathlib import Path

import pandas as pd
import pytest

import checker
from checker.survey import COLUMNS

EXAMPLE = Path(__file__).resolve().parent.parent / "claims_examples" / "survey_table.csv"
CLAIM = {"title": "Invented parity test", "metric": "proportion", "estimate": "0.62", "stat_error": "0.022",
         "samples": "500", "threshold": "0.5", "significance": {"sigma": "5.5", "p_value": "1.9e-8"}}


def test_public_names():
    assert {"check", "batch", "Report", "Finding"} <= set(checker.__all__)


def test_check_a_mapping_and_its_frame():
    report = checker.check(CLAIM)
    assert isinstance(report, checker.Report) and report.verdict == "consistent"
    frame = report.to_frame()
    assert isinstance(frame, pd.DataFrame)
    assert len(frame) == len(report.findings)  # one row per finding
    assert list(frame.columns[:6]) == ["check", "status", "message", "reported", "recomputed", "reproduced_by"]
    assert list(frame["check"]) == [f.check for f in report.findings]
    sigma = frame[(frame["check"] == "significance") & (frame["details.quantity"] == "sigma")].iloc[0]
    # 0.12 / 0.022 = 5.4545 sigma recomputed; printed 5.5 agrees within its printed precision.
    assert sigma["status"] == "pass" and sigma["reported"] == 5.5
    assert sigma["details.sigma_low"] <= 0.12 / 0.022 <= sigma["details.sigma_high"]


def test_to_frame_carries_reproduced_by():
    slipped = dict(CLAIM, significance={"sigma": "5.5", "p_value": "3.8e-8"})  # the two-sided p
    frame = checker.check(slipped).to_frame()
    # No sidedness is stated, so the two-sided reading that reproduces the print is a note (issue 16).
    flagged = frame[frame["status"].isin(["fail", "warn"])]
    assert {"sided": "two"} in list(flagged["reproduced_by"])


def test_check_a_path(tmp_path):
    path = tmp_path / "c.yaml"
    path.write_text("title: T\nmetric: mean\nestimate: 0.25\nsd: 0.9\nsamples: 400\nstat_error: 0.045\n")
    assert checker.check(str(path)).file == str(path)


def test_batch_from_a_path_a_frame_and_mappings():
    from_path = checker.batch(EXAMPLE)
    assert list(from_path.columns) == list(COLUMNS) and len(from_path) == 11
    assert from_path.attrs["summary"]["verdicts"]["inconsistent"] == 3
    frame = pd.DataFrame([{"title": "A", "metric": "proportion", "estimate": "0.62", "stat_error": "0.022",
                           "samples": "500", "threshold": "0.5", "significance.sigma": "5.5"},
                          {"title": "B", "metric": "proportion", "estimate": "0.62", "stat_error": "0.005",
                           "samples": "500", "threshold": "0.5", "significance.sigma": "24"}])
    from_frame = checker.batch(frame)
    assert list(from_frame["verdict"]) == ["consistent", "inconsistent"]
    assert from_frame.loc[1, "failed_checks"] == "error-floor"
    from_mappings = checker.batch([CLAIM, {"title": "no metric", "estimate": 1}])
    assert list(from_mappings["verdict"]) == ["consistent", "unusable"]
    assert "'metric' is missing" in from_mappings.loc[1, "problem"]
    assert from_mappings.loc[0, "sigma_recomputed"] == pytest.approx(0.12 / 0.022)


def test_batch_refuses_what_is_not_a_table():
    with pytest.raises(checker.InputFileError):
        checker.batch(3.5)
