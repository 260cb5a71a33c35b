"""What every metric model provides: a per-sample variance v, the variance B
over circuits of each circuit's own mean, hence the standard error of a mean
of N samples over K circuits, sqrt(v / N + B (1/K - 1/N)), and the physical
range of its estimate.  Without K the error is sqrt(v / N), the smallest any
number of circuits allows (checker.stats.porter_thomas.variance_of_mean)."""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..stats.elementwise import at_least_zero
from ..stats.porter_thomas import variance_of_mean


@dataclass(frozen=True)
class ModelInputs:
    """What a metric model may need beyond the value itself."""

    dimension: float | None = None  # Hilbert-space dimension D (xeb metrics)
    sd: float | None = None  # per-sample standard deviation (metric mean)
    circuits: float | None = None  # circuits the samples come from; None: not known


class MetricModel:
    """Base class of the metric models; one subclass per file."""

    name: str = ""
    summary: str = ""
    noun: str = "a value"  # for sentences: "a proportion cannot exceed 1"
    # Range the estimate can take at all, and whether leaving it is impossible
    # (a proportion of 1.02) or only improbable (a noisy fidelity estimate of 1.02).
    lowest: float = -math.inf
    highest: float = math.inf
    hard_bounds: bool = False
    hard_lowest: bool = False  # the lower end alone is impossible to cross (x = D p >= 0)
    # The count N in sqrt(v / N): samples for most metrics, circuits for heavy output.
    count_field: str = "samples"

    def variance(self, value: float, inputs: ModelInputs) -> float | None:
        """Per-sample variance at the given value; None when the model needs an
        input the claim does not give."""
        raise NotImplementedError

    def circuit_variance(self, value: float, inputs: ModelInputs) -> float:
        """Variance over circuits of each circuit's own expected value (B); 0
        for a metric whose samples do not come from random circuits."""
        return 0.0

    def within_variance(self, value: float, inputs: ModelInputs) -> float | None:
        """Expected per-sample variance inside one circuit, v - B (the law of
        total variance); what one circuit's own samples scatter by.  The xeb
        models take an array of values too, elementwise, bit for bit the loop
        over its elements (``raw`` reads every circuit's this way)."""
        v = self.variance(value, inputs)
        if v is None:
            return None
        return at_least_zero(v - self.circuit_variance(value, inputs))

    def standard_error(self, value: float, n: float, inputs: ModelInputs) -> float | None:
        """sqrt(v / N + B (1/K - 1/N)) with K = ``inputs.circuits``; sqrt(v / N)
        when K is not known (or B is 0)."""
        v = self.variance(value, inputs)
        if v is None or n <= 0:
            return None
        b = self.circuit_variance(value, inputs) if inputs.circuits else 0.0
        return math.sqrt(variance_of_mean(v, b, n, inputs.circuits))

    def variance_range(self, low: float, high: float, inputs: ModelInputs) -> tuple[float, float]:
        """Minimum and maximum of the per-sample variance for a value in [low, high]
        (nan, nan when the model cannot give it).  By default a bounded
        one-dimensional search (``stats.ranges.scalar_range``); models with a
        closed form override it."""
        from ..stats.ranges import scalar_range

        return scalar_range(lambda value: self.variance(value, inputs), low, high)

    def needs(self) -> tuple[str, ...]:
        """Claim fields the variance needs besides the estimate."""
        return ()
