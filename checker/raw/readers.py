"""Chunked readers for raw per-sample data: CSV, NPY, NPZ and Parquet.

A table has one row per measured sample: ``probability`` (the ideal
probability of the observed outcome, required), ``circuit`` (an id, optional)
and ``heavy`` (0/1, optional).  Every reader streams fixed-size chunks into
reused buffers, so memory stays flat whatever the file size: NPY is read
with ``readinto`` rather than memory-mapped (a memory map's touched pages
count as resident), NPZ members are streamed out of the zip archive, Parquet
goes batch by batch, CSV through pandas' chunked reader.

Every chunk is validated as it is read; the first bad row raises
:class:`~checker.errors.DataError` naming the row (the line, for CSV).
"""

from __future__ import annotations

import mmap
import os
import zipfile
import zlib
from dataclasses import dataclass
from pathlib import Path
from typing import Iterator

import numpy as np

from ..errors import DataError, InputFileError

CHUNK_ROWS = 1 << 18
COLUMNS = ("circuit", "probability", "heavy")
KINDS = {".csv": "csv", ".npy": "npy", ".npz": "npz", ".parquet": "parquet", ".pq": "parquet"}
ALLOWED_PROBABILITY = "each row holds the ideal probability of the observed outcome, a number from 0 to 1"
_ONE_BITS = int(np.array(1.0).view(np.uint64))
ALLOWED_HEAVY = "heavy is 0 or 1 (1 when the outcome's ideal probability is above its circuit's median)"


@dataclass(frozen=True, eq=False)
class Chunk:
    """Consecutive rows of a table.

    ``probability`` may be a view into a buffer the reader reuses for the next
    chunk: copy what must outlive the chunk.
    """

    start: int  # 0-based index of the first row
    probability: np.ndarray  # float64
    circuit: np.ndarray | None  # int64 codes into Table.labels
    heavy: np.ndarray | None  # float64, 0 or 1

    def __len__(self) -> int:
        return int(self.probability.size)


class _Coder:
    """Circuit ids -> 0, 1, 2, ... in order of first appearance."""

    def __init__(self):
        self.index: dict = {}
        self.labels: list = []

    def codes(self, values: np.ndarray) -> np.ndarray:
        uniq, first, inverse = np.unique(values, return_index=True, return_inverse=True)
        mapping = np.empty(uniq.size, dtype=np.int64)
        for j in np.argsort(first, kind="stable"):
            key = uniq[j].item() if hasattr(uniq[j], "item") else uniq[j]
            code = self.index.get(key)
            if code is None:
                code = self.index[key] = len(self.labels)
                self.labels.append(key)
            mapping[j] = code
        return mapping[inverse.ravel()]


