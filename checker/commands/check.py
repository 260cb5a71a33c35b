"""``claimcheck check FILE [FILE ...]``: re-derive every number of each claim.

Several files are checked one after another (``-`` reads one claim from
standard input); an unusable file gets its one line on standard error (and,
with ``--json``, an entry in the array) and the others are still checked.
The exit status is the worst: 2 when any file could not be used, else 1 when
any check flagged something, else 0.
"""

from __future__ import annotations

import argparse
import sys

HELP = "check claim files and say which printed numbers follow from their inputs"
STDIN = "<stdin>"


def add_parser(sub) -> None:
    from ..checks import REGISTRY

    p = sub.add_parser("check", help=HELP, description=HELP)
    p.add_argument("file", nargs="+",
                   help="claim files (.yaml, .yml or .json); - reads one claim (YAML or JSON) from standard input")
    p.add_argument("--json", action="store_true", help="print the report as JSON")
    p.add_argument("--markdown", metavar="OUT", help="also write draft referee notes (Markdown) to OUT")
    p.add_argument("--plain-text", metavar="OUT",
                   help="also write the same referee notes as plain text (no markup, lines of at most "
                        "78 columns, for a review form) to OUT")
    p.add_argument("--html", metavar="OUT", help="also write an HTML report with plots to OUT")
    p.add_argument("--only", metavar="IDS", type=_ids(REGISTRY),
                   help=f"comma-separated check ids to run (of: {', '.join(REGISTRY)})")
    p.add_argument("--verdict-only", action="store_true",
                   help="print just the verdict line (after the file's name when several are given)")


def _ids(registry):
    def parse(text: str):
        ids = [t.strip() for t in text.split(",") if t.strip()]
        unknown = [i for i in ids if i not in registry]
        if unknown or not ids:
            raise argparse.ArgumentTypeError(
                f"unknown check id {', '.join(unknown) or '(none)'}; known: {', '.join(registry)}")
        return ids
    return parse


def _read(path: str):
    """The Claim in ``path``, or in standard input for ``-``."""
    from ..claim import claim_from_document, read_claim

    if path != "-":
        return read_claim(path)
    from ..claim.load import MAX_BYTES, parse_bytes
    from ..errors import InputFileError

    if sys.stdin is None:
        raise InputFileError(STDIN, "is closed", "give a claim file, or pipe one in")
    stream = getattr(sys.stdin, "buffer", None)
    raw = stream.read(MAX_BYTES + 1) if stream is not None else sys.stdin.read(MAX_BYTES + 1)
    if isinstance(raw, str):
        raw = raw.encode("utf-8", "surrogateescape")
    # JSON is told from YAML by its first character: a JSON claim is one object.
    fmt = "json" if raw.lstrip(b"\xef\xbb\xbf \t\r\n").startswith(b"{") else "yaml"
    return claim_from_document(parse_bytes(raw, STDIN, fmt))


def run(args, stdout, stderr) -> int:
    from ..checks import run_checks
    from ..errors import ClaimcheckError, OutputError
    from ..output import check_targets, write_all_atomic
    from ..render.text import render_text, render_verdict_line

    files = list(args.file)
    inputs = [f for f in files if f != "-"]
    if files.count("-") > 1:
        raise OutputError("-", "is given more than once", "standard input holds one claim; give - once")
    targets = {"--markdown": args.markdown, "--plain-text": args.plain_text, "--html": args.html}
    if len(files) > 1 and any(t is not None for t in targets.values()):
        option = next(o for o, t in targets.items() if t is not None)
        raise OutputError(option, f"writes one claim's report, and {len(files)} files were given",
                          "give one file with --markdown, --plain-text or --html, or use claimcheck batch "
                          "for a set of claims")
    # Every output is checked before the work, and every report is rendered
    # before any is written; then all are written or none.
    check_targets(targets, inputs)
    status = 0
    rendered = []
    for path in files:
        try:
            claim = _read(path)
        except ClaimcheckError as exc:
            if len(files) == 1:
                raise
            stderr.write(exc.one_line() + "\n")
            status = 2
            if args.json:
                from ..render.json import dumps

                # The array keeps one entry per file given, in order: a script
                # reading it sees which file could not be used and why.
                rendered.append(dumps({"file": STDIN if path == "-" else path, "status": "unusable",
                                       "verdict": "unusable", "error": exc.one_line()}))
            continue
        report = run_checks(claim, args.only)
        status = max(status, report.exit_status)
        written = []
        if args.markdown is not None:
            from ..render.markdown import render_markdown

            written.append((args.markdown, render_markdown(report, claim)))
        if args.plain_text is not None:
            from ..render.plain_text import render_plain_text

            written.append((args.plain_text, render_plain_text(report, claim)))
        if args.html is not None:
            from ..render.html import render_html

            written.append((args.html, render_html(report, claim)))
        write_all_atomic(written, inputs)
        if args.json:
            from ..render.json import render_json

            rendered.append(render_json(report))
        elif args.verdict_only:
            line = render_verdict_line(report)
            rendered.append(f"{claim.file}: {line}" if len(files) > 1 else line)
        else:
            rendered.append(render_text(report))
    if args.json and len(files) > 1:
        # Several reports: one JSON array of the report objects, in the order given.
        stdout.write("[\n" + ",\n".join(r.rstrip("\n") for r in rendered) + "\n]\n")
    elif args.verdict_only:
        stdout.write("".join(rendered))
    else:
        stdout.write("\n".join(rendered))
    return status
