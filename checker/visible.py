"""Text from an input, made safe to show: one function for the terminal,
Markdown, HTML, CSV and JSON alike.  A leaf module: it imports nothing of ours.

A title, a label, a circuit id or a file name can hold anything: an escape
sequence (ESC [ ... that recolours or rewrites a terminal, or sets its title),
a bell, a carriage return that overwrites the line before it, a right-to-left
override that shows text in another order than it is stored, or a lone
surrogate (an undecodable file name) that no encoder accepts.  :func:`visible`
writes each of these as a visible escape (``\\x1b``, ``\\u202e``, ``\\udcff``)
and drops NUL; newlines and tabs stay.  :func:`for_stream` also spells the
few non-ASCII symbols the reports use in ASCII when the stream cannot encode
them (``PYTHONIOENCODING=ascii``, a latin-1 terminal): ``+-`` for the
plus-minus sign, and so on.
"""

from __future__ import annotations

import re

# C0 controls but tab and newline, DEL, C1 controls; the bidirectional
# formatting characters (embeddings, overrides, isolates, marks); lone surrogates.
_UNSAFE = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069\ud800-\udfff]")

# The symbols claimcheck's own wording uses, spelled in ASCII.
ASCII_SPELLINGS = {
    "\u00b1": "+-", "\u00d7": "x", "\u00b7": "*", "\u2212": "-",
    "\u2013": "-", "\u2014": "--", "\u2018": "'", "\u2019": "'", "\u201c": '"', "\u201d": '"',
    "\u2026": "...", "\u2264": "<=", "\u2265": ">=", "\u2248": "~", "\u2260": "!=", "\u221a": "sqrt",
    "\u03a0": "prod", "\u03a3": "sum", "\u03c3": "sigma", "\u03c7": "chi", "\u03c4": "tau", "\u03c0": "pi",
    "\u03b3": "gamma", "\u03bc": "mu", "\u03b1": "alpha", "\u03b5": "epsilon", "\u0394": "Delta",
    "\u2192": "->", "\u2190": "<-", "\u00a0": " ", "\u2009": " ", "\u202f": " ",
}
_SPELLED = re.compile("[" + "".join(ASCII_SPELLINGS) + "]")
# A run of superscripts is an exponent: "10\u207b\u00b3" is spelt "10^-3", "I\u00b2" "I^2".
_SUPERSCRIPTS = "\u207b\u2070\u00b9\u00b2\u00b3\u2074\u2075\u2076\u2077\u2078\u2079"
_SUPERSCRIPT_RUN = re.compile(f"[{_SUPERSCRIPTS}]+")
_FROM_SUPERSCRIPT = str.maketrans(_SUPERSCRIPTS, "-0123456789")


def _escape(match: re.Match) -> str:
    char = match.group()
    if char == "\x00":
        return ""
    code = ord(char)
    return f"\\x{code:02x}" if code < 0x100 else f"\\u{code:04x}"


def visible(text) -> str:
    """``text`` with every control character, bidirectional override and lone
    surrogate written as a visible escape, and NUL removed; newline and tab
    kept.  Applying it twice changes nothing more."""
    text = str(text)
    return _UNSAFE.sub(_escape, text)


def json_safe(text: str) -> str:
    """JSON text with the characters :func:`visible` would escape written as
    JSON ``\\u`` escapes instead (valid JSON that reads back to the same
    strings; they can only stand inside strings)."""
    return _UNSAFE.sub(lambda m: f"\\u{ord(m.group()):04x}", text)


def ascii_spelled(text: str) -> str:
    """The report symbols spelled in ASCII (``+-`` for the plus-minus sign ...)."""
    text = _SUPERSCRIPT_RUN.sub(lambda m: "^" + m.group().translate(_FROM_SUPERSCRIPT), text)
    return _SPELLED.sub(lambda m: ASCII_SPELLINGS[m.group()], text)


def for_stream(text: str, encoding: str | None, escape: bool = True) -> str:
    """``text`` made writable to a stream of ``encoding``: visible (when
    ``escape``), then, if the encoding cannot hold it, spelled in ASCII and
    anything still left over as a backslash escape."""
    if escape:
        text = visible(text)
    if not encoding:
        return text
    try:
        text.encode(encoding)
        return text
    except UnicodeEncodeError:
        pass
    except LookupError:
        return text
    text = ascii_spelled(text)
    return text.encode(encoding, errors="backslashreplace").decode(encoding, errors="replace")


class SafeStream:
    """A text stream wrapper whose ``write`` passes through :func:`for_stream`."""

    def __init__(self, stream, escape: bool = True):
        self.stream = stream
        self.escape = escape
        self.encoding = getattr(stream, "encoding", None)

    def write(self, text: str) -> int:
        return self.stream.write(for_stream(text, self.encoding, self.escape))

    def flush(self) -> None:
        flush = getattr(self.stream, "flush", None)
        if flush:
            flush()

    def isatty(self) -> bool:
        isatty = getattr(self.stream, "isatty", None)
        return bool(isatty and isatty())

    def __getattr__(self, name):
        return getattr(self.stream, name)
