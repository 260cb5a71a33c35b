"""``claimcheck check FILE``: re-derive every number of one claim."""

from __future__ import annotations

import argparse

HELP = "check one claim file and say which printed numbers follow from its inputs"


def add_parser(sub) -> None:
    from ..checks import REGISTRY

    p = sub.add_parser("check", help=HELP, description=HELP)
    p.add_argument("file", help="claim file (.yaml, .yml or .json)")
    p.add_argument("--json", action="store_true", help="print the report as JSON")
    p.add_argument("--markdown", metavar="OUT", help="also write draft referee notes (Markdown) to OUT")
    p.add_argument("--html", metavar="OUT", help="also write an HTML report with plots to OUT")
    p.add_argument("--only", metavar="IDS", type=_ids(REGISTRY),
                   help=f"comma-separated check ids to run (of: {', '.join(REGISTRY)})")
    p.add_argument("--verdict-only", action="store_true", help="print just the verdict line")


def _ids(registry):
    def parse(text: str):
        ids = [t.strip() for t in text.split(",") if t.strip()]
        unknown = [i for i in ids if i not in registry]
        if unknown or not ids:
            raise argparse.ArgumentTypeError(
                f"unknown check id {', '.join(unknown) or '(none)'}; known: {', '.join(registry)}")
        return ids
    return parse


def run(args, stdout, stderr) -> int:
    from ..checks import run_checks
    from ..claim import read_claim
    from ..output import refuse_overwriting_inputs, write_atomic
    from ..render.text import render_text, render_verdict_line

    from pathlib import Path

    from ..errors import OutputError

    for out in (args.markdown, args.html):
        if out:
            refuse_overwriting_inputs(out, [args.file])
            if not Path(out).parent.is_dir():  # say so before writing the other report
                raise OutputError(out, "its folder does not exist", "create the folder first")
            if Path(out).is_dir():
                raise OutputError(out, "is a directory", "give a file name for the report")
    claim = read_claim(args.file)
    report = run_checks(claim, args.only)
    # Every report is rendered before any is written, so that a failure leaves no file behind.
    written = []
    if args.markdown:
        from ..render.markdown import render_markdown

        written.append((args.markdown, render_markdown(report, claim)))
    if args.html:
        from ..render.html import render_html

        written.append((args.html, render_html(report, claim)))
    for out, text in written:
        write_atomic(out, text, [args.file])
    if args.json:
        from ..render.json import render_json

        stdout.write(render_json(report))
    elif args.verdict_only:
        stdout.write(render_verdict_line(report))
    else:
        stdout.write(render_text(report))
    return report.exit_status
