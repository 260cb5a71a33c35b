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

import json
from typing import Any, Iterator

from ..visible import json_safe
from .json import clean, dumps, finding_to_dict

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


def circuit_to_dict(result, label, metrics) -> dict:
    """One entry of ``circuits``: the headline metric's numbers, then every metric's."""
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
    return entry


def raw_result_to_dict(result, circuits: bool = True) -> dict:
    """The whole raw-data result, findings included when a claim was given
    (``circuits`` False: an empty ``circuits`` list, for :func:`raw_result_json_pieces`)."""
    head = result.headline.to_dict()
    combined = {k: head[k] for k in CONTRACT_KEYS}
    combined.update({k: v for k, v in head.items() if k not in combined and k != "metric"})
    b = result.bootstrap
    out: dict[str, Any] = {
        "file": result.file, "metric": result.metric, "qubits": result.qubits, "dimension": 2.0 ** result.qubits,
        "rows": result.rows, "circuit_count": result.circuit_count, "combined": combined,
        "metrics": {k: {kk: vv for kk, vv in v.to_dict().items() if kk != "metric"}
                    for k, v in result.combined.items()},
        "circuits": [circuit_to_dict(result, label, metrics) for label, metrics in result.circuits] if circuits else [],
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


# Circuits per piece of the streamed JSON: about 0.9 MB of text each.
CIRCUITS_PER_PIECE = 1000
_CIRCUITS_KEY = '\n  "circuits": []'
_FLAT_ENCODERS: dict = {}


def _flat_encoder(level: int) -> json.JSONEncoder:
    pad = "\n" + "  " * (level + 1)
    encoder = _FLAT_ENCODERS.get(level)
    if encoder is None:
        encoder = _FLAT_ENCODERS[level] = json.JSONEncoder(ensure_ascii=False, allow_nan=False,
                                                           separators=("," + pad, ": "))
    return encoder


def indented_json(value: Any, level: int = 0) -> str:
    """``json.dumps(value, indent=2, ensure_ascii=False, allow_nan=False)`` of a
    clean() value, as it stands ``level`` levels deep.

    Written here because the standard library encodes with indentation in pure
    Python (its C encoder only without ``indent``), which took 10 s for the
    circuits of 100,000-circuit raw data.  A dict or list of scalars is one call
    of the C encoder whose item separator is the newline and indentation the
    indented form puts between items (the C encoder writes scalars as the
    Python one does, and a string never holds a raw newline); deeper values
    recurse.  tests/render/test_raw_json_stream.py holds it to json.dumps."""
    if isinstance(value, dict):
        opening, closing, items = "{", "}", value.values()
    elif isinstance(value, list):
        opening, closing, items = "[", "]", value
    else:
        return _flat_encoder(0).encode(value)
    if not value:
        return opening + closing
    pad = "\n" + "  " * (level + 1)
    if not any(isinstance(v, (dict, list)) for v in items):
        body = _flat_encoder(level).encode(value)[1:-1]
    elif opening == "{":
        encode = _flat_encoder(0).encode
        body = ("," + pad).join(encode(k) + ": " + indented_json(v, level + 1) for k, v in value.items())
    else:
        body = ("," + pad).join(indented_json(v, level + 1) for v in value)
    return opening + pad + body + "\n" + "  " * level + closing


def raw_result_json_pieces(result) -> Iterator[str]:
    """``dumps(raw_result_to_dict(result))`` in pieces, the same text once joined,
    without holding every circuit's dict or the whole text at once (100,000
    circuits made about 1 GB of both).  The circuits are written a thousand at a
    time by :func:`indented_json`, each as it stands in the whole document;
    tests/render/test_raw_json_stream.py holds the joined pieces to the plain text."""
    text = dumps(raw_result_to_dict(result, circuits=False))
    at = text.find(_CIRCUITS_KEY)
    if at < 0 or len(result.circuits) == 0:
        yield dumps(raw_result_to_dict(result))
        return
    cut = at + len(_CIRCUITS_KEY) - 1  # just before the closing bracket of []
    yield text[:cut] + "\n"
    count = len(result.circuits)
    for start in range(0, count, CIRCUITS_PER_PIECE):
        rows = result.circuits[start:start + CIRCUITS_PER_PIECE]
        piece = ",\n".join("    " + indented_json(clean(circuit_to_dict(result, label, metrics)), 2)
                           for label, metrics in rows)
        yield json_safe(piece) + (",\n" if start + CIRCUITS_PER_PIECE < count else "\n  ")
    yield text[cut:]


__all__ = ["CONTRACT_KEYS", "bootstrap_to_dict", "circuit_to_dict", "indented_json", "raw_result_json_pieces",
           "raw_result_to_dict"]
