"""Cost of the multi-part checks, as ratios against a claim without parts checked in the same run.

1. `claimcheck check` end to end (process start included) on a claim without parts (the baseline,
   which must not load statsmodels), on the 12-circuit example and on a generated 100-part claim.
2. In process, with imports already paid: the time to check claims of 10, 50 and 200 parts,
   against the 10-part one.
Run: .venv/bin/python benchmarks/multi_part_checks.py
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
PLAIN = ROOT / "claims_examples" / "error_budget_optimistic.yaml"
MANY = ROOT / "claims_examples" / "many_circuit_combination.yaml"
REPEATS = 7


def parts_claim(k: int, seed: int = 1) -> dict:
    rng = np.random.default_rng(seed)
    parts = [{"label": f"c{i}", "estimate": f"{x:.3e}", "stat_error": "7.1e-4", "samples": "2.0e6"}
             for i, x in enumerate(rng.normal(2.1e-3, 7.1e-4, k))]
    return {"title": f"{k} parts", "metric": "linear-xeb", "estimate": "2.1e-3", "stat_error": "0.2e-3",
            "parts": parts, "combination": {"method": "inverse-variance"}}


def timed(argv: list[str]) -> float:
    start = time.perf_counter()
    subprocess.run(argv, check=False, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    return time.perf_counter() - start


def main() -> int:
    import json

    python = sys.executable
    with tempfile.TemporaryDirectory() as tmp:
        hundred = Path(tmp) / "hundred_parts.json"
        hundred.write_text(json.dumps(parts_claim(100)), encoding="utf-8")
        commands = {name: [python, "-m", "checker.cli", "check", str(path)]
                    for name, path in (("no parts", PLAIN), ("12 parts", MANY), ("100 parts", hundred))}
        for argv in commands.values():
            timed(argv)  # warm the file cache
        runs = {name: [] for name in commands}
        for _ in range(REPEATS):  # interleaved, so drifts in machine load hit all alike
            for name, argv in commands.items():
                runs[name].append(timed(argv))
    base = statistics.median(runs["no parts"])
    print(f"claimcheck check, claim without parts: median {base * 1000:.0f} ms over {REPEATS} runs")
    for name in ("12 parts", "100 parts"):
        t = statistics.median(runs[name])
        print(f"claimcheck check, {name:>9}: median {t * 1000:.0f} ms, ratio {t / base:.2f}x")

    sys.path.insert(0, str(ROOT))
    import checker
    from checker.checks.parts_summary import parts_summary

    checker.check(parts_claim(10))  # pay the imports
    inproc = {}
    for k in (10, 50, 200):
        times = []
        for seed in range(3):
            parts_summary.cache_clear()
            start = time.perf_counter()
            checker.check(parts_claim(k, seed))
            times.append(time.perf_counter() - start)
        inproc[k] = statistics.median(times)
    for k, t in inproc.items():
        print(f"in process, {k:>3} parts: {t * 1000:.0f} ms, ratio {t / inproc[10]:.1f}x the 10-part claim")
    return 0


if __name__ == "__main__":
    sys.exit(main())
