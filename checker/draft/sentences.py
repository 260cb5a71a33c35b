"""Sentences of a normalised text, and the quotes a draft shows beside each
field (the words around a number, cut at word boundaries)."""

from __future__ import annotations

import re
from dataclasses import dataclass

from .normalize import printable

QUOTE_LIMIT = 110

_ABBREVIATION = re.compile(
    r"(?:\b(?:e\.g|i\.e|etc|Fig|Figs|Eq|Eqs|Eqn|Ref|Refs|Sec|Secs|Tab|No|approx|vs|cf|al|resp|Suppl|Supp|"
    r"ca|Dr|Prof|Vol|Ch|s\.e\.m|s\.d|s\.e|Tbl)|\b[A-Z])\.$")
_SENTENCE_END = re.compile(r"(?<=[.!?;])\s+(?=[A-Z0-9(\[\"'#*-])|\n+")
_HEADING = re.compile(r"^(?:#{1,6}\s+|title\s*:\s*)(.+)$", re.I)


@dataclass(frozen=True)
class Sentence:
    text: str
    heading: bool
    index: int


def split_sentences(text: str) -> list[Sentence]:
    """Sentences of a normalised text: at ``. `` before a capital or a digit
    (not after an abbreviation such as ``Fig.``), at a semicolon, and at a
    line break; a Markdown heading or ``Title:`` line is a sentence marked as
    a heading."""
    out: list[Sentence] = []
    start = 0
    pieces = []
    for m in _SENTENCE_END.finditer(text):
        piece = text[start:m.start()]
        if "\n" not in m.group() and _ABBREVIATION.search(piece):
            continue
        pieces.append(piece)
        start = m.end()
    pieces.append(text[start:])
    for piece in pieces:
        piece = piece.strip()
        if not piece:
            continue
        heading = _HEADING.match(piece)
        out.append(Sentence(heading.group(1).strip() if heading else piece, bool(heading), len(out)))
    return out


def clip(text: str, start: int, end: int, limit: int = QUOTE_LIMIT) -> str:
    """The words of ``text`` around [start, end), cut at word boundaries."""
    start = max(0, start)
    end = min(len(text), end)
    if end - start > limit:
        start = end - limit  # keep the number, which ends the quote
    while 0 < start < len(text) and text[start].isalnum() and text[start - 1].isalnum():
        start -= 1
    while 0 < end < len(text) and text[end - 1].isalnum() and text[end].isalnum():
        end += 1
    piece = text[start:end].strip(" ,;:#")
    return printable(piece, limit + 20)


def sentence_bounds(text: str, start: int, end: int) -> tuple[int, int]:
    left = max(text.rfind(". ", 0, start), text.rfind("\n", 0, start))
    right_candidates = [p for p in (text.find(". ", end), text.find("\n", end)) if p != -1]
    right = min(right_candidates) if right_candidates else len(text)
    return (left + 1 if left >= 0 else 0), right


def sentence_of(text: str, start: int, end: int) -> str:
    left, right = sentence_bounds(text, start, end)
    return text[left:right]


def text_quote(text: str, start: int, end: int) -> str:
    """The words around a whole-text match, inside its sentence."""
    left, right = sentence_bounds(text, start, end)
    return clip(text, max(left, start - 25), min(right, end + 25))
