"""``claimcheck drift SERIES.csv``: a stability systematic from repeated
measurements of one estimate."""

from __future__ import annotations

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
                   help="the data-taking window of the headline number, in the time column's units, or as "
                        "date-times when the times are date-times (default: the whole series)")
    p.add_argument("--level", type=_level, default=0.95, help="level of the slope interval (default 0.95)")
    p.add_argument("--alpha", type=_alpha, default=0.05,
                   help="test size for rejecting a constant value (default 0.05)")
    p.add_argument("--json", action="store_true", help="print the result as JSON")


def run(args, stdout, stderr) -> int:
    from ..errors import DataError
    from ..raw.series import read_series, window_value
    from ..render.raw_text import render_drift_text
    from ..stats.drift import drift_analysis

    series = read_series(args.series)
    times, estimates, errors, kind = series.times, series.estimates, series.errors, series.kind
    window = None
    if args.window:
        window = tuple(window_value(args.series, v, series) for v in args.window)
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
    # Date-times are counted in hours since the first point: name it wherever a time is shown.
    origin = series.origin.isoformat() if kind == "datetime" else None
    if args.json:
        from ..render.json import dumps

        out = {"file": args.series, "time_unit": "hours since the first point" if kind == "datetime" else "as given"}
        if origin is not None:
            out["time_origin"] = origin
        out.update(result.to_dict())
        stdout.write(dumps(out))
    else:
        stdout.write(render_drift_text(result, args.series, origin))
    return 0


