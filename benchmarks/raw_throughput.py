"""Benchmark: raw linear XEB over a memory-mapped 1e8-row NPY file.

Writes a simulated file of ROWS probabilities under /tmp (about 800 MB),
then times, in this process and after a warm-up pass so that both read from
the page cache:

* baseline: ``numpy.load(path, mmap_mode="r").mean()`` (a bare numpy mean
  over the same memory-mapped file);
* ours, estimate only: ``analyse(path, "linear-xeb", ..., estimate_only=True)``
  (the linear XEB and its errors, chunked reads, every row validated);
* ours, full: the same with log XEB, value bins, the likelihood fit, the
  goodness-of-fit subsample and tests, and a 10,000-replicate bootstrap.

Peak memory of each of ours is ``ru_maxrss`` (resource.getrusage) of a fresh
subprocess, so that the figure covers the whole process (Python, numpy,
scipy) and nothing else; the tracemalloc peak of the arrays we allocate is
reported beside it.  Linux keeps ru_maxrss across fork and exec, so the file
is written by a subprocess too and the memory children run before this
process touches the memory map.  The file is deleted at the end.

Run:  .venv/bin/python benchmarks/raw_throughput.py [--rows N]
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


def write_file(path: str, rows: int, seed: int = 1) -> None:
    """Simulated large-D Porter-Thomas data at F = 0.3, written chunk by chunk."""
    rng = np.random.default_rng(seed)
    out = np.lib.format.open_memmap(path, mode="w+", dtype=np.float64, shape=(rows,))
    step = 1 << 22
    for start in range(0, rows, step):
        n = min(step, rows - start)
        ideal = rng.random(n) < 0.3
        x = np.where(ideal, rng.gamma(2.0, size=n), rng.exponential(size=n))
        out[start:start + n] = x / 2.0 ** QUBITS
    out.flush()
    del out


def interleaved(functions: dict, rounds: int) -> dict:
    """Times of each function over ``rounds`` rounds, run in turn within each
    round so that a busy moment of the machine hits all of them alike."""
    times = {name: [] for name in functions}
    for _ in range(rounds):
        for name, fn in functions.items():
            t = time.perf_counter()
            fn()
            times[name].append(time.perf_counter() - t)
    return times


CHILD = """
import json, resource, sys, time, tracemalloc
sys.path.insert(0, {root!r})
from checker.raw.analysis import analyse
estimate_only = {estimate_only}
analyse({path!r}, "linear-xeb", {qubits}, estimate_only=estimate_only, bootstrap=10000)  # warm
tracemalloc.start()
t = time.perf_counter()
r = analyse({path!r}, "linear-xeb", {qubits}, estimate_only=estimate_only, bootstrap=10000)
elapsed = time.perf_counter() - t
traced = tracemalloc.get_traced_memory()[1]
tracemalloc.stop()
print(json.dumps({{"estimate": r.headline.estimate, "maxrss_kb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss,
                  "traced_peak": traced, "elapsed_traced": elapsed}}))
"""


def child(path: str, estimate_only: bool) -> dict:
    code = CHILD.format(root=str(ROOT), path=path, qubits=QUBITS, estimate_only=estimate_only)
    out = subprocess.run([sys.executable, "-c", code], check=True, capture_output=True, text=True)
    return json.loads(out.stdout.strip().splitlines()[-1])


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rows", type=int, default=100_000_000)
    parser.add_argument("--repeats", type=int, default=9, help="interleaved rounds (default 9)")
    args = parser.parse_args()
    from checker.raw.analysis import analyse

    folder = tempfile.mkdtemp(prefix="claimcheck-bench-", dir="/tmp")
    path = os.path.join(folder, "probabilities.npy")
    try:
        t = time.perf_counter()
        subprocess.run([sys.executable, "-c", f"import sys; sys.path.insert(0, {str(ROOT / 'benchmarks')!r}); "
                        f"import raw_throughput as b; b.write_file({path!r}, {args.rows})"], check=True)
        written = time.perf_counter() - t
        size = os.path.getsize(path)
        mem_est = child(path, True)
        mem_full = child(path, False)

        def bare():
            return float(np.load(path, mmap_mode="r").mean())

        def ours_estimate():
            return analyse(path, "linear-xeb", QUBITS, estimate_only=True)

        def ours_full():
            return analyse(path, "linear-xeb", QUBITS, bootstrap=10_000)

        bare()  # warm the page cache
        ours_estimate()
        times = interleaved({"bare": bare, "estimate": ours_estimate}, args.repeats)
        t_full = interleaved({"bare": bare, "full": ours_full}, 2)
        check = abs(ours_estimate().headline.estimate + 1.0 - bare() * 2.0 ** QUBITS)
        rows = args.rows

        def summary(name, values, baseline):
            best, mid = min(values), float(np.median(values))
            return (f"{best:.3f} s best, {mid:.3f} s median ({rows / best / 1e6:,.0f} M rows/s best); "
                    f"throughput ratio {min(baseline) / best:.2f}x (best) and "
                    f"{float(np.median(baseline)) / mid:.2f}x (median) the bare mean")

        print(f"rows {rows:,} ({size / 1e6:,.0f} MB, written in {written:.1f} s); linear XEB agrees with the bare "
              f"mean to {check:.1e}; {args.repeats} interleaved rounds")
        print(f"bare numpy mean over the memmap: {min(times['bare']):.3f} s best, "
              f"{float(np.median(times['bare'])):.3f} s median")
        print(f"ours, estimate only: {summary('estimate', times['estimate'], times['bare'])}; "
              f"peak RSS {mem_est['maxrss_kb'] / 1024:.0f} MB, traced arrays {mem_est['traced_peak'] / 2**20:.1f} MB")
        print(f"ours, full analysis: {summary('full', t_full['full'], t_full['bare'])}; "
              f"peak RSS {mem_full['maxrss_kb'] / 1024:.0f} MB, traced arrays {mem_full['traced_peak'] / 2**20:.1f} MB")
        r = float(np.median(times["bare"])) / float(np.median(times["estimate"]))
        peak = mem_est["maxrss_kb"] / 1024
        print(f"GOAL | raw estimate-only, {rows:,}-row NPY (in process, imports paid; peak of a fresh process) | "
              f"{r:.2f}x the bare mean's throughput, {peak:.0f} MB | >= 0.6x, <= 256 MB | "
              + ("met" if r >= 0.6 and peak <= 256 else f"missed: {r:.2f}x, {peak:.0f} MB"))
    finally:
        try:
            os.unlink(path)
        except OSError:
            pass
        os.rmdir(folder)


if __name__ == "__main__":
    main()
