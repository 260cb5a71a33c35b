"""What a claim's parts imply when combined, shared by the ``combination``,
``heterogeneity`` and ``extrapolation`` checks (not a check itself).

Each part's error is its printed ``stat_error`` or, when only ``samples`` (or
``circuits`` for heavy output) are printed, the one the metric model gives.
Every method is evaluated over the printed precision of all parts' inputs by
first-order worst-case propagation (``stats.propagation``), and the result is
cached per claim, since three checks read it.
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass
from types import MappingProxyType
from typing import Mapping

from ..claim.model import Claim, Reported
from ..stats.combine import METHODS, combine, spread_error
from ..stats.heterogeneity import Heterogeneity, cochran_q, heterogeneity, log_p_chi2, scale_factor
from ..stats.propagation import ranges_one_at_a_time
from ..vocabulary import COMBINATION_MEANS as METHOD_WORDS  # noqa: F401  (the checks read it here)
from ..wording import like
from .common import metric_of, model_inputs

Range = tuple[float, float]

# Ways of turning part errors into a combined error: the first two are
# legitimate choices, the last two are slips.
VARIANT_WORDS = {
    "spread": "with the error taken from the parts' scatter",
    "scaled": "with the error scaled by the Birge ratio",
    "average": "with the error taken as the average part error",
    "quadrature": "with the part errors added in quadrature but not divided by the number of parts",
}


@dataclass(frozen=True)
class MethodResult:
    """One combination method over the printed precision of the parts."""

    method: str
    estimate: float
    estimate_range: Range
    stat_error: float | None
    stat_error_range: Range | None
    scaled_error: float | None  # stat_error x the PDG scale factor S
    scaled_error_range: Range | None
    weights: tuple[float, ...]
    tau2: float


@dataclass(frozen=True)
class PartsSummary:
    """Every combination the parts allow, with their scatter."""

    count: int
    error_source: str | None  # "printed", "model", "printed and model" or None
    methods: Mapping[str, MethodResult]
    variants: Mapping[str, tuple[float, Range]]  # "spread", "average", "quadrature"
    heterogeneity: Heterogeneity | None
    log_p_q_high: float | None  # the largest log p_Q over printed precision
    q_range: Range | None


def _error_count(claim: Claim, part) -> Reported | None:
    if metric_of(claim).count_field == "circuits" and part.circuits is not None:
        return part.circuits
    return part.samples


def _layout(claim: Claim):
    """The flat input vector: estimates, then per-part error inputs (the
    printed error or the count the model error comes from), then samples."""
    parts = claim.parts
    model = metric_of(claim)
    model_ok = not [f for f in model.needs() if getattr(claim, f) is None]
    error_inputs: list[tuple[str, Reported] | None] = []
    for p in parts:
        if p.stat_error is not None and p.stat_error.value > 0:
            error_inputs.append(("printed", p.stat_error))
        elif model_ok and _error_count(claim, p) is not None:
            error_inputs.append(("model", _error_count(claim, p)))
        else:
            error_inputs.append(None)
    have_errors = all(e is not None for e in error_inputs)
    have_samples = all(p.samples is not None for p in parts)
    reps: list[Reported] = [p.estimate for p in parts]
    if have_errors:
        reps += [e[1] for e in error_inputs]
    if have_samples:
        reps += [p.samples for p in parts]
    kinds = tuple(e[0] for e in error_inputs) if have_errors else None
    return reps, kinds, have_samples


def _unpack(claim: Claim, vec, kinds, have_samples):
    k = len(claim.parts)
    estimates = vec[:k]
    errors = None
    pos = k
    if kinds is not None:
        model = metric_of(claim)
        inputs = model_inputs(claim)
        errors = []
        for kind, value, est in zip(kinds, vec[pos:pos + k], estimates):
            if kind == "printed":
                errors.append(value)
            else:
                errors.append(model.standard_error(est, value, inputs))
        pos += k
        if any(e is None or not (e > 0 and math.isfinite(e)) for e in errors):
            errors = None
    samples = vec[pos:pos + k] if have_samples else None
    return estimates, errors, samples


def _evaluate(claim: Claim, kinds, have_samples, vec):
    """Every output at one point of the box: for each method its estimate, error
    and scaled error, then the variants, then Q."""
    estimates, errors, samples = _unpack(claim, vec, kinds, have_samples)
    k = len(estimates)
    s = None
    q = None
    if errors is not None and k >= 2:
        q = cochran_q(estimates, errors)
        s = scale_factor(q, k - 1)
    out: list[float | None] = []
    for method in METHODS:
        try:
            c = combine(method, estimates, errors, samples)
        except ValueError:
            c = None
        if c is None:
            out += [None, None, None]
        else:
            out += [c.estimate, c.stat_error,
                    None if (c.stat_error is None or s is None) else c.stat_error * s]
    out.append(spread_error(estimates) if k >= 2 else None)
    out.append(sum(errors) / k if errors is not None else None)
    out.append(math.sqrt(sum(e * e for e in errors)) if errors is not None else None)
    out.append(q)
    return out


def _range(r) -> Range | None:
    if r is None or not all(math.isfinite(v) for v in r):
        return None
    return (float(r[0]), float(r[1]))


@functools.lru_cache(maxsize=32)
def parts_summary(claim: Claim) -> PartsSummary | None:
    """All combinations of the claim's parts; None with fewer than two parts."""
    k = len(claim.parts)
    if k < 2:
        return None
    reps, kinds, have_samples = _layout(claim)
    centre = [r.value for r in reps]
    bounds = [r.bounds for r in reps]
    at_centre = _evaluate(claim, kinds, have_samples, centre)
    ranges = ranges_one_at_a_time(lambda v: _evaluate(claim, kinds, have_samples, v), centre, bounds)
    methods = {}
    for i, method in enumerate(METHODS):
        est, err, scaled = at_centre[3 * i:3 * i + 3]
        if est is None:
            continue
        try:
            weights_of = combine(method, *_unpack(claim, centre, kinds, have_samples))
        except ValueError:
            continue
        methods[method] = MethodResult(
            method, est, _range(ranges[3 * i]), err, _range(ranges[3 * i + 1]) if err is not None else None,
            scaled, _range(ranges[3 * i + 2]) if scaled is not None else None,
            weights_of.weights, weights_of.tau2)
    base = 3 * len(METHODS)
    variants = {}
    for j, name in enumerate(("spread", "average", "quadrature")):
        if at_centre[base + j] is not None and _range(ranges[base + j]) is not None:
            variants[name] = (at_centre[base + j], _range(ranges[base + j]))
    het = None
    log_p_high = None
    q_range = None
    if kinds is not None:
        estimates, errors, _ = _unpack(claim, centre, kinds, have_samples)
        if errors is not None:
            het = heterogeneity(estimates, errors)
            q_range = _range(ranges[base + 3])
            if q_range is not None:
                log_p_high = log_p_chi2(q_range[0], k - 1)
    if kinds is None:
        source = None
    else:
        source = " and ".join(sorted(set(kinds), reverse=True))
    return PartsSummary(k, source, MappingProxyType(methods), MappingProxyType(variants), het,
                        log_p_high, q_range)


def printed_combination(claim: Claim) -> tuple[Reported | None, Reported | None]:
    """The combined value and error as printed: the ``combination`` block, or
    the headline when no extrapolation stands between the two."""
    comb = claim.combination
    direct = claim.extrapolation is None
    estimate = comb.estimate if comb is not None and comb.estimate is not None else None
    error = comb.stat_error if comb is not None and comb.stat_error is not None else None
    if estimate is None and direct:
        estimate = claim.estimate
    if error is None and direct:
        error = claim.stat_error
    return estimate, error


def value_text(value: float | None, like_this: Reported | None) -> str:
    return like(value, like_this)


def methods_details(summary: PartsSummary) -> dict:
    """The ``methods`` mapping the renderers read: estimate and stat_error."""
    return {m: {"estimate": r.estimate, "stat_error": r.stat_error} for m, r in summary.methods.items()}
