"""Per-circuit estimates as arrays: the same numbers as
:func:`checker.raw.estimators.circuit_estimates`, computed once over all
circuits with numpy and turned into :class:`MetricEstimate` objects only for
the rows a renderer reads.

Why not the plain loop: over 100,000 circuits of 10 samples it built 200,000
estimates through the metric models one scalar call at a time (several
seconds) and held them all (about 100 MB of small objects).  Here every
estimate is an element of an array and a row's objects are made when asked
for, so the text report (which shows 12 rows) never makes the others.

The model variances are the metric models' own formulas, called once with
the array of estimates (they are written elementwise with
:mod:`checker.stats.elementwise`).  Every other operation below repeats the
plain path's, in the same order and on the same IEEE doubles (``+ - * /`` and
``sqrt`` round the same in numpy as in Python), so each number is bit for bit
the one the plain path gives; where the plain path uses Python's ``max``/``min``
the arrays use the comparisons that choose the same operand (NaN and -0.0
included).  tests/raw/test_circuit_table.py holds the two paths equal on random
and edge-case sums.
"""

from __future__ import annotations

from dataclasses import dataclass
from collections.abc import Sequence
from typing import Iterator

import numpy as np

from ..metrics import METRICS, ModelInputs
from ..stats.elementwise import clip_unit
from ..stats.fidelity_fit import finite_dimension_factor
from ..stats.porter_thomas import EULER_GAMMA, dimension_of, log_xeb_offsets
from .estimators import MetricEstimate, Sums, circuit_estimates


def _py_max_x0(x: np.ndarray) -> np.ndarray:
    """Python's max(x, 0.0) elementwise: x unless 0.0 > x (so -0.0 and NaN stay)."""
    return np.where(0.0 > x, 0.0, x)


def _sample_sd(n: np.ndarray, s: np.ndarray, s2: np.ndarray) -> np.ndarray:
    """The sample standard deviation of estimators' plain path elementwise; NaN where n < 2 (None there)."""
    with np.errstate(invalid="ignore", divide="ignore"):
        mean = s / n
        sd = np.sqrt(_py_max_x0(s2 - n * mean * mean) / (n - 1))
    return np.where(n < 2, np.nan, sd)


def _within_variances(metric: str, est: np.ndarray, dim) -> np.ndarray:
    """The metric model's own within_variance(est), elementwise over the circuits: one formula for both paths."""
    return METRICS[metric].within_variance(est, ModelInputs(dimension=dim))


def _errors(n, s, s2, est, within_var):
    """(model error sqrt(w / n), data error sd / sqrt(n), ratio data / model) with NaN for None."""
    sd = _sample_sd(n, s, s2)
    with np.errstate(invalid="ignore", divide="ignore"):
        data = sd / np.sqrt(n)
        model = np.sqrt(within_var / n)
        ratio = np.where(model > 0, data / model, np.nan)
    return model, data, ratio


def _value(x: float):
    return None if x != x else x  # NaN stands for None


@dataclass(frozen=True, eq=False)
class CircuitEstimates(Sequence):
    """The per-circuit estimates of every metric, one array element per circuit.

    A sequence of ``(label, {metric name: MetricEstimate})`` like the tuple the
    plain path builds; a row's objects are made when it is read.
    """

    labels: tuple
    qubits: int
    n: np.ndarray
    columns: dict  # metric -> dict of arrays: estimate, model, data, ratio, extras, and "zeros" / "has"
    order: tuple  # metric names in the order of the plain path's dicts

    def __len__(self) -> int:
        return len(self.labels)

    def __getitem__(self, index):
        if isinstance(index, slice):
            return [self._row(i) for i in range(*index.indices(len(self)))]
        i = int(index)
        if i < 0:
            i += len(self)
        if not 0 <= i < len(self):
            raise IndexError(index)
        return self._row(i)

    def __iter__(self) -> Iterator:
        for i in range(len(self)):
            yield self._row(i)

    def _row(self, c: int) -> tuple:
        n = self.n[c]
        metrics = {}
        for name in self.order:
            col = self.columns[name]
            if "has" in col and not col["has"][c]:
                continue
            count = col.get("count", self.n)[c]
            if "zeros" in col and col["zeros"][c]:
                metrics[name] = MetricEstimate(name, None, None, None, int(n), None,
                                               note=f"{int(col['zeros'][c])} samples have probability 0, so "
                                                    "ln(D p) is minus infinity")
                continue
            extra = {key: float(values[c]) if isinstance(values, np.ndarray) else values
                     for key, values in col["extra"].items()}
            metrics[name] = MetricEstimate(name, float(col["estimate"][c]), _value(float(col["model"][c])),
                                           _value(float(col["data"][c])), int(count),
                                           _value(float(col["ratio"][c])), extra)
        return self.labels[c], metrics


def circuit_table(sums: Sums, labels) -> Sequence:
    """Per circuit, ``(label, {metric name: MetricEstimate})``: the numbers of
    :func:`~checker.raw.estimators.circuit_estimates`, as arrays.  Falls back
    to the plain loop where it would raise (a circuit of no samples)."""
    labels = tuple(labels)
    n = np.asarray(sums.n, dtype=float)
    if n.size != len(labels) or not np.all(n > 0):
        return tuple(zip(labels, circuit_estimates(sums)))
    dim = dimension_of(sums.qubits)
    columns, order = {}, ["linear-xeb"]
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        est = sums.sum_x / n - 1.0
        model, data, ratio = _errors(n, sums.sum_x, sums.sum_x2, est, _within_variances("linear-xeb", est, dim))
        factor = finite_dimension_factor(dim)
        columns["linear-xeb"] = {"estimate": est, "model": model, "data": data, "ratio": ratio,
                                 "extra": {"fidelity_finite_d": est / factor, "finite_d_factor": factor}}
        if sums.sum_l is not None:
            order.append("log-xeb")
            est = sums.sum_l / n + EULER_GAMMA
            model, data, ratio = _errors(n, sums.sum_l, sums.sum_l2, est, _within_variances("log-xeb", est, dim))
            u, i = log_xeb_offsets(dim)
            columns["log-xeb"] = {"estimate": est, "model": model, "data": data, "ratio": ratio,
                                  "zeros": np.asarray(sums.zeros), "extra": {"fidelity_finite_d": (est - u) / (i - u)}}
        if sums.heavy_n is not None:
            order.append("heavy-output")
            hn = np.asarray(sums.heavy_n, dtype=float)
            has = hn > 0
            h = sums.heavy_sum / hn
            p = clip_unit(h)
            var = p * (1.0 - p)
            model = np.sqrt(var / hn)
            sd = _sample_sd(hn, sums.heavy_sum, sums.heavy_sum)
            data = sd / np.sqrt(hn)
            ratio = np.where(model > 0, data / model, np.nan)
            columns["heavy-output"] = {"estimate": h, "model": model, "data": data, "ratio": ratio, "has": has,
                                       "count": hn, "extra": {}}
    return CircuitEstimates(labels, sums.qubits, n, columns, tuple(order))
