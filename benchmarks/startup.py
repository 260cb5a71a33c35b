"""Start-up cost of `claimcheck check` on one example claim, as a ratio against a bare
`python -c "import numpy, scipy.stats"` measured in the same run (goal: at most 1.3x), and of
`claimcheck --help` and `claimcheck schema` against the same baseline (goal: at most 0.15x).

Also lists which heavy modules a plain check imports (none of statsmodels, pandas,
matplotlib should appear).  Run: .venv/bin/python benchmarks/startup.py
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
CLAIM = ROOT / "claims_examples" / "lattice_xeb_clean.yaml"
REPEATS = 15
HEAVY = ("statsmodels", "pandas", "matplotlib")


def timed(argv: list[str]) -> float:
    start = time.perf_counter()
    subprocess.run(argv, check=False, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    return time.perf_counter() - start


def main() -> int:
    python = sys.executable
    baseline_cmd = [python, "-c", "import numpy, scipy.stats"]
    check_cmd = [python, "-m", "checker.cli", "check", str(CLAIM)]
    timed(baseline_cmd), timed(check_cmd)  # warm the file cache
    base, check = [], []
    for _ in range(REPEATS):  # interleaved, so drifts in machine load hit both alike
        base.append(timed(baseline_cmd))
        check.append(timed(check_cmd))
    b, c = statistics.median(base), statistics.median(check)
    light = {}
    for label, extra in (("claimcheck --help", ["--help"]), ("claimcheck schema", ["schema"])):
        runs = []
        for _ in range(REPEATS):
            runs.append(timed([python, "-m", "checker.cli", *extra]))
            base.append(timed(baseline_cmd))
        light[label] = statistics.median(runs)
    b = statistics.median(base)
    probe = subprocess.run(
        [python, "-c", "import sys, io; from checker.cli import run; "
         f"run(['check', {str(CLAIM)!r}], io.StringIO(), io.StringIO()); "
         f"print(' '.join(m for m in {HEAVY!r} if m in sys.modules))"],
        capture_output=True, text=True, check=False)
    heavy = probe.stdout.strip() or "none"
    print(f"bare import numpy, scipy.stats: median {b * 1000:.0f} ms over {REPEATS} runs")
    print(f"claimcheck check (one claim):   median {c * 1000:.0f} ms over {REPEATS} runs")
    print(f"ratio: {c / b:.2f}x (goal at most 1.3x)")
    print(f"heavy modules imported by a plain check: {heavy}")
    for label, took in light.items():
        print(f"{label}: median {took * 1000:.0f} ms, ratio {took / b:.2f}x the bare import (goal at most 0.15x)")
    for label, took in light.items():
        r = took / b
        print(f"GOAL | `{label}` against a bare `import numpy, scipy.stats` | {r:.2f}x | <= 0.15x | "
              + ("met" if r <= 0.15 else f"missed by {r - 0.15:.2f}x (Python's own start-up, `python -c pass`, "
                 "is most of it)"))
    return 0


if __name__ == "__main__":
    sys.exit(main())