class Table:
    """An opened data file; iterate :meth:`chunks` once.

    Attributes
    ----------
    path : str
    kind : str
        ``csv``, ``npy``, ``npz`` or ``parquet``.
    has_circuit, has_heavy : bool
    total_rows : int or None
        Known up front for NPY, NPZ and Parquet; None for CSV.
    ignored_columns : tuple of str
        Columns present in the file that claimcheck does not read.
    labels : list
        Circuit ids in order of first appearance (filled while reading).
    """

    def __init__(self, path: str, kind: str, columns, total_rows, ignored, chunk_rows):
        self.path = path
        self.kind = kind
        self.has_circuit = "circuit" in columns
        self.has_heavy = "heavy" in columns
        self.total_rows = total_rows
        self.ignored_columns = tuple(ignored)
        self.chunk_rows = chunk_rows
        self._coder = _Coder()

    @property
    def labels(self) -> list:
        return self._coder.labels

    def chunks(self) -> Iterator[Chunk]:
        reader = {"csv": _csv_chunks, "npy": _npy_chunks, "npz": _npz_chunks,
                  "parquet": _parquet_chunks}[self.kind]
        rows = 0
        for chunk in reader(self):
            rows += len(chunk)
            yield chunk
        if rows == 0:
            raise DataError(self.path, "holds no rows", "give at least one sample")

    # --- shared validation ------------------------------------------------

    def fail_row(self, row: int, column: str, problem: str, allowed: str):
        """Raise a DataError for 0-based ``row``."""
        if self.kind == "csv":
            raise DataError(self.path, problem, allowed, path=column, line=row + 2)
        raise DataError(self.path, f"row {row + 1}: {problem}", allowed, path=column)

    def check_probability(self, start: int, p: np.ndarray) -> np.ndarray:
        """Raise at the first row whose probability is not a number in [0, 1];
        return ``p``, with any -0.0 made +0.0 (the value bins read the bits)."""
        if p.size == 0:
            return p
        # One pass: as unsigned integers the bit patterns of 0.0 ... 1.0 are
        # exactly 0 ... _ONE_BITS; negatives (sign bit), NaN and infinities lie above.
        if p.view(np.uint64).max() <= _ONE_BITS:
            return p
        bad = ~((p >= 0.0) & (p <= 1.0))  # the slow path; -0.0 passes here
        if not bad.any():
            # Only negative zeros set the sign bit: adding +0.0 clears it (a copy,
            # since p may be a read-only memory map or a reused buffer).
            return p + 0.0
        i = int(np.flatnonzero(bad)[0])
        v = float(p[i])
        nan_word = "is missing or NaN" if self.kind == "csv" else "is NaN (not a number)"
        what = nan_word if np.isnan(v) else (
            f"is {v!r}, not a finite number" if np.isinf(v) else f"is {v!r}, outside [0, 1]")
        self.fail_row(start + i, "probability", f"probability {what}", ALLOWED_PROBABILITY)

    def check_heavy(self, start: int, h: np.ndarray) -> np.ndarray:
        h = np.asarray(h, dtype=float)
        bad = ~((h == 0.0) | (h == 1.0))
        if bad.any():
            i = int(np.flatnonzero(bad)[0])
            what = "missing or NaN" if np.isnan(h[i]) else f"{float(h[i]):g}"
            self.fail_row(start + i, "heavy", f"heavy is {what}", ALLOWED_HEAVY)
        return h

    def make_chunk(self, start: int, p: np.ndarray, circuit, heavy) -> Chunk:
        p = np.ascontiguousarray(p, dtype=np.float64)
        p = self.check_probability(start, p)
        codes = None
        if circuit is not None:
            codes = self._coder.codes(circuit)
        h = self.check_heavy(start, heavy) if heavy is not None else None
        return Chunk(start, p, codes, h)


def open_table(path: str | os.PathLike, chunk_rows: int = CHUNK_ROWS) -> Table:
    """Open a raw data file for chunked reading (the format from its extension).

    Raises
    ------
    InputFileError
        Missing, a directory, or an unknown extension.
    DataError
        The file's header or columns cannot be used.
    """
    p = Path(path)
    name = str(path)
    if not p.exists():
        raise InputFileError(name, "no such file", "give the path of a CSV, NPY, NPZ or Parquet data file")
    if p.is_dir():
        raise InputFileError(name, "is a directory, not a data file",
                             "give the path of a CSV, NPY, NPZ or Parquet data file")
    suffixes = [s.lower() for s in p.suffixes]
    kind = KINDS.get(suffixes[-1] if suffixes else "")
    if kind is None and len(suffixes) >= 2 and suffixes[-2] == ".csv" and suffixes[-1] in (".gz", ".bz2", ".xz", ".zip"):
        kind = "csv"
    if kind is None:
        raise InputFileError(name, f"has the extension {p.suffix or '(none)'!r}",
                             "raw data files end in .csv, .npy, .npz or .parquet")
    opener = {"csv": _open_csv, "npy": _open_npy, "npz": _open_npz, "parquet": _open_parquet}[kind]
    return opener(name, chunk_rows)


# --- CSV -------------------------------------------------------------------

def _columns_or_fail(name: str, columns) -> tuple[list, list]:
    columns = [str(c) for c in columns]
    if "probability" not in columns:
        close = [c for c in columns if c.strip().lower() in ("prob", "p", "probabilities", "ideal_probability",
                                                               "probability ")]
        hint = f" (is {close[0]!r} meant to be 'probability'?)" if close else ""
        raise DataError(name, f"has no 'probability' column; its columns are {', '.join(columns) or '(none)'}{hint}",
                        "columns: probability (required), circuit and heavy (optional)")
    seen = set()
    for c in columns:
        if c in seen:
            raise DataError(name, f"has the column {c!r} twice", "each column appears once")
        seen.add(c)
    known = [c for c in columns if c in COLUMNS]
    ignored = [c for c in columns if c not in COLUMNS]
    return known, ignored


