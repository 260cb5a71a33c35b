"""write_atomic: never over an input, never a partial file."""

from __future__ import annotations

import os

import pytest

from checker.errors import OutputError
from checker.output import refuse_overwriting_inputs, write_atomic


def test_writes_text_and_bytes(tmp_path):
    write_atomic(tmp_path / "a.md", "notes\n")
    write_atomic(tmp_path / "b.bin", b"\x00\x01")
    assert (tmp_path / "a.md").read_text() == "notes\n" and (tmp_path / "b.bin").read_bytes() == b"\x00\x01"
    write_atomic(tmp_path / "a.md", "replaced\n")
    assert (tmp_path / "a.md").read_text() == "replaced\n"


def test_refuses_an_input_path_in_any_spelling(tmp_path, monkeypatch):
    claim = tmp_path / "claim.yaml"
    claim.write_text("title: t\n")
    monkeypatch.chdir(tmp_path)
    for target in (claim, "claim.yaml", "./claim.yaml", tmp_path / "sub" / ".." / "claim.yaml"):
        with pytest.raises(OutputError, match="is one of the input files"):
            write_atomic(target, "x", inputs=[claim])
    link = tmp_path / "link.yaml"
    os.symlink(claim, link)
    with pytest.raises(OutputError):
        write_atomic(link, "x", inputs=[claim])
    assert claim.read_text() == "title: t\n"
    refuse_overwriting_inputs(tmp_path / "other.md", [claim])  # a new name is fine


def test_refuses_a_missing_folder_and_a_directory(tmp_path):
    with pytest.raises(OutputError, match="folder does not exist"):
        write_atomic(tmp_path / "nowhere" / "a.md", "x")
    with pytest.raises(OutputError, match="is a directory"):
        write_atomic(tmp_path, "x")


def test_no_partial_file_on_failure(tmp_path, monkeypatch):
    target = tmp_path / "report.md"
    target.write_text("old report\n")

    def broken_replace(src, dst):
        raise OSError("disk full")

    monkeypatch.setattr(os, "replace", broken_replace)
    # An OS failure is an unusable output: the documented OutputError, naming the file.
    with pytest.raises(OutputError, match="disk full"):
        write_atomic(target, "new report\n")
    assert target.read_text() == "old report\n"  # the old file is whole
    assert sorted(p.name for p in tmp_path.iterdir()) == ["report.md"]  # no temporary left behind


def test_a_failing_write_leaves_nothing(tmp_path, monkeypatch):
    # Text can no longer fail to encode (lone surrogates are shown escaped), so the
    # failure is made inside the write of the temporary file.
    import checker.output

    def broken_fdopen(fd, *args, **kwargs):
        os.close(fd)
        raise RuntimeError("write failed (on purpose, in a test)")

    monkeypatch.setattr(checker.output.os, "fdopen", broken_fdopen)
    with pytest.raises(RuntimeError):
        write_atomic(tmp_path / "r.md", "x")
    assert list(tmp_path.iterdir()) == []


# --- targets checked before the work; all or none -----------------------------------------

from checker.output import check_targets, write_all_atomic  # noqa: E402


def test_targets_that_cannot_take_a_report(tmp_path):
    fifo = tmp_path / "fifo.md"
    os.mkfifo(fifo)
    link = tmp_path / "null.md"
    link.symlink_to("/dev/null")
    cases = {"/dev/null": "character device", str(fifo): "FIFO", str(link): "character device",
             str(tmp_path): "is a directory", str(tmp_path / "missing" / "r.md"): "folder does not exist",
             str(tmp_path / ("n" * 300 + ".md")): "too long"}
    for target, words in cases.items():
        with pytest.raises(OutputError) as err:
            check_targets({"--markdown": target})
        assert words in str(err.value), (target, err.value)
    with pytest.raises(OutputError, match="empty path"):
        check_targets({"--html": ""})
    with pytest.raises(OutputError, match="both --markdown and --html"):
        check_targets({"--markdown": str(tmp_path / "x"), "--html": str(tmp_path / "." / "x")})
    assert check_targets({"--markdown": None, "--html": str(tmp_path / "r.html")}) == [
        ("--html", str(tmp_path / "r.html"))]


def test_write_all_atomic_writes_every_report(tmp_path):
    write_all_atomic([(tmp_path / "a.md", "one\n"), (tmp_path / "b.html", b"two\n")])
    assert (tmp_path / "a.md").read_text() == "one\n" and (tmp_path / "b.html").read_bytes() == b"two\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a.md", "b.html"]  # no temporary, no backup left


def test_text_reports_never_hold_raw_control_characters(tmp_path):
    write_atomic(tmp_path / "r.md", "title \x1b[31m\x00 \ud800\n")
    assert (tmp_path / "r.md").read_bytes() == b"title \\x1b[31m \\ud800\n"
