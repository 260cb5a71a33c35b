"""``claimcheck drift SERIES.csv`` through the real command line.  (Named
test_drift_command so as not to collide with tests/stats/test_drift.py.)"""

import io
import json

import numpy as np
import pytest

from checker.cli import run


def _run(*argv):
    out, err = io.StringIO(), io.StringIO()
    status = run(list(argv), out, err)
    return status, out.getvalue(), err.getvalue()


def _series(path, header="time,estimate,error", rows=None):
    rng = np.random.default_rng(5)
    if rows is None:
        rows = [f"{t},{0.6 + 0.003 * t + rng.normal(0, 0.01):.5f},0.01" for t in range(12)]
    path.write_text("\n".join([header] + rows) + "\n")
    return str(path)


def test_text_and_json(tmp_path):
    path = _series(tmp_path / "s.csv")
    status, out, err = _run("drift", path, "--window", "4", "8")
    assert status == 0 and err == ""
    first = out.splitlines()[0]
    assert first == f"Drift of {path}: 12 points, 5 of them in the window 4 to 8" and "rejected" in out
    # The whole series as the window: each count said once, not "(12 points)" again.
    status, out, _ = _run("drift", path)
    first = out.splitlines()[0]
    # (counted after the path: a temporary folder such as pytest-120 holds "12" itself)
    assert first == f"Drift of {path}: 12 points, all in the window 0 to 11"
    assert first[len(f"Drift of {path}"):].count("12") == 1
    status, out, _ = _run("drift", path, "--json", "--level", "0.9")
    d = json.loads(out)
    assert d["slope_interval"]["level"] == 0.9 and d["constant_model"]["rejected"] is True
    assert d["slope"] == pytest.approx(0.003, abs=0.002)


def test_date_times_become_hours(tmp_path):
    rows = [f"2026-03-0{1 + i // 24}T{i % 24:02d}:00,{1.0 + 0.001 * (i % 3)},0.01" for i in range(30)]
    path = _series(tmp_path / "dt.csv", rows=rows)
    status, out, _ = _run("drift", path, "--json", "--window", "2026-03-01T02:00", "2026-03-01T10:00")
    d = json.loads(out)
    assert status == 0 and d["time_unit"] == "hours since the first point"
    assert d["window"] == {"start": 2.0, "end": 10.0, "points": 9}


@pytest.mark.parametrize("header, rows, words", [
    ("when,estimate", ["1,2", "2,3", "3,4"], "has no 'time' column"),
    ("time,estimate", ["1,2", "2,abc", "3,4"], "estimate (line 3): estimate 'abc' is not usable"),
    ("time,estimate,error", ["1,2,0.1", "2,3,-1", "3,4,0.1"], "error (line 3)"),
    ("time,estimate", ["1,2", "2,3"], "a trend needs at least three points"),
    ("time,estimate", ["1,2", "1,3", "1,4"], "all points are at the same time"),
    ("time,estimate", [], "holds no rows"),
])
def test_unusable_series_exit_2(tmp_path, header, rows, words):
    path = _series(tmp_path / "bad.csv", header, rows)
    status, out, err = _run("drift", path)
    assert status == 2 and out == "" and words in err and err.count("\n") == 1


def test_bad_window(tmp_path):
    path = _series(tmp_path / "s.csv")
    status, _, err = _run("drift", path, "--window", "8", "4")
    assert status == 2 and "the window ends before it starts" in err
    status, _, err = _run("drift", path, "--window", "a", "4")
    assert status == 2 and "is not a number" in err
    status, _, err = _run("drift", str(tmp_path / "none.csv"))
    assert status == 2 and "no such file" in err


def test_date_times_name_their_unit_in_the_window_and_the_slope(tmp_path):
    rows = [f"2026-03-0{1 + i // 24}T{i % 24:02d}:00,{1.0 + 0.001 * (i % 3)},0.01" for i in range(30)]
    path = _series(tmp_path / "dt.csv", rows=rows)
    status, out, _ = _run("drift", path, "--window", "2026-03-01T02:00", "2026-03-01T10:00")
    first, _, slope, *_ = out.splitlines()
    assert status == 0
    assert first.endswith(": 30 points, 9 of them in the window 2 to 10 hours since the first point "
                          "(2026-03-01T00:00:00)")
    assert " per hour; " in slope and "per unit time" not in out
    status, out, _ = _run("drift", path, "--json")
    assert json.loads(out)["time_origin"] == "2026-03-01T00:00:00"
    # Plain numbers keep the time column's own unit, which claimcheck does not know.
    status, out, _ = _run("drift", _series(tmp_path / "n.csv"))
    assert "per unit time" in out and "hours" not in out
