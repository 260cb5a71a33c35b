"""NPZ: arrays ``probability`` and optional ``circuit`` and ``heavy``, each
member streamed out of the zip archive (never unpickled, never loaded whole)."""

from __future__ import annotations

import zipfile
import zlib
from typing import Iterator

import numpy as np

from ...errors import DataError
from ...input_files import open_regular
from .npy_files import check_float_dtype, read_npy_header, rows_of
from .table import ALLOWED_HEAVY, COLUMNS, MAX_ID_CHARS, Chunk, DataTable, first_line

ALLOWED_FILE = "give the path of a CSV, NPY, NPZ or Parquet data file"
# Bytes of all members together per chunk: wide fixed-width id arrays get fewer rows per chunk.
CHUNK_BYTES = 32 << 20
_DAMAGED = (zipfile.BadZipFile, EOFError, zlib.error, OSError, NotImplementedError)


def open_npz(name: str, chunk_rows: int) -> DataTable:
    handle = open_regular(name, ALLOWED_FILE)
    try:
        try:
            archive = zipfile.ZipFile(handle)
        except (zipfile.BadZipFile, OSError, EOFError, ValueError) as exc:
            raise DataError(name, f"is not a readable NPZ archive; truncated or damaged? ({first_line(exc)})",
                            "save the arrays with numpy.savez (probability, optional circuit and heavy)") from None
        with archive:
            members = {m[:-4] if m.endswith(".npy") else m: m for m in archive.namelist()}
            if "probability" not in members:
                raise DataError(name, f"has no 'probability' array; its arrays are "
                                f"{', '.join(sorted(members)) or '(none)'}",
                                "arrays: probability (required), circuit and heavy (optional)")
            headers, sizes = {}, {}
            for key in [k for k in COLUMNS if k in members]:
                try:
                    with archive.open(members[key]) as stream:
                        headers[key] = read_npy_header(stream, name, members[key])
                        sizes[key] = archive.getinfo(members[key]).file_size - stream.tell()
                except _DAMAGED as exc:
                    raise DataError(name, f"is truncated or damaged ({first_line(exc)})",
                                    "give the complete file") from None
    finally:
        handle.close()
    shape, dtype, _ = headers["probability"]
    check_float_dtype(name, dtype, "probability")
    rows = rows_of(name, shape, "probability")
    if rows > sizes["probability"] // dtype.itemsize:  # the zip directory says how much there is
        raise DataError(name, f"the probability array's header promises {rows:,} rows but it holds "
                        f"{sizes['probability'] // dtype.itemsize:,}", "give the complete file", path="probability")
    for key in ("circuit", "heavy"):
        if key in headers:
            s, dt, _ = headers[key]
            if dt.hasobject or dt.names:
                raise DataError(name, f"the {key} array holds Python objects or records",
                                "plain numbers (or, for circuit, strings); objects are never unpickled", path=key)
            if key == "heavy" and dt.kind not in "biuf":
                raise DataError(name, f"the heavy array holds {dt} values", ALLOWED_HEAVY, path=key)
            if key == "circuit" and dt.kind not in "biuSU":
                raise DataError(name, f"the circuit array holds {dt} values",
                                "circuit ids as integers or strings", path=key)
            if key == "circuit" and dt.kind in "SU":
                width = dt.itemsize // (4 if dt.kind == "U" else 1)
                if width > MAX_ID_CHARS:
                    raise DataError(name, f"the circuit array holds ids {width:,} characters wide ({dt})",
                                    f"circuit ids of at most {MAX_ID_CHARS:,} characters", path=key)
            n = rows_of(name, s, key)
            if n > sizes[key] // max(dt.itemsize, 1):
                raise DataError(name, f"the {key} array's header promises {n:,} rows but it holds "
                                f"{sizes[key] // max(dt.itemsize, 1):,}", "give the complete file", path=key)
            if n != rows:
                raise DataError(name, f"the {key} array has {n:,} rows but probability has {rows:,}",
                                "all arrays have one entry per sample", path=key)
    ignored = [k for k in members if k not in COLUMNS]
    width = sum(headers[k][1].itemsize for k in headers)
    chunk_rows = max(1, min(chunk_rows, CHUNK_BYTES // max(width, 1)))
    return DataTable(name, "npz", [k for k in COLUMNS if k in headers], rows, ignored, chunk_rows, npz_chunks,
                 members={k: members[k] for k in headers}, dtypes={k: headers[k][1] for k in headers})


def npz_chunks(table: DataTable) -> Iterator[Chunk]:
    name = table.path
    rows = table.total_rows
    dtypes = table.state["dtypes"]
    try:
        with open_regular(name, ALLOWED_FILE) as handle, zipfile.ZipFile(handle) as archive:
            streams = {}
            try:
                for key, member in table.state["members"].items():
                    streams[key] = archive.open(member)
                    read_npy_header(streams[key], name, member)
                start = 0
                while start < rows:
                    n = min(table.chunk_rows, rows - start)
                    arrays = {}
                    for key, stream in streams.items():
                        dt = dtypes[key]
                        data = stream.read(n * dt.itemsize)
                        if len(data) != n * dt.itemsize:
                            raise DataError(name, f"the {key} array is truncated at row "
                                            f"{start + len(data) // dt.itemsize + 1:,}",
                                            "give the complete file", path=key)
                        arrays[key] = np.frombuffer(data, dtype=dt)
                    p = arrays["probability"].astype(float, copy=False)
                    yield table.make_chunk(start, p, arrays.get("circuit"), arrays.get("heavy"))
                    start += n
            finally:
                for stream in streams.values():
                    stream.close()
    except _DAMAGED as exc:
        raise DataError(name, f"is truncated or damaged ({first_line(exc)})", "give the complete file") from None
