"""claimcheck never loses a user's file.

Inputs are never modified (bytes and modification time unchanged); an output path that
is an input (however it is spelt) is refused with exit 2; a run that fails while
rendering or writing leaves no report and no temporary file, and an older report of
that name stays as it was; the reports written are readable by others (mode 0644
under the usual umask 022).  Facts checked here are claimcheck's own contract
(DESIGN.md, "output"), common practice for safe file writing.
"""

from __future__ import annotations

import errno
import io
import os
import shutil
import stat
from pathlib import Path

import pytest

import checker.output
from checker.cli import run

ROOT = Path(__file__).resolve().parents[2]
EXAMPLES = ROOT / "claims_examples"
CLAIM = "lattice_xeb_clean.yaml"
SERIES = "time,estimate,error\n" + "".join(f"{t},{0.5 + 0.001 * t:.4f},0.01\n" for t in range(8))  # invented


def run_cli(argv):
    out, err = io.StringIO(), io.StringIO()
    status = run([str(a) for a in argv], out, err)
    return status, out.getvalue(), err.getvalue()


def snapshot(folder: Path) -> dict:
    """Every file below ``folder``: its bytes, modification time (ns) and mode."""
    out = {}
    for path in sorted(folder.rglob("*")):
        if path.is_file():
            st = path.stat()
            out[str(path.relative_to(folder))] = (path.read_bytes(), st.st_mtime_ns, stat.S_IMODE(st.st_mode))
    return out


@pytest.fixture
def inputs(tmp_path) -> Path:
    """Copies of the example inputs (with their times) in a folder of their own."""
    folder = tmp_path / "inputs"
    folder.mkdir()
    for name in (CLAIM, "survey_table.csv", "simulated_raw_lattice.csv", "simulated_raw_lattice.yaml",
                 "many_circuit_combination.yaml"):
        shutil.copy2(EXAMPLES / name, folder / name)
    (folder / "series.csv").write_text(SERIES)
    claims = folder / "claims"
    claims.mkdir()
    for name in (CLAIM, "small_chip_xeb_above_one.json", "ghz_parity_clean.yaml"):
        shutil.copy2(EXAMPLES / name, claims / name)
    # An old time, so that a rewrite of the same bytes would still show.
    for path in folder.rglob("*"):
        os.utime(path, ns=(1_000_000_000_000_000_000, 1_000_000_000_000_000_000))
    return folder


@pytest.fixture
def umask_022():
    old = os.umask(0o022)
    yield
    os.umask(old)


def commands(i: Path, o: Path):
    """Every command that reads inputs, with every output it can write (into ``o``)."""
    return {
        "check": ["check", i / CLAIM, "--json", "--markdown", o / "notes.md", "--html", o / "report.html"],
        "check-text": ["check", i / "many_circuit_combination.yaml"],
        "batch-table": ["batch", i / "survey_table.csv", "--out", o / "summary.html"],
        "batch-folder": ["batch", i / "claims", "--out", o / "summary.json"],
        "raw": ["raw", i / "simulated_raw_lattice.csv", "--claim", i / "simulated_raw_lattice.yaml",
                "--bootstrap", "50", "--fit-sample", "500", "--json"],
        "drift": ["drift", i / "series.csv", "--json"],
    }


@pytest.mark.parametrize("name", list(commands(Path("."), Path("."))))
def test_inputs_are_never_modified(tmp_path, inputs, name, umask_022):
    out = tmp_path / "out"
    out.mkdir()
    before = snapshot(inputs)
    status, stdout, stderr = run_cli(commands(inputs, out)[name])
    assert status in (0, 1, 2) and "Traceback" not in stderr, stderr
    assert stdout
    assert snapshot(inputs) == before


