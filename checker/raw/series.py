"""Reading a series of repeated measurements for ``claimcheck drift``: a CSV
with columns ``time`` (a number or an ISO 8601 date-time), ``estimate`` and
optionally ``error``.

Date-times become hours since the earliest point.  Points written with
different UTC offsets are the instants they name (converted through UTC); a
series that mixes date-times with and without an offset is refused, since
the ones without name no instant.  A series is a small table: it is read
whole, up to :data:`MAX_BYTES`.
"""

from __future__ import annotations

import io
from dataclasses import dataclass

import numpy as np

from ..errors import DataError, InputFileError
from ..input_files import read_limited

MAX_BYTES = 100_000_000
ALLOWED_FILE = "give the path of a CSV file with columns time, estimate[, error]"
ALLOWED = {"time": "a number or an ISO 8601 date-time", "estimate": "a finite number",
           "error": "a standard error above 0"}
SHOWN_CHARS = 40
# The fit squares times and values: beyond this size the squares of their spread
# leave double precision (and the linear algebra gives zeros, not an error).
MAX_MAGNITUDE = 1e100


@dataclass(frozen=True)
class Series:
    """The points of a series, as floats; ``origin`` is the earliest date-time
    (a pandas Timestamp) when the times were date-times, else None."""

    times: np.ndarray
    estimates: np.ndarray
    errors: np.ndarray | None
    kind: str  # "number" or "datetime"
    origin: object = None


def shown(value) -> str:
    """A cell as quoted in a message, shortened when long."""
    text = str(value)
    return repr(text if len(text) <= SHOWN_CHARS else text[:SHOWN_CHARS] + "...")


def read_series(name: str) -> Series:
    """The series in a CSV file.

    Raises
    ------
    InputFileError
        Missing, not a regular file, unreadable, or larger than MAX_BYTES.
    DataError
        Not CSV, missing columns, or a value that is not usable (with its line).
    """
    import pandas as pd

    raw = read_limited(name, MAX_BYTES, ALLOWED_FILE)
    if len(raw) > MAX_BYTES:
        raise InputFileError(name, f"is larger than {MAX_BYTES:,} bytes", "a series holds one line per point")
    try:
        frame = pd.read_csv(io.BytesIO(raw), skip_blank_lines=False, dtype=str, keep_default_na=False)
    except pd.errors.EmptyDataError:
        raise DataError(name, "is empty", "a header line time,estimate[,error] and one line per point") from None
    except (pd.errors.ParserError, UnicodeDecodeError, ValueError) as exc:
        raise DataError(name, f"cannot be read as CSV ({str(exc).strip().splitlines()[-1]})",
                        "comma-separated values with a header line") from None
    columns = [str(c) for c in frame.columns]
    # pandas renames a repeated header "estimate" to "estimate.1".
    repeated = [c.rsplit(".", 1)[0] for c in columns
                if "." in c and c.rsplit(".", 1)[1].isdigit() and c.rsplit(".", 1)[0] in columns]
    if repeated:
        raise DataError(name, f"has the column {repeated[0]!r} twice", "each column appears once", line=1)
    missing = [c for c in ("time", "estimate") if c not in columns]
    if missing:
        raise DataError(name, f"has no {' or '.join(repr(m) for m in missing)} column; its columns are "
                        f"{', '.join(columns) or '(none)'}", "columns: time, estimate and optionally error")
    if len(frame) == 0:
        raise DataError(name, "holds no rows", "give at least three points")
    kind, origin = "number", None
    times = _numbers(frame["time"])
    if np.isnan(times).any() and (frame["time"].str.strip() != "").all():
        stamps = _datetimes(name, frame["time"])
        if stamps is not None:
            kind, origin = "datetime", stamps.min()
            times = ((stamps - origin) / pd.Timedelta(hours=1)).to_numpy(dtype=float)
    values = {"time": times, "estimate": _numbers(frame["estimate"])}
    if "error" in columns:
        values["error"] = _numbers(frame["error"])
    for column, arr in values.items():
        bad = ~np.isfinite(arr)
        if column == "error":
            bad |= ~(arr > 0)
        if bad.any():
            i = int(np.flatnonzero(bad)[0])
            raise DataError(name, f"{column} {shown(frame[column].iloc[i])} is not usable", ALLOWED[column],
                            path=column, line=i + 2)
        large = np.abs(arr) > MAX_MAGNITUDE
        if large.any():
            i = int(np.flatnonzero(large)[0])
            raise DataError(name, f"{column} {shown(frame[column].iloc[i])} is too large to fit a line to in "
                            "double precision", f"values up to {MAX_MAGNITUDE:g} in size; rescale the column "
                            "(other units)", path=column, line=i + 2)
    return Series(values["time"], values["estimate"], values.get("error"), kind, origin)


