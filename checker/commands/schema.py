"""``claimcheck schema``: print the claim file's JSON Schema."""

from pathlib import Path

# The file claim.validate reads (tests/test_imports.py checks they are one); named here so that
# `claimcheck schema` imports neither the claim reader, YAML, jsonschema nor numpy (issue 13).
SCHEMA_FILE = Path(__file__).resolve().parent.parent / "data" / "claim.schema.json"

HELP = "print the JSON Schema (draft 2020-12) that claim files follow"


def add_parser(sub) -> None:
    sub.add_parser("schema", help=HELP, description=HELP)


def run(args, stdout, stderr) -> int:
    stdout.write(SCHEMA_FILE.read_text(encoding="utf-8"))
    return 0
