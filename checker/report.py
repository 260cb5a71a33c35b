"""Findings and the report that collects them.

A Finding is data: the check that made it, a status, one plain sentence, the
value as printed, the value recomputed, and, when the print is off, the
convention or method under which it would agree.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from dataclasses import field as _field
from types import MappingProxyType
from typing import Any, Mapping

from .vocabulary import COUNT_WORDS

STATUSES = ("pass", "warn", "fail", "skip", "info")
# What a status counts as: "info" is a value recomputed with nothing printed to compare it
# with, so it neither agrees nor disagrees and, like "skip", checks no printed number.
NOT_COMPARED = frozenset({"skip", "info"})
SCALES = ("linear", "log10")


def _frozen(mapping: Mapping[str, Any] | None) -> Mapping[str, Any]:
    return MappingProxyType(dict(mapping or {}))


@dataclass(frozen=True)
class Shown:
    """A printed number as a finding quotes it: the text and the interval its
    digits stand for, with base-10 logs of the ends for numbers (p-values) that
    may lie below the double range.

    Attributes
    ----------
    text : str
        As printed ("2.24e-3", "< 0.001", "91.2%").
    low, high : float
        The interval the printed digits stand for.
    log10_low, log10_high : float or None
        log10 of the ends, exact where the values underflow; None where an end
        is zero or negative.
    log10_value : float or None
        log10 of the printed value itself, read from its text, so that a
        printed ``1e-400`` (whose value underflows to 0) keeps its size; None
        for a value that is not above zero.
    one_sigma : float or None
        For an error printed at another level (the claim's ``error_level``,
        such as a 95% half-width): the one standard error it stands for, which
        the checks compared; None for a number printed at one sigma.  ``text``,
        ``low`` and ``high`` are then those of the print itself.
    error_level : str or None
        What such an error stands for, in words ("95% half-width", "2-sigma bar").
    """

    text: str
    low: float
    high: float
    log10_low: float | None = None
    log10_high: float | None = None
    log10_value: float | None = None
    one_sigma: float | None = None
    error_level: str | None = None

    @classmethod
    def of(cls, rep: Any) -> "Shown | None":
        """From a claim's Reported value (anything with text, low, high and
        natural-log bounds ``log_low``/``log_high``); None for None.  A
        Reported error at another level (``level`` and ``as_printed`` set) is
        shown as printed, with its one standard error beside it."""
        if rep is None:
            return None
        log_low, log_high = getattr(rep, "log_low", math.nan), getattr(rep, "log_high", math.nan)
        level = getattr(rep, "level", None)
        if level is None or getattr(rep, "as_printed", None) is None:
            return cls(rep.text, rep.low, rep.high, _log10(log_low), _log10(log_high),
                       log10_of_printed(rep.text, rep.value))
        k, shift = level.multiple, math.log(level.multiple)
        return cls(rep.as_printed, rep.low * k, rep.high * k, _log10(log_low + shift), _log10(log_high + shift),
                   log10_of_printed(rep.as_printed, rep.value * k), one_sigma=rep.value, error_level=level.words)

    @property
    def quoted(self) -> str:
        """The text a reader is shown: the print, and for an error at another
        level its one standard error too ("0.4e-3 (95% half-width: 0.204e-3 at
        one sigma)"), as the checks' messages quote it."""
        if self.one_sigma is None or self.error_level is None:
            return self.text
        from .wording import at_one_sigma

        return at_one_sigma(self.text, self.error_level, self.one_sigma)


@dataclass(frozen=True)
class Span:
    """A recomputed range: ``low`` to ``high`` on a ``linear`` scale, or on a
    ``log10`` scale (the ends are then base-10 logs, as for p-values)."""

    low: float
    high: float
    scale: str = "linear"

    def __post_init__(self) -> None:
        if self.scale not in SCALES:
            raise ValueError(f"scale must be one of {SCALES}, got {self.scale!r}")


def log10_of_printed(text: str, value: float) -> float | None:
    """log10 of a printed value: from its decimal text where the value underflows
    (``"1e-400"`` -> -400.0; ``"< 1e-400"`` reads the bound), else from the value;
    None for a value that is not above zero or a text that is not a number."""
    if isinstance(value, (int, float)) and math.isfinite(value) and value > 0:
        return math.log10(value)
    if value != 0:
        return None
    from .stats.precision import is_number_text, parse_printed

    body = text.strip().lstrip("<≤").strip() if isinstance(text, str) else ""
    if not is_number_text(body):
        return None
    try:
        log_value = parse_printed(body, exact=True).log_low
    except ValueError:
        return None
    return _log10(log_value)