def _numbers(texts) -> np.ndarray:
    """Cells as floats; NaN where a cell is not a number.  Digits beyond the
    double range (a 400-digit time) become infinity, refused by the caller."""
    import pandas as pd

    try:
        return pd.to_numeric(texts, errors="coerce").to_numpy(dtype=float)
    except (OverflowError, ValueError, TypeError):
        return np.array([_one_number(t) for t in texts], dtype=float)


def _one_number(text) -> float:
    try:
        return float(str(text).strip())
    except (ValueError, OverflowError):
        return np.nan


def _datetimes(name: str, texts):
    """The cells as date-times (all naive, or all converted to UTC), or None
    when some cell is not a date-time at all."""
    import pandas as pd

    try:
        stamps = pd.to_datetime(texts, errors="coerce", format="ISO8601")
    except (ValueError, TypeError, OverflowError):
        stamps = None  # offsets differ, or some have one and some not
    if stamps is None or stamps.dtype == object:
        aware = [_has_offset(t) for t in texts]
        if any(a is None for a in aware):
            return None
        if any(aware) and not all(aware):
            first = aware.index(not aware[0])
            raise DataError(name, f"time {shown(texts.iloc[first])} "
                            f"{'has no' if aware[0] else 'has a'} time zone, unlike the first point",
                            "write every time with its UTC offset (such as +01:00 or Z), or none with one",
                            path="time", line=first + 2)
        try:
            stamps = pd.to_datetime(texts, errors="coerce", format="ISO8601", utc=True)
        except (ValueError, TypeError, OverflowError):
            return None
    if stamps.isna().any():
        return None
    return stamps


def _has_offset(text) -> bool | None:
    """Whether one date-time names its UTC offset; None when it is not a date-time."""
    import pandas as pd

    try:
        return pd.Timestamp(str(text).strip()).tzinfo is not None
    except (ValueError, TypeError, OverflowError):
        return None


def window_value(name: str, text: str, series: Series) -> float:
    """One end of ``--window`` in the units of the series' times."""
    import math

    if series.kind == "datetime":
        import pandas as pd

        try:
            stamp = pd.Timestamp(text)
        except (ValueError, TypeError, OverflowError):
            raise DataError(name, f"the window value {shown(text)} is not a date-time", "write ISO 8601, such as "
                            "2026-03-01T12:00", path="window") from None
        if (stamp.tzinfo is None) != (series.origin.tzinfo is None):
            have = "have" if series.origin.tzinfo is not None else "have no"
            raise DataError(name, f"the window value {shown(text)} {'has no' if stamp.tzinfo is None else 'has a'} "
                            f"time zone, but the series' times {have} one",
                            "write the window like the series' times", path="window")
        return (stamp - series.origin) / pd.Timedelta(hours=1)
    try:
        value = float(text)
    except (ValueError, OverflowError):
        value = math.nan
    if not math.isfinite(value):
        raise DataError(name, f"the window value {shown(text)} is not a number", "give two numbers", path="window")
    return value
