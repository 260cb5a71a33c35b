"""Intervals over few circuits: measured coverage of the t and bootstrap intervals, and the cluster bootstrap's cost.

Coverage: NSIM seeded datasets per K from the project's simulator (8 qubits, F = 0.5, 500
samples per circuit, Porter-Thomas model); for each, the nominal-95% t interval on K - 1
degrees of freedom (checker.stats.bootstrap.cluster_t_interval) and the percentile and basic
intervals of a 1,000-replicate cluster bootstrap; the fraction that covers the expected linear
XEB F (D - 1)/(D + 1).  With NSIM = 4000 a coverage has a binomial standard error of about
0.35 points.  Cost: one cluster bootstrap of 10,000 replicates at 1,000 to 100,000 circuits,
as a ratio to the 1,000-circuit time (grouping beyond 1,024 circuits keeps it flat).

Run:  .venv/bin/python benchmarks/cluster_intervals.py [--nsim 4000]
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from checker.raw.simulate_circuits import simulate_dataset  # noqa: E402
from checker.stats import bootstrap as boot  # noqa: E402

QUBITS, FIDELITY, SAMPLES = 8, 0.5, 500


def coverage(k: int, nsim: int, rng) -> tuple[float, float, float]:
    d = 2.0 ** QUBITS
    truth = FIDELITY * (d - 1) / (d + 1)
    hits = np.zeros(3)
    for _ in range(nsim):
        data = simulate_dataset(QUBITS, k, SAMPLES, FIDELITY, rng)
        x = data.probability * d - 1.0
        sums = np.bincount(data.circuit, weights=x, minlength=k)
        counts = np.full(k, float(SAMPLES))
        t_iv = boot.cluster_t_interval(sums, counts, 0.95)
        result = boot.cluster_ratio_bootstrap(sums, counts, 1000, rng)
        lo, hi = result.percentile_interval(0.95)
        blo, bhi = result.basic_interval(0.95)
        hits += [t_iv.low <= truth <= t_iv.high, lo <= truth <= hi, blo <= truth <= bhi]
    return tuple(hits / nsim)


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--nsim", type=int, default=4000)
    args = parser.parse_args()
    rng = np.random.default_rng(515)
    print(f"coverage of nominal 95% intervals over {args.nsim} datasets per K "
          f"({QUBITS} qubits, F = {FIDELITY}, {SAMPLES} samples per circuit, seed 515):")
    print(f"{'K':>4}  {'t (K-1 dof)':>11}  {'percentile':>10}  {'basic':>6}")
    for k in (2, 3, 5, 8, 20, 50):
        t, p, b = coverage(k, args.nsim, rng)
        print(f"{k:>4}  {t:>11.3f}  {p:>10.3f}  {b:>6.3f}", flush=True)
    print("\ncluster bootstrap, 10,000 replicates (time ratio to 1,000 circuits):")
    base = None
    for k in (1_000, 10_000, 100_000):
        sums = rng.normal(1.5, 0.1, k) * 500
        counts = np.full(k, 500.0)
        start = time.perf_counter()
        result = boot.cluster_ratio_bootstrap(sums, counts, 10_000, np.random.default_rng(1))
        took = time.perf_counter() - start
        base = base or took
        exact_sd = np.sqrt(np.sum((sums - sums.sum() / counts.sum() * counts) ** 2)) / counts.sum()
        print(f"  {k:>7,} circuits: {took / base:5.2f}x  ({result.method}; sd {result.sd / exact_sd:.4f} of the "
              f"exact bootstrap sd; stated error bound {result.error_bound / exact_sd:.2g} of it)")


if __name__ == "__main__":
    main()
