"""Per-circuit estimators fed chunk by chunk: running sums per circuit, value
bins for the likelihood fit and the bootstrap, and a uniform subsample for the
goodness-of-fit tests and the histogram.

Estimates, with x = D p the scaled ideal probability of a sampled outcome:

* linear XEB: mean(x) - 1 (as printed in papers); also divided by the
  finite-D factor (D - 1)/(D + 1), the unbiased Porter-Thomas fidelity;
* log XEB: mean(ln x) + Euler's gamma;
* heavy output: the fraction of heavy samples per circuit; combined as the
  mean over circuits (Cross et al. 2019).

Each has a standard error from the metric model (checker.metrics, at the
estimate) and one from the data (the sample standard deviation over sqrt(N));
for the combined estimate over several circuits also a between-circuit one
(the usual linearised standard error of a ratio of cluster totals).

The model error of one circuit's estimate is that of its own samples,
sqrt((v - B)/n): v the per-sample variance, B the circuit-to-circuit variance
of each circuit's own mean, v - B the expected variance inside one circuit.
The model error of the combined estimate over circuits with n_c samples each
(N in all) adds what the circuits' own means scatter by:
sqrt((v - B)/N + B sum n_c^2 / N^2), sqrt((v - B)/N + B/K) for equal counts
(checker.stats.porter_thomas).  Its ratio compares like with like: the
between-circuit error from the data over this model error when there are two
or more circuits, else the data's per-sample error over sqrt((v - B)/N).
Without a circuit column the number of circuits is not known and the model
error is sqrt(v/N), the smallest any number of circuits allows.

References
----------
S. Boixo et al., Nature Physics 14, 595 (2018), arXiv:1608.00263.
A. W. Cross et al., Phys. Rev. A 100, 032328 (2019), arXiv:1811.12926.
W. G. Cochran, "Sampling Techniques", 3rd ed., Wiley (1977), ch. 6 (variance
of a ratio estimator from cluster totals; from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

import numpy as np

from ..metrics import METRICS, ModelInputs
from ..stats.fidelity_fit import finite_dimension_factor, log_xeb_finite_dimension
from ..stats.porter_thomas import EULER_GAMMA, dimension_of

# Fine value bins: the top (sign, exponent and MANTISSA_BITS mantissa) bits of
# each float64 probability; adjacent bins differ by a factor 1 + 2^-8 at most.
MANTISSA_BITS = 8
_SHIFT = 52 - MANTISSA_BITS
_FINE_BINS = (1023 << MANTISSA_BITS) + 1  # p = 1.0 is the last index
METRIC_NAMES = ("linear-xeb", "log-xeb", "heavy-output")
# Inner products of rows this short stay on one BLAS thread: above about
# 10,000 elements OpenBLAS wakes its worker threads for every call, which on a
# busy machine cost tens of nanoseconds per element (measured here).  One
# stacked matmul of the rows keeps it to one Python call per chunk and one
# pass over the data (squaring into a buffer and summing is two).
_DOT_BLOCK = 8192


def sum_of_squares(values: np.ndarray) -> float:
    """sum(values**2) of a contiguous 1-d array, in single-threaded BLAS rows."""
    n = values.size
    m = n - n % _DOT_BLOCK
    total = 0.0
    if m:
        rows = values[:m].reshape(-1, _DOT_BLOCK)
        total = float(np.matmul(rows[:, None, :], rows[:, :, None]).sum())
    if m < n:
        tail = values[m:]
        total += float(np.dot(tail, tail))
    return total


@dataclass(frozen=True, eq=False)
class FineBins:
    """Global value bins in increasing order of p (hence of x and ln x)."""

    counts: np.ndarray
    sum_x: np.ndarray
    sum_x2: np.ndarray
    sum_l: np.ndarray | None = None
    sum_l2: np.ndarray | None = None


@dataclass(frozen=True, eq=False)
class Sums:
    """Everything the streaming pass keeps: per-circuit sums, bins, subsample."""

    qubits: int
    labels: tuple
    n: np.ndarray
    sum_x: np.ndarray
    sum_x2: np.ndarray
    sum_l: np.ndarray | None
    sum_l2: np.ndarray | None
    zeros: np.ndarray
    heavy_n: np.ndarray | None
    heavy_sum: np.ndarray | None
    bins: FineBins | None
    sample: np.ndarray

    @property
    def rows(self) -> int:
        return int(self.n.sum())

    @property
    def circuits(self) -> int:
        return int(self.n.size)

    @property
    def scale(self) -> float:
        return 2.0 ** self.qubits


class Accumulator:
    """Running sums over chunks.

    Parameters
    ----------
    qubits : int
        D = 2**qubits scales p to x.
    logs : bool
        Keep sums of ln x (log XEB).
    bins : bool
        Keep global fine value bins of x (likelihood fit, single-circuit bootstrap).
    bin_logs : bool
        Also keep sums of ln x per bin (single-circuit bootstrap of log XEB).
    sample_size : int
        Size of the uniform subsample of x kept (0 for none).
    total_rows : int, optional
        When known, the subsample positions are drawn up front.
    rng : numpy.random.Generator
    """

    def __init__(self, qubits: int, logs: bool = True, bins: bool = True, bin_logs: bool = False,
                 sample_size: int = 100_000, total_rows: int | None = None,
                 rng: np.random.Generator | None = None):
        self.qubits = int(qubits)
        self.scale = 2.0 ** self.qubits
        self.log_scale = self.qubits * math.log(2.0)
        self.logs = logs
        self.rng = rng if rng is not None else np.random.default_rng(0)
        cap = 16
        self._k = 0
        self.n = np.zeros(cap)
        self.sp = np.zeros(cap)
        self.sp2 = np.zeros(cap)
        self.sl = np.zeros(cap) if logs else None
        self.sl2 = np.zeros(cap) if logs else None
        self.zeros = np.zeros(cap)
        self.hn = np.zeros(cap)
        self.hs = np.zeros(cap)
        self.has_heavy = False
        self.bins = bins
        self.bin_logs = bin_logs and logs
        if bins:
            # np.zeros maps untouched pages lazily, so unused bins cost no memory.
            self.bc = np.zeros(_FINE_BINS)
            self.bp = np.zeros(_FINE_BINS)
            self.bp2 = np.zeros(_FINE_BINS)
            self.bl = np.zeros(_FINE_BINS) if self.bin_logs else None
            self.bl2 = np.zeros(_FINE_BINS) if self.bin_logs else None
        self.sample_size = int(sample_size)
        self.positions = None
        self.sample_parts: list = []
        self.keys_parts: list = []
        self.threshold = math.inf
        if self.sample_size and total_rows is not None:
            k = min(self.sample_size, total_rows)
            self.positions = np.sort(self.rng.choice(total_rows, size=k, replace=False))
        self._buffers: dict = {}

    def _buffer(self, name: str, n: int, dtype=float) -> np.ndarray:
        buf = self._buffers.get(name)
        if buf is None or buf.size < n:
            buf = self._buffers[name] = np.empty(max(n, 1), dtype=dtype)
        return buf[:n]

    def _grow(self, k: int) -> None:
        if k <= self.n.size:
            self._k = max(self._k, k)
            return
        cap = max(k, 2 * self.n.size)
        for name in ("n", "sp", "sp2", "sl", "sl2", "zeros", "hn", "hs"):
            old = getattr(self, name)
            if old is None:
                continue
            new = np.zeros(cap)
            new[:old.size] = old
            setattr(self, name, new)
        self._k = max(self._k, k)

    def add(self, chunk) -> None:
        p = np.ascontiguousarray(chunk.probability, dtype=float)
        n = p.size
        if n == 0:
            return
        codes = chunk.circuit
        logs = None
        if self.logs:
            logs = self._buffer("log", n)
            with np.errstate(divide="ignore"):
                np.log(p, out=logs)
            logs += self.log_scale
            zero = None
            if logs.min() == -math.inf:  # ln 0
                zero = p == 0.0
                logs[zero] = 0.0
        if codes is None:
            self._grow(1)
            self.n[0] += n
            self.sp[0] += p.sum()
            self.sp2[0] += sum_of_squares(p)
            if logs is not None:
                self.sl[0] += logs.sum()
                self.sl2[0] += sum_of_squares(logs)
                if zero is not None:
                    self.zeros[0] += np.count_nonzero(zero)
            if chunk.heavy is not None:
                self.has_heavy = True
                self.hn[0] += n
                self.hs[0] += chunk.heavy.sum()
        else:
            square = self._buffer("square", n)
            np.multiply(p, p, out=square)
            k = int(codes.max()) + 1
            self._grow(k)
            self.n[:k] += np.bincount(codes, minlength=k)
            self.sp[:k] += np.bincount(codes, weights=p, minlength=k)
            self.sp2[:k] += np.bincount(codes, weights=square, minlength=k)
            if logs is not None:
                self.sl[:k] += np.bincount(codes, weights=logs, minlength=k)
                np.multiply(logs, logs, out=square)
                self.sl2[:k] += np.bincount(codes, weights=square, minlength=k)
                if zero is not None:
                    self.zeros[:k] += np.bincount(codes, weights=zero.astype(float), minlength=k)
            if chunk.heavy is not None:
                self.has_heavy = True
                self.hn[:k] += np.bincount(codes, minlength=k)
                self.hs[:k] += np.bincount(codes, weights=chunk.heavy, minlength=k)
        if self.bins:
            self._add_bins(p, logs)
        if self.sample_size:
            self._add_sample(chunk.start, p)

    def _add_bins(self, p: np.ndarray, logs: np.ndarray | None) -> None:
        index = self._buffer("index", p.size, np.int64)
        # p >= 0, so the int64 view of its bits is non-negative and ordered like p.
        np.right_shift(p.view(np.int64), _SHIFT, out=index)
        lo, hi = int(index.min()), int(index.max())
        index -= lo
        size = hi - lo + 1
        window = slice(lo, hi + 1)
        self.bc[window] += np.bincount(index, minlength=size)
        self.bp[window] += np.bincount(index, weights=p, minlength=size)
        square = self._buffer("bin_square", p.size)
        np.multiply(p, p, out=square)
        self.bp2[window] += np.bincount(index, weights=square, minlength=size)
        if self.bin_logs and logs is not None:
            self.bl[window] += np.bincount(index, weights=logs, minlength=size)
            np.multiply(logs, logs, out=square)
            self.bl2[window] += np.bincount(index, weights=square, minlength=size)

    def _add_sample(self, start: int, p: np.ndarray) -> None:
        n = p.size
        if self.positions is not None:
            i0, i1 = np.searchsorted(self.positions, [start, start + n])
            if i1 > i0:
                self.sample_parts.append(p[self.positions[i0:i1] - start] * self.scale)
            return
        # Unknown length: keep the rows with the k smallest uniform keys (an
        # exact uniform sample without replacement), pruning as we go.
        keys = self.rng.random(n)
        keep = keys < self.threshold
        self.keys_parts.append(keys[keep])
        self.sample_parts.append(p[keep] * self.scale)
        if sum(a.size for a in self.keys_parts) > 2 * self.sample_size:
            self._prune()

    def _prune(self) -> None:
        keys = np.concatenate(self.keys_parts)
        values = np.concatenate(self.sample_parts)
        if keys.size > self.sample_size:
            order = np.argpartition(keys, self.sample_size - 1)[:self.sample_size]
            keys, values = keys[order], values[order]
            self.threshold = float(keys.max())
        self.keys_parts, self.sample_parts = [keys], [values]

    def result(self, labels) -> Sums:
        k = max(self._k, 1)
        scale = self.scale
        if self.positions is None and self.sample_size and self.keys_parts:
            self._prune()
            keys = self.keys_parts[0]
            order = np.argsort(keys, kind="stable")
            sample = self.sample_parts[0][order]
        else:
            sample = np.concatenate(self.sample_parts) if self.sample_parts else np.empty(0)
        bins = None
        if self.bins:
            used = np.flatnonzero(self.bc)
            bins = FineBins(self.bc[used], self.bp[used] * scale, self.bp2[used] * scale * scale,
                            self.bl[used] if self.bin_logs else None,
                            self.bl2[used] if self.bin_logs else None)
        labels = tuple(labels) if labels else ("all",)
        return Sums(
            qubits=self.qubits, labels=labels[:k] if len(labels) >= k else labels,
            n=self.n[:k].copy(), sum_x=self.sp[:k] * scale, sum_x2=self.sp2[:k] * scale * scale,
            sum_l=self.sl[:k].copy() if self.logs else None, sum_l2=self.sl2[:k].copy() if self.logs else None,
            zeros=self.zeros[:k].copy(),
            heavy_n=self.hn[:k].copy() if self.has_heavy else None,
            heavy_sum=self.hs[:k].copy() if self.has_heavy else None,
            bins=bins, sample=sample)


# --- estimates from sums ------------------------------------------------------

@dataclass(frozen=True)
class MetricEstimate:
    """One metric's estimate for one circuit or for all of them.

    ``stat_error`` comes from the metric model at the estimate,
    ``stat_error_data`` from the data; ``ratio`` is data over model.
    """

    metric: str
    estimate: float | None
    stat_error: float | None
    stat_error_data: float | None
    samples: int
    ratio: float | None = None
    extra: dict = field(default_factory=dict)
    note: str = ""

    def to_dict(self) -> dict:
        out = {"metric": self.metric, "estimate": self.estimate, "stat_error": self.stat_error,
               "stat_error_data": self.stat_error_data, "samples": self.samples, "ratio": self.ratio}
        out.update(self.extra)
        if self.note:
            out["note"] = self.note
        return out


def _ratio(data: float | None, model: float | None) -> float | None:
    if data is None or model is None or model <= 0:
        return None
    return data / model


def _sample_sd(n: float, s: float, s2: float) -> float | None:
    if n < 2:
        return None
    mean = s / n
    return math.sqrt(max(s2 - n * mean * mean, 0.0) / (n - 1))


def _model_error(metric: str, value: float, count: float, dimension) -> float | None:
    inputs = ModelInputs(dimension=dimension if metric in ("linear-xeb", "log-xeb") else None)
    return METRICS[metric].standard_error(value, count, inputs)


def _within_error(metric: str, value: float, count: float, dimension) -> float | None:
    """sqrt((v - B)/n): the model error of one circuit's own mean of n samples."""
    w = METRICS[metric].within_variance(value, ModelInputs(dimension=dimension))
    if w is None or count <= 0:
        return None
    return math.sqrt(w / count)


