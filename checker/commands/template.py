"""``claimcheck template --metric M``: print a commented claim skeleton."""

from __future__ import annotations

import argparse

HELP = "print a commented claim skeleton for one metric, to fill in from the paper"


def _metric(text: str) -> str:
    from ..claim.suggest import choice_suggestions
    from ..claim.validate import claim_schema

    metrics = claim_schema()["properties"]["metric"]["enum"]
    if text in metrics:
        return text
    close = choice_suggestions(text, metrics)
    hint = f"did you mean {' or '.join(map(repr, close))}? " if close else ""
    raise argparse.ArgumentTypeError(f"unknown metric {text!r}; {hint}one of {', '.join(metrics)}")


def add_parser(sub) -> None:
    p = sub.add_parser("template", help=HELP,
                       description=HELP + ". The skeleton loads as it stands; every optional field is "
                       "commented out with what it means.")
    p.add_argument("--metric", required=True, type=_metric, metavar="M",
                   help="the claim's metric (linear-xeb, log-xeb, heavy-output, proportion, mean, ...)")


def run(args, stdout, stderr) -> int:
    from ..claim.template import skeleton

    stdout.write(skeleton(args.metric))
    return 0
