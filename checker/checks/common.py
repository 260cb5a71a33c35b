"""Small helpers the checks share: the model inputs a claim provides and the
printed p-value's bounds.  How numbers are written is :mod:`checker.wording`'s;
the names of conventions are :mod:`checker.vocabulary`'s."""

from __future__ import annotations

import math

from ..claim.model import Claim, Reported
from ..metrics import METRICS, MetricModel, ModelInputs
from ..stats.porter_thomas import dimension_of

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


# The agreement rule, one-sided (README, "Printed precision"): a printed number and a recomputed
# bound disagree when the gap between them is more than ``tolerance`` times the printed value.
def below(printed: Reported, bound: float, tolerance: float) -> bool:
    """The whole printed interval lies below ``bound``, by more than
    ``tolerance`` x the printed value."""
    return bound - printed.high > tolerance * abs(printed.value)


def above(printed: Reported, bound: float, tolerance: float) -> bool:
    """The whole printed interval lies above ``bound``, by more than
    ``tolerance`` x the printed value."""
    return printed.low - bound > tolerance * abs(printed.value)


def log_bounds(rep: Reported) -> tuple[float, float]:
    """Natural-log interval of a printed p-value ("< 0.001" runs down to 0)."""
    low = -math.inf if math.isnan(rep.log_low) else min(rep.log_low, 0.0)
    return (low, min(rep.log_high, 0.0))


def is_probability(rep: Reported) -> bool:
    """A printed p-value in (0, 1], judged in log space so 1e-400 counts."""
    return rep.log_high > -math.inf and not math.isnan(rep.log_high) and rep.value <= 1.0


def flagged_error(rep: Reported | None) -> bool:
    """A printed error that ``bounds`` flags (zero or negative): checks that need it skip it."""
    return rep is not None and not rep.value > 0


def fewer_samples_than_circuits(samples: Reported | None, circuits: Reported | None) -> bool:
    """Every circuit needs at least one sample: samples below circuits (over the
    whole printed interval of both) cannot be a total count of samples; ``bounds``
    flags it and the checks that would use the two counts skip them."""
    return samples is not None and circuits is not None and samples.high < circuits.low


def skipped_words(rep: Reported) -> str:
    """"the printed stat_error -0.009 is not used: the physical-range check flags it"."""
    return f"the printed {rep.path} {rep.text} is not used: the physical-range check flags it"


def printed_zero(rep: Reported) -> bool:
    """A p printed as exactly zero ("0", "0.000"), not one that underflows the double range
    (1e-400 has a zero value but a zero upper end too) nor a bound ("< 0.001")."""
    return rep.value == 0 and rep.high > 0


def finite_or_none(x: float | None) -> float | None:
    if x is None or not math.isfinite(x):
        return None
    return float(x)
