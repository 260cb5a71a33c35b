"""One streaming pass over a raw data file, then the fits, tests and
bootstrap that need only what the pass kept.

Memory is flat: the pass keeps per-circuit sums, fixed-size value bins and a
uniform subsample (``fit_sample`` rows) for the goodness-of-fit tests and the
histogram, never the data themselves.
"""

from __future__ import annotations

import numpy as np

from ..errors import DataError
from ..stats import bootstrap as boot
from ..stats.fidelity_fit import max_likelihood_fidelity, moment_fidelity
from ..stats.goodness_of_fit import fit_tests, mixture_histogram
from ..stats.porter_thomas import EULER_GAMMA, dimension_of
from .circuit_table import circuit_table
from .estimators import METRIC_NAMES, Accumulator, combined_estimates
from .readers import CHUNK_ROWS, open_table
from .result import BootstrapSummary, RawResult

DEFAULT_REPLICATES = 10_000
DEFAULT_FIT_SAMPLE = 100_000
# D^2 must stay finite in double precision for the sums of squares of x = D p.
MAX_QUBITS = 500


def analyse(path: str, metric: str, qubits: int, *, bootstrap: int = DEFAULT_REPLICATES, seed: int = 0,
            level: float = 0.95, threshold: float | None = None, fit_sample: int = DEFAULT_FIT_SAMPLE,
            estimate_only: bool = False, chunk_rows: int = CHUNK_ROWS) -> RawResult:
    """Re-derive the estimates behind a claim from a raw data file.

    Parameters
    ----------
    path : str
        CSV, NPY, NPZ or Parquet file, one row per sample.
    metric : {"linear-xeb", "log-xeb", "heavy-output"}
        The headline metric (all that the data allow are computed).
    qubits : int
        D = 2**qubits.
    bootstrap : int
        Replicates (0 for none).
    seed : int
        Seeds the subsample and the bootstrap.
    level : float
        Confidence level of the bootstrap intervals.
    threshold : float, optional
        A fidelity at which to test the goodness of fit as well.
    fit_sample : int
        Rows kept (uniformly at random) for the goodness-of-fit tests.
    estimate_only : bool
        Only the estimates and their errors: no bins, fits, tests or bootstrap
        (the fastest pass).

    Raises
    ------
    DataError
        The file cannot be used for the metric.
    """
    if metric not in METRIC_NAMES:
        raise DataError(path, f"the metric {metric!r} has no raw-data estimator",
                        f"raw data give {', '.join(METRIC_NAMES)}", path="metric")
    if not 1 <= int(qubits) <= MAX_QUBITS:
        raise DataError(path, f"qubits must be a whole number from 1 to {MAX_QUBITS}, got {qubits}",
                        "give the number of qubits of the circuits", path="qubits")
    qubits = int(qubits)
    table = open_table(path, chunk_rows=chunk_rows)
    if metric == "heavy-output" and not table.has_heavy:
        raise DataError(path, "has no heavy column", "heavy-output needs a heavy column of 0/1 per sample",
                        path="heavy")
    sample_rng, boot_rng = (np.random.default_rng(s) for s in np.random.SeedSequence(seed).spawn(2))
    logs = metric == "log-xeb" or not estimate_only
    acc = Accumulator(qubits, logs=logs, bins=not estimate_only,
                      bin_logs=(metric == "log-xeb" and not estimate_only),
                      sample_size=0 if estimate_only else fit_sample, total_rows=table.total_rows,
                      rng=sample_rng)
    for chunk in table.chunks():
        acc.add(chunk)
    sums = acc.result(table.labels)
    combined = combined_estimates(sums, circuits_known=table.has_circuit)
    if metric == "log-xeb" and combined["log-xeb"].estimate is None:
        zeros = int(sums.zeros.sum())
        raise DataError(path, f"{zeros} samples have probability 0, where ln(D p) is minus infinity",
                        "log-xeb needs probabilities above 0; linear-xeb accepts zeros", path="probability")
    labels = list(table.labels) if table.has_circuit else ["all"]
    # Arrays, not one object per circuit: 100,000 circuits cost milliseconds (circuit_table).
    circuits = circuit_table(sums, labels)
    notes = _notes(sums, table, combined)
    dim = dimension_of(qubits)

    n = float(sums.n.sum())
    mean_x = float(sums.sum_x.sum()) / n
    var_x = max(float(sums.sum_x2.sum()) - n * mean_x * mean_x, 0.0) / (n - 1) if n > 1 else 0.0
    fits = [moment_fidelity(mean_x, var_x, int(n), dim)]
    tests = []
    histogram = None
    summary = None
    if not estimate_only:
        bins = sums.bins
        # The likelihood over the fine value bins, each bin's mean standing in
        # for its values: within a bin x varies by at most 2^-8 relative, which
        # moves the fitted F by far less than its statistical error.
        fits.append(max_likelihood_fidelity(bins.sum_x / bins.counts, bins.counts))
        fitted = fits[-1].fidelity
        if sums.sample.size >= 2:
            # The circuits' own K D outcomes are the reference's resolution (goodness_of_fit).
            reference = sums.circuits * dim if dim is not None else None
            tests.extend(fit_tests(sums.sample, fitted, dim, at="fitted", reference=reference))
            if threshold is not None:
                tests.extend(fit_tests(sums.sample, threshold, dim, at="threshold", reference=reference))
            tests.extend(fit_tests(sums.sample, 0.0, dim, at="zero", reference=reference))
            histogram = mixture_histogram(sums.sample, fitted, dim)
            resolution = _resolution_note(sums, dim)
            if resolution:
                notes.append(resolution)
            if sums.sample.size < n:
                notes.append(f"The goodness-of-fit tests and the histogram use a uniform random subsample of "
                             f"{sums.sample.size:,} of the {int(n):,} rows (seed {seed}).")
        if fitted < 0.0 or fitted > 1.0:
            notes.append(f"The maximum-likelihood fidelity {fitted:.4g} lies outside [0, 1]; the tests at the "
                         "fitted fidelity use it clipped to [0, 1].")
        if bootstrap > 0:
            summary = _bootstrap(metric, sums, combined, bootstrap, boot_rng, level, seed)
            if summary.interval == "t over circuits" and summary.circuits < boot.PERCENTILE_MIN_CIRCUITS:
                cover = summary.percentile_coverage
                notes.append(f"With {summary.circuits} circuits the percentile and basic bootstrap intervals undercover"
                             + (f" (a nominal 95% percentile interval covered about {cover:.0%} in seeded simulations)"
                                if cover is not None else "")
                             + f"; the interval given first is the t interval on {summary.circuits - 1} degrees of "
                             f"freedom, which holds its level from 2 circuits when the circuit means are near "
                             f"Gaussian. Below {boot.PERCENTILE_MIN_CIRCUITS} circuits read the percentile interval "
                             "as too narrow.")
            if summary.resampling == "binned":
                notes.append(f"Bootstrap of one sample by value bins ({summary.bins} bins): the within-bin share "
                             f"of the variance is {summary.within_share:.2g}; each replicate stands within "
                             f"{summary.error_bound:.2g} (root mean square) of a plain-resampling replicate.")
    return RawResult(file=str(path), metric=metric, qubits=qubits, rows=int(n), combined=combined,
                     circuits=circuits, fits=tuple(fits), goodness_of_fit=tuple(tests), bootstrap=summary,
                     histogram=histogram, notes=tuple(notes), ignored_columns=table.ignored_columns,
                     seed=seed, threshold=threshold,
                     extra={"has_circuit": table.has_circuit, "has_heavy": sums.heavy_n is not None})


