"""Fast bootstrap of a mean: exact where the structure allows it, and with a
stated error bound where it does not.

A bootstrap replicate of the mean of N values x_i is sum_i w_i x_i / N with
w ~ Multinomial(N, 1/N, ..., 1/N).  Plain resampling draws N indices per
replicate; three shortcuts avoid that.

* **Several circuits (cluster bootstrap).**  Resampling circuits needs only
  each circuit's sum S_c and count n_c: a replicate of the pooled mean is
  sum_c m_c S_c / sum_c m_c n_c with m ~ Multinomial(K, 1/K), whatever the
  number of samples.  Up to ``groups`` circuits the weights are drawn per
  circuit (exact); beyond, circuits are grouped by their linearised residual S_c - R n_c
  into about ``groups`` value bins exactly as for one sample below: the group
  counts M ~ Multinomial(K, k_b/K) are exact, and the within-group part of
  (sum S, sum n) is a bivariate Gaussian with its exact conditional
  covariance, so the cost per replicate is at most ``groups`` whatever K, with
  the same sqrt(2 eps) error bound (eps the within-group share of the
  linearised residuals S_c - R n_c).

Intervals over few circuits.  A percentile (or basic) interval from
resampling K circuits undercovers when K is small: the bootstrap variance is
(K - 1)/K of the usual one and its quantiles carry no t-like tails (measured
over seeded simulations with the project's simulator, 8 qubits, F = 0.5, 500
samples per circuit, nominal 95%: benchmarks/cluster_intervals.py and
:data:`PERCENTILE_COVERAGE`).  The interval over circuits reported first is
therefore the t interval on K - 1 degrees of freedom with the linearised
cluster standard error sqrt(K/(K - 1) sum_c (S_c - R n_c)^2) / N (for equal
n_c the one-sample t interval of the circuit means), which holds its level
whenever the circuit means are near Gaussian: measured 94-96% from K = 2.
* **Zero/one data (heavy outputs of one circuit), exact.**  The resampled
  number of ones is Binomial(N, h); a replicate is that over N.
* **Any other single sample: binned, with a bound.**  Sort the values into
  bins b (n_b values, mean m_b, within-bin variance s_b^2).  The number of
  resampled values that land in each bin is exactly M ~ Multinomial(N, n_b/N)
  (the multinomial aggregates exactly over a partition).  Given M, the
  resampled sum is A + R with A = sum_b M_b m_b and R a sum of M_b centred
  draws inside each bin: E[R | M] = 0 and Var[R | M] = sum_b M_b s_b^2.  So

      Var(replicate sum) = Var(A) + N W,   W = sum_b n_b s_b^2 / N,

  and using A alone shrinks the bootstrap variance by exactly the factor
  (1 - eps), eps = W / sigma^2 (sigma^2 the plug-in variance of the data).
  We draw A exactly and add a Gaussian draw with the exact conditional
  variance sum_b M_b s_b^2 for R (each M_b is of order N/bins, so R|M is a
  sum of many small terms and very nearly Gaussian).  The replicates then have
  exactly the mean and variance of the plain bootstrap.  Error bound, exact
  and reported: coupling each of our replicates with a plain-bootstrap
  replicate through the same M (and independent within-bin parts), their
  root-mean-square difference is sqrt(2 eps) times the bootstrap standard
  deviation.  Bins are the union of equal-count and equal-width cuts, which
  keeps eps near 1e-6 for Porter-Thomas data (the tail bins stay narrow).

References
----------
B. Efron and R. J. Tibshirani, "An Introduction to the Bootstrap", Chapman &
Hall (1993): percentile interval (ch. 13) and the basic ("hybrid") interval
2 theta_hat - q(1 - alpha/2) ... (ch. 13, also Davison and Hinkley,
"Bootstrap Methods and their Application", CUP (1997), eq. 5.6).
Cluster (case) resampling of whole groups: Davison and Hinkley (1997), sec. 3.8.
(Chapter, section and equation numbers from memory.)
The multinomial aggregation over a partition is the usual property of the
multinomial distribution (common practice).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

DEFAULT_GROUPS = 1024
# Coverage of the nominal-95% percentile interval from resampling K circuits, measured by
# benchmarks/cluster_intervals.py (8 qubits, F = 0.5, 500 samples per circuit, 2000 seeded
# datasets per K); below PERCENTILE_MIN_CIRCUITS it misses nominal by more than 2 points.
PERCENTILE_COVERAGE = {2: 0.50, 3: 0.72, 5: 0.84, 8: 0.875, 20: 0.93, 50: 0.93}
PERCENTILE_MIN_CIRCUITS = 60
# Replicates drawn per block: keeps the (block x categories) count matrices
# near 2 MB (cache-sized, and reused rather than freshly mapped) whatever the
# number of replicates.
_BLOCK_CELLS = 1 << 18


@dataclass(frozen=True, eq=False)
class BinnedSample:
    """A sample summarised by value-ordered bins.

    Attributes
    ----------
    counts, sums, sums_sq : ndarray
        Per bin: number of values, their sum and their sum of squares, bins in
        increasing order of value.
    """

    counts: np.ndarray
    sums: np.ndarray
    sums_sq: np.ndarray

    @property
    def n(self) -> int:
        return int(self.counts.sum())

    @property
    def mean(self) -> float:
        return float(self.sums.sum() / self.counts.sum())

    def within_ss(self) -> np.ndarray:
        """Sum of squared deviations from the bin mean, per bin (>= 0)."""
        with np.errstate(invalid="ignore", divide="ignore"):
            ss = self.sums_sq - np.where(self.counts > 0, self.sums ** 2 / self.counts, 0.0)
        return np.maximum(ss, 0.0)

    def total_ss(self) -> float:
        """Sum of squared deviations from the overall mean."""
        n = self.counts.sum()
        # Between-bin plus within-bin parts: stabler than sum(x^2) - (sum x)^2 / n.
        means = np.where(self.counts > 0, self.sums / np.maximum(self.counts, 1), 0.0)
        between = float(np.sum(self.counts * (means - self.sums.sum() / n) ** 2))
        return between + float(self.within_ss().sum())

    def within_share(self) -> float:
        """eps = within-bin variance / total variance (0 when all values are equal)."""
        total = self.total_ss()
        return float(self.within_ss().sum() / total) if total > 0 else 0.0


def value_bin_edges(values: np.ndarray, groups: int = DEFAULT_GROUPS) -> np.ndarray:
    """Inner bin edges: the union of ``groups // 2`` equal-count and
    ``groups // 2`` equal-width cuts.  A value v falls in bin
    ``searchsorted(edges, v, side="right")``.

    Equal-count bins keep the dense middle fine; equal-width bins keep the
    sparse tail fine, where equal-count bins alone would be wide.
    """
    x = np.asarray(values, dtype=float).ravel()
    if x.size == 0:
        raise ValueError("cannot bin an empty sample")
    half = max(1, groups // 2)
    lo, hi = float(x.min()), float(x.max())
    quantile_edges = np.quantile(x, np.linspace(0.0, 1.0, half + 1)[1:-1])
    width_edges = np.linspace(lo, hi, half + 1)[1:-1] if hi > lo else np.empty(0)
    return np.unique(np.concatenate([quantile_edges, width_edges]))


def bin_values(values: np.ndarray, groups: int = DEFAULT_GROUPS) -> BinnedSample:
    """Bin an in-memory sample by value (see :func:`value_bin_edges`)."""
    x = np.asarray(values, dtype=float).ravel()
    edges = value_bin_edges(x, groups)
    index = np.searchsorted(edges, x, side="right")
    size = edges.size + 1
    counts = np.bincount(index, minlength=size).astype(float)
    sums = np.bincount(index, weights=x, minlength=size)
    sums_sq = np.bincount(index, weights=x * x, minlength=size)
    keep = counts > 0
    return BinnedSample(counts[keep], sums[keep], sums_sq[keep])


def coarsen_bins(counts: np.ndarray, sums: np.ndarray, sums_sq: np.ndarray,
                 groups: int = DEFAULT_GROUPS) -> BinnedSample:
    """Merge adjacent fine bins (already in value order) into at most about
    ``groups`` bins, cut where either an equal-count or an equal-width cut falls.

    The merged bins keep exact counts, sums and sums of squares, so the
    within-bin share eps is computed exactly, not estimated.
    """
    counts = np.asarray(counts, dtype=float)
    keep = counts > 0
    counts, sums, sums_sq = counts[keep], np.asarray(sums, float)[keep], np.asarray(sums_sq, float)[keep]
    if counts.size == 0:
        raise ValueError("cannot bootstrap an empty sample")
    half = max(1, groups // 2)
    if counts.size <= groups:
        return BinnedSample(counts, sums, sums_sq)
    n = counts.sum()
    before = np.cumsum(counts) - counts
    by_count = np.floor(before * half / n)
    means = sums / counts
    lo, hi = means[0], means[-1]
    by_width = np.floor((means - lo) * half / (hi - lo)) if hi > lo else np.zeros_like(means)
    new_group = np.empty(counts.size, dtype=bool)
    new_group[0] = True
    new_group[1:] = (by_count[1:] != by_count[:-1]) | (by_width[1:] != by_width[:-1])
    starts = np.flatnonzero(new_group)
    return BinnedSample(np.add.reduceat(counts, starts), np.add.reduceat(sums, starts),
                        np.add.reduceat(sums_sq, starts))


@dataclass(frozen=True, eq=False)
class BootstrapResult:
    """Bootstrap replicates of one estimate, with how they were made.

    Attributes
    ----------
    estimate : float
        The estimate from the full data.
    replicates : ndarray
        One value per replicate.
    method : str
        ``circuits`` (cluster, exact), ``binomial`` (0/1 data, exact),
        ``binned`` (single sample, error-bounded) or ``plain`` (reference).
    within_share : float
        eps for ``binned`` (0 for the exact methods).
    error_bound : float
        Root-mean-square distance, in the estimate's units, between a replicate
        and a plain-bootstrap replicate coupled with it (0 for exact methods).
    bins : int
        Number of bins (``binned``) or circuits (``circuits``).
    """

    estimate: float
    replicates: np.ndarray
    method: str
    within_share: float = 0.0
    error_bound: float = 0.0
    bins: int = 0

    @property
    def count(self) -> int:
        return int(self.replicates.size)

    @property
    def sd(self) -> float:
        return float(np.std(self.replicates, ddof=1)) if self.replicates.size > 1 else 0.0

    def shifted(self, offset: float) -> "BootstrapResult":
        """The same replicates for the estimate plus a constant (mean(x) - 1,
        mean(ln x) + gamma)."""
        return BootstrapResult(self.estimate + offset, self.replicates + offset, self.method,
                               self.within_share, self.error_bound, self.bins)

    def percentile_interval(self, level: float = 0.95) -> tuple[float, float]:
        """(q(alpha/2), q(1 - alpha/2)) of the replicates (Efron and Tibshirani 1993, ch. 13)."""
        return percentile_interval(self.replicates, level)

    def basic_interval(self, level: float = 0.95) -> tuple[float, float]:
        """(2 theta - q(1 - alpha/2), 2 theta - q(alpha/2)) (Davison and Hinkley 1997, eq. 5.6)."""
        return basic_interval(self.estimate, self.replicates, level)


def percentile_interval(replicates: np.ndarray, level: float = 0.95) -> tuple[float, float]:
    alpha = 1.0 - level
    lo, hi = np.quantile(replicates, [alpha / 2.0, 1.0 - alpha / 2.0])
    return float(lo), float(hi)


def basic_interval(estimate: float, replicates: np.ndarray, level: float = 0.95) -> tuple[float, float]:
    lo, hi = percentile_interval(replicates, level)
    return 2.0 * estimate - hi, 2.0 * estimate - lo


def _blocks(replicates: int, cells_per_replicate: int):
    per_block = max(1, _BLOCK_CELLS // max(1, cells_per_replicate))
    done = 0
    while done < replicates:
        size = min(per_block, replicates - done)
        yield done, size
        done += size


def binned_mean_bootstrap(binned: BinnedSample, replicates: int, rng: np.random.Generator,
                          gaussian_within: bool = True) -> BootstrapResult:
    """Replicates of the mean from value bins (see the module docstring).

    Parameters
    ----------
    binned : BinnedSample
    replicates : int
    rng : numpy.random.Generator
    gaussian_within : bool
        Add the Gaussian within-bin term (exact bootstrap mean and variance).
        Without it the replicate variance is short by exactly the factor 1 - eps.

    Returns
    -------
    BootstrapResult with ``method="binned"``.
    """
    counts = binned.counts
    n = int(round(counts.sum()))
    means = binned.sums / counts
    within_var = binned.within_ss() / counts
    pvals = counts / counts.sum()
    out = np.empty(replicates)
    for start, size in _blocks(replicates, counts.size):
        draws = rng.multinomial(n, pvals, size=size).astype(float)
        total = draws @ means
        if gaussian_within:
            total += np.sqrt(draws @ within_var) * rng.standard_normal(size)
        out[start:start + size] = total / n
    eps = binned.within_share()
    plain_sd = math.sqrt(binned.total_ss() / n) / math.sqrt(n)
    bound = math.sqrt((2.0 if gaussian_within else 1.0) * eps) * plain_sd
    return BootstrapResult(binned.mean, out, "binned", eps, bound, int(counts.size))


def cluster_ratio_bootstrap(sums: np.ndarray, counts: np.ndarray, replicates: int,
                            rng: np.random.Generator, groups: int = DEFAULT_GROUPS) -> BootstrapResult:
    """Cluster bootstrap of the pooled mean sum(S_c) / sum(n_c): resample whole
    circuits with replacement (module docstring).  Exact up to ``groups``
    circuits; beyond, grouped with a stated error bound, at a cost per
    replicate of about ``groups`` whatever the number of circuits."""
    sums = np.asarray(sums, dtype=float)
    counts = np.asarray(counts, dtype=float)
    k = sums.size
    if k < 2:
        raise ValueError("the cluster bootstrap needs at least two circuits")
    ratio = float(sums.sum() / counts.sum())
    if k <= groups:
        out = np.empty(replicates)
        weights = np.full(k, 1.0 / k)
        for start, size in _blocks(replicates, k):
            m = rng.multinomial(k, weights, size=size).astype(float)
            out[start:start + size] = (m @ sums) / (m @ counts)
        return BootstrapResult(ratio, out, "circuits", bins=k)
    return _grouped_cluster_bootstrap(sums, counts, ratio, replicates, rng, groups)


def _grouped_cluster_bootstrap(sums, counts, ratio, replicates, rng, groups) -> BootstrapResult:
    k = sums.size
    # Grouped by the linearised residual S_c - R n_c, which is what a replicate's departure
    # from R is made of (to first order): equal-count and equal-width cuts keep eps small.
    resid = sums - ratio * counts
    edges = value_bin_edges(resid, groups)
    index = np.searchsorted(edges, resid, side="right")
    size = edges.size + 1
    members = np.bincount(index, minlength=size).astype(float)
    keep = members > 0
    members = members[keep]

    def per_group(w):
        return np.bincount(index, weights=w, minlength=size)[keep]

    s1, n1 = per_group(sums), per_group(counts)
    ss, nn, sn = per_group(sums * sums), per_group(counts * counts), per_group(sums * counts)
    mean_s, mean_n = s1 / members, n1 / members
    # Within-group (co)variances per member, >= 0 up to rounding.
    var_s = np.maximum(ss / members - mean_s ** 2, 0.0)
    var_n = np.maximum(nn / members - mean_n ** 2, 0.0)
    cov = sn / members - mean_s * mean_n
    pvals = members / k
    out = np.empty(replicates)
    for start, size_ in _blocks(replicates, members.size):
        m = rng.multinomial(k, pvals, size=size_).astype(float)
        a_s, a_n = m @ mean_s, m @ mean_n
        # The within-group part of (sum S, sum n): Gaussian with covariance sum_b M_b C_b.
        vs, vn, c = m @ var_s, m @ var_n, m @ cov
        z1, z2 = rng.standard_normal(size_), rng.standard_normal(size_)
        sd_s = np.sqrt(vs)
        rho = np.where(sd_s > 0, c / np.where(sd_s > 0, sd_s, 1.0), 0.0)
        out[start:start + size_] = (a_s + sd_s * z1) / (a_n + rho * z1 + np.sqrt(np.maximum(vn - rho ** 2, 0.0)) * z2)
    total = float(np.sum(resid ** 2))
    within = float(np.sum((resid - (per_group(resid) / members)[np.searchsorted(np.flatnonzero(keep), index)]) ** 2))
    eps = within / total if total > 0 else 0.0
    sd = math.sqrt(total / k) / float(counts.sum()) * math.sqrt(k)
    return BootstrapResult(ratio, out, "circuits, grouped", eps, math.sqrt(2.0 * eps) * sd, int(members.size))


@dataclass(frozen=True)
class ClusterInterval:
    """The t interval over K circuits on K - 1 degrees of freedom.

    Attributes
    ----------
    low, high : float
    estimate, stat_error : float
        The pooled estimate and its linearised cluster standard error.
    circuits : int
    level : float
    """

    low: float
    high: float
    estimate: float
    stat_error: float
    circuits: int
    level: float

    @property
    def dof(self) -> int:
        return self.circuits - 1


def cluster_t_interval(sums: np.ndarray, counts: np.ndarray, level: float = 0.95) -> ClusterInterval:
    """R +- t_{K-1}(1 - alpha/2) se over circuits, se = sqrt(K/(K - 1) sum_c
    (S_c - R n_c)^2) / N (module docstring).

    References
    ----------
    W. G. Cochran, "Sampling Techniques", 3rd ed., Wiley (1977), ch. 6 (the
    ratio estimator's variance from cluster totals); the t interval on K - 1
    degrees of freedom for few clusters: A. C. Cameron and D. L. Miller, "A
    practitioner's guide to cluster-robust inference", J. Human Resources 50,
    317 (2015), section VI (from memory).
    """
    from scipy.stats import t as student_t

    sums = np.asarray(sums, dtype=float)
    counts = np.asarray(counts, dtype=float)
    k = sums.size
    if k < 2:
        raise ValueError("an interval over circuits needs at least two circuits")
    n = float(counts.sum())
    ratio = float(sums.sum()) / n
    resid = sums - ratio * counts
    se = math.sqrt(k / (k - 1) * float(np.sum(resid ** 2))) / n
    half = float(student_t.ppf(0.5 + level / 2.0, k - 1)) * se
    return ClusterInterval(ratio - half, ratio + half, ratio, se, int(k), float(level))


def cluster_mean_bootstrap(values: np.ndarray, replicates: int, rng: np.random.Generator) -> BootstrapResult:
    """Exact cluster bootstrap of an equal-weight mean of per-circuit values."""
    values = np.asarray(values, dtype=float)
    return cluster_ratio_bootstrap(values, np.ones_like(values), replicates, rng)


def binomial_bootstrap(successes: int, n: int, replicates: int, rng: np.random.Generator) -> BootstrapResult:
    """Exact bootstrap of a proportion of 0/1 values: Binomial(n, k/n) / n."""
    if n < 1:
        raise ValueError("the bootstrap needs at least one value")
    out = rng.binomial(n, successes / n, size=replicates) / n
    return BootstrapResult(successes / n, out.astype(float), "binomial", bins=2)


def plain_mean_bootstrap(values: np.ndarray, replicates: int, rng: np.random.Generator) -> BootstrapResult:
    """Reference: plain resampling of every value for every replicate (slow;
    for tests and benchmarks)."""
    x = np.asarray(values, dtype=float).ravel()
    out = np.empty(replicates)
    for i in range(replicates):
        out[i] = x[rng.integers(0, x.size, size=x.size)].mean()
    return BootstrapResult(float(x.mean()), out, "plain", bins=int(x.size))


def histogram(replicates: np.ndarray, bins: int = 40) -> tuple[np.ndarray, np.ndarray]:
    """(edges, density) of the replicates, for a plot."""
    r = np.asarray(replicates, dtype=float)
    lo, hi = float(r.min()), float(r.max())
    if hi <= lo:
        half = abs(lo) * 1e-6 or 1e-12
        lo, hi = lo - half, hi + half
    density, edges = np.histogram(r, bins=bins, range=(lo, hi), density=True)
    return edges, density
