"""Hostile paths through the real command line: special files as inputs and outputs,
names too long for the file system, paths through a file or a missing folder, links
that loop or dangle, and folders of claims holding all of these.

Every input is read only when it is a regular file, and a special one is refused in
one line at once (a FIFO used to block forever, /dev/zero to grow without limit);
every output is checked before the work (a device, a FIFO, a folder, the same file
twice, an empty path), and the reports of one run are written all or none.
"""

from __future__ import annotations

import errno
import io
import os
import shutil
import socket
import stat
from pathlib import Path

import pytest

from limited import ROOT, assert_refused, claimcheck, claimcheck_many

EXAMPLES = ROOT / "claims_examples"
CLAIM = EXAMPLES / "lattice_xeb_clean.yaml"
RAW = EXAMPLES / "simulated_raw_lattice.csv"
SERIES = "time,estimate,error\n" + "".join(f"{t},{0.5 + 0.001 * t:.4f},0.01\n" for t in range(8))  # invented
FAST_RAW = ["--bootstrap", "20", "--fit-sample", "200"]


def special_files(folder: Path) -> dict:
    """name -> a path that is not a regular file, each named like a claim and a table."""
    made = {}
    for suffix in (".yaml", ".csv"):
        fifo = folder / f"fifo{suffix}"
        os.mkfifo(fifo)
        zero = folder / f"zero{suffix}"
        zero.symlink_to("/dev/zero")
        null = folder / f"null{suffix}"
        null.symlink_to("/dev/null")
        loop = folder / f"loop{suffix}"
        loop.symlink_to(folder / f"loop2{suffix}")
        (folder / f"loop2{suffix}").symlink_to(loop)
        dangling = folder / f"dangling{suffix}"
        dangling.symlink_to(folder / f"missing{suffix}")
        directory = folder / f"dir{suffix}"
        directory.mkdir()
        through = folder / "file.txt"
        through.write_text("a regular file\n")
        made.update({f"fifo{suffix}": fifo, f"zero{suffix}": zero, f"null{suffix}": null,
                     f"loop{suffix}": loop, f"dangling{suffix}": dangling, f"dir{suffix}": directory,
                     f"through{suffix}": through / f"x{suffix}",
                     f"long{suffix}": folder / ("n" * 300 + suffix)})
    sock = folder / "socket.yaml"
    server = socket.socket(socket.AF_UNIX)
    server.bind(str(sock))
    made["socket.yaml"] = sock
    return made, server


def input_commands(path: Path, folder: Path) -> list:
    """Every command reading ``path`` in the place of each of its inputs."""
    if path.suffix == ".yaml":
        return [["check", path], ["check", path, "--json"], ["raw", RAW, "--claim", path, *FAST_RAW],
                ["draft", path]]
    return [["raw", path, "--metric", "linear-xeb", "--qubits", "12", *FAST_RAW], ["batch", path],
            ["drift", path], ["batch", path, "--out", folder / "out" / "s.csv"]]


def test_special_files_as_inputs_are_one_line_at_once(tmp_path):
    folder = tmp_path / "special"
    folder.mkdir()
    (tmp_path / "out").mkdir()
    made, server = special_files(folder)
    try:
        cases = [argv for path in made.values() for argv in input_commands(path, tmp_path)]
        outcomes = claimcheck_many(cases, seconds=10)
    finally:
        server.close()
    for outcome in outcomes:
        assert outcome.status != "hang", outcome.argv
        name = next(a for a in outcome.argv if str(folder) in a)
        assert_refused(outcome, name)
        assert outcome.seconds < 5, (outcome.argv, outcome.seconds)
    assert list((tmp_path / "out").iterdir()) == []


def test_the_fifo_reproduction_through_the_console_script(tmp_path):
    # A FIFO blocked check, raw, batch and drift forever; /dev/zero grew memory without limit.
    fifo = tmp_path / "claim.yaml"
    os.mkfifo(fifo)
    assert_refused(claimcheck("check", fifo, timeout=20), fifo, "FIFO")
    zero = tmp_path / "data.csv"
    zero.symlink_to("/dev/zero")
    assert_refused(claimcheck("raw", zero, "--metric", "linear-xeb", "--qubits", "3", timeout=20), zero,
                   "character device")