def test_inputs_may_be_read_only(tmp_path, inputs):
    # Reading needs no write permission on the input or its folder.
    for path in inputs.rglob("*"):
        path.chmod(0o555 if path.is_dir() else 0o444)
    try:
        out = tmp_path / "out"
        out.mkdir()
        for name, argv in commands(inputs, out).items():
            status, _, stderr = run_cli(argv)
            assert status in (0, 1, 2) and "Traceback" not in stderr, (name, stderr)
    finally:
        for path in inputs.rglob("*"):
            path.chmod(0o755 if path.is_dir() else 0o644)


# --- an output equal to an input is refused -------------------------------------------

def spellings(path: Path) -> list:
    """The same file by other names: as given, through '..', relative, a symbolic and a hard link."""
    link = path.parent / f"link-to-{path.name}"
    link.symlink_to(path)
    hard = path.parent / f"hard-{path.name}"
    os.link(path, hard)
    return [path, path.parent / ".." / path.parent.name / path.name,
            Path(os.path.relpath(path)), link, hard]


def refusals(i: Path):
    """(argv with OUT for the output path, the input OUT stands for)."""
    claim, table, folder_claim = i / CLAIM, i / "survey_table.csv", i / "claims" / "small_chip_xeb_above_one.json"
    return [
        (["check", claim, "--markdown", "OUT"], claim),
        (["check", claim, "--html", "OUT"], claim),
        (["check", claim, "--markdown", i / "fine.md", "--html", "OUT"], claim),
        (["batch", table, "--out", "OUT"], table),
        (["batch", i / "claims", "--out", "OUT"], folder_claim),
    ]


@pytest.mark.parametrize("case", range(5))
def test_output_equal_to_an_input_is_refused(inputs, case, monkeypatch):
    monkeypatch.chdir(inputs.parent)
    argv, target = refusals(inputs)[case]
    for spelt in spellings(target):
        before = snapshot(inputs)
        status, stdout, stderr = run_cli([spelt if a == "OUT" else a for a in argv])
        assert status == 2, (spelt, stderr)
        assert stdout == ""
        assert stderr.count("\n") == 1 and "input" in stderr, stderr
        assert stderr.startswith(str(spelt)), stderr
        assert snapshot(inputs) == before  # nothing written, not even the other report


# --- a failed run leaves no file --------------------------------------------------------

def _boom(*args, **kwargs):
    raise RuntimeError("renderer failed (on purpose, in a test)")


@pytest.mark.parametrize("which", ["markdown", "html"])
def test_check_renderer_failure_leaves_no_report(tmp_path, inputs, monkeypatch, which):
    import checker.render.html
    import checker.render.markdown

    module = checker.render.markdown if which == "markdown" else checker.render.html
    monkeypatch.setattr(module, f"render_{which}", _boom)
    out = tmp_path / "out"
    out.mkdir()
    (out / "report.html").write_text("an older report the user keeps")
    before = snapshot(out)
    with pytest.raises(RuntimeError):
        run_cli(["check", inputs / CLAIM, "--markdown", out / "notes.md", "--html", out / "report.html"])
    assert snapshot(out) == before  # neither report, no temporary file, the old one untouched


@pytest.mark.parametrize("fmt", ["csv", "json", "html"])
def test_batch_renderer_failure_leaves_no_table(tmp_path, inputs, monkeypatch, fmt):
    import checker.render.survey_html
    import checker.render.survey_text

    module = checker.render.survey_html if fmt == "html" else checker.render.survey_text
    monkeypatch.setattr(module, f"render_batch_{fmt}", _boom)
    out = tmp_path / "out"
    out.mkdir()
    with pytest.raises(RuntimeError):
        run_cli(["batch", inputs / "survey_table.csv", "--out", out / f"summary.{fmt}"])
    assert list(out.iterdir()) == []


def test_simulate_failure_leaves_no_data_file(tmp_path, monkeypatch):
    import checker.raw.writers

    monkeypatch.setattr(checker.raw.writers, "dataset_bytes", _boom)
    with pytest.raises(RuntimeError):
        run_cli(["simulate", "--qubits", "4", "--circuits", "2", "--samples", "10", "--fidelity", "0.5",
                 "--out", tmp_path / "data.npz"])
    assert list(tmp_path.iterdir()) == []


