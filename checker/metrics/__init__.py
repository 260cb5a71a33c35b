"""Metric models, one file each; add a metric with one file and one line here."""

from .base import MetricModel, ModelInputs
from .counts import Counts
from .heavy_output import HeavyOutput
from .linear_xeb import LinearXEB
from .log_xeb import LogXEB
from .mean import Mean
from .proportion import Proportion

METRICS: dict[str, MetricModel] = {
    "linear-xeb": LinearXEB(),
    "log-xeb": LogXEB(),
    "heavy-output": HeavyOutput(),
    "proportion": Proportion(),
    "mean": Mean(),
    "counts": Counts(),
}

__all__ = ["METRICS", "MetricModel", "ModelInputs"]
