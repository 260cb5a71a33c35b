"""``claimcheck batch``: outputs, exit statuses, bad rows, the progress bar."""

import io
import json
import re
from pathlib import Path

import pandas as pd
import pytest

from checker.cli import run
from checker.commands.batch import Progress

EXAMPLE = Path(__file__).resolve().parents[2] / "claims_examples" / "survey_table.csv"
HEADER = "title,metric,estimate,stat_error,samples,threshold,significance.sigma,significance.required_sigma\n"
GOOD = "good,proportion,0.62,0.022,500,0.5,5.5,3\n"
FLAWED = "flawed,proportion,0.62,0.005,500,0.5,24,3\n"


def claimcheck(*argv):
    out, err = io.StringIO(), io.StringIO()
    status = run(list(map(str, argv)), out, err)
    return status, out.getvalue(), err.getvalue()


def table(tmp_path, *rows, header=HEADER, name="t.csv"):
    path = tmp_path / name
    path.write_text(header + "".join(rows), encoding="utf-8")
    return path


def test_example_to_csv(tmp_path):
    out = tmp_path / "out.csv"
    status, stdout, stderr = claimcheck("batch", EXAMPLE, "--out", out)
    assert status == 2  # three claims fail a check and row 11 cannot be used: 2 beats 1, as in check
    frame = pd.read_csv(out, keep_default_na=False, dtype=str)
    # DESIGN.md's output contract: at least these columns.
    for column in ("source", "title", "verdict", "failed_checks", "sigma_recomputed", "p_recomputed",
                   "p_holm", "p_bh"):
        assert column in frame.columns
    assert frame.loc[5, "failed_checks"] == "significance"
    assert frame.loc[10, "source"] == "row 11" and frame.loc[10, "verdict"] == "unusable"
    # The bad row on stderr with its row number, field, line and reason; the batch went on.
    assert stderr == (f"{EXAMPLE} row 11: samples (line 14): 2,000,000 uses thousands separators; "
                      "write the digits without commas\n")
    assert stdout.splitlines()[-1] == f"wrote 11 rows to {out}"
    assert "\r" not in stderr  # no progress bar when stderr is not a terminal


def test_json_and_html_outputs(tmp_path):
    status, _, _ = claimcheck("batch", EXAMPLE, "--out", tmp_path / "out.json")
    data = json.loads((tmp_path / "out.json").read_text())
    assert status == 2 and data["summary"]["rows"] == 11 and len(data["claims"]) == 11
    claimcheck("batch", EXAMPLE, "--out", tmp_path / "out.html")
    page = (tmp_path / "out.html").read_text()
    assert page.startswith("<!DOCTYPE html>") and page.count("<tr") == 12


@pytest.mark.parametrize("rows, status", [((GOOD, GOOD), 0), ((GOOD, "bad,proportion\n"), 2),
                                          ((FLAWED, GOOD), 1), ((FLAWED, "bad,proportion\n"), 2)])
def test_exit_statuses(tmp_path, rows, status):
    assert claimcheck("batch", table(tmp_path, *rows))[0] == status


def test_ragged_row_is_reported_by_number_and_the_rest_checked(tmp_path):
    status, stdout, stderr = claimcheck("batch", table(tmp_path, GOOD, "short,proportion\n", GOOD))
    assert status == 2
    assert stderr == (f"{tmp_path / 't.csv'} row 2 (line 3): has 2 cells but the header names 8 columns; "
                      "give every row one cell per column (empty for a field left out)\n")
    assert "3 rows; 2 claims checked, 1 row could not be used" in stdout


def test_unknown_column_stops_with_one_line(tmp_path):
    path = table(tmp_path, GOOD.replace(",3\n", "\n"),
                 header="title,metric,estimate,stat_error,samples,threshold,significance.sigm\n")
    status, stdout, stderr = claimcheck("batch", path, "--out", tmp_path / "out.csv")
    assert status == 2 and stdout == ""
    assert stderr.count("\n") == 1 and "Traceback" not in stderr
    assert stderr.startswith(f"{path}: the column 'significance.sigm' is not in the claim vocabulary; "
                             "did you mean 'significance.sigma'?")
    assert not (tmp_path / "out.csv").exists()


def test_outputs_never_overwrite_an_input_and_need_a_known_extension(tmp_path):
    path = table(tmp_path, GOOD)
    before = path.read_bytes()
    status, _, stderr = claimcheck("batch", path, "--out", path)
    assert status == 2 and "is one of the input files" in stderr
    assert path.read_bytes() == before
    status, _, stderr = claimcheck("batch", path, "--out", tmp_path / "out.txt")
    assert status == 2 and "ending in .csv, .json or .html" in stderr


