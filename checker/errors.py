"""The documented exceptions: raised only when an input cannot be used at all.

An inconsistent claim is not an error: it yields findings.  These exceptions
mean the file, a field or a data table could not be read, and each renders as
one line, ``FILE: field.path (line N): what is wrong; what is allowed``.
"""

from __future__ import annotations

from .visible import visible


class ClaimcheckError(Exception):
    """Base of every error that means "this input cannot be used".

    Parameters
    ----------
    file : str
        The file (or table row) the problem is in.
    problem : str
        What is wrong, in plain words.
    allowed : str, optional
        What would be accepted instead.
    path : str, optional
        Dotted field path (``significance.sigma``, ``parts.2.estimate``).
    line : int, optional
        1-based line number in the file, when known.
    """

    def __init__(self, file: str, problem: str, allowed: str = "", path: str = "",
                 line: int | None = None):
        self.file = str(file)
        self.problem = problem
        self.allowed = allowed
        self.path = path
        self.line = line
        super().__init__(self.one_line())

    def one_line(self) -> str:
        where = self.file
        if self.path:
            where += f": {self.path}"
        if self.line is not None:
            where += f" (line {self.line})"
        text = f"{where}: {self.problem}"
        if self.allowed:
            text += f"; {self.allowed}"
        # One line, whatever the user's text held, with its control characters shown.
        return " ".join(visible(text).split())


class InputFileError(ClaimcheckError):
    """The file is missing, unreadable, too large, not text, or not YAML/JSON."""


class ClaimSchemaError(ClaimcheckError):
    """The document parsed but a field is missing, misspelt or of the wrong kind."""


class DataError(ClaimcheckError):
    """A raw data table (or a batch row) cannot be used."""


class OutputError(ClaimcheckError):
    """A report cannot be written where asked (for example over an input file)."""
