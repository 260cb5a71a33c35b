"""What a draft is made of: one :class:`Field` per drafted claim field, the
:class:`Draft` that holds them with its notes, and :class:`DraftError` for a
text that gives nothing to draft."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from ..errors import InputFileError


@dataclass(frozen=True)
class Field:
    """One drafted field.

    Attributes
    ----------
    path : tuple
        ``("estimate",)``, ``("significance", "sigma")``, ``("parts", 2, "samples")``.
    value : Number, str, bool or tuple of Number
    quote : str
        The words it came from (normalised text).
    rule : str
        The rule that placed it (a name in :mod:`.rules`, or ``default-...``,
        ``table``, ``budget``).
    guess : str
        Why this is a guess, when it is one.
    heading : bool
        Read from a heading: body text wins over it.
    computed : bool
        Written out from printed numbers (a proportion printed as k/N): a
        number printed as it is wins over it.
    """

    path: tuple
    value: Any
    quote: str
    rule: str
    guess: str = ""
    heading: bool = False
    order: int = 0
    computed: bool = False


@dataclass(frozen=True)
class Draft:
    """A claim drafted from text, ready to be written as YAML."""

    name: str
    fields: tuple
    also: tuple = ()       # Fields printed again for a path already placed
    unplaced: tuple = ()   # (number text, quote, reason)
    missing: tuple = ()    # (path, why)
    notes: tuple = ()      # lines for the header comment
    dropped: tuple = ()    # (Field, why the loader refused it)
    trace: tuple = ()      # names of the rules that fired

    def get(self, path: tuple) -> Field | None:
        for f in self.fields:
            if f.path == tuple(path):
                return f
        return None

    def has(self, *path) -> bool:
        return self.get(path) is not None

    def under(self, prefix: tuple) -> list[Field]:
        n = len(prefix)
        return [f for f in self.fields if f.path[:n] == tuple(prefix)]


class DraftError(InputFileError):
    """The text cannot give a draft (no number, no estimate, too large)."""
