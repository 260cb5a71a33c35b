"""The same input and seed give byte-identical output, for every command.

Each command runs twice in-process (``checker.cli.run``); a few run through a fresh
``python -m checker.cli`` with different PYTHONHASHSEED values, so that set or dict
order that hangs on string hashing, or any other process-level randomness, would
show.  No output may carry a date or time of day (the run's time is not asked for).
"""

from __future__ import annotations

import datetime
import io
import os
import re
import subprocess
import sys
import zipfile
from pathlib import Path

import pytest

from checker.cli import run

ROOT = Path(__file__).resolve().parents[2]
EXAMPLES = ROOT / "claims_examples"
CLAIMS = sorted(p for p in EXAMPLES.iterdir() if p.suffix in (".yaml", ".json"))
# A few claims of different shapes for the slower HTML report.
HTML_CLAIMS = [EXAMPLES / n for n in ("lattice_xeb_clean.yaml", "many_circuit_combination.yaml",
                                      "error_budget_optimistic.yaml", "coupler_scan_best_of_24.yaml")]
SURVEY = EXAMPLES / "survey_table.csv"
RAW_DATA = EXAMPLES / "simulated_raw_lattice.csv"
RAW_CLAIM = EXAMPLES / "simulated_raw_lattice.yaml"
# An invented series of repeated measurements (times in hours), for drift.
SERIES = "time,estimate,error\n" + "".join(
    f"{t},{0.5 + 0.002 * t + 0.01 * ((7 * t) % 5 - 2) / 2:.4f},0.01\n" for t in range(12))
SERIES_DATES = "time,estimate\n" + "".join(
    f"2026-03-0{1 + t // 4}T{(6 * t) % 24:02d}:00,{0.6 + 0.003 * ((5 * t) % 7):.4f}\n" for t in range(10))


def run_cli(argv) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    status = run([str(a) for a in argv], out, err)
    return status, out.getvalue(), err.getvalue()


# Dates and times of day as a report might print them.
_STAMP = re.compile(r"\b(19|20)\d\d-[01]\d-[0-3]\d[T ][0-2]\d:[0-5]\d|\b[0-2]\d:[0-5]\d:[0-5]\d\b")


def assert_no_timestamp(text: str, allowed: str = "") -> None:
    today = datetime.date.today()
    for stamp in (today.isoformat(), today.strftime("%d %B %Y"), today.strftime("%B %d, %Y"),
                  today.strftime("%d/%m/%Y"), today.strftime("%m/%d/%Y")):
        assert stamp not in text, stamp
    found = [m.group(0) for m in _STAMP.finditer(text)]
    assert all(f in allowed for f in found), found


def twice(tmp_path: Path, argv_of, outputs=(), statuses=(0, 1)) -> tuple[tuple, dict]:
    """Run the command twice, each into its own folder; the two runs' stdout,
    stderr, status and written files (by name) must be byte-identical, and the
    status one of ``statuses``."""
    results = []
    for k in ("a", "b"):
        folder = tmp_path / k
        folder.mkdir()
        status, out, err = run_cli(argv_of(folder))
        files = {name: (folder / name).read_bytes() for name in outputs}
        results.append(((status, out.replace(str(folder), "<out>"), err.replace(str(folder), "<out>")), files))
    assert results[0][0] == results[1][0]
    for name in outputs:
        assert results[0][1][name] == results[1][1][name], name
    assert results[0][0][0] in statuses, results[0][0]
    return results[0]


@pytest.mark.parametrize("claim", CLAIMS, ids=lambda p: p.name)
@pytest.mark.parametrize("form", [[], ["--json"], ["--verdict-only"]], ids=["text", "json", "verdict"])
def test_check_stdout_is_reproducible(tmp_path, claim, form):
    (status, out, err), _ = twice(tmp_path, lambda folder: ["check", claim, *form])
    assert out and not err
    assert_no_timestamp(out)


