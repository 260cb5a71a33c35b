"""A sample mean with a printed per-sample standard deviation: se = sd / sqrt(N)."""

from .base import MetricModel, ModelInputs


class Mean(MetricModel):
    name = "mean"
    summary = "sample mean, sd / sqrt(N)"
    noun = "a mean"

    def variance(self, value: float, inputs: ModelInputs) -> float | None:
        if inputs.sd is None:
            return None
        return inputs.sd * inputs.sd

    def needs(self) -> tuple[str, ...]:
        return ("sd",)

    def variance_range(self, low: float, high: float, inputs: ModelInputs) -> tuple[float, float]:
        v = self.variance(low, inputs)
        return (v, v) if v is not None else (float("nan"), float("nan"))  # the same at every value