@pytest.mark.skipif(os.geteuid() == 0, reason="root reads a folder without search permission all the same")
def test_a_folder_without_search_permission(tmp_path):
    locked = tmp_path / "locked"
    locked.mkdir()
    shutil.copy(CLAIM, locked / "c.yaml")
    (locked / "s.csv").write_text(SERIES)
    locked.chmod(0)
    try:
        outcomes = claimcheck_many([["check", locked / "c.yaml"], ["drift", locked / "s.csv"],
                                    ["batch", locked], ["check", CLAIM, "--markdown", locked / "n.md"]])
    finally:
        locked.chmod(0o755)
    for outcome in outcomes:
        assert outcome.status == 2 and outcome.err.count("\n") == 1 and "Traceback" not in outcome.err, outcome


# --- outputs ------------------------------------------------------------------------------

def output_commands(target, out: Path) -> list:
    return [["check", CLAIM, "--markdown", target], ["check", CLAIM, "--html", target],
            ["check", CLAIM, "--markdown", out / "fine.md", "--html", target],
            ["raw", RAW, "--metric", "linear-xeb", "--qubits", "12", *FAST_RAW, "--html", target],
            ["raw", RAW, "--metric", "linear-xeb", "--qubits", "12", *FAST_RAW, "--markdown", target],
            ["batch", EXAMPLES / "survey_table.csv", "--out", target],
            ["simulate", "--qubits", "4", "--circuits", "2", "--samples", "10", "--fidelity", "0.5", "--out", target]]


def test_outputs_that_cannot_take_a_report_are_refused_before_the_work(tmp_path):
    folder = tmp_path / "special"
    folder.mkdir()
    out = tmp_path / "out"
    out.mkdir()
    made, server = special_files(folder)
    targets = {name: path for name, path in made.items() if not name.startswith("dangling")}
    targets["/dev/null"] = Path("/dev/null")
    targets["missing folder"] = tmp_path / "no-such-folder" / "r.csv"
    try:
        cases = [argv for target in targets.values() for argv in output_commands(target, out)]
        outcomes = claimcheck_many(cases, seconds=10)
    finally:
        server.close()
    for outcome in outcomes:
        assert outcome.status == 2, (outcome.argv, outcome.err)
        assert outcome.stdout == b"" and outcome.err.count("\n") == 1 and "Traceback" not in outcome.err, outcome
    assert list(out.iterdir()) == []  # not even the report that could have been written
    assert stat.S_ISCHR(os.stat("/dev/null").st_mode)


@pytest.mark.parametrize("spelling", ["same", "dotted", "link"])
def test_one_file_for_two_reports_is_refused(tmp_path, spelling):
    target = tmp_path / "report.out"
    other = {"same": target, "dotted": tmp_path / "." / "report.out", "link": tmp_path / "link.out"}[spelling]
    if spelling == "link":
        target.write_text("older\n")
        other.symlink_to(target)
    outcomes = claimcheck_many([["check", CLAIM, "--html", target, "--markdown", other],
                                ["raw", RAW, "--metric", "linear-xeb", "--qubits", "12", *FAST_RAW,
                                 "--html", target, "--markdown", other]])
    for outcome in outcomes:
        assert_refused(outcome, tmp_path, "both")  # named by either of its two names
    assert not target.exists() or target.read_text() == "older\n"


def test_an_empty_output_path_is_refused(tmp_path):
    outcomes = claimcheck_many([["check", CLAIM, "--html", ""], ["check", CLAIM, "--markdown", " "],
                                ["raw", RAW, "--metric", "linear-xeb", "--qubits", "12", "--html", ""],
                                ["batch", EXAMPLES / "survey_table.csv", "--out", ""],
                                ["simulate", "--qubits", "4", "--circuits", "2", "--samples", "10",
                                 "--fidelity", "0.5", "--out", ""]])
    for outcome in outcomes:
        assert outcome.status == 2 and outcome.err.count("\n") == 1, (outcome.argv, outcome.err)
        assert "empty" in outcome.err or "extension" in outcome.err, outcome.err


