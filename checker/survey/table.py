"""Reading a survey: a CSV, TSV or Parquet table with one claim per row, a
folder of claim files, a pandas DataFrame, or a list of mappings.

Every table becomes a header and rows of cell texts.  CSV cells are read as
the exact text written (no type guessing), so "4.20" keeps its three printed
digits.  Parquet and DataFrame cells that are numbers are written out as
their shortest round-trip text, as the notebook API does for a mapping;
store numbers as text there to keep their printed precision.

Rows are numbered from 1 for the first claim below the header; lines before
the header that begin with ``#`` are comments.
"""

from __future__ import annotations

import csv
import io
import itertools
import math
import os
import stat
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Iterable, Mapping, NamedTuple, Sequence

from ..errors import InputFileError
from ..input_files import open_regular, problem_of, read_limited

TABLE_SUFFIXES = {".csv": ",", ".tsv": "\t", ".parquet": None, ".pq": None}
CLAIM_SUFFIXES = (".yaml", ".yml", ".json")
# Limits (README, "Limits"). A batch held in memory (JSON/HTML output, Parquet, the API; a streamed
# CSV keeps about 100 bytes a claim) holds about 1.5 KB per claim and some 25 times a
# table's bytes at its peak (measured), so these keep it within a few gigabytes.
MAX_TABLE_BYTES = 250_000_000
MAX_CLAIMS = 1_000_000


class Row(NamedTuple):
    """One table row: its number (1 = first claim), its line in the file (CSV
    only) and its cells' texts.  A named tuple: 100,000 of them are made and
    sent to worker processes."""

    number: int
    line: int | None
    cells: tuple


@dataclass(frozen=True)
class SurveyTable:
    name: str
    header: tuple
    rows: tuple


@dataclass(frozen=True)
class Folder:
    """A folder of claim files.  ``files`` holds every entry with a claim
    file's extension, once per file (two names of one file, such as a link
    beside its target, count once); entries that are not regular files stay
    in (but folders), so that checking them reports why they cannot be used.  ``notes`` are
    one line per name left out as a second name of a file already listed."""

    name: str
    files: tuple
    notes: tuple = field(default_factory=tuple)


def cell_text(value: Any) -> str:
    """The text of one Parquet or DataFrame cell; "" for a missing value."""
    if value is None or type(value).__name__ in ("NAType", "NaTType"):
        return ""
    if isinstance(value, str):
        return value
    kind = type(value).__name__
    if isinstance(value, bool) or kind in ("bool_", "bool"):
        return "true" if bool(value) else "false"
    if isinstance(value, float) or kind.startswith("float"):
        # str() of a Python or numpy float is its shortest round-trip text
        # (numpy's float32 included, where repr(float(x)) would add digits).
        return "" if math.isnan(float(value)) else str(value)
    if isinstance(value, int) or kind.startswith(("int", "uint")):
        return str(int(value))
    return str(value)


def read_source(source: Any) -> SurveyTable | Folder:
    """A path (table or folder), a DataFrame, or a list of mappings.

    Raises
    ------
    InputFileError
        A missing or unreadable file, an unknown file type, an empty table.
    """
    if isinstance(source, (str, Path)):
        path = Path(source)
        allowed = "give a CSV or Parquet table, or a folder of claim files"
        try:
            mode = os.stat(path).st_mode
        except OSError as exc:
            problem = "no such file or folder" if exc.errno == 2 else problem_of(exc)
            raise InputFileError(str(source), problem, allowed) from None
        except ValueError:
            raise InputFileError(str(source), "is not a usable path (it holds a NUL byte)", allowed) from None
        if stat.S_ISDIR(mode):
            return read_folder(path)
        return read_table_file(path)
    if hasattr(source, "columns") and hasattr(source, "itertuples"):
        return table_from_frame(source, "<DataFrame>")
    if isinstance(source, Sequence) and not isinstance(source, (bytes, bytearray)):
        return table_from_mappings(source, "<mappings>")
    raise InputFileError(repr(type(source).__name__), "is not a table",
                         "give a path, a pandas DataFrame or a list of mappings")


