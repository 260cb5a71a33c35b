"""What a check says about itself: its id, its title, and for each statement
it makes, the question a referee would put to the authors.

Each check module ends with one ``SPEC = CheckSpec(...)``; the registry in
:mod:`checker.checks` lists the specs, and every renderer reads a finding's
words from its check's spec (and from the finding itself), never from a table
of its own.  So adding a check is one file and one registry line.

A question is a template with two fields the renderer fills in:

* ``{what}``: the printed number in words ("the printed p-value 3.6e-9"), or
  "this number" when the finding is about the claim as a whole;
* ``{reproduced}``: the convention or method that reproduces the print, in
  words ("under the two-sided convention (both tails)"); a statement's
  ``if_reproduced`` question is the one used when there is one.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Callable, Iterable, Mapping

from ..report import Finding

WHOLE_CLAIM = "claim"
ONE_NUMBER = "number"


@dataclass(frozen=True)
class Statement:
    """One kind of statement a check makes.

    Attributes
    ----------
    question : str or None
        What to ask the authors when the statement is a flag or a note
        (``{what}`` and ``{reproduced}`` are filled in); None for a statement
        that is never raised (a pass, a skip).
    if_reproduced : str or None
        The question when the finding names a convention that reproduces the
        print; defaults to ``question``.
    about : str
        ``number`` when the finding names the printed number it is about
        (``Finding.field``), ``claim`` when it is about the claim as a whole
        (its ``field`` is then None).
    reproducible : bool
        The statement is about reproducing a printed number, so a flag with no
        ``reproduced_by`` is worth the words "nothing we tried reproduces it".
    """

    question: str | None = None
    if_reproduced: str | None = None
    about: str = ONE_NUMBER
    reproducible: bool = False

    def __post_init__(self) -> None:
        if self.about not in (ONE_NUMBER, WHOLE_CLAIM):
            raise ValueError(f"about must be {ONE_NUMBER!r} or {WHOLE_CLAIM!r}, got {self.about!r}")

    def ask(self, what: str, reproduced: str | None) -> str | None:
        """The question with its blanks filled in; None when there is none."""
        template = (self.if_reproduced or self.question) if reproduced else self.question
        if template is None:
            return None
        return template.format(what=what, reproduced=reproduced or "")


NOT_RAISED = Statement()
ABOUT_THE_CLAIM = Statement(about=WHOLE_CLAIM)


@dataclass(frozen=True)
class SummaryTable:
    """A small table a check makes of its own findings, which the reports show
    under the check's title (the rates printed from a table of counts against
    what the counts give).  Every cell is text."""

    caption: str
    headers: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]


@dataclass(frozen=True)
class CheckSpec:
    """A check: its id, its title, the function that runs it and its statements.

    Attributes
    ----------
    id : str
        The fixed check id (DESIGN.md), stamped on every finding.
    title : str
        The check in plain words, the heading of its points in the reports.
    run : callable
        ``Claim -> Iterable[Finding]``; for a raw-data check (``RAW_SPECS``),
        ``(Claim, RawResult) -> Iterable[Finding]``.
    statements : mapping of str to Statement
        Every statement id the check's findings carry.
    implied : callable, optional
        ``Finding -> str | None``: what the claim's inputs imply, in words,
        for a check whose recomputation is not one number or range (Cochran's
        Q and its companions; a predicted value with its uncertainty).  By
        default the reports write the finding's recomputed range or value.
    summary : callable, optional
        ``findings of this check -> SummaryTable | None``: a table the reports
        show under the check's title.
    """

    id: str
    title: str
    run: Callable[..., Iterable[Finding]]
    statements: Mapping[str, Statement] = field(default_factory=dict)
    implied: Callable[[Finding], str | None] | None = None
    quotes: str = "range"
    summary: Callable[[Iterable[Finding]], "SummaryTable | None"] | None = None

    def __post_init__(self) -> None:
        if self.quotes not in ("range", "value"):
            raise ValueError(f"quotes must be 'range' or 'value', got {self.quotes!r}")
        object.__setattr__(self, "statements", MappingProxyType(dict(self.statements)))

    def statement(self, statement_id: str) -> Statement | None:
        return self.statements.get(statement_id)

    def __call__(self, *inputs) -> Iterable[Finding]:
        return self.run(*inputs)
