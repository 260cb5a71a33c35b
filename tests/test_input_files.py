"""checker.input_files: only regular files are read, and every other case is one line."""

from __future__ import annotations

import os
import socket

import pytest

from checker.errors import InputFileError
from checker.input_files import open_regular, read_limited, regular_file

ALLOWED = "give a file"


def test_regular_files_open(tmp_path):
    path = tmp_path / "a.txt"
    path.write_bytes(b"x" * 100)
    assert regular_file(path, ALLOWED).st_size == 100
    with open_regular(path, ALLOWED) as handle:
        assert handle.read() == b"x" * 100
    assert read_limited(path, 10, ALLOWED) == b"x" * 11  # one byte past the limit says "larger"
    assert read_limited(path, 1000, ALLOWED) == b"x" * 100


def special(tmp_path):
    fifo = tmp_path / "fifo"
    os.mkfifo(fifo)
    zero = tmp_path / "zero"
    zero.symlink_to("/dev/zero")
    loop = tmp_path / "loop"
    loop.symlink_to(loop)
    sock = tmp_path / "sock"
    server = socket.socket(socket.AF_UNIX)
    server.bind(str(sock))
    through = tmp_path / "file"
    through.write_text("x")
    return server, {fifo: "FIFO", zero: "character device", tmp_path: "directory", loop: "loop",
                    sock: "socket", through / "x": "not a folder", tmp_path / "missing": "no such file",
                    tmp_path / ("n" * 300): "too long", "a\x00b": "NUL"}


@pytest.mark.parametrize("opener", [regular_file, open_regular, lambda p, a: read_limited(p, 10, a)])
def test_everything_else_is_one_line(tmp_path, opener):
    server, cases = special(tmp_path)
    try:
        for path, words in cases.items():
            with pytest.raises(InputFileError) as err:
                opener(path, ALLOWED)
            assert words in str(err.value) and str(err.value).endswith(ALLOWED), (path, err.value)
    finally:
        server.close()
