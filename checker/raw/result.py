"""The result of re-deriving a claim's numbers from raw per-sample data.

:meth:`RawResult.to_dict` is the JSON of ``claimcheck raw DATA --json``: the
keys DESIGN.md fixes (``metric``, ``qubits``, ``rows``, ``combined``,
``circuits``, ``goodness_of_fit``, ``bootstrap``, ``findings``) and more:

* ``metrics``: every metric the data allow, combined over circuits;
* ``fits``: the fidelity from the moment estimator and by maximum likelihood;
* ``histogram``: for a plot, bin ``edges`` of x = D p, ``observed_density``,
  the mixture's ``density_fitted`` (at ``fidelity_fitted``) and
  ``density_zero`` (F = 0), and ``bootstrap``: ``edges``, ``density`` and
  ``counts`` (replicates per bin) of the bootstrap replicates of the combined
  estimate;
* ``notes``: plain sentences about what was assumed or left out.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Mapping

from ..report import Finding
from ..stats.fidelity_fit import FidelityFit
from ..stats.goodness_of_fit import FitTest, MixtureHistogram
from .estimators import MetricEstimate

CONTRACT_KEYS = ("estimate", "stat_error", "stat_error_data", "samples")


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

    def to_dict(self) -> dict:
        out = {"level": self.level, "low": self.low, "high": self.high, "replicates": self.replicates,
               "method": self.interval, "basic": {"low": self.basic_low, "high": self.basic_high},
               "resampling": self.resampling, "sd": self.sd, "within_bin_share": self.within_share,
               "error_bound": self.error_bound, "bins": self.bins, "seed": self.seed}
        if self.interval != "percentile":
            out["percentile"] = {"low": self.percentile_low, "high": self.percentile_high,
                                 "measured_coverage": self.percentile_coverage}
            out["degrees_of_freedom"] = self.circuits - 1
        return out


@dataclass(frozen=True)
class RawResult:
    """Everything ``claimcheck raw`` found in one data file."""

    file: str
    metric: str
    qubits: int
    rows: int
    combined: Mapping[str, MetricEstimate]
    circuits: tuple  # of (label, {metric: MetricEstimate})
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

    def to_dict(self) -> dict:
        from ..render.json import finding_to_dict

        head = self.headline.to_dict()
        combined = {k: head[k] for k in CONTRACT_KEYS}
        combined.update({k: v for k, v in head.items() if k not in combined and k != "metric"})
        circuits = []
        for label, metrics in self.circuits:
            mine = metrics.get(self.metric)
            entry = {"circuit": label}
            if mine is not None:
                d = mine.to_dict()
                entry.update({k: d[k] for k in CONTRACT_KEYS})
                entry["ratio"] = d["ratio"]
            else:
                entry.update({"estimate": None, "stat_error": None, "stat_error_data": None,
                              "samples": None, "ratio": None})
            entry["metrics"] = {k: {kk: vv for kk, vv in v.to_dict().items() if kk != "metric"}
                                for k, v in metrics.items()}
            circuits.append(entry)
        out: dict[str, Any] = {
            "file": self.file, "metric": self.metric, "qubits": self.qubits, "dimension": 2.0 ** self.qubits,
            "rows": self.rows, "circuit_count": self.circuit_count, "combined": combined,
            "metrics": {k: {kk: vv for kk, vv in v.to_dict().items() if kk != "metric"}
                        for k, v in self.combined.items()},
            "circuits": circuits,
            "fits": [f.to_dict() for f in self.fits],
            "goodness_of_fit": [t.to_dict() for t in self.goodness_of_fit],
            "bootstrap": self.bootstrap.to_dict() if self.bootstrap else None,
        }
        if self.histogram is not None or self.bootstrap is not None:
            hist = self.histogram.to_dict() if self.histogram is not None else {}
            if self.bootstrap is not None and self.bootstrap.histogram_edges:
                hist["bootstrap"] = {"edges": list(self.bootstrap.histogram_edges),
                                     "density": list(self.bootstrap.histogram_density),
                                     "counts": list(self.bootstrap.histogram_counts),
                                     "estimate": combined["estimate"],
                                     "low": self.bootstrap.low, "high": self.bootstrap.high}
            out["histogram"] = hist
        if self.threshold is not None:
            out["threshold"] = self.threshold
        out["seed"] = self.seed
        out["ignored_columns"] = list(self.ignored_columns)
        out["notes"] = list(self.notes)
        out.update(self.extra)
        if self.findings is not None:
            out["claim"] = self.claim_file
            out["verdict"] = self.verdict
            out["findings"] = [finding_to_dict(f) for f in self.findings]
        return out
