"""``bounds``: every printed value lies in the range it can physically take.

A proportion outside [0, 1] or a p-value of 0 is impossible; a cross-entropy
fidelity estimate above 1 is possible through sampling noise, so it fails only
when it sits more than three standard errors above 1.
"""

from __future__ import annotations

from typing import Iterator

from ..claim.model import Claim, Reported
from ..report import Finding
from .common import is_probability, metric_of, num

NOISE_ALLOWANCE = 3.0  # standard errors a noisy fidelity estimate may exceed 1 by


def _estimate_findings(claim: Claim, value: Reported, error: Reported | None,
                       what: str, details: dict) -> Iterator[Finding]:
    model = metric_of(claim)
    if value.high < model.lowest or value.low > model.highest:
        side, limit = ("above", model.highest) if value.low > model.highest else ("below", model.lowest)
        if model.hard_bounds or (side == "below" and model.hard_lowest):
            yield Finding("fail", f"{what} {value.text} lies {side} {num(limit)}, which "
                          f"{model.noun} cannot do{_percent_hint(value, model) or '.'}", reported=value.value,
                          details={**details, "field": value.path, "limit": limit})
            return
        excess = (value.low - model.highest) if side == "above" else (model.lowest - value.high)
        if error is not None and error.value > 0 and excess <= NOISE_ALLOWANCE * error.high:
            yield Finding("warn", f"{what} {value.text} lies {side} {num(limit)}, the "
                          f"{'most' if side == 'above' else 'least'} {model.noun} can be, by "
                          f"{num(excess / error.high, 2)} standard errors: "
                          "possible through noise, worth a word from the authors.",
                          reported=value.value, details={**details, "field": value.path, "limit": limit})
        elif error is None or not error.value > 0:
            # Without a standard error, noise cannot be told from an impossible value.
            yield Finding("warn", f"{what} {value.text} lies {side} {num(limit)}, the "
                          f"{'most' if side == 'above' else 'least'} {model.noun} can be, and no "
                          "standard error is printed to tell sampling noise from an impossible value.",
                          reported=value.value, details={**details, "field": value.path, "limit": limit})
        else:
            yield Finding("fail", f"{what} {value.text} lies {side} {num(limit)}, the "
                          f"{'most' if side == 'above' else 'least'} {model.noun} can be, by more "
                          f"than {NOISE_ALLOWANCE:g} standard errors.",
                          reported=value.value, details={**details, "field": value.path, "limit": limit})


def _percent_hint(value: Reported, model) -> str:
    """The end of a sentence for a value from 2 to 100 where at most 1 is
    possible: most likely a percentage written without its sign (a 1.02 is
    more likely a value just above 1)."""
    if model.highest == 1 and 2 <= value.value <= 100 and not value.text.rstrip().endswith("%"):
        return f"; {model.noun} is at most 1: did you mean {value.text.strip()}%?"
    return ""


def _positive(rep: Reported | None, what: str, allow_zero: bool = False, details=None) -> Iterator[Finding]:
    if rep is None:
        return
    bad = rep.value < 0 or (rep.value == 0 and not allow_zero)
    if bad:
        need = "zero or more" if allow_zero else "more than zero"
        yield Finding("fail", f"{what} is printed as {rep.text}; an error must be {need}.",
                      reported=rep.value, details={**(details or {}), "field": rep.path})


def check(claim: Claim) -> Iterator[Finding]:
    checked = 0
    found: list[Finding] = []
    model = metric_of(claim)

    def collect(gen):
        nonlocal checked
        checked += 1
        found.extend(gen)

    collect(_estimate_findings(claim, claim.estimate, claim.stat_error, "The estimate", {}))
    collect(_positive(claim.stat_error, "The statistical error"))
    collect(_positive(claim.syst_error, "The systematic error", allow_zero=True))
    if claim.sd is not None:
        collect(_positive(claim.sd, "The per-sample standard deviation"))
    if claim.threshold is not None and model.hard_bounds:
        t = claim.threshold
        checked += 1
        if not model.lowest <= t.value <= model.highest:
            found.append(Finding("fail", f"The threshold {t.text} lies outside [{num(model.lowest)}, "
                                 f"{num(model.highest)}], the range of {model.noun}"
                                 f"{_percent_hint(t, model) or '.'}",
                                 reported=t.value, details={"field": t.path}))
    p = claim.significance.p_value
    if p is not None:
        checked += 1
        if p.value == 0 and p.high > 0:
            found.append(Finding("warn", f"The p-value is printed as {p.text}, which stands for p below "
                                 f"{num(p.high)}; a p-value is never zero, so print it as a bound "
                                 f"(p < {num(p.high)}).", reported=p.value, details={"field": p.path}))
        elif not is_probability(p):
            found.append(Finding("fail", f"The p-value is printed as {p.text}; a p-value lies in (0, 1] "
                                 "(print a bound such as p < 1e-300 for one too small to write).",
                                 reported=p.value, details={"field": p.path}))
    if claim.interval is not None:
        iv = claim.interval
        checked += 1
        if iv.low.value > iv.high.value:
            found.append(Finding("fail", f"The interval runs from {iv.low.text} down to {iv.high.text}: "
                                 "its low end is above its high end.", details={"field": "interval"}))
        elif not iv.low.low <= claim.estimate.value <= iv.high.high:
            found.append(Finding("fail", f"The estimate {claim.estimate.text} lies outside its own "
                                 f"interval [{iv.low.text}, {iv.high.text}].", details={"field": "interval"}))
    for part in claim.parts:
        details = {"part": part.label}
        collect(_estimate_findings(claim, part.estimate, part.stat_error,
                                   f"Part {part.label}: the estimate", details))
        collect(_positive(part.stat_error, f"Part {part.label}: the statistical error", details=details))
    for item in claim.error_budget:
        checked += 1
        if not 0.0 <= item.error.value <= 1.0:
            found.append(Finding("fail", f"Error-budget component {item.name!r} has an error of "
                                 f"{item.error.text} per occurrence; an error rate lies in [0, 1].",
                                 reported=item.error.value, details={"component": item.name}))
        collect(_positive(item.error_sd, f"Error-budget component {item.name!r}: the error's uncertainty",
                          allow_zero=True, details={"component": item.name}))
    if claim.extrapolation is not None:
        f = claim.extrapolation.factor
        checked += 1
        if f.value <= 0:
            found.append(Finding("fail", f"The extrapolation factor is printed as {f.text}; a scale "
                                 "factor must be more than zero.", reported=f.value,
                                 details={"field": f.path}))
        collect(_positive(claim.extrapolation.factor_error, "The extrapolation factor's error",
                          allow_zero=True))
    yield from found
    if not found:  # a warned value does not lie in its range: no "all values" sentence then
        yield Finding("pass", f"All {checked} printed values checked lie in their physical ranges.",
                      details={"values_checked": checked})