def test_a_full_disk_on_the_second_report_leaves_neither(tmp_path, monkeypatch):
    """Write all or none: the second temporary file fails to be written, and the first
    report (new) does not appear while an older file of the second name stays whole."""
    import checker.output
    from checker.cli import run

    real = checker.output._write_temporary
    calls = []

    def full_on_second(target, payload):
        calls.append(target)
        if len(calls) == 2:
            raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))
        return real(target, payload)

    monkeypatch.setattr(checker.output, "_write_temporary", full_on_second)
    (tmp_path / "r.html").write_text("older report\n")
    err = io.StringIO()
    status = run(["check", str(CLAIM), "--markdown", str(tmp_path / "n.md"), "--html", str(tmp_path / "r.html")],
                 io.StringIO(), err)
    assert status == 2 and "No space left" in err.getvalue() and err.getvalue().count("\n") == 1
    assert sorted(p.name for p in tmp_path.iterdir()) == ["r.html"]
    assert (tmp_path / "r.html").read_text() == "older report\n"


def test_a_failed_second_rename_puts_the_first_report_back(tmp_path, monkeypatch):
    import checker.output
    from checker.cli import run

    real = os.replace
    calls = []

    def fail_second(src, dst):
        calls.append(dst)
        if len(calls) == 2:
            raise OSError(errno.EIO, os.strerror(errno.EIO))
        return real(src, dst)

    monkeypatch.setattr(checker.output.os, "replace", fail_second)
    (tmp_path / "n.md").write_text("older notes\n")
    status = run(["check", str(CLAIM), "--markdown", str(tmp_path / "n.md"), "--html", str(tmp_path / "r.html")],
                 io.StringIO(), io.StringIO())
    assert status == 2
    assert sorted(p.name for p in tmp_path.iterdir()) == ["n.md"]
    assert (tmp_path / "n.md").read_text() == "older notes\n"


# --- folders of claims ---------------------------------------------------------------------

def test_a_batch_folder_reports_every_entry_it_cannot_use_and_counts_a_file_once(tmp_path):
    folder = tmp_path / "claims"
    folder.mkdir()
    for name in ("lattice_xeb_clean.yaml", "ghz_parity_clean.yaml", "small_chip_xeb_above_one.json"):
        shutil.copy(EXAMPLES / name, folder / name)
    (folder / "second-name.yaml").symlink_to(folder / "lattice_xeb_clean.yaml")
    os.link(folder / "ghz_parity_clean.yaml", folder / "hard-link.yaml")
    outside = tmp_path / "outside.yaml"
    shutil.copy(EXAMPLES / "log_xeb_sidedness.yaml", outside)
    (folder / "a-link-out.yaml").symlink_to(outside)
    (folder / "b-link-out.yaml").symlink_to(outside)
    os.mkfifo(folder / "fifo.yaml")
    (folder / "dev.yaml").symlink_to("/dev/zero")
    (folder / "loop.yaml").symlink_to(folder / "loop.yaml")
    (folder / "dangling.json").symlink_to(folder / "gone.json")
    out = tmp_path / "summary.json"
    outcome = claimcheck_many([["batch", folder, "--out", out]], seconds=30)[0]
    assert outcome.status in (1, 2) and "Traceback" not in outcome.err, outcome.err
    lines = outcome.err.splitlines()
    for name, words in {"fifo.yaml": "FIFO", "dev.yaml": "character device", "loop.yaml": "loop",
                        "dangling.json": "no such file"}.items():
        assert any(line.startswith(str(folder / name)) and words in line for line in lines), (name, lines)
    assert sum("checked once" in line for line in lines) == 3  # second-name, hard-link, one link out
    import json

    data = json.loads(out.read_text())
    assert data["summary"]["checked"] == 4  # four distinct claim files, each once
    assert data["summary"]["unusable"] == 4  # the FIFO, the device, the loop and the dangling link
    assert data["summary"]["tested"] <= 4  # the Holm and BH family holds each file once
