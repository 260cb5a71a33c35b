"""Small helpers the checks share: the model inputs a claim provides, and the
way numbers are written in findings."""

from __future__ import annotations

import math

from ..claim.model import Claim, Reported
from ..metrics import METRICS, MetricModel, ModelInputs
from .. import wording
from ..stats.porter_thomas import dimension_of
from ..wording import num  # noqa: F401  (re-exported for the checks)

LN10 = math.log(10.0)


def metric_of(claim: Claim) -> MetricModel:
    return METRICS[claim.metric]


def model_inputs(claim: Claim, sd: float | None = None, circuits: float | None = None) -> ModelInputs:
    """The metric model's inputs; ``circuits`` (K of the error sqrt(v/N + B (1/K - 1/N)))
    only where the caller says which count of circuits the samples come from."""
    if sd is None and claim.sd is not None:
        sd = claim.sd.value
    xeb = claim.metric in ("linear-xeb", "log-xeb")
    return ModelInputs(dimension=dimension_of(claim.qubit_count) if xeb else None, sd=sd, circuits=circuits)


def count_for_error(claim: Claim) -> Reported | None:
    """The N in sqrt(v / N) for this claim's metric (circuits for heavy output
    when given, otherwise samples)."""
    model = metric_of(claim)
    if model.count_field == "circuits" and claim.circuits is not None:
        return claim.circuits
    return claim.samples


def num_range(bounds: tuple[float, float], digits: int = 3) -> str:
    return wording.num_range(bounds[0], bounds[1], digits)


def p_text(log_p: float, digits: int = 2) -> str:
    """A p-value from its natural log, correct below the double-precision range."""
    if not math.isfinite(log_p):  # sigma of 1e300: log p itself overflows
        return "0" if log_p == -math.inf else "n/a"
    if log_p > -700:
        return num(math.exp(log_p), digits)
    log10 = log_p / LN10
    exponent = math.floor(log10)
    mantissa = 10 ** (log10 - exponent)
    if float(f"{mantissa:.{digits - 1}f}") >= 10.0:  # 9.996 would print as "10.0e-350"
        mantissa, exponent = mantissa / 10.0, exponent + 1
    return f"{mantissa:.{digits - 1}f}e{exponent}"


def p_range_text(log_bounds: tuple[float, float]) -> str:
    a, b = p_text(log_bounds[0]), p_text(log_bounds[1])
    return a if a == b else f"{a} to {b}"


def log_bounds(rep: Reported) -> tuple[float, float]:
    """Natural-log interval of a printed p-value ("< 0.001" runs down to 0)."""
    low = -math.inf if math.isnan(rep.log_low) else min(rep.log_low, 0.0)
    return (low, min(rep.log_high, 0.0))


def is_probability(rep: Reported) -> bool:
    """A printed p-value in (0, 1], judged in log space so 1e-400 counts."""
    return rep.log_high > -math.inf and not math.isnan(rep.log_high) and rep.value <= 1.0


def finite_or_none(x: float | None) -> float | None:
    if x is None or not math.isfinite(x):
        return None
    return float(x)


_CONVENTION_WORDS = {
    ("sided", "one"): "one-sided", ("sided", "two"): "two-sided",
    ("systematics", "none"): "statistical error only",
    ("systematics", "quadrature"): "systematic error added in quadrature",
    ("systematics", "marginalized"): "systematic error marginalized",
    ("error_at", "estimate"): "error taken at the estimate",
    ("error_at", "threshold"): "error taken at the threshold",
    ("method", "sidak"): "the Sidak correction", ("method", "bonferroni"): "the Bonferroni bound",
    ("method", "gross-vitells"): "the Gross-Vitells correction", ("method", "none"): "no correction",
}


def convention_text(conv: dict) -> str:
    """Plain words for a convention: {"sided": "two"} -> "two-sided"."""
    return ", ".join(_CONVENTION_WORDS.get((k, v), f"{k} {v}") for k, v in conv.items())
