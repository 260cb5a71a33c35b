"""``bounds``: every printed value lies in the range it can physically take.

A proportion outside [0, 1] or a p-value of 0 is impossible; a cross-entropy
fidelity estimate above 1 is possible through sampling noise, so it fails only
when it sits more than three standard errors above 1.
"""

from __future__ import annotations

from typing import Iterator

from ..claim.model import Claim, Reported
from ..report import Finding, Shown
from ..wording import num
from .common import fewer_samples_than_circuits, is_probability, metric_of, printed_zero
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement


def _on(rep: Reported, statement: str) -> dict:
    return {"field": rep.path, "statement": statement, "printed": Shown.of(rep), "reported": rep.value}

NOISE_ALLOWANCE = 3.0  # standard errors a noisy fidelity estimate may exceed 1 by


def _estimate_findings(claim: Claim, value: Reported, error: Reported | None,
                       what: str, details: dict) -> Iterator[Finding]:
    model = metric_of(claim)
    if value.high < model.lowest or value.low > model.highest:
        side, limit = ("above", model.highest) if value.low > model.highest else ("below", model.lowest)
        if model.hard_bounds or (side == "below" and model.hard_lowest):
            yield Finding("fail", f"{what} {value.text} lies {side} {num(limit)}, which "
                          f"{model.noun} cannot do{_percent_hint(value, model) or '.'}",
                          details={**details, "field": value.path, "limit": limit}, **_on(value, "estimate_range"))
            return
        excess = (value.low - model.highest) if side == "above" else (model.lowest - value.high)
        if error is not None and error.value > 0 and excess <= NOISE_ALLOWANCE * error.high:
            yield Finding("warn", f"{what} {value.text} lies {side} {num(limit)}, the "
                          f"{'most' if side == 'above' else 'least'} {model.noun} can be, by "
                          f"{num(excess / error.high, 2)} standard errors: "
                          "possible through noise, worth a word from the authors.",
                          details={**details, "field": value.path, "limit": limit}, **_on(value, "estimate_range"))
        elif error is None or not error.value > 0:
            # Without a standard error, noise cannot be told from an impossible value.
            yield Finding("warn", f"{what} {value.text} lies {side} {num(limit)}, the "
                          f"{'most' if side == 'above' else 'least'} {model.noun} can be, and no "
                          "standard error is printed to tell sampling noise from an impossible value.",
                          details={**details, "field": value.path, "limit": limit}, **_on(value, "estimate_range"))
        else:
            yield Finding("fail", f"{what} {value.text} lies {side} {num(limit)}, the "
                          f"{'most' if side == 'above' else 'least'} {model.noun} can be, by more "
                          f"than {NOISE_ALLOWANCE:g} standard errors.",
                          details={**details, "field": value.path, "limit": limit}, **_on(value, "estimate_range"))


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
                      details={**(details or {}), "field": rep.path}, **_on(rep, "error_sign"))


def _samples_and_circuits(samples: Reported | None, circuits: Reported | None, what: str,
                          details: dict) -> Iterator[Finding]:
    if not fewer_samples_than_circuits(samples, circuits):
        return
    per = samples.value * circuits.value
    yield Finding("fail", f"{what} {samples.text} samples but {circuits.text} circuits, and every "
                  f"circuit needs at least one sample: is {samples.text} the samples per circuit "
                  f"({num(per, 2)} in all), or are the two counts swapped?",
                  details={**details, "field": samples.path, "circuits": circuits.value,
                           "samples_if_per_circuit": per},
                  **_on(samples, "samples_below_circuits"))


