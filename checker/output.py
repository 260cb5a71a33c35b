"""Writing reports without ever losing a user's file: a temporary file in the
target's folder, then an atomic rename; an output path equal to an input is
refused."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path
from typing import Iterable

from .errors import OutputError


def _same(a: Path, b: Path) -> bool:
    try:
        return a.resolve() == b.resolve() or (a.exists() and b.exists() and os.path.samefile(a, b))
    except OSError:
        return False


def refuse_overwriting_inputs(target: str | Path, inputs: Iterable[str | Path]) -> None:
    target = Path(target)
    for source in inputs:
        if _same(target, Path(source)):
            raise OutputError(str(target), "is one of the input files",
                              "write the report to a new file; inputs are never modified")


def write_atomic(target: str | Path, data: str | bytes, inputs: Iterable[str | Path] = ()) -> None:
    """Write ``data`` to ``target`` through a temporary file and a rename."""
    target = Path(target)
    refuse_overwriting_inputs(target, inputs)
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise OutputError(str(target), "its folder does not exist", "create the folder first")
    if target.is_dir():
        raise OutputError(str(target), "is a directory", "give a file name for the report")
    payload = data.encode("utf-8") if isinstance(data, str) else data
    fd, tmp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=folder)
    try:
        # mkstemp makes the file private (0600); a report is an ordinary file.
        umask = os.umask(0)
        os.umask(umask)
        os.fchmod(fd, 0o666 & ~umask)
        with os.fdopen(fd, "wb") as handle:
            handle.write(payload)
        os.replace(tmp, target)
    except BaseException:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise
