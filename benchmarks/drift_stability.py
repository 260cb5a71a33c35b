"""Drift on stable series: false rejections, the systematic, and the coverage of the level interval.

Stable series of 20 points (times 0..19, true level 0.5, stated errors drawn from 0.8 to 1.2
times 0.01 and correct, Gaussian scatter), seed 700: the share in which ``drift`` rejects a
constant value at alpha = 0.05, the mean stability systematic as a multiple of the level's
statistical error, and the coverage of the 95% level interval at the window centre.  Then series
with a real extra scatter tau = 0.01 (the systematic's estimate of tau^2 and the coverage of its
95% upper limit) and a real drift.  500 series as the issue asks, then 4000 for precision
(binomial sd of a 5% rate: 0.35 points).

Run:  .venv/bin/python benchmarks/drift_stability.py
"""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from checker.stats.drift import drift_analysis  # noqa: E402

T = np.arange(20.0)


def stable(count: int, rng, errors: bool = True):
    rejected, syst, estimate, stat, covered = [], [], [], [], []
    for _ in range(count):
        e = rng.uniform(0.8, 1.2, T.size) * 0.01
        y = 0.5 + rng.normal(0.0, 1.0, T.size) * e
        r = drift_analysis(T, y, e if errors else None)
        rejected.append(r.constant_rejected)
        syst.append(r.systematic)
        estimate.append(r.systematic_estimate)
        stat.append(r.trend_level_error)
        covered.append(r.trend_level_low <= 0.5 <= r.trend_level_high)
    stat = np.mean(stat)
    return np.mean(rejected), np.mean(syst) / stat, np.mean(estimate) / stat, np.mean(covered)


def main() -> None:
    rng = np.random.default_rng(700)
    for count in (500, 4000):
        rej, syst, est, cov = stable(count, rng)
        print(f"{count} stable series with stated errors: constant rejected in {rej:.3f} (alpha 0.05); mean "
              f"systematic {syst:.2f}x the level's error (estimate before the test {est:.2f}x); 95% level "
              f"interval covers in {cov:.3f}")
    rej, syst, _, cov = stable(4000, rng, errors=False)
    print(f"4000 stable series without errors: constant rejected in {rej:.3f} (slope test alone); systematic "
          f"(all of the scatter) {syst:.2f}x the level's error; 95% level interval covers in {cov:.3f}")
    tau2, upper = [], []
    for _ in range(2000):
        e = np.full(T.size, 0.01)
        y = 0.5 + rng.normal(0.0, 0.01, T.size) + rng.normal(0.0, 0.01, T.size)
        r = drift_analysis(T, y, e)
        tau2.append(r.excess_spread_window ** 2)
        upper.append(r.systematic_upper >= 0.01)
    print(f"2000 series with extra scatter tau = 0.01: mean estimated tau^2 {np.mean(tau2):.3g} (true 1e-4); "
          f"95% upper limit of the systematic covers tau in {np.mean(upper):.3f}")
    trend2 = []
    for _ in range(2000):
        y = 0.5 + 0.002 * T + rng.normal(0.0, 0.01, T.size)
        r = drift_analysis(T, y, np.full(T.size, 0.01))
        trend2.append(r.trend_systematic ** 2)
    print(f"2000 series drifting 0.002 per point: mean trend systematic^2 {np.mean(trend2):.3g} "
          f"(true (0.002 x 19)^2 / 12 = {(0.002 * 19) ** 2 / 12:.3g})")


if __name__ == "__main__":
    main()
