"""checker/survey/run.py: every check on every claim, the set-wide columns, bad rows."""

import math
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from scipy.special import ndtr

import checker.survey.run as engine
from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.survey import COLUMNS, run_batch
from checker.survey.columns import ColumnPlan
from checker.survey.table import read_source

EXAMPLE = Path(__file__).resolve().parents[2] / "claims_examples" / "survey_table.csv"


@pytest.fixture(scope="module")
def example():
    return run_batch(EXAMPLE)


def test_example_table_verdicts(example):
    frame = example.frame
    assert list(frame.columns) == list(COLUMNS)
    assert list(frame["source"]) == [f"row {i}" for i in range(1, 12)]
    failed = dict(zip(frame["source"], frame["failed_checks"]))
    # The rows the table's comment line says carry slips, and nothing else.
    assert failed["row 6"] == "significance"
    assert failed["row 7"] == "look-elsewhere"
    assert failed["row 8"] == "error-floor"
    assert all(failed[f"row {i}"] == "" for i in (1, 2, 3, 4, 5, 9, 10))
    assert frame.loc[10, "verdict"] == "unusable"
    assert frame.loc[10, "problem"] == (f"{EXAMPLE} row 11: samples (line 14): 2,000,000 uses thousands "
                                        "separators; write the digits without commas")
    assert example.summary["verdicts"] == {"consistent": 7, "inconsistent": 3, "incomplete": 0}
    assert example.summary["unusable"] == 1
    assert example.exit_status == 2  # the unusable row 11 beats the three flags, as in check


def test_recomputed_columns_are_the_significance_check_at_the_printed_values(example):
    # Row 2: (1.85e-3 - 1.0e-3) / 0.20e-3 = 4.25 sigma, one-sided p = Phi(-4.25)
    # (scipy.special.ndtr as the reference).
    row = example.frame.loc[1]
    assert row["sigma_recomputed"] == pytest.approx(4.25, rel=1e-12)
    assert row["p_recomputed"] == pytest.approx(ndtr(-4.25), rel=1e-12)
    # Row 9 adds its systematic in quadrature: 0.051 / hypot(0.012, 0.008) = 3.5362.
    assert example.frame.loc[8, "sigma_recomputed"] == pytest.approx(0.051 / math.hypot(0.012, 0.008))


def _significance_box(text_rows, header):
    plan = ColumnPlan(header, "t")
    for row in text_rows:
        doc, _ = plan.document(row.cells, "t", None)
        report = run_checks(claim_from_document(doc))
        box = next((f.details for f in report.findings if f.check == "significance"
                    and "sigma_low" in f.details), None)
        yield box


def test_recomputed_sigma_lies_in_the_checks_printed_precision_box(tmp_path):
    # The column is the formula at the printed central values; the check evaluates it over the
    # box of printed precision, which must contain it -- for stated errors, intervals, two-sided
    # claims, errors at the threshold and both systematics treatments.
    text = ("title,metric,estimate,stat_error,syst_error,interval.low,interval.high,samples,circuits,threshold,"
            "significance.sided,significance.systematics,significance.error_at\n"
            "a,linear-xeb,1.85e-3,0.20e-3,,,,2.5e7,,1.0e-3,,,\n"
            "b,proportion,0.40,0.02,,,,600,,0.5,two,,\n"
            "c,proportion,0.62,,,0.58,0.66,,,0.5,,,\n"
            "d,proportion,0.62,,,,,500,,0.5,,,threshold\n"
            "e,heavy-output,0.781,,,,,,200,0.666667,,,threshold\n"
            "f,log-xeb,0.081,0.012,0.008,,,,,0.03,,quadrature,\n"
            "g,log-xeb,0.081,0.012,0.008,,,,,0.03,,marginalized,\n"
            "h,log-xeb,0.081,0.012,0.008,,,,,0.03,,none,\n")
    path = tmp_path / "t.csv"
    path.write_text(text)
    result = run_batch(path)
    table = read_source(path)
    boxes = list(_significance_box(table.rows, table.header))
    for sigma, box in zip(result.frame["sigma_recomputed"], boxes):
        assert box is not None
        assert box["sigma_low"] - 1e-9 <= sigma <= box["sigma_high"] + 1e-9
    # Row d: the error at the threshold is sqrt(0.5 * 0.5 / 500) (binomial model).
    assert result.frame.loc[3, "sigma_recomputed"] == pytest.approx(0.12 / math.sqrt(0.25 / 500))


def _holm_by_hand(p):
    # Holm (1979): sort, multiply the i-th smallest (from 0) by m - i, running maximum, cap at 1.
    order = np.argsort(p)
    m = len(p)
    stepped = np.minimum(1.0, np.maximum.accumulate((m - np.arange(m)) * p[order]))
    out = np.empty(m)
    out[order] = stepped
    return out


def _bh_by_hand(p):
    # Benjamini and Hochberg (1995): sort, p_(i) m / i, running minimum from the largest.
    order = np.argsort(p)
    m = len(p)
    stepped = np.minimum.accumulate((p[order] * m / np.arange(1, m + 1))[::-1])[::-1]
    out = np.empty(m)
    out[order] = np.minimum(stepped, 1.0)
    return out


