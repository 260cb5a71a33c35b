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
    from ..output import check_targets, write_all_atomic
    from ..render.text import render_text, render_verdict_line

    # Every output is checked before the work, and every report is rendered
    # before any is written; then all are written or none.
    check_targets({"--markdown": args.markdown, "--html": args.html}, [args.file])
    claim = read_claim(args.file)
    report = run_checks(claim, args.only)
    written = []
    if args.markdown is not None:
        from ..render.markdown import render_markdown

        written.append((args.markdown, render_markdown(report, claim)))
    if args.html is not None:
        from ..render.html import render_html

        written.append((args.html, render_html(report, claim)))
    write_all_atomic(written, [args.file])
    if args.json:
        from ..render.json import render_json

        stdout.write(render_json(report))
    elif args.verdict_only:
        stdout.write(render_verdict_line(report))
    else:
        stdout.write(render_text(report))
    return report.exit_status
