"""Run the benchmarks of the speed goals (issue 13) and rewrite benchmarks/RESULTS.md.

Each script prints its own figures (ratios against a baseline measured in the same
run) and, for each goal it measures, a line ``GOAL | measure | today | goal | verdict``;
this runner puts those lines in one table at the top, then records each script's
command, time and output, and the machine. ``make bench`` must finish in about ten
minutes on the shared 2-core machine, so the scripts listed in QUICK run with the
workloads scaled as stated there; the longer studies (SLOW) are not rerun and their
sections are carried over from the previous RESULTS.md, marked as such.
Run: make bench   (or .venv/bin/python benchmarks/run_all.py)
"""

from __future__ import annotations

import datetime
import os
import platform
import re
import subprocess
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
RESULTS = HERE / "RESULTS.md"

# script, arguments, how the workload is scaled from the goal's (said in RESULTS.md)
QUICK = [
    ("startup.py", [], "as in the goal"),
    ("interval_claims.py", [], "as in the goal"),
    ("range_engine.py", [], "as in the goal (K = 1000)"),
    ("multi_part_checks.py", [], "as in the goal"),
    ("batch_memory.py", ["--rows", "10000", "100000"],
     "10,000 and 100,000 rows rather than 1,000,000 (1/10); the slope gives the million-row figure"),
    ("batch_throughput.py", ["--claims", "20000", "--files", "10"],
     "20,000 claims rather than 100,000 (1/5), wall time scaled by 5; 10 single-check files"),
    ("raw_throughput.py", ["--rows", "30000000", "--repeats", "5"],
     "3e7 rows rather than 1e8 (0.3x), 5 interleaved rounds"),
    ("raw_csv_circuits.py", ["--rows", "3000000", "--rounds", "5"], "3e6 rows rather than 1e7 (0.3x), 5 interleaved rounds"),
    ("raw_circuits_scale.py", ["--rounds", "3"], "as in the goal (1e5 circuits x 10 samples), 3 interleaved rounds"),
    ("bootstrap.py", [], "as before"),
]
# Studies of minutes to half an hour each: not rerun by make bench.
SLOW = ("cluster_intervals.py", "drift_stability.py", "error_model_circuits.py", "fit_false_alarms.py",
        "against_main.py")
# Goals of issue 13 no script here measures yet.
UNMEASURED: list = []


def machine() -> str:
    import numpy
    import scipy

    cpu = platform.processor() or platform.machine()
    load = ", ".join(f"{x:.1f}" for x in os.getloadavg())
    return (f"{platform.system()} {platform.release()}, {cpu}, {os.cpu_count()} cores (shared; load average "
            f"{load} at the start); Python {platform.python_version()}, numpy {numpy.__version__}, "
            f"scipy {scipy.__version__}")


def previous_sections() -> dict:
    """The sections of the RESULTS.md being replaced, by script name."""
    try:
        text = RESULTS.read_text(encoding="utf-8")
    except OSError:
        return {}
    out = {}
    for block in re.split(r"(?m)^## ", text)[1:]:
        name = block.split("\n", 1)[0].strip()
        out[name] = "## " + block.rstrip().split("\n<!--")[0].rstrip() + "\n"
    return out


def main() -> int:
    old = previous_sections()
    start_all = time.perf_counter()
    where = machine()
    sections, goals = [], []
    status = 0
    for name, extra, scale in QUICK:
        script = HERE / name
        command = " ".join(["python", f"benchmarks/{name}", *extra])
        print(f"== {command}", flush=True)
        start = time.perf_counter()
        proc = subprocess.run([sys.executable, str(script), *extra], cwd=ROOT, capture_output=True, text=True)
        took = time.perf_counter() - start
        print(proc.stdout, end="", flush=True)
        lines = proc.stdout.rstrip().splitlines()
        goals += ["| " + line.split("|", 1)[1].strip() + " |" for line in lines if line.startswith("GOAL |")]
        body = "\n".join(line for line in lines if not line.startswith("GOAL |")) or "(no output)"
        if proc.returncode != 0:
            status = 1
            print(proc.stderr, end="", file=sys.stderr)
            body += f"\n(exit status {proc.returncode})\n" + proc.stderr.strip()[-2000:]
        doc = (script.read_text(encoding="utf-8").split('"""')[1].strip().splitlines() or [""])[0]
        sections.append(f"## {name}\n\n{doc}\n\nCommand: `{command}` ({took:.0f} s; workload: {scale})\n\n"
                        f"```\n{body}\n```\n")
    carried = []
    quick = {name for name, _, _ in QUICK}
    for name in [n for n in SLOW if n in old] + [n for n in old if n not in SLOW and n not in quick
                                                 and not n.startswith("Goals of")]:
        if name in old:
            carried.append(old[name].rstrip() + "\n\n(Carried over from the previous RESULTS.md: not rerun by "
                           "`make bench`, which keeps to about ten minutes.)\n")
    total = time.perf_counter() - start_all
    today = datetime.date.today().isoformat()
    table = ("| measure | today | goal | verdict |\n|---|---|---|---|\n" + "\n".join(goals + UNMEASURED) + "\n")
    text = (f"# Benchmark results\n\nWritten by `make bench` (benchmarks/run_all.py) on {today} in {total / 60:.1f} "
            f"min.\nMachine: {where}.\n`python` is the project's `.venv/bin/python`. Every figure is a ratio against "
            "a baseline measured in the same run (an absolute time only where the goal is one); each section "
            "states its workload and how it is scaled from the goal's.\n\n"
            "## Goals of issue 13\n\n" + table + "\n" + "\n".join(sections)
            + ("\n" + "\n".join(carried) if carried else ""))
    tmp = HERE / ".RESULTS.md.tmp"
    tmp.write_text(text, encoding="utf-8")
    os.replace(tmp, RESULTS)
    return status


if __name__ == "__main__":
    sys.exit(main())