def _open_csv(name: str, chunk_rows: int) -> Table:
    import pandas as pd

    try:
        header = pd.read_csv(name, nrows=0)
    except pd.errors.EmptyDataError:
        raise DataError(name, "is empty", "a CSV file starts with a header line: circuit,probability,heavy") from None
    except UnicodeDecodeError as exc:
        raise DataError(name, f"is not UTF-8 text (byte {exc.start})", "save the file as UTF-8 CSV") from None
    except (pd.errors.ParserError, ValueError, OSError) as exc:
        raise DataError(name, f"cannot be read as CSV ({_first_line(exc)})", "write comma-separated values") from None
    cols = [str(c) for c in header.columns]
    # pandas renames a repeated header "probability" to "probability.1".
    repeated = [c.rsplit(".", 1)[0] for c in cols
                if "." in c and c.rsplit(".", 1)[1].isdigit() and c.rsplit(".", 1)[0] in cols]
    if repeated:
        raise DataError(name, f"has the column {repeated[0]!r} twice", "each column appears once", line=1)
    if cols and all(_looks_numeric(str(c)) for c in cols):
        raise DataError(name, "its first line holds numbers, not column names",
                        "start the file with a header line such as circuit,probability,heavy", line=1)
    known, ignored = _columns_or_fail(name, cols)
    return Table(name, "csv", known, None, ignored, chunk_rows)


def _looks_numeric(text: str) -> bool:
    try:
        float(text)
        return True
    except ValueError:
        return False


def _first_line(exc: BaseException) -> str:
    text = str(exc).strip().splitlines()
    return text[-1] if text else type(exc).__name__


def _csv_chunks(table: Table) -> Iterator[Chunk]:
    import pandas as pd

    dtype = {"circuit": str} if table.has_circuit else None
    start = 0
    try:
        # No usecols: with it pandas silently drops the extra fields of a malformed line.
        reader = pd.read_csv(table.path, dtype=dtype, chunksize=table.chunk_rows,
                             skip_blank_lines=False, keep_default_na=True)
        for frame in reader:
            n = len(frame)
            p = _numeric_column(table, frame, "probability", start)
            circuit = None
            if table.has_circuit:
                c = frame["circuit"]
                missing = c.isna().to_numpy()
                if missing.any():
                    i = int(np.flatnonzero(missing)[0])
                    table.fail_row(start + i, "circuit", "the circuit id is missing",
                                   "every row names its circuit when the column is present")
                circuit = c.to_numpy(dtype=str)
            heavy = _numeric_column(table, frame, "heavy", start) if table.has_heavy else None
            yield table.make_chunk(start, p, circuit, heavy)
            start += n
    except pd.errors.ParserError as exc:
        raise DataError(table.path, f"is not well-formed CSV ({_first_line(exc)})",
                        "every line has the same fields as the header") from None
    except UnicodeDecodeError as exc:
        raise DataError(table.path, f"is not UTF-8 text (byte {exc.start})", "save the file as UTF-8 CSV") from None
    except (EOFError, OSError, zlib.error) as exc:
        raise DataError(table.path, f"is truncated or damaged ({_first_line(exc)})",
                        "give the complete file") from None


def _numeric_column(table: Table, frame, column: str, start: int) -> np.ndarray:
    import pandas as pd

    values = frame[column]
    if values.dtype.kind in "fiub":
        return values.to_numpy(dtype=float)
    numbers = pd.to_numeric(values, errors="coerce")
    bad = (numbers.isna() & values.notna()).to_numpy()
    if bad.any():
        i = int(np.flatnonzero(bad)[0])
        allowed = ALLOWED_PROBABILITY if column == "probability" else ALLOWED_HEAVY
        table.fail_row(start + i, column, f"{column} {str(values.iloc[i])!r} is not a number", allowed)
    return numbers.to_numpy(dtype=float)


# --- NPY -------------------------------------------------------------------

def _read_npy_header(handle, name: str, member: str = ""):
    """(shape, dtype) from an NPY header, refusing what cannot hold probabilities."""
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
    except (ValueError, OSError, EOFError, SyntaxError, zipfile.BadZipFile, zlib.error) as exc:
        raise DataError(name, f"{where.strip() + ' ' if where else ''}is not a readable NPY array "
                        f"({_first_line(exc)})", "save the array with numpy.save") from None
    return tuple(shape), np.dtype(dtype), bool(fortran)