def _pooled_model_error(metric: str, value: float, n: float, counts: np.ndarray | None,
                        dimension) -> float | None:
    """sqrt((v - B)/N + B sum n_c^2 / N^2) over circuits with ``counts`` samples
    each; sqrt(v / N) when ``counts`` is None (the circuits are not known)."""
    model = METRICS[metric]
    inputs = ModelInputs(dimension=dimension)
    v = model.variance(value, inputs)
    if v is None or not n > 0:
        return None
    if counts is None:
        return math.sqrt(v / n)
    b = model.circuit_variance(value, inputs)
    return math.sqrt(max(v - b, 0.0) / n + b * float(np.sum(np.square(counts))) / (n * n))


def linear_xeb(n: float, sx: float, sx2: float, qubits: int, pooled: bool = False,
               counts: np.ndarray | None = None) -> MetricEstimate:
    """One circuit's estimate, or (``pooled``) the one over circuits with
    ``counts`` samples each (None: circuits not known)."""
    mean = float(sx) / float(n)
    est = mean - 1.0
    sd = _sample_sd(n, sx, sx2)
    data = sd / math.sqrt(n) if sd is not None else None
    dim = dimension_of(qubits)
    within = _within_error("linear-xeb", est, n, dim)
    model = _pooled_model_error("linear-xeb", est, n, counts, dim) if pooled else within
    factor = finite_dimension_factor(dim)
    return MetricEstimate("linear-xeb", est, model, data, int(n), _ratio(data, within),
                          {"fidelity_finite_d": est / factor, "finite_d_factor": factor})


