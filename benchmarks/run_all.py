"""Run every benchmark script in this folder and rewrite benchmarks/RESULTS.md.

Each script prints its own figures (ratios against a baseline measured in the same
run); this runner records the command, the machine and that output.
Run: make bench   (or .venv/bin/python benchmarks/run_all.py)
"""

from __future__ import annotations

import datetime
import os
import platform
import subprocess
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent


def machine() -> str:
    import numpy
    import scipy

    cpu = platform.processor() or platform.machine()
    return (f"{platform.system()} {platform.release()}, {cpu}, {os.cpu_count()} cores; "
            f"Python {platform.python_version()}, numpy {numpy.__version__}, scipy {scipy.__version__}")


def main() -> int:
    scripts = sorted(p for p in HERE.glob("*.py") if p.name != Path(__file__).name)
    sections = []
    status = 0
    for script in scripts:
        command = f"python benchmarks/{script.name}"
        print(f"== {command}", flush=True)
        start = time.perf_counter()
        proc = subprocess.run([sys.executable, str(script)], cwd=ROOT, capture_output=True, text=True)
        took = time.perf_counter() - start
        print(proc.stdout, end="")
        if proc.returncode != 0:
            status = 1
            print(proc.stderr, end="", file=sys.stderr)
        doc = (script.read_text(encoding="utf-8").split('"""')[1].strip().splitlines() or [""])[0]
        body = proc.stdout.rstrip() or "(no output)"
        if proc.returncode != 0:
            body += f"\n(exit status {proc.returncode})\n" + proc.stderr.strip()[-2000:]
        sections.append(f"## {script.name}\n\n{doc}\n\nCommand: `{command}` ({took:.0f} s)\n\n```\n{body}\n```\n")
    today = datetime.date.today().isoformat()
    text = (f"# Benchmark results\n\nWritten by `make bench` (benchmarks/run_all.py) on {today}.\n"
            f"Machine: {machine()}.\n`python` is the project's `.venv/bin/python`. Every figure is a ratio against a baseline measured in the same run.\n\n"
            + "\n".join(sections))
    tmp = HERE / ".RESULTS.md.tmp"
    tmp.write_text(text, encoding="utf-8")
    os.replace(tmp, HERE / "RESULTS.md")
    return status


if __name__ == "__main__":
    sys.exit(main())
