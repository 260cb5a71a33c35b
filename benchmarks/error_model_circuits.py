"""Error model over circuits: the XEB standard error with circuits against the simulated scatter.

For every cell of the grid D = 2^6..2^16, F = 0.01..0.8, K = 1, 5, 50 circuits, the script
simulates REPS experiments with the project's own simulator (checker.raw.simulate_circuits,
Porter-Thomas model: a fresh flat-Dirichlet output distribution per circuit, outcomes from
F p + (1 - F)/D), takes the linear and log XEB estimate of each, and prints the ratio of their
standard deviation to the metric model's error sqrt(v/N + B (1/K - 1/N)) and to the error
without circuits sqrt(v/N).  The samples per circuit S are chosen so that the circuit term is a
visible share (S near v D / (4 F^2), kept within 200..4000).  With REPS = 500 the scatter's own
relative standard error is about 1/sqrt(2 REPS) = 3.2%, so a correct model lands within 10% in
all but about 1 cell in 500 where the estimate is near Gaussian; each line also prints the
scatter's own standard error from its kurtosis.  Then the issue's two cases.

Run:  .venv/bin/python benchmarks/error_model_circuits.py [--reps 500] [--quick]
"""

from __future__ import annotations

import argparse
import math
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from checker.metrics import METRICS, ModelInputs  # noqa: E402
from checker.raw.simulate_circuits import simulate_dataset  # noqa: E402
from checker.stats.porter_thomas import EULER_GAMMA, log_xeb_mean  # noqa: E402

LIN, LOG = METRICS["linear-xeb"], METRICS["log-xeb"]


def scatter(qubits, circuits, samples, fidelity, reps, rng):
    """(sd, relative standard error of that sd) of the linear and of the log XEB estimates.
    The standard error is sqrt((kurtosis - 1)/(4 R)) (common practice): one circuit's mean at
    small D is skewed, so its sd is less certain than a Gaussian's 1/sqrt(2 R)."""
    d = 2.0 ** qubits
    lin, log = np.empty(reps), np.empty(reps)
    for r in range(reps):
        data = simulate_dataset(qubits, circuits, samples, fidelity, rng)
        x = data.probability * d
        lin[r] = x.mean() - 1.0
        log[r] = np.log(x).mean() + EULER_GAMMA
    out = []
    for e in (lin, log):
        z = (e - e.mean()) / e.std()
        kurtosis = float(np.mean(z ** 4))
        out.append((e.std(ddof=1), math.sqrt(max(kurtosis - 1.0, 0.0) / (4 * reps))))
    return out


def models(qubits, circuits, samples, fidelity):
    d = 2.0 ** qubits
    n = circuits * samples
    with_k = ModelInputs(dimension=d, circuits=circuits)
    without = ModelInputs(dimension=d)
    lin_value, log_value = fidelity * (d - 1) / (d + 1), log_xeb_mean(fidelity, d)
    return (LIN.standard_error(lin_value, n, with_k), LIN.standard_error(lin_value, n, without),
            LOG.standard_error(log_value, n, with_k), LOG.standard_error(log_value, n, without))


def samples_for(qubits, fidelity):
    d = 2.0 ** qubits
    v = LIN.variance(fidelity, ModelInputs(dimension=d))
    return int(min(4000, max(200, round(v * d / (4 * fidelity * fidelity)))))


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--reps", type=int, default=500)
    parser.add_argument("--quick", action="store_true", help="qubits 6 and 10 only")
    args = parser.parse_args()
    rng = np.random.default_rng(20250101)
    qubit_grid = (6, 10) if args.quick else (6, 8, 10, 12, 14, 16)
    start = time.perf_counter()
    print(f"reps per cell: {args.reps} (scatter's relative standard error {100 / math.sqrt(2 * args.reps):.1f}%), "
          "seed 20250101; ratio = simulated sd / model error")
    print(f"{'qubits':>6} {'F':>5} {'K':>3} {'S':>5} {'reps':>5}  {'linear: with K':>15} {'without':>7}  "
          f"{'log: with K':>15} {'without':>7}")
    worst, worst_z, outside, cells = 0.0, 0.0, 0, 0
    for qubits in qubit_grid:
        for fidelity in (0.01, 0.1, 0.5, 0.8):
            s = samples_for(qubits, fidelity)
            for k in (1, 5, 50):
                # One circuit gets 4x the repetitions (it is cheap): there its skewed
                # mean makes the scatter's own error largest.
                reps = args.reps * (4 if k == 1 else 1)
                (lin_sd, lin_se), (log_sd, log_se) = scatter(qubits, k, s, fidelity, reps, rng)
                lin_k, lin_0, log_k, log_0 = models(qubits, k, s, fidelity)
                ratios = (lin_sd / lin_k, log_sd / log_k)
                cells += 2
                outside += sum(abs(r - 1) > 0.10 for r in ratios)
                worst = max(worst, *(abs(r - 1) for r in ratios))
                worst_z = max(worst_z, abs(ratios[0] - 1) / lin_se, abs(ratios[1] - 1) / log_se)
                print(f"{qubits:>6} {fidelity:>5} {k:>3} {s:>5} {reps:>5}  {ratios[0]:>6.3f} +- {lin_se:.3f} "
                      f"{lin_sd / lin_0:>7.3f}  {ratios[1]:>6.3f} +- {log_se:.3f} {log_sd / log_0:>7.3f}", flush=True)
    print(f"cells (metric x grid point): {cells}; outside 10%: {outside}; largest |ratio - 1| with K: {worst:.3f}; "
          f"largest in units of the scatter's own standard error: {worst_z:.2f}")

    print("\nThe issue's cases (reps 300):")
    (lin_sd, _), _ = scatter(10, 10, 100_000, 0.5, 300, rng)
    lin_k, lin_0, _, _ = models(10, 10, 100_000, 0.5)
    print(f"  10 qubits, F = 0.5, 10 circuits x 100,000 samples, linear XEB: simulated sd {lin_sd:.4f}; model with "
          f"circuits {lin_k:.4f} (ratio {lin_sd / lin_k:.3f}); without circuits {lin_0:.5f} "
          f"(ratio {lin_sd / lin_0:.2f})")
    _, (log_sd, _) = scatter(16, 5, 200_000, 0.05, 300, rng)
    _, _, log_k, log_0 = models(16, 5, 200_000, 0.05)
    print(f"  16 qubits, F = 0.05, 5 circuits x 200,000 samples, log XEB: simulated sd {log_sd:.5f}; model with "
          f"circuits {log_k:.5f} (ratio {log_sd / log_k:.3f}); without circuits {log_0:.5f} "
          f"(ratio {log_sd / log_0:.2f})")
    print(f"time: {time.perf_counter() - start:.0f} s")


if __name__ == "__main__":
    main()
