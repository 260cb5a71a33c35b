"""Argument parsing and dispatch only: ``run(argv, stdout, stderr) -> int``.

Exit status: 0 no check failed; 1 a check failed (and nothing else); 2 the input
could not be used (one line on stderr naming the file, the field and what is
wrong); 3 claimcheck itself failed (one line; a bug to report).
"""

from __future__ import annotations

import argparse
import contextlib
import importlib
import re
import sys
import warnings

from .errors import ClaimcheckError
from .visible import SafeStream

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
    "template": "template",
}

DESCRIPTION = ("Re-derive the numbers of a benchmark claim from its own inputs and say, number by "
               "number, which agree. A flag is a question for the authors, not proof of an error.")


class _Parser(argparse.ArgumentParser):
    """argparse that raises instead of exiting, so run() returns a status, and
    that reads ``--threshold -1e-3`` as a value: Python before 3.13 takes a
    token starting with "-" for an option unless it is a plain "-1" or "-0.5"
    (3.13 widened the rule to this one; none of our options looks like a number)."""

    def __init__(self, *args, **kwargs):
        super().__init__(*args, **kwargs)
        self._negative_number_matcher = re.compile(r"^-\.?\d")

    def error(self, message):
        raise _UsageError(message, self)


class _UsageError(Exception):
    def __init__(self, message, parser):
        super().__init__(message)
        self.parser = parser


def build_parser(argv: list[str] | None = None) -> tuple[argparse.ArgumentParser, dict]:
    """The parser, with every command's full options, or (given ``argv``) the
    full options of only the command it names: the others are listed by name
    and help line, so ``claimcheck --help`` and ``claimcheck schema`` import
    neither the checks nor numpy (benchmarks/startup.py measures it)."""
    from . import __version__

    chosen = argv[0] if argv and argv[0] in COMMANDS else None
    parser = _Parser(prog="claimcheck", description=DESCRIPTION)
    parser.add_argument("--version", action="version", version=f"claimcheck {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    modules = {}
    for name, module_name in COMMANDS.items():
        module = importlib.import_module(f".commands.{module_name}", __package__)
        if argv is None or name == chosen:
            module.add_parser(sub)
        else:
            sub.add_parser(name, help=module.HELP, description=module.HELP)
        modules[name] = module
    return parser, modules


def run(argv=None, stdout=None, stderr=None) -> int:
    # Every character written is shown safely (control characters escaped) and
    # fits the stream's encoding (ASCII spellings on a non-UTF-8 terminal).
    stdout = SafeStream(stdout if stdout is not None else sys.stdout)
    stderr = SafeStream(stderr if stderr is not None else sys.stderr, escape=False)
    argv = list(sys.argv[1:] if argv is None else argv)
    parser, modules = build_parser(argv)
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
            # overflow on the way to a `skip` finding, statsmodels about a
            # singular matrix, matplotlib about an empty axis; the findings say
            # what matters in words, and stderr carries only claimcheck's lines.
            warnings.simplefilter("ignore")
            return modules[args.command].run(args, stdout, stderr)
    except ClaimcheckError as exc:
        stderr.write(exc.one_line() + "\n")
        return 2
    except KeyboardInterrupt:
        stderr.write("claimcheck: interrupted\n")
        return 130
    except BrokenPipeError:
        return 0


# Exit status of the console script when claimcheck itself fails (a bug, or memory
# exhausted): never 1, which means only "something was flagged".
INTERNAL_ERROR = 3


def main() -> None:
    try:
        status = run(sys.argv[1:])
    except MemoryError:
        sys.stderr.write("claimcheck: ran out of memory; the input is beyond what this machine can check "
                         "(see the limits in the README)\n")
        status = INTERNAL_ERROR
    except Exception as exc:  # run() lets a bug surface for tests and the Python API; a shell gets one line
        from .visible import visible

        sys.stderr.write(" ".join(visible(f"claimcheck: internal error ({type(exc).__name__}: {exc}); this is a "
                                          "bug in claimcheck, please report it with the input that caused it")
                                  .split()) + "\n")
        status = INTERNAL_ERROR
    sys.exit(status)


if __name__ == "__main__":
    main()