def _resolution_note(sums, dim) -> str:
    """A note when the circuits' own finite sets of D probabilities deviate
    from the continuous Porter-Thomas law by about what the tests resolve."""
    if dim is None:
        return ""
    from ..stats.goodness_of_fit import tested_size

    distinct = sums.circuits * dim
    k = sums.sample.size
    m = tested_size(k, distinct)
    if m >= k and k <= distinct / 4.0:
        return ""
    return (f"The ideal probabilities come from {sums.circuits:,} circuit(s) of D = {dim:,.0f} outcomes, whose own "
            f"spread about the Porter-Thomas law (about 1/sqrt(K D) = {distinct ** -0.5:.2g}) limits what a test "
            f"can resolve: the goodness-of-fit tests use {m:,} of the {k:,} values kept and count that spread in "
            "their p-values (calibrated so data from the model give p < 0.01 in about 1% of runs).")


def _notes(sums, table, combined) -> list[str]:
    notes = []
    if table.ignored_columns:
        notes.append(f"Columns not read: {', '.join(table.ignored_columns)}.")
    mean_x = float(sums.sum_x.sum() / sums.n.sum())
    if not 0.2 <= mean_x <= 5.0:
        notes.append(f"The mean of D p is {mean_x:.3g}, far from the 1 to 2 of Porter-Thomas sampling; "
                     "check --qubits and that the probabilities are those of the observed outcomes.")
    if not table.has_circuit:
        notes.append("No circuit column: all rows are treated as one circuit.")
    if "log-xeb" in combined and combined["log-xeb"].estimate is None:
        notes.append(f"log XEB not computed: {combined['log-xeb'].note}.")
    if table.kind == "npy":
        notes.append("NPY holds one column of probabilities: no circuits, no heavy outputs.")
    return notes