@pytest.mark.parametrize("claim", CLAIMS, ids=lambda p: p.name)
def test_check_markdown_is_reproducible(tmp_path, claim):
    _, files = twice(tmp_path, lambda folder: ["check", claim, "--markdown", folder / "notes.md"], ["notes.md"])
    assert files["notes.md"]
    assert_no_timestamp(files["notes.md"].decode())


@pytest.mark.parametrize("claim", HTML_CLAIMS, ids=lambda p: p.name)
def test_check_html_is_reproducible(tmp_path, claim):
    _, files = twice(tmp_path, lambda folder: ["check", claim, "--html", folder / "report.html"], ["report.html"])
    assert b"<svg" in files["report.html"] or b"<html" in files["report.html"]
    assert_no_timestamp(files["report.html"].decode())


@pytest.mark.parametrize("suffix", [".csv", ".json", ".html"])
def test_batch_is_reproducible(tmp_path, suffix):
    name = f"summary{suffix}"
    # The example survey's row 11 cannot be used (a thousands separator), so the worst status is 2.
    (status, out, err), files = twice(tmp_path, lambda folder: ["batch", SURVEY, "--out", folder / name], [name],
                                      statuses=(2,))
    assert files[name]
    assert_no_timestamp(files[name].decode())
    assert_no_timestamp(out + err)


def test_batch_of_a_folder_is_reproducible(tmp_path):
    # A folder's files are listed in whatever order the file system gives; the result must not be.
    (_, out, _), files = twice(tmp_path, lambda folder: ["batch", EXAMPLES, "--out", folder / "s.json"], ["s.json"])
    assert files["s.json"]


@pytest.mark.parametrize("form", [[], ["--json"]], ids=["text", "json"])
@pytest.mark.parametrize("with_claim", [False, True], ids=["data", "claim"])
def test_raw_is_reproducible(tmp_path, form, with_claim):
    claim = ["--claim", RAW_CLAIM] if with_claim else ["--metric", "linear-xeb", "--qubits", "12"]
    (status, out, err), _ = twice(tmp_path, lambda folder: ["raw", RAW_DATA, *claim, "--seed", "11",
                                                            "--bootstrap", "200", "--fit-sample", "2000", *form])
    assert out
    assert_no_timestamp(out + err)


def test_raw_seed_changes_the_bootstrap(tmp_path):
    # The test above could pass if the seed were ignored and everything fixed; it must not be.
    argv = ["raw", RAW_DATA, "--metric", "linear-xeb", "--qubits", "12", "--bootstrap", "200", "--json"]
    outs = {run_cli(argv + ["--seed", str(s)])[1] for s in (1, 2)}
    assert len(outs) == 2


@pytest.mark.parametrize("suffix", [".csv", ".npy", ".npz", ".parquet"])
@pytest.mark.parametrize("model", ["porter-thomas", "circuit"])
def test_simulate_is_reproducible(tmp_path, suffix, model):
    pytest.importorskip("pyarrow") if suffix == ".parquet" else None
    name = f"data{suffix}"
    argv = lambda folder: ["simulate", "--qubits", "6", "--circuits", "3", "--samples", "40", "--fidelity", "0.4",
                           "--seed", "5", "--model", model, "--out", folder / name]
    (_, out, _), files = twice(tmp_path, argv, [name])
    assert files[name]
    if suffix == ".npz":
        # A zip archive stores each member's modification time: it must be fixed, not the clock's.
        with zipfile.ZipFile(io.BytesIO(files[name])) as archive:
            assert {info.date_time for info in archive.infolist()} == {(1980, 1, 1, 0, 0, 0)}
    if suffix == ".csv":
        assert_no_timestamp(files[name].decode())


@pytest.mark.parametrize("series", [SERIES, SERIES_DATES], ids=["hours", "dates"])
@pytest.mark.parametrize("form", [[], ["--json"]], ids=["text", "json"])
def test_drift_is_reproducible(tmp_path, series, form):
    data = tmp_path / "series.csv"
    data.write_text(series)
    (_, out, _), _ = twice(tmp_path, lambda folder: ["drift", data, *form])
    assert out
    # The dated series' own times may be echoed back; nothing else may look like a time.
    assert_no_timestamp(out, allowed=series)


