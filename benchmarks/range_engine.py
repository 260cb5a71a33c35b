"""Cost of the range engine (issue 11), as ratios measured in one run.

1. `claimcheck check` end to end on five-part claims (one consistent, one with disagreeing parts),
   this tree's code against main's (a `git archive` of the branch `main`, run from a temporary
   directory with the same interpreter), interleaved so drifts in machine load hit both alike.
2. `claimcheck check` end to end on a consistent 1000-part claim against the same claim without
   parts (issue 13 aims at 1.3x).
Run: .venv/bin/python benchmarks/range_engine.py [--main-ref main]
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
REPEATS = 9


def claim(k: int, scattered: bool = False, seed: int = 3) -> dict:
    """An invented linear-XEB claim whose headline is the inverse-variance mean of k parts."""
    rng = np.random.default_rng(seed)
    error = 7.1e-4
    spread = 4 * error if scattered else error
    xs = [float(f"{x:.3e}") for x in rng.normal(2.1e-3, spread, k)]
    mean = float(np.mean(xs))
    combined = error / np.sqrt(k)
    out = {"title": f"Invented claim with {k} parts", "metric": "linear-xeb", "qubits": 20,
           "estimate": f"{mean:.4e}", "stat_error": f"{combined:.3e}", "samples": f"{2.0e6 * k:.2e}",
           "threshold": 0.0, "significance": {"required_sigma": 3},
           "parts": [{"label": f"c{i}", "estimate": f"{x:.3e}", "stat_error": "7.1e-4", "samples": "2.0e6"}
                     for i, x in enumerate(xs)],
           "combination": {"method": "inverse-variance"}}
    return out


def without_parts(doc: dict) -> dict:
    """The same claim with its parts (and so its combination) left out."""
    return {k: v for k, v in doc.items() if k not in ("parts", "combination")}


def timed(argv: list[str], env: dict) -> float:
    start = time.perf_counter()
    subprocess.run(argv, check=False, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, env=env)
    return time.perf_counter() - start


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("--main-ref", default="main")
    args = parser.parse_args()
    python = sys.executable
    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        old = tmp / "main_tree"
        old.mkdir()
        archive = subprocess.run(["git", "-C", str(ROOT), "archive", args.main_ref], check=True,
                                 capture_output=True).stdout
        subprocess.run(["tar", "-x", "-C", str(old)], input=archive, check=True)
        files = {}
        for name, doc in (("five consistent", claim(5)), ("five scattered", claim(5, scattered=True)),
                          ("1000 parts", claim(1000)), ("no parts", without_parts(claim(1000)))):
            path = tmp / (name.replace(" ", "_") + ".json")
            path.write_text(json.dumps(doc), encoding="utf-8")
            files[name] = path
        env_new = {**os.environ, "PYTHONPATH": str(ROOT)}
        env_old = {**os.environ, "PYTHONPATH": str(old)}
        runs = []
        for name in ("five consistent", "five scattered"):
            for tree, env in (("this tree", env_new), ("main", env_old)):
                runs.append(((name, tree), [python, "-m", "checker.cli", "check", str(files[name])], env))
        for name in ("1000 parts", "no parts"):
            runs.append(((name, "this tree"), [python, "-m", "checker.cli", "check", str(files[name])], env_new))
        for _, argv, env in runs:
            timed(argv, env)  # warm the file cache and the bytecode
        times = {key: [] for key, _, _ in runs}
        for _ in range(REPEATS):
            for key, argv, env in runs:
                times[key].append(timed(argv, env))
        # In process, imports paid: reading and checking only (median of 30; of 5 for 1000 parts), each tree.
        inproc = {}
        script = ("import statistics, sys, time\nfrom checker.claim import read_claim\n"
                  "from checker.checks import run_checks\nfrom checker.checks import parts_summary as ps\n"
                  "f = sys.argv[1]\nrun_checks(read_claim(f))\nts = []\n"
                  "for _ in range(int(sys.argv[2])):\n    ps.parts_summary.cache_clear()\n"
                  "    t = time.perf_counter(); run_checks(read_claim(f)); ts.append(time.perf_counter() - t)\n"
                  "print(statistics.median(ts))\n")
        for name, count in (("five consistent", 30), ("five scattered", 30), ("1000 parts", 5)):
            for tree, env in (("this tree", env_new), ("main", env_old)):
                out = subprocess.run([python, "-c", script, str(files[name]), str(count)], env=env,
                                     capture_output=True, text=True, check=True).stdout
                inproc[(name, tree)] = float(out)
        # The 1000-part claim by phase, this tree, in process (median of 5; caches cleared as in a fresh process).
        phase_script = ("import statistics, sys, time\nfrom checker.claim.load import load_document\n"
                        "from checker.claim.validate import validate_document\nfrom checker.claim.model import build_claim\n"
                        "from checker.checks import run_checks\nfrom checker.checks import parts_summary as ps\n"
                        "from checker.stats.precision import parse_printed\n"
                        "ts = []\nfor _ in range(6):\n    ps.parts_summary.cache_clear(); parse_printed.cache_clear()\n"
                        "    t0 = time.perf_counter(); doc = load_document(sys.argv[1]); t1 = time.perf_counter()\n"
                        "    validate_document(doc); t2 = time.perf_counter(); c = build_claim(doc); t3 = time.perf_counter()\n"
                        "    run_checks(c); t4 = time.perf_counter(); ts.append((t1 - t0, t2 - t1, t3 - t2, t4 - t3))\n"
                        "print(' '.join(str(statistics.median(x)) for x in zip(*ts[1:])))\n")
        phases = [float(x) * 1000 for x in subprocess.run(
            [python, "-c", phase_script, str(files["1000 parts"])], env=env_new, capture_output=True, text=True,
            check=True).stdout.split()]
    med = {key: statistics.median(v) for key, v in times.items()}
    print(f"claimcheck check, median of {REPEATS} interleaved runs")
    for name in ("five consistent", "five scattered"):
        new, old_t = med[(name, "this tree")], med[(name, "main")]
        print(f"  {name:<16} this tree {new * 1000:6.0f} ms, main {old_t * 1000:6.0f} ms, "
              f"ratio {new / old_t:.2f}x")
    print("in process, imports paid (reading and checking the claim; median of 30 runs, of 5 for 1000 parts)")
    for name in ("five consistent", "five scattered", "1000 parts"):
        new, old_t = inproc[(name, "this tree")], inproc[(name, "main")]
        print(f"  {name:<16} this tree {new * 1000:8.1f} ms, main {old_t * 1000:8.1f} ms, "
              f"ratio {new / old_t:.2f}x")
    base = med[("no parts", "this tree")]
    big = med[("1000 parts", "this tree")]
    print(f"  1000 parts {big * 1000:.0f} ms against {base * 1000:.0f} ms without parts: ratio {big / base:.2f}x")
    r = big / base
    load, valid, build, checks = phases
    by_phase = (f"loading {load:.0f} ms, schema validation {valid:.0f} ms, building the claim {build:.0f} ms, "
                f"the checks {checks:.0f} ms")
    print(f"  1000 parts in process by phase (median of 5): {by_phase}")
    print(f"GOAL | `check` of a 1,000-part claim against the same claim without parts | {r:.2f}x | <= 1.3x | "
          + ("met" if r <= 1.3 else f"missed by {r - 1.3:.2f}x ({(big - base) * 1000:.0f} ms for the parts; in "
             f"process {by_phase}; profile of building: about 40% is the decimal logarithms of each printed "
             "bound, about 20 us each whatever the precision, which only computing them when a check asks "
             "would remove; loading reads the JSON's line numbers from the YAML parser's events)"))
    return 0


if __name__ == "__main__":
    sys.exit(main())
