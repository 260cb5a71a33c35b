"""Benchmark: bootstrap of a 3,000,000-sample mean, 10,000 replicates.

Fast: checker.stats.bootstrap.bin_values + binned_mean_bootstrap (value bins,
exact multinomial bin counts, Gaussian within-bin term; error bound reported).
Naive: plain resampling of all N values per replicate.  The naive method is
timed on NAIVE replicates only (default 300) and its time scaled to 10,000;
the script says so in its output.

Accuracy, three ways:
* the fast bootstrap sd against the exact plain-bootstrap sd of a mean,
  sigma_hat / sqrt(N) (sigma_hat the plug-in sd), which plain resampling
  converges to;
* the fast sd against the naive sd (whose own Monte Carlo error with NAIVE
  replicates is about 1/sqrt(2 NAIVE), 4 % for 300, so this ratio is noisy);
* coupled: each naive replicate's resampled counts aggregated by bin give the
  binned replicate for the very same draw; their RMS gap is held against the
  stated bound.

Run:  .venv/bin/python benchmarks/bootstrap.py [--naive 300]
"""

from __future__ import annotations

import argparse
import math
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from checker.stats import bootstrap as boot  # noqa: E402

N = 3_000_000
REPLICATES = 10_000


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--naive", type=int, default=300, help="naive replicates actually run (default 300)")
    parser.add_argument("--seed", type=int, default=1)
    args = parser.parse_args()
    rng = np.random.default_rng(args.seed)
    ideal = rng.random(N) < 0.3
    x = np.where(ideal, rng.gamma(2.0, size=N), rng.exponential(size=N))  # x = D p at F = 0.3
    exact_sd = float(np.std(x)) / math.sqrt(N)

    t = time.perf_counter()
    binned = boot.bin_values(x)
    fast = boot.binned_mean_bootstrap(binned, REPLICATES, np.random.default_rng(args.seed + 1))
    t_fast = time.perf_counter() - t

    naive_rng = np.random.default_rng(args.seed + 2)
    edges = boot.value_bin_edges(x)
    member = np.searchsorted(edges, x, side="right")
    used = np.flatnonzero(np.bincount(member, minlength=edges.size + 1))
    compact = np.searchsorted(used, member)  # bin index among non-empty bins, as in bin_values
    means = binned.sums / binned.counts
    naive, coupled = [], []
    t_naive = 0.0
    for _ in range(args.naive):
        t = time.perf_counter()
        pick = naive_rng.integers(0, N, size=N)
        value = float(x[pick].mean())
        t_naive += time.perf_counter() - t
        naive.append(value)
        counts = np.bincount(compact[pick], minlength=binned.counts.size)
        coupled.append(float(counts @ means) / N)
    naive, coupled = np.array(naive), np.array(coupled)
    per_naive = t_naive / args.naive
    t_naive_scaled = per_naive * REPLICATES
    rms_gap = float(np.sqrt(np.mean((naive - coupled) ** 2)))
    bound_plain = math.sqrt(binned.within_share()) * exact_sd

    print(f"data: {N:,} samples of x = D p (Porter-Thomas mixture, F = 0.3), seed {args.seed}")
    print(f"fast (binned, {binned.counts.size} bins, {REPLICATES:,} replicates): {t_fast:.2f} s including binning")
    print(f"naive: {per_naive * 1e3:.1f} ms per replicate, timed on {args.naive} replicates and scaled to "
          f"{REPLICATES:,}: {t_naive_scaled:.0f} s")
    print(f"speed ratio (naive / fast): {t_naive_scaled / t_fast:.0f}x")
    print(f"exact bootstrap sd sigma_hat/sqrt(N) = {exact_sd:.6g}")
    print(f"fast sd {fast.sd:.6g}: {100 * (fast.sd / exact_sd - 1):+.2f}% from exact "
          f"(Monte Carlo sd of a {REPLICATES:,}-replicate sd: {100 / math.sqrt(2 * REPLICATES):.2f}%)")
    print(f"naive sd {naive.std(ddof=1):.6g} over {args.naive} replicates: "
          f"{100 * (naive.std(ddof=1) / exact_sd - 1):+.2f}% from exact (its Monte Carlo sd: "
          f"{100 / math.sqrt(2 * args.naive):.1f}%); fast/naive sd ratio {fast.sd / naive.std(ddof=1):.4f}")
    print(f"coupled ({args.naive} naive draws binned): sd ratio binned/naive {coupled.std(ddof=1) / naive.std(ddof=1):.5f}; "
          f"RMS gap {rms_gap:.3g} = {100 * rms_gap / exact_sd:.2f}% of the sd, bound sqrt(eps) sd = "
          f"{100 * bound_plain / exact_sd:.2f}% (eps = {binned.within_share():.2g}); the fast method's stated bound "
          f"with its Gaussian term, sqrt(2 eps) sd = {100 * fast.error_bound / exact_sd:.2f}%")


if __name__ == "__main__":
    main()
