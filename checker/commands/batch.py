"""``claimcheck batch TABLE|FOLDER``: check every claim of a survey at once."""

from __future__ import annotations

import argparse
import time
from pathlib import Path

HELP = ("check every claim in a table (CSV, TSV or Parquet, one claim per row) or a folder of claim "
        "files, and adjust their p-values across the set (Holm, Benjamini-Hochberg)")
FORMATS = {".csv": "csv", ".json": "json", ".html": "html", ".htm": "html"}


def add_parser(sub) -> None:
    p = sub.add_parser("batch", help=HELP, description=HELP + ". Columns are claim fields with dots "
                       "for nesting (significance.sigma); a column starting with # is a note. Exit "
                       "status, the worst as for check: 2 when a row could not be used, else 1 when a claim fails a "
                       "check, else 0.")
    p.add_argument("table", help="a .csv, .tsv, .parquet table, or a folder of .yaml/.json claim files")
    p.add_argument("--out", metavar="OUT",
                   help="write one row per claim to OUT.csv, OUT.json or OUT.html")
    p.add_argument("--jobs", metavar="N", type=_jobs,
                   help="worker processes (default: one for small tables, every CPU from 2,000 claims)")


def _jobs(text: str) -> int:
    try:
        n = int(text)
    except ValueError:
        n = 0
    if n < 1:
        raise argparse.ArgumentTypeError(f"must be a whole number of at least 1, got {text!r}")
    return n


class Progress:
    """A one-line progress bar on a terminal's stderr; silent anywhere else
    (a pipe, a file, a test) and for runs shorter than half a second."""

    def __init__(self, stream, after: float = 0.5, every: float = 0.2):
        isatty = getattr(stream, "isatty", None)
        self.enabled = bool(isatty and isatty())
        self.stream = stream
        self.start = time.monotonic()
        self.after = after
        self.every = every
        self.last = 0.0
        self.width = 0

    def __call__(self, done: int, total: int) -> None:
        if not self.enabled:
            return
        now = time.monotonic()
        if now - self.start < self.after or (done < total and now - self.last < self.every):
            return
        self.last = now
        bar = 30
        filled = bar * done // max(total, 1)
        text = f"\rchecking claims [{'#' * filled}{'.' * (bar - filled)}] {done:,} of {total:,}"
        self.width = max(self.width, len(text))
        self.stream.write(text)
        self.stream.flush()

    def close(self) -> None:
        if self.enabled and self.width:
            self.stream.write("\r" + " " * self.width + "\r")
            self.stream.flush()


def _inputs(path: Path) -> list:
    """The files an output must not overwrite (an unreadable folder lists none;
    reading it says why)."""
    from ..input_files import is_folder

    if is_folder(path):
        try:
            return list(path.iterdir())
        except OSError:
            return []
    return [path]


def run(args, stdout, stderr) -> int:
    from ..errors import OutputError
    from ..output import check_targets
    from ..render.survey_text import render_batch_text, render_problems
    from ..visible import visible
    from ..wording import plural

    fmt = None
    inputs = _inputs(Path(args.table))
    if args.out is not None:
        check_targets({"--out": args.out}, inputs)  # say so before the work, not after
        fmt = FORMATS.get(Path(args.out).suffix.lower())
        if fmt is None:
            raise OutputError(args.out, f"has the extension {Path(args.out).suffix or '(none)'!r}",
                              "write the table to a file ending in .csv, .json or .html")
    if fmt in ("json", "html"):
        return _run_whole(args, stdout, stderr, fmt, inputs)
    # No --out, or a CSV: the table streamed through, never held (issue 13).
    from ..output import write_pieces_atomic
    from ..render.survey_text import render_batch_csv
    from ..survey.run import stream_batch

    progress = Progress(stderr)
    try:
        result = stream_batch(args.table, jobs=args.jobs, progress=progress, keep_rows=fmt == "csv")
    finally:
        progress.close()
    try:
        if fmt == "csv":
            pieces = (render_batch_csv(frame, header=i == 0) for i, frame in enumerate(result.frames()))
            write_pieces_atomic(args.out, pieces, inputs)
    finally:
        result.close()
    if result.problems:
        stderr.write(visible(render_problems(result.problems, total=result.problem_count)))
    stdout.write(render_batch_text(result.flagged, result.summary))
    if args.out is not None:
        stdout.write(f"wrote {plural(result.summary['rows'], 'row')} to {args.out}\n")
    return result.exit_status


def _run_whole(args, stdout, stderr, fmt: str, inputs: list) -> int:
    """JSON and HTML: the whole table in memory, as the notebook API gives it."""
    from ..output import write_atomic
    from ..render.survey_text import render_batch_text, render_problems
    from ..survey import run_batch
    from ..visible import visible
    from ..wording import plural

    progress = Progress(stderr)
    try:
        result = run_batch(args.table, jobs=args.jobs, progress=progress)
    finally:
        progress.close()
    if fmt == "json":
        from ..render.survey_text import render_batch_json

        text = render_batch_json(result.frame, result.summary)
    else:
        from ..render.survey_html import render_batch_html

        text = render_batch_html(result.frame, result.summary)
    write_atomic(args.out, text, inputs)
    if result.problems:
        stderr.write(visible(render_problems(result.problems)))
    stdout.write(render_batch_text(result.frame, result.summary))
    stdout.write(f"wrote {plural(len(result.frame), 'row')} to {args.out}\n")
    return result.exit_status