def read_folder(path: Path) -> Folder:
    try:
        entries = sorted(str(p) for p in path.iterdir() if p.suffix.lower() in CLAIM_SUFFIXES)
    except OSError as exc:
        raise InputFileError(str(path), f"its entries cannot be listed ({problem_of(exc)})",
                             "give a folder you may read") from None
    files, notes, seen = [], [], {}
    # Real files first, so that a link is the name left out rather than its target.
    for name in sorted(entries, key=lambda n: (os.path.islink(n), n)):
        try:
            info = os.stat(name)
        except OSError:
            files.append(name)  # a dangling link or a loop: checking it says which
            continue
        if stat.S_ISDIR(info.st_mode):
            continue  # a folder named like a claim file is not one
        key = (info.st_dev, info.st_ino)
        if stat.S_ISREG(info.st_mode) and key in seen:
            notes.append(f"{name}: is another name of {seen[key]}; that file is checked once")
            continue
        seen[key] = name
        files.append(name)
    if len(files) > MAX_CLAIMS:
        raise InputFileError(str(path), f"holds {len(files):,} claim files, more than {MAX_CLAIMS:,}",
                             "split the folder")
    if not files:
        raise InputFileError(str(path), "holds no claim files",
                             "a folder for batch holds .yaml, .yml or .json claim files")
    return Folder(str(path), tuple(sorted(files)), tuple(notes))


def read_table_file(path: Path) -> SurveyTable:
    suffix = path.suffix.lower()
    if suffix not in TABLE_SUFFIXES:
        raise InputFileError(str(path), f"has the extension {path.suffix or '(none)'!r}",
                             "a table for batch ends in .csv, .tsv, .parquet or .pq (or give a folder)")
    if TABLE_SUFFIXES[suffix] is None:
        return _read_parquet(path)
    raw = read_limited(path, MAX_TABLE_BYTES, "give a CSV or Parquet table, or a folder of claim files")
    if len(raw) > MAX_TABLE_BYTES:
        raise InputFileError(str(path), f"is larger than {MAX_TABLE_BYTES:,} bytes", "split the table")
    if b"\x00" in raw:
        raise InputFileError(str(path), "holds binary data (a NUL byte)", "a CSV table is UTF-8 text")
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise InputFileError(str(path), f"is not UTF-8 text (byte {exc.start})", "save the table as UTF-8") from None
    return parse_delimited(text, str(path), TABLE_SUFFIXES[suffix])


def parse_delimited(text: str, name: str, delimiter: str = ",") -> SurveyTable:
    """A CSV (or TSV) text: comment lines, a header, then one claim per row.

    The csv module rather than pandas.read_csv: a row with too many or too
    few cells must become one reported bad row (with its line) while the rest
    are checked, where read_csv stops the whole table; and every cell stays
    the text written.
    """
    # The same reader as the streamed path, on the whole text held in memory.
    header, rows = _delimited_rows(io.StringIO(text, newline=""), name, delimiter)
    rows = tuple(rows)
    if not rows:
        raise InputFileError(name, "holds a header but no claims", "give one claim per row below the header")
    return SurveyTable(name, header, rows)


def _read_parquet(path: Path) -> SurveyTable:
    handle = open_regular(path, "give a CSV or Parquet table, or a folder of claim files")
    try:
        if os.fstat(handle.fileno()).st_size > MAX_TABLE_BYTES:
            raise InputFileError(str(path), f"is larger than {MAX_TABLE_BYTES:,} bytes", "split the table")
        import pandas as pd
        import pyarrow.parquet as pq

        rows = pq.ParquetFile(handle).metadata.num_rows  # counted before anything is decompressed
        if rows > MAX_CLAIMS:
            raise InputFileError(str(path), f"holds {rows:,} claims, more than {MAX_CLAIMS:,}", "split the table")
        handle.seek(0)
        frame = pd.read_parquet(handle)
    except InputFileError:
        raise
    except ImportError:
        raise InputFileError(str(path), "is a Parquet file, and reading one needs pyarrow",
                             "pip install pyarrow (or save the table as CSV)") from None
    except Exception as exc:  # pyarrow raises its own many kinds
        raise InputFileError(str(path), f"cannot be read as Parquet ({type(exc).__name__}: {exc})",
                             "check that the file is a Parquet table") from None
    finally:
        handle.close()
    return table_from_frame(frame, str(path))


