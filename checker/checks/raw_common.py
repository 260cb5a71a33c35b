"""What the raw-data checks share: which printed numbers the raw data are held
against, and the fields every comparison finding carries.

The raw-data checks (``raw_estimate``, ``raw_error``, ``raw_samples``,
``raw_circuits``, ``raw_model``, ``raw_rerun``) run on a claim and the
:class:`~checker.raw.result.RawResult` of its data file; they are registered in
``RAW_SPECS`` beside the claim checks (:mod:`checker.checks`).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Iterator

from ..claim.model import Claim, Reported
from ..report import Finding, Shown, Span
from ..stats.precision import agrees


@dataclass(frozen=True)
class Target:
    """The printed estimate and error the raw estimate is compared with.

    ``factor`` holds the bounds the raw estimate is multiplied by first (the
    extrapolation factor when the headline is extrapolated from the measured
    value, else 1); ``what`` names the printed estimate in the messages."""

    estimate: Reported | None
    stat_error: Reported | None
    factor: tuple[float, float]
    what: str


def target(claim: Claim) -> Target:
    """What the raw data are held against: the printed combined value when the
    headline is extrapolated from it, the headline over the factor when no
    combined value is printed, else the headline itself."""
    comb = claim.combination
    if claim.extrapolation is not None and comb is not None and comb.estimate is not None:
        return Target(comb.estimate, comb.stat_error, (1.0, 1.0), "combined estimate")
    if claim.extrapolation is not None:
        return Target(claim.estimate, claim.stat_error, claim.extrapolation.factor.bounds,
                      "headline (raw x factor)")
    return Target(claim.estimate, claim.stat_error, (1.0, 1.0), "estimate")


def about(printed: Reported, statement: str, low: float, high: float, tol: float) -> dict:
    """The keyword arguments naming the printed number a finding is about."""
    return {"field": printed.path, "statement": statement, "printed": Shown.of(printed),
            "recomputed_range": Span(low, high), "tolerance": tol}


def count_findings(printed: Reported | None, actual: int, name: str, tol: float, have: bool) -> Iterator[Finding]:
    """A printed count (samples or circuits) against the count in the data;
    ``have`` is False when the data cannot give it (no circuit column)."""
    if printed is None:
        yield Finding("skip", f"No {name} count is printed to compare with the data.", statement="not_printed")
        return
    if not have:
        yield Finding("skip", f"The data file has no circuit column, so the printed {printed.text} {name} "
                      "cannot be counted.", field=printed.path, statement="not_counted",
                      printed=Shown.of(printed), reported=printed.value)
        return
    details = {"printed_low": printed.low, "printed_high": printed.high, "tolerance": tol}
    facts = about(printed, name, float(actual), float(actual), tol)
    if agrees(printed.bounds, (actual, actual), tol):
        yield Finding("pass", f"Printed {printed.text} {name}; the data hold {actual:,}.",
                      reported=printed.value, recomputed=float(actual), details=details, **facts)
    else:
        yield Finding("fail", f"Printed {printed.text} {name}, but the data hold {actual:,}.",
                      reported=printed.value, recomputed=float(actual), details=details, **facts)
