"""What a claim's parts imply when combined, shared by the ``combination``,
``heterogeneity`` and ``extrapolation`` checks (not a check itself).

Each part's error is its printed ``stat_error`` or, when only ``samples`` (or
``circuits`` for heavy output) are printed, the one the metric model gives.
Every method's value is computed at the printed values, and its range over
the box of the parts' printed intervals by the range engine
(``stats.combination_ranges``: closed forms where they exist, a bounded search
where not, each range computed only when a check asks for it).  The result is
cached per claim, since three checks read it.
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Mapping

import numpy as np

from ..claim.model import Claim, Reported
from ..stats.combination_ranges import CombinationRanges, PartsBox
from ..stats.combine import COMBINATION_METHODS, combine, spread_error
from ..stats.heterogeneity import Heterogeneity, cochran_q, heterogeneity, log_p_chi2, scale_factor
from ..stats.precision import agrees
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


def _range(r) -> Range | None:
    if r is None or not all(math.isfinite(v) for v in r):
        return None
    return (float(r[0]), float(r[1]))


@dataclass(frozen=True)
class MethodResult:
    """One combination method: its values at the printed parts, and their
    ranges over the printed precision of the parts (computed on first use)."""

    method: str
    estimate: float
    stat_error: float | None
    scaled_error: float | None  # stat_error x the PDG scale factor S
    weights: tuple[float, ...]
    tau2: float
    engine: CombinationRanges = field(repr=False, compare=False)

    @property
    def estimate_range(self) -> Range | None:
        return _range(self.engine.range(self.method, "estimate"))

    @property
    def stat_error_range(self) -> Range | None:
        return None if self.stat_error is None else _range(self.engine.range(self.method, "stat_error"))

    @property
    def scaled_error_range(self) -> Range | None:
        return None if self.scaled_error is None else _range(self.engine.range(self.method, "scaled_error"))

    def agrees(self, quantity: str, bounds: tuple[float, float], tolerance: float) -> bool:
        """``precision.agrees(bounds, <quantity>_range, tolerance)``, False where that
        range is None; the engine answers from cheaper bounds where they settle it,
        so a check that only asks need not pay for a searched range."""
        if quantity != "estimate" and getattr(self, quantity) is None:
            return False
        return self.engine.agrees(self.method, quantity, bounds, tolerance)


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


@dataclass(frozen=True)
class RangeOption:
    """A range a printed number may fall in: asked whether a print agrees, it is
    answered without the full range where cheaper bounds settle it; ``range``
    is the full range (for showing)."""

    result: MethodResult | None = None
    quantity: str = ""
    fixed: Range | None = None

    def agrees(self, bounds: tuple[float, float], tolerance: float) -> bool:
        if self.result is not None:
            return self.result.agrees(self.quantity, bounds, tolerance)
        return self.fixed is not None and agrees(bounds, self.fixed, tolerance)

    @property
    def range(self) -> Range | None:
        if self.result is not None:
            return getattr(self.result, f"{self.quantity}_range")
        return self.fixed


def _error_count(claim: Claim, part) -> Reported | None:
    if metric_of(claim).count_field == "circuits" and part.circuits is not None:
        return part.circuits
    return part.samples


def _box(claim: Claim) -> tuple[PartsBox, tuple[str, ...] | None]:
    """The box of the parts' inputs.  A model error gets the interval of the
    model's error over its estimate's interval and its count's (the variance's
    exact extremes there, ``MetricModel.variance_range``)."""
    parts = claim.parts
    model = metric_of(claim)
    inputs = model_inputs(claim)
    model_ok = not [f for f in model.needs() if getattr(claim, f) is None]
    x = np.array([p.estimate.value for p in parts])
    x_low = np.array([p.estimate.low for p in parts])
    x_high = np.array([p.estimate.high for p in parts])
    errors = []
    kinds = []
    for p in parts:
        if p.stat_error is not None and p.stat_error.value > 0:
            e = p.stat_error
            errors.append((e.value, e.low, e.high))
            kinds.append("printed")
            continue
        count = _error_count(claim, p) if model_ok else None
        mid = model.standard_error(p.estimate.value, count.value, inputs) if count is not None else None
        if mid is None or not (mid > 0 and math.isfinite(mid)) or not count.low > 0:
            errors = None
            break
        v_low, v_high = model.variance_range(p.estimate.low, p.estimate.high, inputs)
        low = math.sqrt(max(v_low, 0.0) / count.high) if math.isfinite(v_low) else 0.0
        high = math.sqrt(v_high / count.low) if math.isfinite(v_high) else math.inf
        # A variance that vanishes at the interval's end (a proportion printed as 1.00): the
        # weight is unbounded there, which a part error of 1e-12 of its value stands for.
        errors.append((mid, min(max(low, mid * 1e-12), mid), max(high, mid)))
        kinds.append("model")
    s = s_low = s_high = None
    if errors is not None:
        s, s_low, s_high = (np.array(col) for col in zip(*errors))
        if not (np.all(np.isfinite(s_high)) and np.all(s_low > 0)):
            s = s_low = s_high = None
    n = n_low = n_high = None
    if all(p.samples is not None for p in parts) and all(p.samples.value > 0 and p.samples.low > 0
                                                         for p in parts):
        n = np.array([p.samples.value for p in parts])
        n_low = np.array([p.samples.low for p in parts])
        n_high = np.array([p.samples.high for p in parts])
    box = PartsBox(x, x_low, x_high, s, s_low, s_high, n, n_low, n_high)
    return box, (tuple(kinds) if s is not None else None)


@functools.lru_cache(maxsize=32)
def parts_summary(claim: Claim) -> PartsSummary | None:
    """All combinations of the claim's parts; None with fewer than two parts."""
    k = len(claim.parts)
    if k < 2:
        return None
    box, kinds = _box(claim)
    engine = CombinationRanges(box)
    estimates = box.x.tolist()
    errors = box.s.tolist() if box.s is not None else None
    samples = box.n.tolist() if box.n is not None else None
    s_factor = scale_factor(cochran_q(estimates, errors), k - 1) if errors is not None else None
    methods = {}
    for method in COMBINATION_METHODS:
        try:
            c = combine(method, estimates, errors, samples)
        except ValueError:
            c = None
        if c is None:
            continue
        scaled = None if (c.stat_error is None or s_factor is None) else c.stat_error * s_factor
        methods[method] = MethodResult(method, c.estimate, c.stat_error, scaled, c.weights, c.tau2, engine)
    variants = {}
    spread = _range(engine.spread())
    if spread is not None:
        variants["spread"] = (spread_error(estimates), spread)
    if errors is not None:
        variants["average"] = (sum(errors) / k, _range(engine.average()))
        variants["quadrature"] = (math.sqrt(sum(e * e for e in errors)), _range(engine.quadrature()))
        variants = {name: v for name, v in variants.items() if v[1] is not None}
    het = None
    log_p_high = None
    q_range = None
    if errors is not None:
        het = heterogeneity(estimates, errors)
        q = engine.q()
        q_range = (float(q[0]), float(q[1])) if q is not None and math.isfinite(q[0]) else None
        if q_range is not None:
            log_p_high = log_p_chi2(q_range[0], k - 1)
    source = None if kinds is None else " and ".join(sorted(set(kinds), reverse=True))
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