def log_xeb(n: float, sl: float, sl2: float, zeros: float, qubits: int, pooled: bool = False,
            counts: np.ndarray | None = None) -> MetricEstimate:
    if zeros:
        return MetricEstimate("log-xeb", None, None, None, int(n), None,
                              note=f"{int(zeros)} samples have probability 0, so ln(D p) is minus infinity")
    est = float(sl) / float(n) + EULER_GAMMA
    sd = _sample_sd(n, sl, sl2)
    data = sd / math.sqrt(n) if sd is not None else None
    dim = dimension_of(qubits)
    within = _within_error("log-xeb", est, n, dim)
    model = _pooled_model_error("log-xeb", est, n, counts, dim) if pooled else within
    return MetricEstimate("log-xeb", est, model, data, int(n), _ratio(data, within),
                          {"fidelity_finite_d": log_xeb_finite_dimension(est, dim)})


def heavy_output(n: float, h_sum: float) -> MetricEstimate:
    h = float(h_sum) / float(n)
    model = _model_error("heavy-output", h, n, None)
    sd = _sample_sd(n, h_sum, h_sum)  # 0/1 values: sum of squares equals the sum
    data = sd / math.sqrt(n) if sd is not None else None
    return MetricEstimate("heavy-output", h, model, data, int(n), _ratio(data, model))


