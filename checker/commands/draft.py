"""``claimcheck draft [FILE|-]``: a claim file drafted from pasted text."""

from __future__ import annotations

import sys
from pathlib import Path

HELP = "draft a claim file from a paper's own words (plain text, LaTeX or Markdown) for a person to review"
MAX_TEXT_BYTES = 4_000_000
STDIN = "<stdin>"


def add_parser(sub) -> None:
    p = sub.add_parser(
        "draft", help=HELP,
        description=HELP + ". Every number it recognises goes in a field with the words it came from "
        "quoted beside it; guesses are marked; fields a check would still need are commented out. "
        "The draft always loads. Exit status: 0 (1 with --check when a check flags something), 2 when "
        "the text gives nothing to draft.")
    p.add_argument("file", nargs="?", default="-", metavar="FILE|-",
                   help="the text to read (default: standard input)")
    p.add_argument("--out", metavar="CLAIM.yaml",
                   help="write the draft to this file (never over the input) instead of standard output")
    p.add_argument("--table", action="store_true",
                   help="one claim per row of the text's results table, as a batch CSV for claimcheck batch")
    p.add_argument("--check", action="store_true",
                   help="run the checks on the draft at once (printed as comments after the draft on "
                   "standard output; with --table without --out, on standard error)")


def _read(path: str) -> tuple[str, str]:
    """(text, name) of the input; one line and exit 2 for anything unusable."""
    from ..errors import InputFileError

    if path == "-":
        if sys.stdin is None:
            raise InputFileError(STDIN, "is closed", "give a text file, or pipe the text in")
        stream = getattr(sys.stdin, "buffer", None)
        raw = stream.read(MAX_TEXT_BYTES + 1) if stream is not None else sys.stdin.read(MAX_TEXT_BYTES + 1)
        name = STDIN
    else:
        from ..input_files import read_limited

        name = path
        # Read-only, a regular file only (a FIFO or /dev/zero is refused in one line).
        raw = read_limited(path, MAX_TEXT_BYTES, "give a text file, or - for standard input")
    if isinstance(raw, str):
        raw = raw.encode("utf-8", "surrogateescape")
    if len(raw) > MAX_TEXT_BYTES:
        raise InputFileError(name, f"is larger than {MAX_TEXT_BYTES:,} bytes",
                             "paste the paragraphs that print the claim, not the whole paper")
    if raw.startswith(b"%PDF"):
        raise InputFileError(name, "is a PDF file", "copy its text (or run pdftotext on it) and draft that")
    if not raw.strip():
        raise InputFileError(name, "is empty", "paste the sentences that print the claim's numbers")
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise InputFileError(name, f"is not UTF-8 text (byte {exc.start})", "save the text as UTF-8") from None
    binary = sum(1 for c in text[:100_000] if c < " " and c not in "\n\r\t\f\v")
    if binary > max(64, len(text[:100_000]) // 10):
        raise InputFileError(name, "holds binary data, not text", "paste the paper's text")
    return text, name


def run(args, stdout, stderr) -> int:
    from ..errors import OutputError
    from ..output import check_targets, write_atomic

    inputs = [] if args.file == "-" else [args.file]
    if args.out is not None:
        check_targets({"--out": args.out}, inputs)
        suffix = Path(args.out).suffix.lower()
        wanted = (".csv",) if args.table else (".yaml", ".yml")
        if suffix not in wanted:
            raise OutputError(args.out, f"has the extension {suffix or '(none)'!r}",
                              f"write the {'batch table' if args.table else 'claim'} to a file ending in "
                              f"{' or '.join(wanted)}")
    text, name = _read(args.file)
    if args.table:
        return _run_table(args, text, name, inputs, stdout, stderr)
    from ..draft import draft_text, make_loadable

    draft, yaml_text = make_loadable(draft_text(text, name))
    if args.out:
        write_atomic(args.out, yaml_text, inputs)
        guesses = sum(bool(f.guess) for f in draft.fields)
        stdout.write(f"wrote a draft claim to {args.out}: {len(draft.fields)} fields, "
                     f"{len(draft.missing)} still needed, {guesses} {'guess' if guesses == 1 else 'guesses'}\n")
    else:
        stdout.write(yaml_text)
    if not args.check:
        return 0
    from ..checks import run_checks
    from ..claim import claim_from_document
    from ..claim.load import parse_text
    from ..render.text import render_text

    claim = claim_from_document(parse_text(yaml_text, args.out or name, "yaml"))
    report = run_checks(claim)
    rendered = render_text(report)
    if not args.out:
        # Keep standard output one loadable YAML document: the report as comments.
        rendered = "".join(f"# {line}\n" if line else "#\n" for line in
                           ["claimcheck check of this draft:", ""] + rendered.splitlines())
    stdout.write(rendered)
    return report.exit_status


def _run_table(args, text, name, inputs, stdout, stderr) -> int:
    from ..draft.table_rows import draft_rows, render_csv
    from ..output import write_atomic

    rows = draft_rows(text, name)
    csv_text = render_csv(rows)
    if args.out:
        write_atomic(args.out, csv_text, inputs)
        stdout.write(f"wrote {len(rows.rows):,} claims to {args.out}\n")
    else:
        stdout.write(csv_text)
    if not args.check:
        return 0
    from ..render.survey_text import render_batch_text
    from ..survey import run_batch

    result = run_batch(rows.mappings())
    report = render_batch_text(result.frame, result.summary)
    # A CSV holds comment lines only above its header: without --out the
    # report goes to standard error, so that standard output stays the table.
    (stdout if args.out else stderr).write(report)
    return result.exit_status