def _rows_of(name: str, shape: tuple, what: str, member: str = "") -> int:
    label = f"{member!r} " if member else ""
    if len(shape) == 1:
        return int(shape[0])
    if len(shape) == 2 and shape[1] == 1:
        return int(shape[0])
    raise DataError(name, f"the {what} array {label}has shape {shape}",
                    "one column: shape (N,) or (N, 1)", path=what)


def _check_float_dtype(name: str, dtype: np.dtype, what: str) -> None:
    if dtype.hasobject or dtype.names:
        raise DataError(name, f"the {what} array holds {'records' if dtype.names else 'Python objects'}",
                        "a plain array of floating-point numbers (objects are never unpickled)", path=what)
    if dtype.kind != "f":
        raise DataError(name, f"the {what} array holds {dtype} values",
                        "floating-point probabilities (float32 or float64)", path=what)


def _open_npy(name: str, chunk_rows: int) -> Table:
    with open(name, "rb") as handle:
        shape, dtype, _ = _read_npy_header(handle, name)
        offset = handle.tell()
    _check_float_dtype(name, dtype, "probability")
    rows = _rows_of(name, shape, "probability")
    size = os.path.getsize(name)
    complete = (size - offset) // dtype.itemsize
    if complete < rows:
        raise DataError(name, f"is truncated: its header promises {rows:,} rows but only {complete:,} are complete",
                        "give the complete file")
    table = Table(name, "npy", ["probability"], rows, [], chunk_rows)
    table._offset = offset
    table._dtype = dtype
    return table


def _npy_chunks(table: Table) -> Iterator[Chunk]:
    """Native float64 files are read through a memory map whose pages are
    handed back (madvise DONTNEED) after each chunk: no copy, and the resident
    set stays about one chunk whatever the file size.  Other dtypes, or
    systems without madvise, are read with ``readinto`` into a reused buffer.
    (Measured here: faster than ``readinto`` and than one pre-faulted map per
    chunk.)"""
    dtype = table._dtype
    if dtype.isnative and dtype == np.dtype(np.float64) and hasattr(mmap, "MADV_DONTNEED") \
            and table.total_rows > 0:
        yield from _npy_chunks_mapped(table)
    else:
        yield from _npy_chunks_read(table)