def circuit_estimates(sums: Sums) -> list[dict]:
    """Per circuit: {metric name: MetricEstimate}."""
    out = []
    for c in range(sums.circuits):
        metrics = {"linear-xeb": linear_xeb(sums.n[c], sums.sum_x[c], sums.sum_x2[c], sums.qubits)}
        if sums.sum_l is not None:
            metrics["log-xeb"] = log_xeb(sums.n[c], sums.sum_l[c], sums.sum_l2[c], sums.zeros[c], sums.qubits)
        if sums.heavy_n is not None and sums.heavy_n[c] > 0:
            metrics["heavy-output"] = heavy_output(sums.heavy_n[c], sums.heavy_sum[c])
        out.append(metrics)
    return out


def _cluster_error(totals: np.ndarray, counts: np.ndarray) -> float | None:
    """Linearised standard error of sum(totals) / sum(counts) over clusters."""
    k = totals.size
    if k < 2:
        return None
    r = totals.sum() / counts.sum()
    resid = totals - r * counts
    return math.sqrt(k / (k - 1) * float(np.sum(resid ** 2))) / float(counts.sum())


def _pooled(est: MetricEstimate, totals: np.ndarray, sums: Sums, known: bool) -> MetricEstimate:
    """The pooled estimate with its between-circuit error, and the ratio of like to like."""
    cluster = _cluster_error(totals, sums.n)
    extra = {**est.extra, "stat_error_circuits": cluster}
    if cluster is not None:
        return replace(est, ratio=_ratio(cluster, est.stat_error),
                       extra={**extra, "ratio_of": "between-circuit error over model error"})
    if not known:
        return replace(est, ratio=_ratio(est.stat_error_data, est.stat_error),
                       extra={**extra, "ratio_of": "per-sample error over model error (circuits not known)"})
    return replace(est, extra={**extra, "ratio_of": "per-sample error over the model's within-circuit error"})