def check(claim: Claim) -> Iterator[Finding]:
    checked = 0
    found: list[Finding] = []
    model = metric_of(claim)

    def collect(gen):
        nonlocal checked
        checked += 1
        found.extend(gen)

    if claim.estimate is not None:
        collect(_estimate_findings(claim, claim.estimate, claim.stat_error, "The estimate", {}))
    collect(_positive(claim.stat_error, "The statistical error"))
    # A relation between two counts, not a value of its own: not counted among the values checked.
    found.extend(_samples_and_circuits(claim.samples, claim.circuits, "The claim gives", {}))
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
                                 details={"field": t.path}, **_on(t, "threshold_range")))
    p = claim.significance.p_value
    if p is not None:
        checked += 1
        if printed_zero(p):
            # The unit of the last printed digit: "0.000" stands for [0, 0.0005), one unit 0.001.
            unit = 2 * p.high
            meant = (f"most likely it meant p below the last printed digit, p < {num(unit)}" if unit < 1
                     else "most likely it meant a p too small to print, to be written as a bound (p < ...)")
            found.append(Finding("warn", f"The p-value is printed as {p.text}; a p of exactly 0 is impossible: "
                                 f"{meant}.", details={"field": p.path, "last_digit": unit},
                                 **_on(p, "p_zero")))
        elif not is_probability(p):
            found.append(Finding("fail", f"The p-value is printed as {p.text}; a p-value lies in (0, 1] "
                                 "(print a bound such as p < 1e-300 for one too small to write).",
                                 details={"field": p.path}, **_on(p, "p_range")))
    if claim.interval is not None:
        iv = claim.interval
        checked += 1
        if iv.low.value > iv.high.value:
            found.append(Finding("fail", f"The interval runs from {iv.low.text} down to {iv.high.text}: "
                                 "its low end is above its high end.", details={"field": "interval"},
                                 field="interval", statement="interval_order",
                                 printed=Shown(f"[{iv.low.text}, {iv.high.text}]", iv.low.low, iv.high.high)))
        elif claim.estimate is not None and not iv.low.low <= claim.estimate.value <= iv.high.high:
            found.append(Finding("fail", f"The estimate {claim.estimate.text} lies outside its own "
                                 f"interval [{iv.low.text}, {iv.high.text}].", details={"field": "interval"},
                                 **_on(claim.estimate, "outside_interval")))
    for part in claim.parts:
        details = {"part": part.label}
        collect(_estimate_findings(claim, part.estimate, part.stat_error,
                                   f"Part {part.label}: the estimate", details))
        collect(_positive(part.stat_error, f"Part {part.label}: the statistical error", details=details))
        found.extend(_samples_and_circuits(part.samples, part.circuits, f"Part {part.label} gives", details))
    for item in claim.error_budget:
        checked += 1
        if not 0.0 <= item.error.value <= 1.0:
            found.append(Finding("fail", f"Error-budget component {item.name!r} has an error of "
                                 f"{item.error.text} per occurrence; an error rate lies in [0, 1].",
                                 details={"component": item.name}, **_on(item.error, "rate_range")))
        collect(_positive(item.error_sd, f"Error-budget component {item.name!r}: the error's uncertainty",
                          allow_zero=True, details={"component": item.name}))
    if claim.extrapolation is not None:
        f = claim.extrapolation.factor
        checked += 1
        if f.value <= 0:
            found.append(Finding("fail", f"The extrapolation factor is printed as {f.text}; a scale "
                                 "factor must be more than zero.",
                                 details={"field": f.path}, **_on(f, "factor_sign")))
        collect(_positive(claim.extrapolation.factor_error, "The extrapolation factor's error",
                          allow_zero=True))
    yield from found
    if not found:  # a warned value does not lie in its range: no "all values" sentence then
        yield Finding("pass", f"All {checked} printed values checked lie in their physical ranges.",
                      details={"values_checked": checked}, statement="all_in_range")


_RANGE = Statement(question=("Could the authors confirm {what}? As printed it lies outside the range the "
                             "quantity can take; is it a typo, or a different quantity from the one named?"))

SPEC = CheckSpec(
    id="bounds",
    title="Physical range",
    run=check,
    statements={
        "estimate_range": _RANGE,
        "error_sign": _RANGE,
        "threshold_range": _RANGE,
        "p_range": _RANGE,
        "p_zero": Statement(question=("Could the authors print {what} as a bound (p < ...)? A p-value of "
                                      "exactly zero is impossible.")),
        "interval_order": Statement(question=("Could the authors confirm the interval's ends? As printed "
                                              "the low end lies above the high end.")),
        "outside_interval": Statement(question=("Could the authors confirm {what}? As printed it lies "
                                                "outside its own interval.")),
        "rate_range": _RANGE,
        "samples_below_circuits": Statement(question=(
            "Could the authors confirm {what}? As printed there are fewer samples than circuits, so "
            "some circuits were never sampled; is it the number of samples per circuit?")),
        "factor_sign": _RANGE,
        "all_in_range": ABOUT_THE_CLAIM,
    },
)