def _full_disk(src, dst, *args, **kwargs):
    raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))


def _argv_writing(kind: str, i: Path, out: Path):
    return {
        "check-markdown": ["check", i / CLAIM, "--markdown", out / "r.md"],
        "check-html": ["check", i / CLAIM, "--html", out / "r.html"],
        "batch": ["batch", i / "survey_table.csv", "--out", out / "r.csv"],
        "simulate": ["simulate", "--qubits", "4", "--circuits", "2", "--samples", "10", "--fidelity", "0.5",
                     "--out", out / "r.npy"],
    }[kind]


@pytest.mark.parametrize("kind", ["check-markdown", "check-html", "batch", "simulate"])
@pytest.mark.parametrize("failure", ["rename", "create"])
def test_write_failure_is_one_line_and_leaves_no_partial_file(tmp_path, inputs, monkeypatch, kind, failure):
    """A full disk at the rename, or a folder refusing new files: exit 2 with one line
    naming the output, the older file of that name intact, no temporary file."""
    out = tmp_path / "out"
    out.mkdir()
    argv = _argv_writing(kind, inputs, out)
    target = Path(argv[-1])
    target.write_bytes(b"the user's older file")
    before = snapshot(out)
    if failure == "rename":
        monkeypatch.setattr(checker.output.os, "replace", _full_disk)
    else:
        def refuse(*args, **kwargs):
            raise PermissionError(errno.EACCES, os.strerror(errno.EACCES))
        monkeypatch.setattr(checker.output.tempfile, "mkstemp", refuse)
    status, stdout, stderr = run_cli(argv)
    assert status == 2, stderr
    assert stderr.splitlines()[-1].startswith(f"{target}: cannot be written"), stderr
    assert "Traceback" not in stderr
    assert snapshot(out) == before


def test_missing_output_folder_is_found_before_any_report_is_written(tmp_path, inputs):
    status, stdout, stderr = run_cli(["check", inputs / CLAIM, "--markdown", tmp_path / "notes.md",
                                      "--html", tmp_path / "missing" / "report.html"])
    assert status == 2 and stderr.count("\n") == 1 and "folder does not exist" in stderr, stderr
    assert not (tmp_path / "notes.md").exists()


# --- written files are ordinary, readable files ----------------------------------------

def test_written_files_are_readable_by_others(tmp_path, inputs, umask_022):
    out = tmp_path / "out"
    out.mkdir()
    runs = [["check", inputs / CLAIM, "--markdown", out / "n.md", "--html", out / "r.html"]]
    runs += [["batch", inputs / "survey_table.csv", "--out", out / f"s.{s}"] for s in ("csv", "json", "html")]
    runs += [["simulate", "--qubits", "4", "--circuits", "2", "--samples", "10", "--fidelity", "0.5",
              "--out", out / f"d.{s}"] for s in ("csv", "npy", "npz")]
    for argv in runs:
        status, _, stderr = run_cli(argv)
        # The example survey's row 11 cannot be used (a thousands separator): the worst status, 2.
        assert status in ((2,) if argv[0] == "batch" else (0, 1)), stderr
    written = sorted(p.name for p in out.iterdir())
    assert written == ["d.csv", "d.npy", "d.npz", "n.md", "r.html", "s.csv", "s.html", "s.json"]
    for path in out.iterdir():
        mode = stat.S_IMODE(path.stat().st_mode)
        assert mode & 0o044 == 0o044, (path.name, oct(mode))
        assert mode == 0o644, (path.name, oct(mode))  # and no execute bit


def test_a_private_umask_is_respected(tmp_path, inputs):
    old = os.umask(0o077)
    try:
        status, _, stderr = run_cli(["check", inputs / CLAIM, "--markdown", tmp_path / "n.md"])
    finally:
        os.umask(old)
    assert status in (0, 1), stderr
    assert stat.S_IMODE((tmp_path / "n.md").stat().st_mode) == 0o600
