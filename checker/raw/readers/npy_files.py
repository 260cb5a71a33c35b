"""NPY: one column of probabilities, read through a memory map whose pages are
handed back after each chunk (or with ``readinto`` into a reused buffer)."""

from __future__ import annotations

import mmap
import os
import zipfile
import zlib
from typing import Iterator

import numpy as np

from ...errors import DataError
from ...input_files import open_regular
from .table import Chunk, DataTable, first_line

ALLOWED_FILE = "give the path of a CSV, NPY, NPZ or Parquet data file"


def read_npy_header(handle, name: str, member: str = ""):
    """(shape, dtype, fortran) from an NPY header, refusing what cannot hold probabilities."""
    from numpy.lib import format as npy_format

    where = f" member {member!r}" if member else ""
    try:
        version = npy_format.read_magic(handle)
        if version == (1, 0):
            shape, fortran, dtype = npy_format.read_array_header_1_0(handle)
        elif version == (2, 0):
            shape, fortran, dtype = npy_format.read_array_header_2_0(handle)
        else:
            raise ValueError(f"NPY format version {version[0]}.{version[1]} is not supported")
    except (ValueError, OSError, EOFError, SyntaxError, TypeError, zipfile.BadZipFile, zlib.error) as exc:
        raise DataError(name, f"{where.strip() + ' ' if where else ''}is not a readable NPY array "
                        f"({first_line(exc)})", "save the array with numpy.save") from None
    shape = tuple(shape)
    # numpy's header reader accepts any tuple of integers, negative ones included.
    if not all(type(s) is int and s >= 0 for s in shape):  # (True,) is a tuple of ints too
        raise DataError(name, f"{where.strip() + ' ' if where else ''}has the impossible shape {shape} in its header",
                        "save the array with numpy.save")
    return shape, np.dtype(dtype), bool(fortran)


def rows_of(name: str, shape: tuple, what: str, member: str = "") -> int:
    label = f"{member!r} " if member else ""
    if len(shape) == 1:
        return int(shape[0])
    if len(shape) == 2 and shape[1] == 1:
        return int(shape[0])
    raise DataError(name, f"the {what} array {label}has shape {shape}",
                    "one column: shape (N,) or (N, 1)", path=what)


def check_float_dtype(name: str, dtype: np.dtype, what: str) -> None:
    if dtype.hasobject or dtype.names:
        raise DataError(name, f"the {what} array holds {'records' if dtype.names else 'Python objects'}",
                        "a plain array of floating-point numbers (objects are never unpickled)", path=what)
    if dtype.kind != "f":
        raise DataError(name, f"the {what} array holds {dtype} values",
                        "floating-point probabilities (float32 or float64)", path=what)


def open_npy(name: str, chunk_rows: int) -> DataTable:
    with open_regular(name, ALLOWED_FILE) as handle:
        shape, dtype, _ = read_npy_header(handle, name)
        offset = handle.tell()
        size = os.fstat(handle.fileno()).st_size
    check_float_dtype(name, dtype, "probability")
    rows = rows_of(name, shape, "probability")
    complete = (size - offset) // dtype.itemsize
    if complete < rows:
        raise DataError(name, f"is truncated: its header promises {rows:,} rows but only {complete:,} are complete",
                        "give the complete file")
    return DataTable(name, "npy", ["probability"], rows, [], chunk_rows, npy_chunks, offset=offset, dtype=dtype)


def npy_chunks(table: DataTable) -> Iterator[Chunk]:
    """Native float64 files are read through a memory map whose pages are
    handed back (madvise DONTNEED) after each chunk: no copy, and the resident
    set stays about one chunk whatever the file size.  Other dtypes, or
    systems without madvise, are read with ``readinto`` into a reused buffer.
    (Measured here: faster than ``readinto`` and than one pre-faulted map per
    chunk.)"""
    dtype = table.state["dtype"]
    if dtype.isnative and dtype == np.dtype(np.float64) and hasattr(mmap, "MADV_DONTNEED") \
            and table.total_rows > 0:
        yield from _npy_chunks_mapped(table)
    else:
        yield from _npy_chunks_read(table)


def _npy_chunks_mapped(table: DataTable) -> Iterator[Chunk]:
    rows, offset = table.total_rows, table.state["offset"]
    page = mmap.PAGESIZE
    try:
        with open_regular(table.path, ALLOWED_FILE) as handle:
            mapping = mmap.mmap(handle.fileno(), 0, access=mmap.ACCESS_READ)
        values = np.frombuffer(mapping, dtype=np.float64, count=rows, offset=offset)
    except (OSError, ValueError) as exc:  # the file shrank since it was opened
        raise DataError(table.path, f"cannot be read to the end ({first_line(exc)})",
                        "give the complete file") from None
    start = 0
    released = 0
    while start < rows:
        n = min(table.chunk_rows, rows - start)
        yield table.make_chunk(start, values[start:start + n], None, None)
        start += n
        done = (offset + start * 8) // page * page
        if done > released:
            # Pages handed back are read again from the page cache if a caller
            # still looks at an old chunk, so this is safe as well as flat.
            mapping.madvise(mmap.MADV_DONTNEED, released, done - released)
            released = done
    # The arrays keep the mapping alive; it is unmapped when the last goes.
    del values, mapping


def _npy_chunks_read(table: DataTable) -> Iterator[Chunk]:
    dtype = table.state["dtype"]
    rows = table.total_rows
    raw = np.empty(table.chunk_rows, dtype=dtype)
    as_float = None if dtype == np.dtype("<f8") or dtype == np.dtype("=f8") else np.empty(table.chunk_rows)
    view = memoryview(raw).cast("B")
    with open_regular(table.path, ALLOWED_FILE) as handle:
        handle.seek(table.state["offset"])
        start = 0
        while start < rows:
            n = min(table.chunk_rows, rows - start)
            want = n * dtype.itemsize
            got = handle.readinto(view[:want])
            if got != want:
                raise DataError(table.path, f"is truncated at row {start + got // dtype.itemsize + 1:,}",
                                "give the complete file")
            if as_float is None:
                p = raw[:n]
            else:
                p = as_float[:n]
                p[...] = raw[:n]
            yield table.make_chunk(start, p, None, None)
            start += n
