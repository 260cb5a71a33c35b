"""A counting experiment: n events observed over an expected background b.

The estimate, when printed, is the signal yield s = n - b, whose Poisson
error is sqrt(n) (with a background error sigma_b added in quadrature).  The
model has no per-sample variance: its significance and its error come from the
counts themselves (checker/stats/counts.py), not from sqrt(v / N).
"""

from .base import MetricModel, ModelInputs


class Counts(MetricModel):
    name = "counts"
    summary = "events over an expected background; Poisson"
    noun = "a signal yield"

    def variance(self, value: float, inputs: ModelInputs) -> float | None:
        return None  # the error of a yield comes from the observed count, not from samples

    def needs(self) -> tuple[str, ...]:
        return ("observed", "background")