def table_from_frame(frame, name: str) -> SurveyTable:
    if len(frame) > MAX_CLAIMS:
        raise InputFileError(name, f"holds {len(frame):,} claims, more than {MAX_CLAIMS:,}", "split the table")
    header = tuple(str(c) for c in frame.columns)
    rows = tuple(Row(i + 1, None, tuple(cell_text(v) for v in values))
                 for i, values in enumerate(frame.itertuples(index=False, name=None)))
    if not rows:
        raise InputFileError(name, "holds no claims", "give one claim per row")
    return SurveyTable(name, header, rows)


def _flatten(mapping: Mapping, prefix: str, out: dict) -> None:
    for key, value in mapping.items():
        name = f"{prefix}{key}"
        if isinstance(value, Mapping):
            _flatten(value, name + ".", out)
        elif isinstance(value, (list, tuple)):
            _flatten({str(i): v for i, v in enumerate(value)}, name + ".", out)
        else:
            out[name] = cell_text(value)


def table_from_mappings(mappings: Iterable[Mapping], name: str) -> SurveyTable:
    """Claims as mappings (nested, or with dotted keys) become a table."""
    flat = []
    for i, mapping in enumerate(mappings):
        if not isinstance(mapping, Mapping):
            raise InputFileError(name, f"entry {i + 1} is a {type(mapping).__name__}, not a mapping",
                                 "give one mapping of claim fields per claim")
        row: dict = {}
        _flatten(mapping, "", row)
        flat.append(row)
    if not flat:
        raise InputFileError(name, "holds no claims", "give one mapping per claim")
    header: dict = {}
    for row in flat:
        header.update(dict.fromkeys(row))
    columns = tuple(header)
    rows = tuple(Row(i + 1, None, tuple(row.get(c, "") for c in columns)) for i, row in enumerate(flat))
    return SurveyTable(name, columns, rows)


# --- reading a CSV/TSV table without holding it -----------------------------
# ``batch`` on a path reads a delimited table three times rather than once into memory, so that
# its memory does not grow with the table (issue 13): one pass over the bytes (size, NUL, UTF-8),
# one that parses every row and counts them (so that a malformed table is refused before any work,
# as parse_delimited does, and the row count is known), and the one that hands rows to the checks.

READ_PIECE = 1 << 20
_BOM = b"\xef\xbb\xbf"


@dataclass(frozen=True)
class StreamedTable:
    """A CSV/TSV table read on demand: its header, how many claims it holds,
    and :meth:`rows`, a fresh iterator over them in order."""

    name: str
    header: tuple
    count: int
    path: str
    delimiter: str

    def rows(self):
        with _text_handle(self.path, self.name) as handle:
            header, rows = _delimited_rows(handle, self.name, self.delimiter)
            yield from rows


def _text_handle(path: str, name: str):
    handle = open_regular(path, "give a CSV or Parquet table, or a folder of claim files")
    return io.TextIOWrapper(handle, encoding="utf-8-sig", newline="")


