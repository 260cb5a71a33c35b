"""The JSON of ``claimcheck raw DATA --json``: a plain dict of a
:class:`~checker.raw.result.RawResult`, for :func:`checker.render.json.dumps`.

The keys DESIGN.md fixes (``metric``, ``qubits``, ``rows``, ``combined``,
``circuits``, ``goodness_of_fit``, ``bootstrap``, ``findings``) and more:

* ``metrics``: every metric the data allow, combined over circuits;
* ``fits``: the fidelity from the moment estimator and by maximum likelihood;
* ``histogram``: for a plot, bin ``edges`` of x = D p, ``observed_density``,
  the mixture's ``density_fitted`` (at ``fidelity_fitted``) and
  ``density_zero`` (F = 0), and ``bootstrap``: ``edges``, ``density`` and
  ``counts`` (replicates per bin) of the bootstrap replicates of the combined
  estimate;
* ``notes``: plain sentences about what was assumed or left out;
* with ``--claim``: ``claim``, ``verdict`` and ``findings`` (each as in the
  claim report's JSON, :func:`checker.render.json.finding_to_dict`).

Nothing here computes: every value was computed in :mod:`checker.raw`.
"""

from __future__ import annotations

from typing import Any

from .json import finding_to_dict

CONTRACT_KEYS = ("estimate", "stat_error", "stat_error_data", "samples")


def bootstrap_to_dict(b) -> dict:
    """A :class:`~checker.raw.result.BootstrapSummary` as JSON values."""
    out = {"level": b.level, "low": b.low, "high": b.high, "replicates": b.replicates,
           "method": b.interval, "basic": {"low": b.basic_low, "high": b.basic_high},
           "resampling": b.resampling, "sd": b.sd, "within_bin_share": b.within_share,
           "error_bound": b.error_bound, "bins": b.bins, "seed": b.seed}
    if b.interval != "percentile":
        out["percentile"] = {"low": b.percentile_low, "high": b.percentile_high,
                             "measured_coverage": b.percentile_coverage}
        out["degrees_of_freedom"] = b.circuits - 1
    return out


def raw_result_to_dict(result) -> dict:
    """The whole raw-data result, findings included when a claim was given."""
    head = result.headline.to_dict()
    combined = {k: head[k] for k in CONTRACT_KEYS}
    combined.update({k: v for k, v in head.items() if k not in combined and k != "metric"})
    circuits = []
    for label, metrics in result.circuits:
        mine = metrics.get(result.metric)
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
    b = result.bootstrap
    out: dict[str, Any] = {
        "file": result.file, "metric": result.metric, "qubits": result.qubits, "dimension": 2.0 ** result.qubits,
        "rows": result.rows, "circuit_count": result.circuit_count, "combined": combined,
        "metrics": {k: {kk: vv for kk, vv in v.to_dict().items() if kk != "metric"}
                    for k, v in result.combined.items()},
        "circuits": circuits,
        "fits": [f.to_dict() for f in result.fits],
        "goodness_of_fit": [t.to_dict() for t in result.goodness_of_fit],
        "bootstrap": bootstrap_to_dict(b) if b else None,
    }
    if result.histogram is not None or b is not None:
        hist = result.histogram.to_dict() if result.histogram is not None else {}
        if b is not None and b.histogram_edges:
            hist["bootstrap"] = {"edges": list(b.histogram_edges), "density": list(b.histogram_density),
                                 "counts": list(b.histogram_counts), "estimate": combined["estimate"],
                                 "low": b.low, "high": b.high}
        out["histogram"] = hist
    if result.threshold is not None:
        out["threshold"] = result.threshold
    out["seed"] = result.seed
    out["ignored_columns"] = list(result.ignored_columns)
    out["notes"] = list(result.notes)
    out.update(result.extra)
    if result.findings is not None:
        out["claim"] = result.claim_file
        out["verdict"] = result.verdict
        out["findings"] = [finding_to_dict(f) for f in result.findings]
    return out


__all__ = ["CONTRACT_KEYS", "bootstrap_to_dict", "raw_result_to_dict"]
