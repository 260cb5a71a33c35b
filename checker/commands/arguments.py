"""Option parsers the subcommands share: each turns bad text into one argparse
message that says what is allowed."""

from __future__ import annotations

import argparse
import math
import re


def finite(text: str) -> float:
    try:
        x = float(text)
    except ValueError:
        x = math.nan
    if not math.isfinite(x):
        raise argparse.ArgumentTypeError(f"must be a finite number, got {text!r}")
    return x


def value(text: str) -> float:
    """A finite number that may be written as a percentage, as in claim files
    (``80%`` is 0.8) or an exact fraction (``2/3``), for options whose value is a fraction, a fidelity or a
    level; significances in sigma and counts use ``finite`` and ``whole``."""
    stripped = text.strip()
    if re.fullmatch(r"[+-]?[0-9]+/[1-9][0-9]*", stripped):  # an exact fraction, as in claim files: 2/3
        from fractions import Fraction  # here, not at the top: `claimcheck --help` stays light

        return float(Fraction(stripped))
    if stripped.endswith("%"):
        try:
            x = float(stripped[:-1]) / 100.0
        except ValueError:
            x = math.nan
        if not math.isfinite(x):
            raise argparse.ArgumentTypeError(f"must be a finite number or percentage, got {text!r}")
        return x
    return finite(text)


def whole(low: int, what: str, most: int | None = None):
    """A parser for whole numbers of at least ``low`` (and at most ``most``;
    ``2.5e7`` is accepted); ``what`` names the value in messages (argparse
    already names the option)."""
    name = f"{what} " if what else ""

    def parse(text: str) -> int:
        try:
            x = float(text)
        except ValueError:
            x = math.nan
        if not (math.isfinite(x) and x == math.floor(x)):
            raise argparse.ArgumentTypeError(f"{name}must be a whole number, got {text!r}")
        if x < low:
            raise argparse.ArgumentTypeError(f"{name}must be at least {low}, got {text}")
        if most is not None and x > most:
            raise argparse.ArgumentTypeError(f"{name}must be at most {most:,}, got {text}")
        return int(x)
    return parse


def level(text: str) -> float:
    x = value(text)
    if not 0.0 < x < 1.0:
        raise argparse.ArgumentTypeError(f"level must lie between 0 and 1, got {text}")
    return x


class OldName(argparse.Action):
    """An option's first name, kept working as a deprecated alias: it stores
    its value where the new name does, stays out of ``--help``, and leaves in
    ``namespace.old_names`` the one line the command prints on stderr."""

    def __init__(self, option_strings, dest, new_name: str = "", why: str = "", **kwargs):
        kwargs.setdefault("help", argparse.SUPPRESS)
        super().__init__(option_strings, dest, **kwargs)
        self.new_name, self.why = new_name, why

    def __call__(self, parser, namespace, values, option_string=None):
        setattr(namespace, self.dest, values)
        notes = list(getattr(namespace, "old_names", None) or [])
        notes.append(f"{parser.prog}: {option_string} is deprecated; use {self.new_name}"
                     + (f" ({self.why})" if self.why else "") + "; the old name will be removed")
        setattr(namespace, "old_names", notes)


def print_old_names(args, stderr) -> None:
    """The one line for each deprecated option name used (see :class:`OldName`)."""
    for line in dict.fromkeys(getattr(args, "old_names", None) or []):
        stderr.write(line + "\n")
