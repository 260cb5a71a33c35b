"""Every input is an existing regular file, and says so in one line when not.

A FIFO given as input would block the first read until some other process
writes to it; ``/dev/zero`` (or a link to it) never ends; a folder, a socket or
a device is not a claim or a table.  So every command opens its inputs here:
the file is opened without blocking (``O_NONBLOCK``, which makes opening a
FIFO return at once), checked with ``fstat`` on the open descriptor (so a name
swapped between a check and the open cannot slip through), and only then read.
Every ``OSError`` on the way (a missing file, a name component over 255
bytes, a folder without search permission, a symbolic-link loop) becomes one
:class:`~checker.errors.InputFileError` line.
"""

from __future__ import annotations

import errno
import os
import stat
from typing import BinaryIO

from .errors import InputFileError

# What each errno means for an input, in the words of a one-line message.
_PROBLEMS = {
    errno.ENOENT: "no such file",
    errno.ENOTDIR: "a part of the path is not a folder",
    errno.ENAMETOOLONG: "the name is too long for the file system (a name over 255 bytes, or a path over 4,096)",
    errno.EACCES: "cannot be read (permission denied)",
    errno.EPERM: "cannot be read (operation not permitted)",
    errno.ELOOP: "is a loop of symbolic links",
}


def problem_of(exc: OSError) -> str:
    """The words for an OSError met while opening or reading an input."""
    return _PROBLEMS.get(exc.errno, f"cannot be read ({exc.strerror or type(exc).__name__})")


def kind_of(mode: int) -> str:
    """'a folder', 'a FIFO (named pipe)', ... for a file mode that is not a regular file."""
    if stat.S_ISDIR(mode):
        return "a directory"
    if stat.S_ISFIFO(mode):
        return "a FIFO (named pipe)"
    if stat.S_ISCHR(mode):
        return "a character device"
    if stat.S_ISBLK(mode):
        return "a block device"
    if stat.S_ISSOCK(mode):
        return "a socket"
    return "not a regular file"


def refuse_special(name: str, mode: int, allowed: str) -> None:
    if not stat.S_ISREG(mode):
        raise InputFileError(name, f"is {kind_of(mode)}, not a regular file", allowed)


def regular_file(name: str | os.PathLike, allowed: str) -> os.stat_result:
    """The ``stat`` of ``name`` (links followed) when it is an existing regular
    file; otherwise one InputFileError naming the problem and ``allowed``."""
    name = str(name)
    try:
        info = os.stat(name)
    except OSError as exc:
        raise InputFileError(name, problem_of(exc), allowed) from None
    except ValueError:  # an embedded NUL byte
        raise InputFileError(name, "is not a usable path (it holds a NUL byte)", allowed) from None
    refuse_special(name, info.st_mode, allowed)
    return info


def open_regular(name: str | os.PathLike, allowed: str) -> BinaryIO:
    """Open ``name`` for reading (binary) when it is a regular file; the caller closes it."""
    name = str(name)
    try:
        fd = os.open(name, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_CLOEXEC", 0))
    except OSError as exc:
        if exc.errno == errno.ENXIO:  # a socket, or a FIFO nobody writes to (some systems)
            raise InputFileError(name, "is a special file (a socket or FIFO), not a regular file", allowed) from None
        raise InputFileError(name, problem_of(exc), allowed) from None
    except ValueError:
        raise InputFileError(name, "is not a usable path (it holds a NUL byte)", allowed) from None
    try:
        mode = os.fstat(fd).st_mode
        refuse_special(name, mode, allowed)
        if hasattr(os, "set_blocking"):
            os.set_blocking(fd, True)
        return os.fdopen(fd, "rb")
    except BaseException:
        os.close(fd)
        raise


def read_limited(name: str | os.PathLike, limit: int, allowed: str) -> bytes:
    """At most ``limit + 1`` bytes of a regular file (so the caller can tell
    "larger than the limit" without reading the rest).  Read in pieces: a
    single read(limit + 1) would ask for the whole limit in memory up front."""
    pieces, total = [], 0
    with open_regular(name, allowed) as handle:
        try:
            while total <= limit:
                piece = handle.read(min(limit + 1 - total, 1 << 24))
                if not piece:
                    break
                pieces.append(piece)
                total += len(piece)
        except OSError as exc:
            raise InputFileError(str(name), problem_of(exc), allowed) from None
    return b"".join(pieces)


def is_folder(name: str | os.PathLike) -> bool:
    """True for an existing folder (links followed); False for anything else,
    including a path that cannot be looked at (the caller's open says why)."""
    try:
        return stat.S_ISDIR(os.stat(name).st_mode)
    except (OSError, ValueError):
        return False


def exists(name: str | os.PathLike) -> bool:
    try:
        os.stat(name)
        return True
    except (OSError, ValueError):
        return False


