"""A proportion k/N (test accuracy, success probability, parity above 1/2):
binomial variance p (1 - p)."""

from ..stats.binomial import binomial_variance
from .base import MetricModel, ModelInputs


class Proportion(MetricModel):
    name = "proportion"
    summary = "binomial proportion k/N"
    noun = "a proportion"
    lowest = 0.0
    highest = 1.0
    hard_bounds = True

    def variance(self, value: float, inputs: ModelInputs) -> float:
        return binomial_variance(value)

    def variance_range(self, low: float, high: float, inputs: ModelInputs) -> tuple[float, float]:
        from ..stats.ranges import binomial_variance_range  # numpy: loaded only by the checks

        return binomial_variance_range(low, high)  # exact: p (1 - p) peaks at 1/2
