"""``claimcheck drift SERIES.csv``: a stability systematic from repeated
measurements of one estimate."""

from __future__ import annotations

import argparse

from .arguments import finite as _finite
from .arguments import level as _level

HELP = "estimate a stability systematic from a series of repeated measurements (time, estimate, error)"
DESCRIPTION = (HELP + ". SERIES.csv has columns time (a number or an ISO date-time), estimate and, optionally, "
               "error (one standard error per point).")


def _alpha(text: str) -> float:
    value = _level(text)
    return value


def add_parser(sub) -> None:
    p = sub.add_parser("drift", help=HELP, description=DESCRIPTION)
    p.add_argument("series", metavar="SERIES.csv", help="CSV with columns time, estimate[, error]")
    p.add_argument("--window", nargs=2, metavar=("START", "END"),
                   help="the data-taking window of the headline number, in the time column's units "
                        "(default: the whole series)")
    p.add_argument("--level", type=_level, default=0.95, help="level of the slope interval (default 0.95)")
    p.add_argument("--alpha", type=_alpha, default=0.05,
                   help="test size for rejecting a constant value (default 0.05)")
    p.add_argument("--json", action="store_true", help="print the result as JSON")


def run(args, stdout, stderr) -> int:
    from ..errors import DataError
    from ..render.raw_text import render_drift_text
    from ..stats.drift import drift_analysis

    times, estimates, errors, kind, origin = read_series(args.series)
    window = None
    if args.window:
        window = tuple(_window_value(args.series, v, kind, origin) for v in args.window)
        if window[1] < window[0]:
            raise DataError(args.series, "the window ends before it starts", "give --window START END",
                            path="window")
    import numpy as np

    try:
        # Overflow raises rather than passing inf and nonsense into the report.
        with np.errstate(over="raise"):
            result = drift_analysis(times, estimates, errors, window=window, level=args.level, alpha=args.alpha)
    except ValueError as exc:
        raise DataError(args.series, str(exc), "give at least three points at two or more times") from None
    except ArithmeticError:  # OverflowError, FloatingPointError
        raise DataError(args.series, "its times or values are so large that the fit overflows double precision",
                        "rescale the time or estimate column (different units)") from None
    if args.json:
        from ..render.json import dumps

        out = {"file": args.series, "time_unit": "hours since the first point" if kind == "datetime" else "as given"}
        out.update(result.to_dict())
        stdout.write(dumps(out))
    else:
        stdout.write(render_drift_text(result, args.series))
    return 0


def _window_value(name, text, kind, origin):
    from ..errors import DataError

    if kind == "datetime":
        import pandas as pd

        try:
            stamp = pd.Timestamp(text)
        except ValueError:
            raise DataError(name, f"the window value {text!r} is not a date-time", "write ISO 8601, such as "
                            "2026-03-01T12:00", path="window") from None
        return (stamp - origin) / pd.Timedelta(hours=1)
    try:
        return _finite(text)
    except argparse.ArgumentTypeError:
        raise DataError(name, f"the window value {text!r} is not a number", "give two numbers", path="window") from None


def read_series(name: str):
    """(times, estimates, errors or None, "number"|"datetime", origin) from a CSV file."""
    from pathlib import Path

    import numpy as np
    import pandas as pd

    from ..errors import DataError, InputFileError

    path = Path(name)
    if not path.exists():
        raise InputFileError(name, "no such file", "give the path of a CSV file with columns time, estimate[, error]")
    if path.is_dir():
        raise InputFileError(name, "is a directory", "give the path of a CSV file")
    try:
        frame = pd.read_csv(name, skip_blank_lines=False)
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
    times = pd.to_numeric(frame["time"], errors="coerce")
    if times.isna().any() and frame["time"].notna().all():
        stamps = pd.to_datetime(frame["time"], errors="coerce", utc=False, format="ISO8601")
        if stamps.notna().all():
            kind, origin = "datetime", stamps.min()
            times = (stamps - origin) / pd.Timedelta(hours=1)
    values = {"time": times, "estimate": pd.to_numeric(frame["estimate"], errors="coerce")}
    if "error" in columns:
        values["error"] = pd.to_numeric(frame["error"], errors="coerce")
    for column, series in values.items():
        arr = series.to_numpy(dtype=float)
        bad = ~np.isfinite(arr)
        if column == "error":
            bad |= ~(arr > 0)
        if bad.any():
            i = int(np.flatnonzero(bad)[0])
            shown = frame[column].iloc[i]
            allowed = {"time": "a number or an ISO 8601 date-time", "estimate": "a finite number",
                       "error": "a standard error above 0"}[column]
            raise DataError(name, f"{column} {str(shown)!r} is not usable", allowed, path=column, line=i + 2)
    errors = values["error"].to_numpy(dtype=float) if "error" in values else None
    return (values["time"].to_numpy(dtype=float), values["estimate"].to_numpy(dtype=float), errors, kind, origin)
