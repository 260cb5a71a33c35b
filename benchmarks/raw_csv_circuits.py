"""Benchmark: raw on a CSV of 1e7 rows with a circuit column, against pandas.read_csv alone.

Writes an invented CSV under /tmp: ROWS rows of ``circuit,probability``
(CIRCUITS circuits with ids such as ``lattice-run-0042``, probabilities from
large-D Porter-Thomas sampling at F = 0.3; about 300 MB), then times, in this
process, interleaved over a few rounds (all reading from the page cache):

* baseline: ``pandas.read_csv(path)`` with its defaults (what reading the file
  costs at all);
* ours, estimate only: ``analyse(path, "linear-xeb", 30, estimate_only=True)``
  (chunked reads, circuit ids as categories, every row validated, per-circuit
  sums);
* ours, full: the same with log XEB, value bins, the likelihood fit, the
  goodness-of-fit tests and a 10,000-replicate cluster bootstrap.

The goal (issue "Speed at real scale"): ours, estimate only, at most 1.5x the
baseline.  Peak memory of a fresh subprocess running each is reported beside
(``ru_maxrss``), with the same for one long id (1,000 characters, the most raw takes) in the file,
which made fixed-width string arrays of gigabytes before circuit ids were read
as categories.  The files are deleted at the end.

Run:  .venv/bin/python benchmarks/raw_csv_circuits.py [--rows N]
"""

from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

QUBITS = 30
CIRCUITS = 100


def write_file(path: str, rows: int, seed: int = 1, long_id: bool = False) -> None:
    """Invented data: large-D Porter-Thomas sampling at F = 0.3, written in pieces."""
    rng = np.random.default_rng(seed)
    names = np.array([f"lattice-run-{i:04d}" for i in range(CIRCUITS)], dtype=object)
    if long_id:
        names[7] = "x" * 1000  # the longest id raw takes (MAX_ID_CHARS)
    step = 1 << 20
    with open(path, "w", encoding="utf-8") as out:
        out.write("circuit,probability\n")
        for start in range(0, rows, step):
            n = min(step, rows - start)
            ideal = rng.random(n) < 0.3
            x = np.where(ideal, rng.gamma(2.0, size=n), rng.exponential(size=n))
            p = x / 2.0 ** QUBITS
            ids = names[rng.integers(0, CIRCUITS, size=n)]
            out.write("".join(f"{c},{v:.6e}\n" for c, v in zip(ids, p)))


def baseline(path: str) -> None:
    import pandas as pd

    pd.read_csv(path)


def ours(path: str, full: bool = False) -> None:
    from checker.raw.analysis import analyse

    analyse(path, "linear-xeb", QUBITS, estimate_only=not full, bootstrap=10_000 if full else 0)


def interleaved(functions: dict, rounds: int) -> dict:
    times = {name: [] for name in functions}
    for _ in range(rounds):
        for name, fn in functions.items():
            start = time.perf_counter()
            fn()
            times[name].append(time.perf_counter() - start)
    return times


def peak_mb(code: str) -> float | None:
    """Peak resident memory (MB) of a fresh Python running ``code``, from GNU
    time's %M.  Not the child's own ru_maxrss: Linux carries a process's peak
    across fork and exec, so a child of this (large) process would report ours."""
    if not os.path.exists("/usr/bin/time"):
        return None
    script = f"import sys; sys.path.insert(0, {str(ROOT)!r})\n{code}\n"
    out = subprocess.run(["/usr/bin/time", "-f", "peak-kb %M", sys.executable, "-c", script],
                         capture_output=True, text=True, check=True)
    line = [w for w in out.stderr.splitlines() if w.startswith("peak-kb ")][-1]
    return int(line.split()[1]) / 1024


def _mb(value: float | None) -> str:
    return "n/a (no /usr/bin/time)" if value is None else f"{value:.0f} MB"


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rows", type=int, default=10_000_000)
    parser.add_argument("--rounds", type=int, default=3)
    args = parser.parse_args()
    folder = tempfile.mkdtemp(prefix="claimcheck-bench-")
    path = os.path.join(folder, "invented.csv")
    long_path = os.path.join(folder, "invented-long-id.csv")
    try:
        write_file(path, args.rows)
        write_file(long_path, args.rows // 10, long_id=True)
        size = os.path.getsize(path)
        print(f"data: {args.rows:,} rows x (circuit, probability), {CIRCUITS} circuits, {size / 1e6:.0f} MB "
              f"(invented, seed 1)")
        baseline(path)  # warm the page cache
        times = interleaved({"read_csv": lambda: baseline(path), "estimate-only": lambda: ours(path)},
                            args.rounds)
        full = interleaved({"full": lambda: ours(path, full=True)}, 1)["full"]
        base = min(times["read_csv"])
        est = min(times["estimate-only"])
        print(f"baseline pandas.read_csv: {base:.2f} s (best of {args.rounds})")
        print(f"raw --estimate-only (analyse): {est:.2f} s, ratio {est / base:.2f}x (goal <= 1.5x)")
        print(f"GOAL | raw estimate-only, CSV of {args.rows:,} rows with a circuit column, against "
              f"pandas.read_csv alone | {est / base:.2f}x | <= 1.5x | "
              + ("met" if est / base <= 1.5 else f"missed by {est / base - 1.5:.2f}x (not profiled here; below 1e7 rows "
                 "the fixed costs weigh more, and the 1e7-row runs of 2026-12-02 gave 1.23x to 1.64x)"))
        print(f"raw full (fits, tests, 10,000-replicate cluster bootstrap): {full[0]:.2f} s, "
              f"ratio {full[0] / base:.2f}x")
        code = "from benchmarks.raw_csv_circuits import ours, baseline\n"
        print(f"peak memory, whole process: read_csv {_mb(peak_mb(code + f'baseline({path!r})'))}; "
              f"raw --estimate-only {_mb(peak_mb(code + f'ours({path!r})'))}")
        long_rows = args.rows // 10
        print(f"one 1,000-character circuit id in {long_rows:,} rows "
              f"({os.path.getsize(long_path) / 1e6:.0f} MB): raw --estimate-only peak "
              f"{_mb(peak_mb(code + f'ours({long_path!r})'))}")
        print(json.dumps({"rows": args.rows, "read_csv_s": round(base, 3), "estimate_only_s": round(est, 3),
                          "ratio": round(est / base, 3), "full_s": round(full[0], 3)}))
    finally:
        for name in (path, long_path):
            if os.path.exists(name):
                os.unlink(name)
        os.rmdir(folder)
    return 0


if __name__ == "__main__":
    sys.exit(main())