def test_folder_input(tmp_path):
    folder = tmp_path / "claims"
    folder.mkdir()
    (folder / "a.yaml").write_text("title: A\nmetric: proportion\nestimate: 0.62\nstat_error: 0.022\n"
                                   "samples: 500\nthreshold: 0.5\nsignificance: {sigma: 5.5}\n")
    (folder / "b.yaml").write_text("title: B\nmetric: proportion\nestimate: 1e-3\n")  # YAML 1.1 trap
    status, stdout, stderr = claimcheck("batch", folder, "--out", tmp_path / "out.csv")
    frame = pd.read_csv(tmp_path / "out.csv", keep_default_na=False, dtype=str)
    assert list(frame["verdict"]) == ["consistent", "consistent"]
    assert status == 0 and stderr == ""


def test_missing_table_is_one_line(tmp_path):
    status, _, stderr = claimcheck("batch", tmp_path / "none.csv")
    assert status == 2 and stderr == f"{tmp_path / 'none.csv'}: no such file or folder; give a CSV or Parquet table, or a folder of claim files\n"


def test_jobs_must_be_a_count(tmp_path):
    status, _, stderr = claimcheck("batch", table(tmp_path, GOOD), "--jobs", "0")
    assert status == 2 and "--jobs" in stderr


class _Terminal(io.StringIO):
    def isatty(self):
        return True


def test_progress_bar_only_on_a_terminal():
    quiet = io.StringIO()
    bar = Progress(quiet, after=0.0, every=0.0)
    bar(5, 10)
    bar.close()
    assert quiet.getvalue() == ""
    screen = _Terminal()
    bar = Progress(screen, after=0.0, every=0.0)
    bar(5, 10)
    bar(10, 10)
    bar.close()
    text = screen.getvalue()
    assert "\rchecking claims [###############...............] 5 of 10" in text
    assert "10 of 10" in text and text.endswith("\r")


def test_folder_summary_counts_files_and_a_missing_out_folder_stops_first(tmp_path):
    folder = tmp_path / "claims"
    folder.mkdir()
    (folder / "a.yaml").write_text("title: A\nmetric: mean\nestimate: 0.25\n")
    (folder / "b.json").write_text("{")
    status, stdout, stderr = claimcheck("batch", folder)
    assert status == 2
    assert stdout.splitlines()[0] == f"{folder}: 2 files; 1 claim checked, 1 file could not be used"
    assert stderr.startswith(f"{folder / 'b.json'} (line 1): is not valid JSON")
    status, stdout, stderr = claimcheck("batch", folder, "--out", tmp_path / "nowhere" / "out.csv")
    assert status == 2 and stdout == "" and "its folder does not exist" in stderr


def test_the_summary_agrees_in_number(tmp_path):
    status, out, _ = claimcheck("batch", table(tmp_path, GOOD))
    assert status == 0
    assert ("required sigma: 1 claim states one and has a recomputed significance; 1 clears it as "
            "recomputed, 1 after Holm and 1 after Benjamini-Hochberg adjustment across 1 recomputed p-value") in out
    claimcheck("batch", table(tmp_path, GOOD, name="u.csv"), "--out", tmp_path / "one.html")
    page = (tmp_path / "one.html").read_text()
    assert "Of 1 claim that states a required sigma, 1 clears it as recomputed" in page
    status, out, _ = claimcheck("batch", table(tmp_path, GOOD, GOOD, name="two.csv"))
    assert "2 claims state one and have a recomputed significance; 2 clear it" in out


def test_the_html_table_scrolls_inside_its_own_box(tmp_path):
    claimcheck("batch", EXAMPLE, "--out", tmp_path / "out.html")
    page = (tmp_path / "out.html").read_text()
    box = page.index('<div class="wide"')
    assert box < page.index("<table>") < page.index("</table>") < page.index("</div>", box)
    assert re.search(r"div\.wide \{[^}]*overflow-x: auto", page)


def test_help_ranks_exit_statuses_as_check_does(tmp_path):
    # The help says what the code does: an unusable row (2) beats a flag (1), as check's worst status.
    status, out, _ = claimcheck("batch", "--help")
    text = " ".join(out.split())
    assert status == 0
    assert "2 when a row could not be used, else 1 when a claim fails a check, else 0" in text
    assert claimcheck("batch", table(tmp_path, FLAWED, "bad,proportion\n"))[0] == 2
    assert claimcheck("batch", table(tmp_path, FLAWED, GOOD))[0] == 1
