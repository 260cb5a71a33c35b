"""``error-floor``: the standard error that sampling alone implies.

With N samples and a per-sample variance v from the metric model, no honest
analysis can print a statistical error below sqrt(v / N).  One far above it
(more than 3x) is not impossible (drifts, circuit-to-circuit spread, a
conservative analysis) but deserves a sentence in the paper.
"""

from __future__ import annotations

import math
from typing import Iterator

from ..claim.model import Claim, Reported
from ..report import Finding
from ..stats.precision import over_box
from .common import count_for_error, metric_of, model_inputs, num, num_range

WARN_RATIO = 3.0


def _floor(claim: Claim, estimate: Reported, n: Reported, factor: tuple[float, float]):
    model = metric_of(claim)
    sd_box = claim.sd.bounds if claim.sd is not None else (None, None)

    def se(value, count, sd, scale):
        inputs = model_inputs(claim, sd=sd)
        s = model.standard_error(value / scale, count, inputs)
        return None if s is None else s * scale

    return over_box(se, [estimate.bounds, n.bounds, sd_box, factor])


def _one(claim: Claim, estimate: Reported, error: Reported | None, n: Reported | None,
         factor: tuple[float, float], what: str, details: dict) -> Iterator[Finding]:
    model = metric_of(claim)
    if error is None or n is None:
        missing = (["stat_error"] if error is None else []) + ([model.count_field] if n is None else [])
        yield Finding("skip", f"{what}: no floor to compare with; needs {' and '.join(missing)}.",
                      details={**details, "missing": missing})
        return
    missing = [f for f in model.needs() if getattr(claim, f) is None]
    if missing:
        yield Finding("skip", f"{what}: the {model.name} model needs {', '.join(missing)}.",
                      details={**details, "missing": missing})
        return
    low, high = _floor(claim, estimate, n, factor)
    if not math.isfinite(low):
        yield Finding("skip", f"{what}: the model gives no finite error here.", details=details)
        return
    tol = claim.tolerance
    count_name = "circuits" if n.path.endswith("circuits") else "samples"
    v_mid = model.variance(estimate.value / factor[0], model_inputs(claim))
    implied_n = v_mid * factor[0] ** 2 / error.value ** 2 if error.value > 0 and v_mid else None
    facts = {**details, "floor_low": low, "floor_high": high, "printed_low": error.low,
             "printed_high": error.high, "tolerance": tol, "count_field": count_name}
    ratio = error.value / ((low + high) / 2)
    facts["ratio"] = ratio
    reproduce = {count_name: round(implied_n)} if implied_n else None
    base = (f"{what}: printed stat_error {error.text} against {num_range((low, high))} that "
            f"{n.text} {count_name} allow under the {model.name} model")
    if error.high * (1 + tol) < low:
        yield Finding("fail", f"{base}: smaller than sampling alone permits "
                      f"({num(ratio, 2)}x); it would take about {num(implied_n, 2)} {count_name}.",
                      reported=error.value, recomputed=(low + high) / 2, reproduced_by=reproduce,
                      details=facts)
    elif error.low > WARN_RATIO * high * (1 + tol):
        yield Finding("warn", f"{base}: {num(ratio, 2)}x the sampling floor, which suggests extra "
                      "spread (drift, circuit-to-circuit variation) the claim does not describe.",
                      reported=error.value, recomputed=(low + high) / 2, reproduced_by=reproduce,
                      details=facts)
    else:
        yield Finding("pass", f"{base}: consistent ({num(ratio, 2)}x the floor).",
                      reported=error.value, recomputed=(low + high) / 2, details=facts)


def check(claim: Claim) -> Iterator[Finding]:
    factor = (1.0, 1.0)
    if claim.extrapolation is not None and claim.extrapolation.factor.value > 0:
        # The headline is the measured value times the factor; so is its error.
        factor = claim.extrapolation.factor.bounds
    yield from _one(claim, claim.estimate, claim.stat_error, count_for_error(claim), factor,
                    "Headline", {})
    for part in claim.parts:
        if part.stat_error is None:
            continue
        n = part.circuits if (metric_of(claim).count_field == "circuits" and part.circuits) else part.samples
        if n is None:
            continue
        yield from _one(claim, part.estimate, part.stat_error, n, (1.0, 1.0),
                        f"Part {part.label}", {"part": part.label})
