"""CSV (optionally .gz, .bz2, .xz or .zip compressed), through pandas' chunked reader.

The circuit column is read as a pandas category: each chunk arrives as its
distinct ids and one small integer per row, so a long id costs its length
once, not once per row.  Circuit ids are text: ``NA``, ``None`` and ``nan``
are ids like any other, and only an empty cell is a missing id.
"""

from __future__ import annotations

import lzma
import zipfile
import zlib
from typing import Iterator

import numpy as np

from ...errors import DataError
from ...input_files import open_regular
from .table import (ALLOWED_HEAVY, ALLOWED_PROBABILITY, Chunk, CircuitColumn, DataTable, columns_or_fail,
                    first_line)

ALLOWED_FILE = "give the path of a CSV, NPY, NPZ or Parquet data file"
COMPRESSION = {".gz": "gzip", ".bz2": "bz2", ".xz": "xz", ".zip": "zip"}
# The texts pandas reads as missing by default (pandas documentation, read_csv,
# "na_values"); kept for the numeric columns, where they mean "no number".
MISSING_NUMBER = ["", "#N/A", "#N/A N/A", "#NA", "-1.#IND", "-1.#QNAN", "-NaN", "-nan", "1.#IND",
                  "1.#QNAN", "<NA>", "N/A", "NA", "NULL", "NaN", "None", "n/a", "nan", "null"]
_DAMAGED = (EOFError, OSError, zlib.error, lzma.LZMAError, zipfile.BadZipFile)


def compression_of(name: str) -> str | None:
    lower = name.lower()
    for suffix, kind in COMPRESSION.items():
        if lower.endswith(suffix):
            return kind
    return None


def _read_csv(name: str, **options):
    """pandas.read_csv over a handle opened by :func:`open_regular` (which
    refuses FIFOs and devices); the handle is closed with the reader."""
    import pandas as pd

    handle = open_regular(name, ALLOWED_FILE)
    try:
        return handle, pd.read_csv(handle, compression=compression_of(name), encoding="utf-8", **options)
    except BaseException:
        handle.close()
        raise


def open_csv(name: str, chunk_rows: int) -> DataTable:
    import pandas as pd

    try:
        handle, header = _read_csv(name, nrows=0)
        handle.close()
    except pd.errors.EmptyDataError:
        raise DataError(name, "is empty", "a CSV file starts with a header line: circuit,probability,heavy") from None
    except UnicodeDecodeError as exc:
        raise DataError(name, f"is not UTF-8 text (byte {exc.start})", "save the file as UTF-8 CSV") from None
    except (pd.errors.ParserError, ValueError) as exc:
        raise DataError(name, f"cannot be read as CSV ({first_line(exc)})", "write comma-separated values") from None
    except _DAMAGED as exc:
        raise DataError(name, f"is truncated or damaged ({first_line(exc)})", "give the complete file") from None
    cols = [str(c) for c in header.columns]
    # pandas renames a repeated header "probability" to "probability.1".
    repeated = [c.rsplit(".", 1)[0] for c in cols
                if "." in c and c.rsplit(".", 1)[1].isdigit() and c.rsplit(".", 1)[0] in cols]
    if repeated:
        raise DataError(name, f"has the column {repeated[0]!r} twice", "each column appears once", line=1)
    if cols and all(_looks_numeric(str(c)) for c in cols):
        raise DataError(name, "its first line holds numbers, not column names",
                        "start the file with a header line such as circuit,probability,heavy", line=1)
    known, ignored = columns_or_fail(name, cols)
    return DataTable(name, "csv", known, None, ignored, chunk_rows, csv_chunks)


def _looks_numeric(text: str) -> bool:
    try:
        float(text)
        return True
    except ValueError:
        return False


# pandas parses this many chunks' rows at a time (fewer, larger reads cost less per row: 3e6 rows
# in 0.65 s at 2^18 rows a read against 0.54 s at 2^20); the rows still reach the estimators in
# chunks of ``chunk_rows``, so every sum is added in the same order and every number is the same.
CSV_READ_CHUNKS = 2


