"""``error-budget``: does the listed component error model account for the
measured value?

The prediction prod (1 - e_i)^n_i (with the exponential approximation beside
it) is evaluated over the printed precision of every error rate and count;
with ``error_sd`` its uncertainty is propagated.  The measured value is the
headline estimate, with its statistical and systematic errors in quadrature.
A budget is a model, not a measurement, so a mismatch is a ``warn``: when the
two differ by more than a factor of 2, or by more than their combined
uncertainty.
"""

from __future__ import annotations

import math
from typing import Iterator

from ..claim.model import Claim
from ..report import Finding, Shown, Span
from .no_estimate import no_estimate
from ..stats.budget import predict
from ..stats.precision import gap
from ..wording import like, num
from .significance import statistical_error
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

FACTOR = 2.0


def check(claim: Claim) -> Iterator[Finding]:
    items = claim.error_budget
    if not items:
        yield Finding("skip", "No error budget is given.", details={"missing": ["error_budget"]},
                      statement="needs_inputs")
        return
    if claim.estimate is None:
        yield no_estimate(claim, "the measured value against the budget")
        return
    if any(not 0.0 <= it.error.value <= 1.0 for it in items):
        yield Finding("skip", "An error rate lies outside [0, 1] (see bounds), so the budget predicts "
                      "nothing.", details={"missing": []}, statement="needs_inputs")
        return
    tol = claim.tolerance
    errors = [it.error.value for it in items]
    counts = [it.count.value for it in items]
    # A negative uncertainty is the bounds check's to flag; here it counts as none.
    sds = [it.error_sd.value if it.error_sd is not None and it.error_sd.value >= 0 else None for it in items]
    at = predict(errors, counts, sds)
    # The product falls as any error rate or count grows: its range over the
    # printed precision is at the two far corners.
    clip = lambda e: min(max(e, 0.0), 1.0)  # noqa: E731
    low = predict([clip(it.error.high) for it in items], [it.count.high for it in items]).predicted
    high = predict([clip(it.error.low) for it in items], [it.count.low for it in items]).predicted
    measured = claim.estimate
    stat, _ = statistical_error(claim)
    stat_mid = (stat[0] + stat[1]) / 2 if stat is not None else 0.0
    syst = claim.syst_error.value if claim.syst_error is not None else 0.0
    measured_sd = math.hypot(stat_mid, syst)
    predicted_sd = at.predicted_sd or 0.0
    combined_sd = math.hypot(measured_sd, predicted_sd)
    ratio = measured.value / at.predicted if at.predicted > 0 else None
    ratio_low = measured.low / high if high > 0 else math.inf
    ratio_high = measured.high / low if low > 0 else math.inf
    details = {
        "components": [{"name": it.name, "count": it.count.value, "error": it.error.value,
                        "survival": s} for it, s in zip(items, at.survivals)],
        "predicted": at.predicted, "predicted_low": low, "predicted_high": high,
        "predicted_sd": at.predicted_sd, "predicted_exponential": at.predicted_exponential,
        "measured": measured.value, "measured_sd": measured_sd or None, "ratio": ratio,
        "combined_sd": combined_sd or None, "tolerance": tol,
    }
    about = {"field": measured.path, "statement": "budget", "printed": Shown.of(measured),
             "recomputed_range": Span(low, high), "tolerance": tol}
    pred_text = like(at.predicted, measured)
    sd_text = f" ± {like(at.predicted_sd, measured)}" if at.predicted_sd else ""
    head = (f"The error budget of {len(items)} component{'s' if len(items) != 1 else ''} predicts "
            f"{pred_text}{sd_text} (exponential approximation {like(at.predicted_exponential, measured)})")
    times = f"{num(ratio, 2)} times" if ratio is not None else "not comparable with"
    distance = gap(measured.bounds, (low, high))
    if ratio_low > FACTOR * (1 + tol) or ratio_high * FACTOR * (1 + tol) < 1:
        side = "above" if ratio_low > 1 else "below"
        yield Finding("warn", f"{head}; the measured {measured.text} is {times} that, more than a factor of "
                      f"{FACTOR:g} {side} it: the listed errors do not account for the result.",
                      reported=measured.value, recomputed=at.predicted, details=details, **about)
    elif combined_sd > 0 and distance > combined_sd * (1 + tol):
        yield Finding("warn", f"{head}; the measured {measured.text} is {times} that, and the two differ by "
                      f"{like(distance, measured)}, more than their combined uncertainty "
                      f"{like(combined_sd, measured)}.", reported=measured.value, recomputed=at.predicted,
                      details=details, **about)
    else:
        within = (f", within their combined uncertainty {like(combined_sd, measured)}" if combined_sd > 0
                  else ", within a factor of 2")
        yield Finding("pass", f"{head}; the measured {measured.text} is {times} that{within}.",
                      reported=measured.value, recomputed=at.predicted, details=details, **about)


def implied(finding: Finding) -> str | None:
    """The predicted value with its uncertainty, and the ratio measured / predicted."""
    d = finding.details
    if not _is_number(d.get("predicted")):
        return None
    printed = finding.printed.text if finding.printed is not None else None
    text = f"predicted {like(d['predicted'], printed)}"
    if _is_number(d.get("predicted_sd")):
        text += f" ± {like(d['predicted_sd'], printed)}"
    if _is_number(d.get("ratio")):
        text += f" (measured / predicted = {num(d['ratio'], 2)})"
    return text


def _is_number(x) -> bool:
    return isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x)


SPEC = CheckSpec(
    id="error-budget",
    title="Error budget against the measured value",
    run=check,
    statements={
        "budget": Statement(
            question=("The component error model and the measured value differ by more than a factor of 2, "
                      "or by more than their combined uncertainty. What accounts for the difference: missing "
                      "error sources, correlated errors, or a different model?")),
        "needs_inputs": ABOUT_THE_CLAIM,
        "no_estimate": ABOUT_THE_CLAIM,
    },
    implied=implied,
)