def combined_estimates(sums: Sums, circuits_known: bool = True) -> dict:
    """All circuits together: {metric name: MetricEstimate}.  ``circuits_known``
    False (no circuit column): the model error is sqrt(v / N), the smallest any
    number of circuits allows."""
    n = float(sums.n.sum())
    counts = sums.n if circuits_known else None
    lin = linear_xeb(n, float(sums.sum_x.sum()), float(sums.sum_x2.sum()), sums.qubits, True, counts)
    out = {"linear-xeb": _pooled(lin, sums.sum_x, sums, circuits_known)}
    if sums.sum_l is not None:
        lg = log_xeb(n, float(sums.sum_l.sum()), float(sums.sum_l2.sum()), float(sums.zeros.sum()), sums.qubits,
                     True, counts)
        if lg.estimate is not None:
            lg = _pooled(lg, sums.sum_l, sums, circuits_known)
        out["log-xeb"] = lg
    if sums.heavy_n is not None:
        has = sums.heavy_n > 0
        hn, hs = sums.heavy_n[has], sums.heavy_sum[has]
        k = int(hn.size)
        if k >= 2:
            per = hs / hn
            h = float(per.mean())
            # Cross et al.: sigma = sqrt(h (1 - h) / circuits).
            model = _model_error("heavy-output", h, k, None)
            data = float(np.std(per, ddof=1)) / math.sqrt(k)
            shots = math.sqrt(float(np.sum(per * (1.0 - per) / hn))) / k
            out["heavy-output"] = MetricEstimate("heavy-output", h, model, data, int(hn.sum()),
                                                 _ratio(data, model),
                                                 {"circuits": k, "stat_error_shots": shots,
                                                  "combined_as": "mean over circuits"})
        elif k == 1:
            out["heavy-output"] = heavy_output(float(hn[0]), float(hs[0]))
    return out
