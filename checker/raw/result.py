"""The result of re-deriving a claim's numbers from raw per-sample data:
frozen dataclasses only.  Their JSON (``claimcheck raw DATA --json``) is
:func:`checker.render.raw_json.raw_result_to_dict`.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Mapping, Sequence

from ..report import Finding
from ..stats.fidelity_fit import FidelityFit
from ..stats.goodness_of_fit import FitTest, MixtureHistogram
from .estimators import MetricEstimate

@dataclass(frozen=True)
class BootstrapSummary:
    """Bootstrap intervals for the combined estimate."""

    level: float
    low: float  # the interval named by ``interval``
    high: float
    basic_low: float
    basic_high: float
    replicates: int
    resampling: str  # circuits | binned | binomial
    sd: float
    within_share: float
    error_bound: float
    bins: int
    seed: int
    histogram_edges: tuple = ()
    histogram_density: tuple = ()
    histogram_counts: tuple = ()  # replicates per bin, on the same edges
    # "percentile", or over several circuits "t over circuits" (t on K - 1 degrees of freedom,
    # which holds its level with few circuits; checker.stats.bootstrap)
    interval: str = "percentile"
    percentile_low: float | None = None
    percentile_high: float | None = None
    percentile_coverage: float | None = None  # measured coverage of the percentile interval at this K
    circuits: int = 0


@dataclass(frozen=True)
class RawResult:
    """Everything ``claimcheck raw`` found in one data file."""

    file: str
    metric: str
    qubits: int
    rows: int
    combined: Mapping[str, MetricEstimate]
    circuits: Sequence  # of (label, {metric: MetricEstimate}); raw.circuit_table.CircuitEstimates
    fits: tuple[FidelityFit, ...] = ()
    goodness_of_fit: tuple[FitTest, ...] = ()
    bootstrap: BootstrapSummary | None = None
    histogram: MixtureHistogram | None = None
    findings: tuple[Finding, ...] | None = None
    notes: tuple[str, ...] = ()
    ignored_columns: tuple[str, ...] = ()
    seed: int = 0
    threshold: float | None = None
    claim_file: str | None = None
    verdict: str | None = None
    extra: Mapping[str, Any] = field(default_factory=dict)

    @property
    def headline(self) -> MetricEstimate:
        return self.combined[self.metric]

    @property
    def circuit_count(self) -> int:
        return len(self.circuits)

    def fit(self, method: str) -> FidelityFit | None:
        return next((f for f in self.fits if f.method == method), None)