def _bootstrap(metric, sums, combined, replicates, rng, level, seed) -> BootstrapSummary:
    k = sums.circuits
    if metric == "heavy-output":
        has = sums.heavy_n > 0
        if int(has.sum()) >= 2:
            result = boot.cluster_mean_bootstrap(sums.heavy_sum[has] / sums.heavy_n[has], replicates, rng)
        else:
            result = boot.binomial_bootstrap(int(round(sums.heavy_sum[has].sum())),
                                             int(round(sums.heavy_n[has].sum())), replicates, rng)
    elif k >= 2:
        if metric == "linear-xeb":
            result = boot.cluster_ratio_bootstrap(sums.sum_x, sums.n, replicates, rng).shifted(-1.0)
        else:
            result = boot.cluster_ratio_bootstrap(sums.sum_l, sums.n, replicates, rng).shifted(EULER_GAMMA)
    else:
        bins = sums.bins
        if metric == "linear-xeb":
            binned = boot.coarsen_bins(bins.counts, bins.sum_x, bins.sum_x2)
            result = boot.binned_mean_bootstrap(binned, replicates, rng).shifted(-1.0)
        else:
            binned = boot.coarsen_bins(bins.counts, bins.sum_l, bins.sum_l2)
            result = boot.binned_mean_bootstrap(binned, replicates, rng).shifted(EULER_GAMMA)
    low, high = result.percentile_interval(level)
    blow, bhigh = result.basic_interval(level)
    edges, density = boot.histogram(result.replicates)
    counts, _ = np.histogram(result.replicates, bins=edges)
    over = {}
    if result.method.startswith("circuits"):
        # Few circuits: the t interval on K - 1 degrees of freedom holds its level where the
        # percentile interval does not (checker.stats.bootstrap, measured coverage).
        if metric == "heavy-output":
            has = sums.heavy_n > 0
            per = sums.heavy_sum[has] / sums.heavy_n[has]
            t_iv = boot.cluster_t_interval(per, np.ones_like(per), level)
        else:
            totals = sums.sum_x if metric == "linear-xeb" else sums.sum_l
            shift = -1.0 if metric == "linear-xeb" else EULER_GAMMA
            t_iv = boot.cluster_t_interval(totals, sums.n, level)
            t_iv = boot.ClusterInterval(t_iv.low + shift, t_iv.high + shift, t_iv.estimate + shift,
                                        t_iv.stat_error, t_iv.circuits, t_iv.level)
        k = t_iv.circuits
        measured = [c for kk, c in sorted(boot.PERCENTILE_COVERAGE.items()) if kk <= k]
        over = {"interval": "t over circuits", "percentile_low": low, "percentile_high": high,
                "percentile_coverage": measured[-1] if measured and k < boot.PERCENTILE_MIN_CIRCUITS else None,
                "circuits": k}
        low, high = t_iv.low, t_iv.high
    return BootstrapSummary(level=level, low=low, high=high, basic_low=blow, basic_high=bhigh, **over,
                            replicates=result.count, resampling=result.method, sd=result.sd,
                            within_share=result.within_share, error_bound=result.error_bound,
                            bins=result.bins, seed=seed, histogram_edges=tuple(float(e) for e in edges),
                            histogram_density=tuple(float(d) for d in density),
                            histogram_counts=tuple(int(c) for c in counts))

