"""``claimcheck schema``: print the claim file's JSON Schema."""

HELP = "print the JSON Schema (draft 2020-12) that claim files follow"


def add_parser(sub) -> None:
    sub.add_parser("schema", help=HELP, description=HELP)


def run(args, stdout, stderr) -> int:
    from ..claim.validate import SCHEMA_PATH

    stdout.write(SCHEMA_PATH.read_text(encoding="utf-8"))
    return 0
