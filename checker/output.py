"""Writing reports without ever losing a user's file.

Each report goes to a temporary file in its target's folder and is then
renamed into place.  The reports of one run are written all or none: every
temporary file is written first (a full disk shows here, and then no report
appears), and only then are they renamed; should a rename fail, the reports
already renamed are put back as they were.  Before any work, the targets are
checked (:func:`check_targets`): an empty path, the same file named twice, an
input, a folder, a missing or unreachable folder and anything that is not a
regular file (``/dev/null``, a FIFO) are refused with one line.

Text payloads pass through :func:`checker.visible.visible`, so no control
character from an input reaches a report raw (and NUL never does).
"""

from __future__ import annotations

import errno
import os
import stat
import tempfile
from pathlib import Path
from typing import Iterable, Mapping, Sequence

from .errors import OutputError
from .input_files import kind_of
from .visible import visible


def _same(a: Path, b: Path) -> bool:
    """Whether two names are one file (as spelt, through links, or hard links);
    False when either cannot be looked at (a loop, a dangling link)."""
    if os.path.realpath(a) == os.path.realpath(b):  # realpath never raises on a loop
        return True
    try:
        sa, sb = os.stat(a), os.stat(b)
    except (OSError, ValueError):
        return False
    return (sa.st_dev, sa.st_ino) == (sb.st_dev, sb.st_ino)


def refuse_overwriting_inputs(target: str | Path, inputs: Iterable[str | Path]) -> None:
    target = Path(target)
    for source in inputs:
        if _same(target, Path(source)):
            raise OutputError(str(target), "is one of the input files",
                              "write the report to a new file; inputs are never modified")


def _folder_of(target: Path) -> Path:
    return target.parent if str(target.parent) else Path(".")


def check_target(target: str | Path, inputs: Iterable[str | Path] = ()) -> None:
    """Refuse, with one line, a target that cannot take a report."""
    name = str(target)
    if not name.strip():
        raise OutputError(repr(name), "is an empty output path", "give a file name for the report")
    target = Path(name)
    refuse_overwriting_inputs(target, inputs)
    folder = _folder_of(target)
    try:
        folder_mode = os.stat(folder).st_mode
    except OSError as exc:
        if exc.errno in (errno.ENOENT, errno.ENOTDIR):
            raise OutputError(name, "its folder does not exist", "create the folder first") from None
        raise OutputError(name, f"its folder cannot be reached ({exc.strerror or exc})",
                          "check the folder's permissions") from None
    except ValueError:
        raise OutputError(name, "is not a usable path (it holds a NUL byte)", "give a file name for the report") from None
    if not stat.S_ISDIR(folder_mode):
        raise OutputError(name, "its folder does not exist", "create the folder first")
    if not os.access(folder, os.W_OK | os.X_OK):  # said before the work, not after it
        raise OutputError(name, "cannot be written (its folder does not allow it)",
                          "check the folder's permissions")
    try:
        mode = os.stat(target).st_mode  # links followed: a link to /dev/null is /dev/null
    except FileNotFoundError:
        return
    except OSError as exc:
        if exc.errno == errno.ENAMETOOLONG:
            raise OutputError(name, "the name is too long for the file system (a name over 255 bytes)",
                              "give a shorter file name") from None
        if exc.errno == errno.ELOOP:
            raise OutputError(name, "is a loop of symbolic links", "give a file name for the report") from None
        raise OutputError(name, f"cannot be written ({exc.strerror or exc})",
                          "check the folder's permissions") from None
    if stat.S_ISDIR(mode):
        raise OutputError(name, "is a directory", "give a file name for the report")
    if not stat.S_ISREG(mode):
        raise OutputError(name, f"is {kind_of(mode)}, not a regular file",
                          "reports are written to regular files only")


def check_targets(targets: Mapping[str, str | None], inputs: Sequence[str | Path] = ()) -> list[tuple[str, str]]:
    """Check every output of one command before its work starts.

    Parameters
    ----------
    targets : mapping
        Option name (``--html``) -> the path given, or None when not given.
    inputs : sequence
        The command's input files, which no output may be.

    Returns
    -------
    list of (option, path) for the outputs given.

    Raises
    ------
    OutputError
        An empty path, the same file given to two options, or a target that
        :func:`check_target` refuses.
    """
    given = [(option, path) for option, path in targets.items() if path is not None]
    for i, (option, path) in enumerate(given):
        if not str(path).strip():
            raise OutputError(option, "was given an empty path", "give a file name for the report")
        check_target(path, inputs)
        for other, earlier in given[:i]:
            if _same(Path(path), Path(earlier)):
                raise OutputError(str(path), f"is given to both {other} and {option}",
                                  "give each report a file of its own")
    return given


