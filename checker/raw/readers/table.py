"""What every raw-data reader shares: the chunk, the opened table, the
validation of each chunk, and the coding of circuit ids.

Circuit ids are coded as integers (0, 1, 2, ... in order of first
appearance) chunk by chunk from each chunk's *distinct* ids, never from an
array of every row's id: a fixed-width string array of a chunk is as wide as
its longest id times its rows (one 2,000-character id made a 4 MB file ask
for gigabytes).  Readers hand over either the distinct ids with one integer
code per row (CSV categories, Parquet dictionaries) or a plain array whose
distinct values are found with ``numpy.unique`` (NPZ).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, Iterator

import numpy as np

from ...errors import DataError

CHUNK_ROWS = 1 << 18
COLUMNS = ("circuit", "probability", "heavy")
# Limits (README, "Limits"): beyond them the file is refused with one line.
MAX_CIRCUITS = 100_000
MAX_ID_CHARS = 1_000
ALLOWED_PROBABILITY = "each row holds the ideal probability of the observed outcome, a number from 0 to 1"
ALLOWED_HEAVY = "heavy is 0 or 1 (1 when the outcome's ideal probability is above its circuit's median)"
ALLOWED_CIRCUIT = f"circuit ids are integers or text of at most {MAX_ID_CHARS:,} characters"
_ONE_BITS = int(np.array(1.0).view(np.uint64))


@dataclass(frozen=True, eq=False)
class Chunk:
    """Consecutive rows of a table.

    ``probability`` may be a view into a buffer the reader reuses for the next
    chunk: copy what must outlive the chunk.
    """

    start: int  # 0-based index of the first row
    probability: np.ndarray  # float64
    circuit: np.ndarray | None  # int64 codes into DataTable.labels
    heavy: np.ndarray | None  # float64, 0 or 1

    def __len__(self) -> int:
        return int(self.probability.size)


@dataclass(frozen=True, eq=False)
class CircuitColumn:
    """One chunk's circuit ids as its distinct ids and a code per row into them
    (``ids[codes[i]]`` is row i's id)."""

    ids: np.ndarray  # object or numeric array of distinct ids
    codes: np.ndarray  # integer array, one per row, 0 <= code < len(ids)


class CircuitCodes:
    """Circuit ids -> 0, 1, 2, ... in order of first appearance, across chunks."""

    def __init__(self, table: "DataTable"):
        self.table = table
        self.index: dict = {}
        self.labels: list = []

    def codes(self, start: int, values) -> np.ndarray:
        if isinstance(values, CircuitColumn):
            ids, local = values.ids, np.asarray(values.codes)
            if local.size == 0:
                return np.empty(0, dtype=np.int64)
            known = [self.index.get(_key(i)) for i in ids]
            if None not in known:  # every id seen before (the usual chunk): no order to find
                return np.asarray(known, dtype=np.int64)[local]
            import pandas as pd  # (the readers that make a CircuitColumn have imported it)

            order = pd.unique(local)  # the distinct ids in the order this chunk first shows them
        else:
            ids, first, local = np.unique(np.asarray(values), return_index=True, return_inverse=True)
            local = local.ravel()
            order = np.argsort(first, kind="stable")
        mapping = np.empty(len(ids), dtype=np.int64)
        for j in order:
            key = _key(ids[j])
            code = self.index.get(key)
            if code is None:
                if isinstance(key, str) and len(key) > MAX_ID_CHARS:
                    row = start + int(np.flatnonzero(local == j)[0])
                    self.table.fail_row(row, "circuit", f"the circuit id is {len(key):,} characters long",
                                        ALLOWED_CIRCUIT)
                if len(self.labels) >= MAX_CIRCUITS:
                    row = start + int(np.flatnonzero(local == j)[0])
                    self.table.fail_row(row, "circuit", f"more than {MAX_CIRCUITS:,} distinct circuits",
                                        f"raw takes at most {MAX_CIRCUITS:,} circuits per file; split the file")
                code = self.index[key] = len(self.labels)
                self.labels.append(key)
            mapping[j] = code
        return mapping[local]


def _key(value):
    """A circuit id as a plain Python value (numpy scalars as their item)."""
    return value.item() if hasattr(value, "item") else value


class DataTable:
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
    state : dict
        What the format's reader learnt when it opened the file.
    """

    def __init__(self, path: str, kind: str, columns, total_rows, ignored, chunk_rows,
                 reader: Callable[["DataTable"], Iterator[Chunk]], **state):
        self.path = path
        self.kind = kind
        self.has_circuit = "circuit" in columns
        self.has_heavy = "heavy" in columns
        self.total_rows = total_rows
        self.ignored_columns = tuple(ignored)
        self.chunk_rows = chunk_rows
        self.state = state
        self._reader = reader
        self._coder = CircuitCodes(self)

    @property
    def labels(self) -> list:
        return self._coder.labels

    def chunks(self) -> Iterator[Chunk]:
        rows = 0
        for chunk in self._reader(self):
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
            codes = self._coder.codes(start, circuit)
        h = self.check_heavy(start, heavy) if heavy is not None else None
        return Chunk(start, p, codes, h)


def columns_or_fail(name: str, columns) -> tuple[list, list]:
    """(the columns claimcheck reads, the others); refuses a table without
    ``probability`` or with a repeated column."""
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


def first_line(exc: BaseException) -> str:
    """The last line of an exception's text (libraries put the point there)."""
    text = str(exc).strip().splitlines()
    return text[-1] if text else type(exc).__name__
