"""raw-model false alarms: how often data from the Porter-Thomas model itself fail the fit tests.

For 12 to 20 qubits and 1, 5 and 20 circuits, REPS seeded datasets of 100,000 samples (the
default --fit-sample) from the project's simulator (checker.raw.simulate_circuits, Porter-Thomas
model, F = 0.3), tested as ``claimcheck raw`` tests them (checker.stats.goodness_of_fit.fit_tests
with the reference of K D outcomes): the share with Kolmogorov-Smirnov p < 0.01, Cramer-von
Mises p < 0.01, and either (the raw-model finding warns on the smaller p), at the true F and at
the maximum-likelihood F fitted from the same sample.  Beside them, the KS rate without the
calibration (all 100,000 values against the continuous law).  A calibrated test gives about 1%
per test; over REPS = 200 runs per cell a rate has a binomial sd of 0.7 points, over all 15
cells 0.18 points.

Run:  .venv/bin/python benchmarks/fit_false_alarms.py [--reps 200]
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from checker.raw.simulate_circuits import simulate_dataset  # noqa: E402
from checker.stats.fidelity_fit import max_likelihood_fidelity  # noqa: E402
from checker.stats.goodness_of_fit import fit_tests  # noqa: E402

FIDELITY, SAMPLES = 0.3, 100_000


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--reps", type=int, default=200)
    args = parser.parse_args()
    rng = np.random.default_rng(808)
    start = time.perf_counter()
    print(f"{'qubits':>6} {'K':>3}  {'true F: KS':>10} {'CvM':>6} {'either':>6}  {'fitted: KS':>10} {'CvM':>6} "
          f"{'either':>6}  {'uncalibrated KS':>15}")
    totals = np.zeros(7)
    cells = 0
    for qubits in (12, 14, 16, 18, 20):
        d = 2.0 ** qubits
        for k in (1, 5, 20):
            hits = np.zeros(7)
            for _ in range(args.reps):
                data = simulate_dataset(qubits, k, SAMPLES // k, FIDELITY, rng)
                x = data.probability * d
                x = x[rng.permutation(x.size)]  # a uniform subsample comes in no circuit order
                true = fit_tests(x, FIDELITY, d, reference=k * d)
                fitted_f = max_likelihood_fidelity(x).fidelity
                fitted = fit_tests(x, fitted_f, d, reference=k * d)
                plain = fit_tests(x, FIDELITY, d)
                p = [t.p_value for t in true] + [t.p_value for t in fitted]
                hits += [p[0] < 0.01, p[1] < 0.01, min(p[:2]) < 0.01, p[2] < 0.01, p[3] < 0.01,
                         min(p[2:]) < 0.01, plain[0].p_value < 0.01]
            rates = hits / args.reps
            totals += hits
            cells += 1
            print(f"{qubits:>6} {k:>3}  {rates[0]:>10.3f} {rates[1]:>6.3f} {rates[2]:>6.3f}  {rates[3]:>10.3f} "
                  f"{rates[4]:>6.3f} {rates[5]:>6.3f}  {rates[6]:>15.3f}", flush=True)
    rates = totals / (cells * args.reps)
    print(f"{'all':>6} {'':>3}  {rates[0]:>10.3f} {rates[1]:>6.3f} {rates[2]:>6.3f}  {rates[3]:>10.3f} "
          f"{rates[4]:>6.3f} {rates[5]:>6.3f}  {rates[6]:>15.3f}")
    print(f"time: {time.perf_counter() - start:.0f} s")


if __name__ == "__main__":
    main()