def write_atomic(target: str | Path, data: str | bytes, inputs: Iterable[str | Path] = ()) -> None:
    """Write ``data`` to ``target`` through a temporary file and a rename."""
    write_all_atomic([(target, data)], inputs)


def write_all_atomic(outputs: Sequence[tuple[str | Path, str | bytes]], inputs: Iterable[str | Path] = ()) -> None:
    """Write every ``(target, data)`` or none of them.

    Raises
    ------
    OutputError
        A target is refused (see :func:`check_target`) or cannot be written;
        then no target has changed.
    """
    inputs = list(inputs)
    for target, _ in outputs:
        check_target(target, inputs)
    written: list[tuple[Path, str]] = []
    try:
        for target, data in outputs:
            target = Path(target)
            payload = visible(data).encode("utf-8") if isinstance(data, str) else data
            if isinstance(data, _Pieces):
                payload = (visible(piece).encode("utf-8") for piece in data.pieces)
            written.append((target, _write_temporary(target, payload)))
    except OSError as exc:  # an unwritable folder, a full disk: one line, not a traceback
        _remove([tmp for _, tmp in written])
        raise OutputError(str(target), f"cannot be written ({exc.strerror or exc})",
                          "check the folder's permissions and free space") from None
    except BaseException:
        _remove([tmp for _, tmp in written])
        raise
    _rename_all(written)


def write_pieces_atomic(target: str | Path, pieces: Iterable[str], inputs: Iterable[str | Path] = ()) -> None:
    """Write the texts ``pieces`` one after another to ``target`` through a
    temporary file and a rename, holding one piece at a time (a batch's table
    of a million rows, issue 13); the same bytes as :func:`write_atomic` of
    their concatenation."""
    write_all_atomic([(target, _Pieces(pieces))], inputs)


class _Pieces:
    """Texts to write in turn (see :func:`write_pieces_atomic`)."""

    def __init__(self, pieces: Iterable[str]):
        self.pieces = pieces


def _write_temporary(target: Path, payload) -> str:
    fd, tmp = tempfile.mkstemp(prefix=f".{target.name[:200]}.", suffix=".tmp", dir=_folder_of(target))
    try:
        # mkstemp makes the file private (0600); a report is an ordinary file.
        umask = os.umask(0)
        os.umask(umask)
        os.fchmod(fd, 0o666 & ~umask)
        with os.fdopen(fd, "wb") as handle:
            if isinstance(payload, (bytes, bytearray, memoryview)):
                handle.write(payload)
            else:
                for piece in payload:
                    handle.write(piece)
    except BaseException:
        _remove([tmp])
        raise
    return tmp


def _rename_all(written: list[tuple[Path, str]]) -> None:
    """Rename each temporary file onto its target; on a failure, put back the
    targets renamed so far (from a hard link to each older file, made before
    its rename; a target that did not exist is removed) and remove every
    temporary file."""
    done: list[tuple[Path, str | None, bool]] = []
    target, backup = None, None
    try:
        for target, tmp in written:
            backup = None
            existed = os.path.lexists(target)
            if len(written) > 1 and existed:
                try:
                    os.link(target, tmp + ".old")
                    backup = tmp + ".old"
                except OSError:
                    pass  # no hard links here: that older file could not be put back
            os.replace(tmp, target)
            done.append((target, backup, existed))
    except BaseException as exc:
        if backup is not None and (not done or done[-1][1] != backup):
            _remove([backup])
        for renamed, old, existed in reversed(done):
            try:
                if old is not None:
                    os.replace(old, renamed)
                elif not existed:
                    os.unlink(renamed)
            except OSError:
                pass
        _remove([tmp for _, tmp in written])
        if isinstance(exc, OSError):
            raise OutputError(str(target), f"cannot be written ({exc.strerror or exc})",
                              "check the folder's permissions and free space") from None
        raise
    _remove([old for _, old, _ in done if old is not None])


def _remove(paths: Iterable[str]) -> None:
    for path in paths:
        try:
            os.unlink(path)
        except OSError:
            pass
