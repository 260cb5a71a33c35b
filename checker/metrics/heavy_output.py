"""Heavy-output probability h: the fraction of samples whose ideal probability
exceeds the median.  Ideal Porter-Thomas value (1 + ln 2)/2; the usual pass
criterion is h - 2 sigma > 2/3 with sigma = sqrt(h (1 - h) / circuits).

References
----------
A. W. Cross et al., "Validating quantum computers using randomized model
circuits", Phys. Rev. A 100, 032328 (2019), arXiv:1811.12926.
"""

from ..stats.binomial import binomial_variance
from .base import MetricModel, ModelInputs


class HeavyOutput(MetricModel):
    name = "heavy-output"
    summary = "heavy-output probability"
    noun = "a heavy-output probability"
    lowest = 0.0
    highest = 1.0
    hard_bounds = True
    count_field = "circuits"

    def variance(self, value: float, inputs: ModelInputs) -> float:
        return binomial_variance(value)

    def variance_range(self, low: float, high: float, inputs: ModelInputs) -> tuple[float, float]:
        from ..stats.ranges import binomial_variance_range  # numpy: loaded only by the checks

        return binomial_variance_range(low, high)  # exact: p (1 - p) peaks at 1/2
