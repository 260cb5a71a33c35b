"""Chunked readers for raw per-sample data, one module per format: CSV
(``csv_files``), NPY (``npy_files``), NPZ (``npz_files``) and Parquet
(``parquet_files``); ``table`` holds what they share.

A table has one row per measured sample: ``probability`` (the ideal
probability of the observed outcome, required), ``circuit`` (an id, optional)
and ``heavy`` (0/1, optional).  Every reader streams fixed-size chunks into
reused buffers, so memory stays flat whatever the file size: NPY is read
through a memory map whose pages are handed back (or with ``readinto``), NPZ
members are streamed out of the zip archive, Parquet goes batch by batch, CSV
through pandas' chunked reader.

Every chunk is validated as it is read; the first bad row raises
:class:`~checker.errors.DataError` naming the row (the line, for CSV).  Only
regular files are opened (:mod:`checker.input_files`).
"""

from __future__ import annotations

import os
from pathlib import Path

from ...errors import InputFileError
from ...input_files import regular_file
from .csv_files import open_csv
from .npy_files import open_npy
from .npz_files import open_npz
from .parquet_files import open_parquet
from .table import (ALLOWED_HEAVY, ALLOWED_PROBABILITY, CHUNK_ROWS, COLUMNS, MAX_CIRCUITS, MAX_ID_CHARS, Chunk,
                    DataTable)

KINDS = {".csv": "csv", ".npy": "npy", ".npz": "npz", ".parquet": "parquet", ".pq": "parquet"}
OPENERS = {"csv": open_csv, "npy": open_npy, "npz": open_npz, "parquet": open_parquet}
ALLOWED_FILE = "give the path of a CSV, NPY, NPZ or Parquet data file"

__all__ = ["open_table", "DataTable", "Chunk", "CHUNK_ROWS", "COLUMNS", "KINDS", "MAX_CIRCUITS", "MAX_ID_CHARS",
           "ALLOWED_HEAVY", "ALLOWED_PROBABILITY"]


def open_table(path: str | os.PathLike, chunk_rows: int = CHUNK_ROWS) -> DataTable:
    """Open a raw data file for chunked reading (the format from its extension).

    Raises
    ------
    InputFileError
        Missing, not a regular file (a folder, a FIFO, a device), unreadable,
        or an unknown extension.
    DataError
        The file's header or columns cannot be used.
    """
    p = Path(path)
    name = str(path)
    regular_file(name, ALLOWED_FILE)
    suffixes = [s.lower() for s in p.suffixes]
    kind = KINDS.get(suffixes[-1] if suffixes else "")
    if kind is None and len(suffixes) >= 2 and suffixes[-2] == ".csv" and suffixes[-1] in (".gz", ".bz2", ".xz", ".zip"):
        kind = "csv"
    if kind is None:
        raise InputFileError(name, f"has the extension {p.suffix or '(none)'!r}",
                             "raw data files end in .csv, .npy, .npz or .parquet")
    return OPENERS[kind](name, chunk_rows)