def csv_chunks(table: DataTable) -> Iterator[Chunk]:
    """The rows in chunks of ``table.chunk_rows``.  pandas reads CSV_READ_CHUNKS
    chunks at once; a read that is not clean (a column that is not numeric, a
    missing circuit id, a line pandas refuses) is read again chunk by chunk from
    its first row, so that the first problem is found and told exactly as
    reading chunk by chunk finds it."""
    try:
        yield from _csv_read(table, table.chunk_rows * CSV_READ_CHUNKS, 0, quick=True)
        return
    except _NotClean as exc:
        done = exc.start
    # Rows before ``done`` were read and checked already; from there chunk by chunk.
    yield from _csv_read(table, table.chunk_rows, done, quick=False)


class _NotClean(Exception):
    def __init__(self, start: int):
        self.start = start


def _clean(table: DataTable, frame) -> bool:
    """Every value of the read valid: numbers, probabilities from 0 to 1 (so a
    column of whole numbers holds only 0 and 1, which parse alike as integers
    and as floats), heavy 0 or 1, every circuit named."""
    if frame["probability"].dtype.kind not in "fiub":
        return False
    p = frame["probability"].to_numpy(dtype=float)
    if p.size and not ((p >= 0.0) & (p <= 1.0)).all():
        return False
    if table.has_heavy:
        if frame["heavy"].dtype.kind not in "fiub":
            return False
        h = frame["heavy"].to_numpy(dtype=float)
        if h.size and not ((h == 0.0) | (h == 1.0)).all():
            return False
    if table.has_circuit and len(frame) and frame["circuit"].cat.codes.to_numpy().min() < 0:
        return False
    return True


def _csv_read(table: DataTable, read_rows: int, skip_to: int, quick: bool) -> Iterator[Chunk]:
    import pandas as pd

    dtype = {"circuit": "category"} if table.has_circuit else None
    na_values = {"probability": MISSING_NUMBER, "heavy": MISSING_NUMBER, "circuit": [""]}
    start = 0
    handle = None
    step = table.chunk_rows
    try:
        # No usecols: with it pandas silently drops the extra fields of a malformed line.
        handle, reader = _read_csv(table.path, dtype=dtype, chunksize=read_rows, skip_blank_lines=False,
                                   keep_default_na=False, na_values=na_values)
        with reader:
            while True:
                try:
                    big = next(reader)
                except StopIteration:
                    return
                except pd.errors.ParserError:
                    if quick:
                        raise _NotClean(start) from None
                    raise
                if start + len(big) <= skip_to:
                    start += len(big)
                    continue
                if quick and not _clean(table, big):
                    raise _NotClean(start)
                for at in range(0, len(big), step):
                    frame = big.iloc[at:at + step]
                    yield _chunk(table, frame, start)
                    start += len(frame)
    except pd.errors.ParserError as exc:
        raise DataError(table.path, f"is not well-formed CSV ({first_line(exc)})",
                        "every line has the same fields as the header") from None
    except UnicodeDecodeError as exc:
        if quick:
            raise _NotClean(start) from None
        raise DataError(table.path, f"is not UTF-8 text (byte {exc.start})", "save the file as UTF-8 CSV") from None
    except _DAMAGED as exc:
        if quick:
            raise _NotClean(start) from None
        raise DataError(table.path, f"is truncated or damaged ({first_line(exc)})",
                        "give the complete file") from None
    finally:
        if handle is not None:
            handle.close()


def _chunk(table: DataTable, frame, start: int) -> Chunk:
    """One chunk's rows, checked in the order reading chunk by chunk checks them."""
    n = len(frame)
    p = _numeric_column(table, frame, "probability", start)
    circuit = None
    if table.has_circuit:
        c = frame["circuit"]
        codes = c.cat.codes.to_numpy()
        if n and codes.min() < 0:
            i = int(np.flatnonzero(codes < 0)[0])
            table.fail_row(start + i, "circuit", "the circuit id is missing",
                           "every row names its circuit when the column is present")
        circuit = CircuitColumn(np.asarray(c.cat.categories, dtype=object), codes)
    heavy = _numeric_column(table, frame, "heavy", start) if table.has_heavy else None
    return table.make_chunk(start, p, circuit, heavy)


def _numeric_column(table: DataTable, frame, column: str, start: int) -> np.ndarray:
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