def _log10(natural_log: float) -> float | None:
    if natural_log is None or not math.isfinite(natural_log):
        return None
    return natural_log / LN10


LN10 = math.log(10.0)


@dataclass(frozen=True)
class Finding:
    """One statement about one number of a claim.

    Parameters
    ----------
    status : str
        ``pass``, ``warn``, ``fail``, ``skip`` or ``info`` (for information: a value
        recomputed where nothing was printed to compare it with).
    message : str
        One sentence: what was printed, what the inputs imply, and what would
        reproduce the print.
    reported, recomputed : float or None
        The printed value and the value re-derived from the claim's inputs.
    reproduced_by : mapping or None
        The convention or method under which the printed value agrees.
    details : mapping
        Everything else worth keeping (the part's label, intermediate values).
    check : str
        The check id; the runner fills it in.
    field : str or None
        Dotted claim path of the printed number the finding is about
        (``combination.stat_error``, ``parts.2.estimate``); None for a finding
        about the claim as a whole.
    statement : str
        A stable id of the statement within its check (``sigma_vs_p``,
        ``sigma_vs_inputs``, ``required_sigma``).
    printed : Shown or None
        The printed number the finding is about, with its interval.
    recomputed_range : Span or None
        What the claim's inputs imply for it, over the box of printed precision.
    tolerance : float or None
        The relative slack used in the comparison.
    """

    status: str
    message: str
    reported: float | None = None
    recomputed: float | None = None
    reproduced_by: Mapping[str, Any] | None = None
    details: Mapping[str, Any] = _field(default_factory=dict)
    check: str = ""
    field: str | None = None
    statement: str = ""
    printed: Shown | None = None
    recomputed_range: Span | None = None
    tolerance: float | None = None

    def __post_init__(self) -> None:
        if self.status not in STATUSES:
            raise ValueError(f"status must be one of {STATUSES}, got {self.status!r}")
        object.__setattr__(self, "details", _frozen(self.details))
        if self.reproduced_by is not None:
            object.__setattr__(self, "reproduced_by", _frozen(self.reproduced_by))

    def from_check(self, check: str) -> "Finding":
        # A field-for-field copy with the check id set: what dataclasses.replace
        # gives (the values are already validated and frozen), at a fraction of
        # its cost, which a batch of 100,000 claims pays eight times per claim.
        new = object.__new__(type(self))
        new.__dict__.update(self.__dict__)
        object.__setattr__(new, "check", check)
        return new


@dataclass(frozen=True)
class Report:
    """All findings for one claim, with the verdict they add up to."""

    title: str
    file: str
    findings: tuple[Finding, ...]

    @property
    def verdict(self) -> str:
        """``inconsistent`` if any check failed, ``incomplete`` if nothing could
        be checked, otherwise ``consistent``."""
        statuses = {f.status for f in self.findings}
        if "fail" in statuses:
            return "inconsistent"
        if not statuses - NOT_COMPARED:
            return "incomplete"
        return "consistent"

    @property
    def exit_status(self) -> int:
        return 1 if self.verdict == "inconsistent" else 0

    def counts(self) -> dict[str, int]:
        return {s: sum(f.status == s for f in self.findings) for s in STATUSES}

    def failed_checks(self) -> tuple[str, ...]:
        seen: dict[str, None] = {}
        for f in self.findings:
            if f.status == "fail":
                seen.setdefault(f.check, None)
        return tuple(seen)

    def to_frame(self):
        """The findings as a pandas DataFrame, one row per finding."""
        import pandas as pd  # heavy: only when asked for

        rows = [
            {"check": f.check, "status": f.status, "message": f.message,
             "reported": f.reported, "recomputed": f.recomputed,
             "reproduced_by": dict(f.reproduced_by) if f.reproduced_by else None,
             **{f"details.{k}": v for k, v in f.details.items()}}
            for f in self.findings
        ]
        return pd.DataFrame(rows)

    def __str__(self) -> str:
        """The verdict in one line ("Title: inconsistent (1 flagged, 0 noted, 5 agree, 0 not
        checked)"); the terminal report itself is ``checker.render.text.render_text``, which
        this layer does not import."""
        c = self.counts()
        tally = ", ".join(f"{c[s]} {COUNT_WORDS[s]}" for s in tally_statuses(c))
        return f"{self.title}: {self.verdict} ({tally})"


def tally_statuses(counts: Mapping[str, int]) -> tuple[str, ...]:
    """The statuses a one-line tally lists, in its order: flagged, noted, agree,
    for information (only when there is any), not checked."""
    return ("fail", "warn", "pass") + (("info",) if counts.get("info") else ()) + ("skip",)