def test_adjusted_columns_across_the_example(example):
    frame = example.frame
    tested = frame["p_recomputed"].notna()
    # A claim stating trials enters the family with its look-elsewhere-corrected p (issue 16).
    used = frame["p_global"].where(frame["look_elsewhere"] != "", frame["p_recomputed"])
    p = used[tested].to_numpy()
    np.testing.assert_allclose(frame.loc[tested, "p_holm"], _holm_by_hand(p), rtol=1e-12)
    np.testing.assert_allclose(frame.loc[tested, "p_bh"], _bh_by_hand(p), rtol=1e-12)
    assert example.summary["tested"] == int(tested.sum()) == 10
    # Row 10 (4.36 sigma, required 4) clears its level as recomputed and after BH, not after Holm:
    # 7 * p = 4.5e-5 is 3.92 sigma.
    row = frame.loc[9]
    assert bool(row["clears_required"]) and bool(row["clears_bh"]) and not bool(row["clears_holm"])
    assert row["p_holm"] == pytest.approx(7 * row["p_recomputed"], rel=1e-12)
    # Row 7 (best of 40 trials) is held to its required 3 sigma by its global significance:
    # local 3.44 sigma, p = 2.9e-4; Sidak over 40 trials 1 - (1 - p)^40 = 0.0116, 2.27 sigma
    # (Sidak 1967, J. Am. Stat. Assoc. 62, 626; arithmetic), which falls short.
    row7 = frame.loc[6]
    assert row7["look_elsewhere"] == "sidak" and row7["sigma_global"] == pytest.approx(2.2704, abs=1e-3)
    assert row7["p_global"] == pytest.approx(1 - (1 - row7["p_recomputed"]) ** 40, rel=1e-9)
    assert not bool(row7["clears_required"]) and row7["sigma_recomputed"] > 3
    assert example.summary["clear_required_sigma"] == {"recomputed": 9, "holm": 7, "bh": 9}
    assert example.summary["look_elsewhere_corrected"] == 1
    assert example.summary["with_required_sigma"] == 10


def _table(tmp_path, rows, name="t.csv"):
    path = tmp_path / name
    path.write_text("title,metric,estimate,stat_error,samples,threshold,significance.sigma\n" + "".join(rows))
    return path


GOOD = "good,proportion,0.62,0.022,500,0.5,5.5\n"
FLAWED = "flawed,proportion,0.62,0.005,500,0.5,24\n"
BAD = "bad,fidelity,0.62,0.022,500,0.5,5.5\n"


def test_a_bad_row_is_reported_and_the_batch_goes_on(tmp_path):
    result = run_batch(_table(tmp_path, [GOOD, BAD, GOOD, FLAWED]))
    assert list(result.frame["verdict"]) == ["consistent", "unusable", "consistent", "inconsistent"]
    assert result.problems == (f"{tmp_path / 't.csv'} row 2: metric (line 3): metric is 'fidelity'; "
                               "allowed: linear-xeb | log-xeb | heavy-output | proportion | mean | counts",)
    assert result.exit_status == 2  # an unusable row beats a flag, as in check


@pytest.mark.parametrize("rows, status", [([GOOD, GOOD], 0), ([GOOD, BAD], 2), ([FLAWED, BAD], 2), ([FLAWED], 1)])
def test_exit_status(tmp_path, rows, status):
    assert run_batch(_table(tmp_path, rows)).exit_status == status


def test_an_internal_error_in_one_claim_does_not_sink_the_survey(tmp_path, monkeypatch):
    real = engine.run_checks

    def fragile(claim):
        if claim.title == "flawed":
            raise ZeroDivisionError("invented failure")
        return real(claim)

    monkeypatch.setattr(engine, "run_checks", fragile)
    result = run_batch(_table(tmp_path, [GOOD, FLAWED, GOOD]))
    assert list(result.frame["verdict"]) == ["consistent", "unusable", "consistent"]
    assert "internal error ZeroDivisionError: invented failure" in result.problems[0]
    assert result.problems[0].startswith(f"{tmp_path / 't.csv'} row 2: ")


def test_two_workers_give_the_same_frame_as_one(tmp_path):
    rows = [GOOD, FLAWED, BAD] * 8
    path = _table(tmp_path, rows)
    one = run_batch(path, jobs=1).frame
    two = run_batch(path, jobs=2).frame
    pd.testing.assert_frame_equal(one, two)


def test_folder_of_claim_files(tmp_path):
    (tmp_path / "a.yaml").write_text("title: A\nmetric: proportion\nestimate: 0.62\nstat_error: 0.022\n"
                                     "samples: 500\nthreshold: 0.5\nsignificance: {sigma: 5.5}\n")
    (tmp_path / "b.json").write_text('{"title": "B", "metric": "proportion", "estimate": NaN}')
    result = run_batch(tmp_path)
    assert list(result.frame["source"]) == [str(tmp_path / "a.yaml"), str(tmp_path / "b.json")]
    assert list(result.frame["verdict"]) == ["consistent", "unusable"]
    assert result.frame.loc[0, "sigma_recomputed"] == pytest.approx(0.12 / 0.022)
    assert "NaN" in result.problems[0] and result.problems[0].startswith(str(tmp_path / "b.json"))


def test_claim_far_below_its_threshold_with_trials(tmp_path):
    # Regression: log_sidak failed (math domain error) when log p was within 1e-16 of 0, as for
    # a one-sided sigma of -9; the claim is checkable and consistent.
    path = tmp_path / "t.csv"
    path.write_text("title,metric,estimate,stat_error,threshold,significance.sigma,trials\n"
                    "below,proportion,0.41,0.01,0.5,-9,5\n")
    result = run_batch(path)
    assert result.frame.loc[0, "verdict"] == "consistent"


def test_progress_is_called_with_counts(tmp_path):
    calls = []
    run_batch(_table(tmp_path, [GOOD] * 3), progress=lambda done, total: calls.append((done, total)))
    assert calls == [(3, 3)]
