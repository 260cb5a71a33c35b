"""Argument parsing and dispatch only: ``run(argv, stdout, stderr) -> int``.

Exit status: 0 no check failed; 1 a check failed; 2 the input could not be
used (one line on stderr naming the file, the field and what is wrong).
"""

from __future__ import annotations

import argparse
import contextlib
import importlib
import sys
import warnings

from .errors import ClaimcheckError

# Subcommand name -> module under checker.commands.
COMMANDS = {
    "check": "check",
    "schema": "schema",
    "batch": "batch",
    "plan": "plan",
    "raw": "raw",
    "simulate": "simulate",
    "drift": "drift",
    "draft": "draft",
}

DESCRIPTION = ("Re-derive the numbers of a benchmark claim from its own inputs and say, number by "
               "number, which agree. A flag is a question for the authors, not proof of an error.")


class _Parser(argparse.ArgumentParser):
    """argparse that raises instead of exiting, so run() returns a status."""

    def error(self, message):
        raise _UsageError(message, self)


class _UsageError(Exception):
    def __init__(self, message, parser):
        super().__init__(message)
        self.parser = parser


def build_parser() -> tuple[argparse.ArgumentParser, dict]:
    parser = _Parser(prog="claimcheck", description=DESCRIPTION)
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    modules = {}
    for name, module_name in COMMANDS.items():
        module = importlib.import_module(f".commands.{module_name}", __package__)
        module.add_parser(sub)
        modules[name] = module
    return parser, modules


def run(argv=None, stdout=None, stderr=None) -> int:
    stdout = stdout if stdout is not None else sys.stdout
    stderr = stderr if stderr is not None else sys.stderr
    argv = list(sys.argv[1:] if argv is None else argv)
    parser, modules = build_parser()
    try:
        # --help and --version print through sys.stdout; send them where run() was told.
        with contextlib.redirect_stdout(stdout):
            args = parser.parse_args(argv)
    except _UsageError as exc:
        stderr.write(f"claimcheck: {exc}; see claimcheck {argv[0] + ' ' if argv and argv[0] in modules else ''}--help\n")
        return 2
    except SystemExit as exc:  # --help
        return int(exc.code or 0)
    if not args.command:
        parser.print_help(stdout)
        return 0
    try:
        with warnings.catch_warnings():
            # Degenerate inputs (errors of 1e-200, say) make numpy warn about
            # overflow on the way to a `skip` finding; the finding says it in words.
            warnings.simplefilter("ignore", RuntimeWarning)
            return modules[args.command].run(args, stdout, stderr)
    except ClaimcheckError as exc:
        stderr.write(exc.one_line() + "\n")
        return 2
    except KeyboardInterrupt:
        stderr.write("claimcheck: interrupted\n")
        return 130
    except BrokenPipeError:
        return 0


def main() -> None:
    sys.exit(run(sys.argv[1:]))


if __name__ == "__main__":
    main()