@pytest.mark.parametrize("options", [
    ["--metric", "linear-xeb", "--fidelity", "0.002", "--threshold", "0", "--sigma", "5", "--qubits", "53"],
    ["--metric", "heavy-output", "--fidelity", "0.70", "--circuits", "200"],
    ["--metric", "mean", "--fidelity", "0.9", "--threshold", "0.85", "--sigma", "3", "--sd", "0.2", "--syst", "0.01"],
], ids=["xeb", "heavy", "mean"])
@pytest.mark.parametrize("form", [[], ["--json"]], ids=["text", "json"])
def test_plan_is_reproducible(tmp_path, options, form):
    (_, out, _), _ = twice(tmp_path, lambda folder: ["plan", *options, *form])
    assert out
    assert_no_timestamp(out)


def test_schema_is_reproducible(tmp_path):
    (_, out, _), _ = twice(tmp_path, lambda folder: ["schema"])
    assert out.startswith("{")


# --- across processes --------------------------------------------------------------

def _subprocess(argv, hash_seed: str, cwd: Path) -> tuple[int, bytes, bytes]:
    env = dict(os.environ, PYTHONHASHSEED=hash_seed)
    env["PYTHONPATH"] = str(ROOT) + os.pathsep + env.get("PYTHONPATH", "")
    done = subprocess.run([sys.executable, "-m", "checker.cli", *map(str, argv)], cwd=cwd, env=env,
                          capture_output=True, timeout=120)
    return done.returncode, done.stdout, done.stderr


def test_same_bytes_across_processes_and_hash_seeds(tmp_path):
    """One process per hash seed runs every writing command once; every byte must agree."""
    script = "; ".join([
        "import sys",
        "from checker.cli import run",
        "out = sys.argv[1]",
        f"run(['check', {str(CLAIMS[0])!r}, '--json', '--markdown', out + '/notes.md', '--html', out + '/r.html'])",
        f"run(['batch', {str(SURVEY)!r}, '--out', out + '/s.json'])",
        f"run(['batch', {str(EXAMPLES)!r}, '--out', out + '/f.csv'])",
        f"run(['raw', {str(RAW_DATA)!r}, '--claim', {str(RAW_CLAIM)!r}, '--seed', '3', '--bootstrap', '100', '--json'])",
        "run(['simulate', '--qubits', '5', '--circuits', '2', '--samples', '20', '--fidelity', '0.3', "
        "'--out', out + '/d.npz'])",
        "run(['plan', '--metric', 'heavy-output', '--fidelity', '0.7', '--json'])",
        "run(['schema'])",
    ])
    results = []
    for seed in ("1", "987654"):
        folder = tmp_path / seed
        folder.mkdir()
        env = dict(os.environ, PYTHONHASHSEED=seed)
        env["PYTHONPATH"] = str(ROOT) + os.pathsep + env.get("PYTHONPATH", "")
        done = subprocess.run([sys.executable, "-c", script, str(folder)], cwd=tmp_path, env=env,
                              capture_output=True, timeout=300)
        assert done.returncode == 0, done.stderr.decode()[-2000:]
        files = {p.name: p.read_bytes() for p in sorted(folder.iterdir())}
        results.append((done.stdout.replace(str(folder).encode(), b"<out>"), files))
    assert sorted(results[0][1]) == ["d.npz", "f.csv", "notes.md", "r.html", "s.json"]
    assert results[0][0] == results[1][0]
    for name in results[0][1]:
        assert results[0][1][name] == results[1][1][name], name


def test_command_line_entry_point_is_reproducible(tmp_path):
    """The real ``python -m checker.cli`` twice, with different hash seeds."""
    argv = ["check", HTML_CLAIMS[1], "--json", "--html", "r.html"]
    seen = []
    for seed in ("0", "4242"):
        folder = tmp_path / seed
        folder.mkdir()
        status, out, err = _subprocess(argv, seed, folder)
        assert status in (0, 1) and err == b"", err
        seen.append((status, out, (folder / "r.html").read_bytes()))
    assert seen[0] == seen[1]