def _npy_chunks_mapped(table: Table) -> Iterator[Chunk]:
    rows, offset = table.total_rows, table._offset
    page = mmap.PAGESIZE
    try:
        with open(table.path, "rb") as handle:
            mapping = mmap.mmap(handle.fileno(), 0, access=mmap.ACCESS_READ)
        values = np.frombuffer(mapping, dtype=np.float64, count=rows, offset=offset)
    except (OSError, ValueError) as exc:  # the file shrank since it was opened
        raise DataError(table.path, f"cannot be read to the end ({_first_line(exc)})",
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


def _npy_chunks_read(table: Table) -> Iterator[Chunk]:
    dtype = table._dtype
    rows = table.total_rows
    raw = np.empty(table.chunk_rows, dtype=dtype)
    as_float = None if dtype == np.dtype("<f8") or dtype == np.dtype("=f8") else np.empty(table.chunk_rows)
    view = memoryview(raw).cast("B")
    with open(table.path, "rb") as handle:
        handle.seek(table._offset)
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


# --- NPZ -------------------------------------------------------------------

def _open_npz(name: str, chunk_rows: int) -> Table:
    try:
        archive = zipfile.ZipFile(name)
    except (zipfile.BadZipFile, OSError, EOFError) as exc:
        raise DataError(name, f"is not a readable NPZ archive; truncated or damaged? ({_first_line(exc)})",
                        "save the arrays with numpy.savez (probability, optional circuit and heavy)") from None
    with archive:
        members = {m[:-4] if m.endswith(".npy") else m: m for m in archive.namelist()}
        if "probability" not in members:
            raise DataError(name, f"has no 'probability' array; its arrays are {', '.join(sorted(members)) or '(none)'}",
                            "arrays: probability (required), circuit and heavy (optional)")
        headers = {}
        for key in [k for k in COLUMNS if k in members]:
            try:
                with archive.open(members[key]) as stream:
                    headers[key] = _read_npy_header(stream, name, members[key])
            except (zipfile.BadZipFile, EOFError, zlib.error, OSError) as exc:
                raise DataError(name, f"is truncated or damaged ({_first_line(exc)})",
                                "give the complete file") from None
    shape, dtype, _ = headers["probability"]
    _check_float_dtype(name, dtype, "probability")
    rows = _rows_of(name, shape, "probability")
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
            n = _rows_of(name, s, key)
            if n != rows:
                raise DataError(name, f"the {key} array has {n:,} rows but probability has {rows:,}",
                                "all arrays have one entry per sample", path=key)
    ignored = [k for k in members if k not in COLUMNS]
    table = Table(name, "npz", [k for k in COLUMNS if k in headers], rows, ignored, chunk_rows)
    table._members = {k: members[k] for k in headers}
    table._dtypes = {k: headers[k][1] for k in headers}
    return table


def _npz_chunks(table: Table) -> Iterator[Chunk]:
    name = table.path
    rows = table.total_rows
    try:
        with zipfile.ZipFile(name) as archive:
            streams = {}
            try:
                for key, member in table._members.items():
                    streams[key] = archive.open(member)
                    _read_npy_header(streams[key], name, member)
                start = 0
                while start < rows:
                    n = min(table.chunk_rows, rows - start)
                    arrays = {}
                    for key, stream in streams.items():
                        dt = table._dtypes[key]
                        data = stream.read(n * dt.itemsize)
                        if len(data) != n * dt.itemsize:
                            raise DataError(name, f"the {key} array is truncated at row {start + len(data) // dt.itemsize + 1:,}",
                                            "give the complete file", path=key)
                        arrays[key] = np.frombuffer(data, dtype=dt)
                    p = arrays["probability"].astype(float, copy=False)
                    yield table.make_chunk(start, p, arrays.get("circuit"), arrays.get("heavy"))
                    start += n
            finally:
                for stream in streams.values():
                    stream.close()
    except (zipfile.BadZipFile, EOFError, zlib.error, OSError) as exc:
        raise DataError(name, f"is truncated or damaged ({_first_line(exc)})", "give the complete file") from None


# --- Parquet -----------------------------------------------------------------

def _pyarrow(name: str):
    try:
        import pyarrow  # noqa: F401
        import pyarrow.parquet as pq
    except ImportError:
        raise DataError(name, "reading Parquet needs the optional package pyarrow, which is not installed",
                        "pip install 'claimcheck[parquet]', or give CSV, NPY or NPZ") from None
    return pq


def _open_parquet(name: str, chunk_rows: int) -> Table:
    pq = _pyarrow(name)
    import pyarrow as pa

    try:
        handle = pq.ParquetFile(name)
    except (pa.ArrowException, OSError, ValueError) as exc:
        raise DataError(name, f"is not a readable Parquet file ({_first_line(exc)})",
                        "give a complete Parquet file") from None
    known, ignored = _columns_or_fail(name, handle.schema_arrow.names)
    table = Table(name, "parquet", known, int(handle.metadata.num_rows), ignored, chunk_rows)
    return table


def _parquet_chunks(table: Table) -> Iterator[Chunk]:
    pq = _pyarrow(table.path)
    import pyarrow as pa

    columns = [c for c in COLUMNS if c == "probability" or getattr(table, f"has_{c}")]
    start = 0
    try:
        handle = pq.ParquetFile(table.path)
        for batch in handle.iter_batches(batch_size=table.chunk_rows, columns=columns):
            arrays = {}
            for key in columns:
                col = batch.column(batch.schema.get_field_index(key))
                if col.null_count:
                    mask = np.asarray(col.is_null().to_numpy(zero_copy_only=False))
                    i = int(np.flatnonzero(mask)[0])
                    table.fail_row(start + i, key, f"{key} is missing (null)",
                                   ALLOWED_PROBABILITY if key == "probability" else
                                   (ALLOWED_HEAVY if key == "heavy" else "every row names its circuit"))
                if key != "circuit" and not (pa.types.is_floating(col.type) or pa.types.is_integer(col.type)
                                             or pa.types.is_boolean(col.type)):
                    table.fail_row(start, key, f"the {key} column holds {col.type} values",
                                   ALLOWED_PROBABILITY if key == "probability" else ALLOWED_HEAVY)
                arrays[key] = col.to_numpy(zero_copy_only=False)
            p = np.asarray(arrays["probability"], dtype=float)
            yield table.make_chunk(start, p, arrays.get("circuit"), arrays.get("heavy"))
            start += len(p)
    except (pa.ArrowException, OSError) as exc:
        raise DataError(table.path, f"is truncated or damaged ({_first_line(exc)})", "give the complete file") from None