def _check_bytes(path: Path) -> None:
    """The checks :func:`read_table_file` makes on the whole text (size, then
    NUL, then UTF-8, in that order of precedence), made piece by piece."""
    import codecs

    allowed = "give a CSV or Parquet table, or a folder of claim files"
    decoder = codecs.getincrementaldecoder("utf-8")()
    total, nul, bad, start = 0, False, None, b""
    with open_regular(path, allowed) as handle:
        try:
            while total <= MAX_TABLE_BYTES:
                piece = handle.read(min(MAX_TABLE_BYTES + 1 - total, READ_PIECE))
                if not piece:
                    break
                if len(start) < 3:
                    start = (start + piece)[:3]
                nul = nul or b"\x00" in piece
                if bad is None:
                    pending = len(decoder.getstate()[0])
                    try:
                        decoder.decode(piece)
                    except UnicodeDecodeError as exc:
                        bad = total - pending + exc.start
                total += len(piece)
            if bad is None and total <= MAX_TABLE_BYTES:
                try:
                    decoder.decode(b"", final=True)
                except UnicodeDecodeError as exc:
                    bad = total - len(decoder.getstate()[0]) + exc.start
        except OSError as exc:
            raise InputFileError(str(path), problem_of(exc), allowed) from None
    if total > MAX_TABLE_BYTES:
        raise InputFileError(str(path), f"is larger than {MAX_TABLE_BYTES:,} bytes", "split the table")
    if nul:
        raise InputFileError(str(path), "holds binary data (a NUL byte)", "a CSV table is UTF-8 text")
    if bad is not None:
        # decode("utf-8-sig") counts from after a byte-order mark
        bad -= 3 if start == _BOM and bad >= 3 else 0
        raise InputFileError(str(path), f"is not UTF-8 text (byte {bad})", "save the table as UTF-8")


def _delimited_rows(handle, name: str, delimiter: str):
    """(header, iterator of Rows) of an open text handle: comment lines and
    blank lines skipped, each row's line number in the file, and a one-line
    error for a malformed table (raised as the rows are read)."""
    skipped = 0
    first = []
    while True:
        line = handle.readline()
        if not line:
            break
        if line.lstrip().startswith("#") or not line.strip():
            skipped += 1
            continue
        first = [line]
        break
    reader = csv.reader(itertools.chain(first, handle), delimiter=delimiter, strict=True)
    try:
        header = next(reader, None)
    except csv.Error as exc:
        raise InputFileError(name, f"is not a well-formed table ({exc})",
                             "fix the quoting near that line", line=skipped + reader.line_num) from None
    if header is None:
        raise InputFileError(name, "holds no header and no claims",
                             "the first row names the fields: title, metric, estimate, ...")
    if len(header) == 1 and delimiter == "," and (";" in header[0] or "\t" in header[0]):
        raise InputFileError(name, "has a single column whose name holds ';' or tabs",
                             "separate cells with commas (or name a tab-separated table .tsv)",
                             line=skipped + 1)

    def rows():
        number = 0
        start = skipped + reader.line_num + 1
        try:
            for cells in reader:
                line = start
                start = skipped + reader.line_num + 1
                if not cells or all(not c.strip() for c in cells):
                    continue  # a blank line is not a claim
                number += 1
                if number > MAX_CLAIMS:
                    raise InputFileError(name, f"holds more than {MAX_CLAIMS:,} claims", "split the table",
                                         line=line)
                yield Row(number, line, tuple(cells))
        except csv.Error as exc:
            raise InputFileError(name, f"is not a well-formed table ({exc})",
                                 "fix the quoting near that line", line=skipped + reader.line_num) from None

    return tuple(header), rows()


def stream_source(source: Any) -> StreamedTable | SurveyTable | Folder:
    """Like :func:`read_source`, but a CSV/TSV path becomes a
    :class:`StreamedTable` (its rows read again when needed, never all held);
    every problem :func:`read_source` would raise is raised here, before any
    claim is checked."""
    if not isinstance(source, (str, Path)):
        return read_source(source)
    path = Path(source)
    try:
        regular = stat.S_ISREG(os.stat(path).st_mode)
    except (OSError, ValueError):
        regular = False
    delimiter = TABLE_SUFFIXES.get(path.suffix.lower())
    if not regular or delimiter is None:
        return read_source(source)  # folders, Parquet, and every refusal
    _check_bytes(path)
    name = str(path)
    with _text_handle(name, name) as handle:
        header, rows = _delimited_rows(handle, name, delimiter)
        count = sum(1 for _ in rows)
    if not count:
        raise InputFileError(name, "holds a header but no claims", "give one claim per row below the header")
    return StreamedTable(name, header, count, name, delimiter)
