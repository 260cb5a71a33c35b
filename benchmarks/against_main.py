"""This tree's ``check`` and ``batch`` speed as ratios against main's, in the same run.

    python benchmarks/against_main.py [--claims 10000] [--repeat 3] [--ref main]

Exports ``--ref`` (a git revision, main by default) with ``git archive`` into a
temporary folder and runs the same work with both trees' ``checker`` package,
each in a fresh process, alternating, best of ``--repeat``:

1. ``run_checks`` on every example claim (claims_examples/), 20 times over, and
   the Markdown, HTML and JSON reports of each: the per-claim cost of ``check``;
2. ``claimcheck batch TABLE --out OUT.csv --jobs 1`` on ``--claims`` invented
   claims (benchmarks/batch_throughput.py makes them; every number is made up).

It also times, in this tree, the part of a batch that gathers the recomputed
significance of every claim from its findings and adjusts it across the set
(``survey.run.recomputed_significance`` and ``summarize``) against the whole batch,
the share issue 10 asks about: survey/run.py reads sigma and p from the
significance findings unless that costs more than 20% of batch time.
A script, never a test: timing belongs here, not in asserts.
"""

from __future__ import annotations

import argparse
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "benchmarks"))

CHECK_DRIVER = """
import sys, time
from pathlib import Path
from checker.checks import run_checks
from checker.claim import read_claim
from checker.render.html import render_html
from checker.render.json import render_json
from checker.render.markdown import render_markdown
files = sorted(p for p in Path(sys.argv[1]).iterdir() if p.suffix in ('.yaml', '.json'))
claims = []
for p in files:
    try:
        claims.append(read_claim(p))
    except Exception:
        pass
start = time.perf_counter()
for _ in range(20):
    for c in claims:
        r = run_checks(c)
        render_json(r); render_markdown(r, c); render_html(r, c)
print(time.perf_counter() - start)
"""


def export(ref: str, into: Path) -> Path:
    into.mkdir(parents=True, exist_ok=True)
    # The package and the schema its data folder links to.
    archive = subprocess.run(["git", "archive", ref, "checker", "schemas"], cwd=ROOT, capture_output=True,
                             check=True).stdout
    subprocess.run(["tar", "-x", "-C", str(into)], input=archive, check=True)
    return into


def timed(cmd: list[str], tree: Path, cwd: Path) -> float:
    env = {**os.environ, "PYTHONPATH": str(tree)}
    start = time.perf_counter()
    subprocess.run(cmd, cwd=cwd, env=env, check=False, capture_output=True)
    return time.perf_counter() - start


def check_time(tree: Path, cwd: Path) -> float:
    env = {**os.environ, "PYTHONPATH": str(tree)}
    out = subprocess.run([sys.executable, "-c", CHECK_DRIVER, str(ROOT / "claims_examples")], cwd=cwd, env=env,
                         capture_output=True, text=True, check=True).stdout
    return float(out.strip().splitlines()[-1])


def significance_share(table: Path) -> tuple[float, float]:
    """(seconds of the whole batch, seconds spent getting every claim's z and p
    and adjusting them across the set) in this tree, one process: the reading
    from the findings (survey.run.recomputed_significance) and summarize."""
    from checker.survey import run as survey_run

    survey_run.run_batch(str(table), jobs=1)  # warm: imports (pandas, scipy) are not the reading's cost
    spent = [0.0]
    patched = {}
    for name in ("recomputed_significance", "summarize"):
        original = getattr(survey_run, name)
        patched[name] = original

        def timed_call(*args, _original=original, **kwargs):
            t = time.perf_counter()
            try:
                return _original(*args, **kwargs)
            finally:
                spent[0] += time.perf_counter() - t

        setattr(survey_run, name, timed_call)
    try:
        start = time.perf_counter()
        survey_run.run_batch(str(table), jobs=1)
        return time.perf_counter() - start, spent[0]
    finally:
        for name, original in patched.items():
            setattr(survey_run, name, original)


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--claims", type=int, default=10000)
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--ref", default="main")
    args = ap.parse_args()
    from batch_throughput import invented_claims, write_table

    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        base = export(args.ref, tmp / "ref")
        work = tmp / "work"
        work.mkdir()
        table = work / "survey.csv"
        write_table(invented_claims(args.claims), table)
        batch = [sys.executable, "-m", "checker.cli", "batch", str(table), "--out", str(work / "out.csv"),
                 "--jobs", "1"]
        times = {"check": {"this": [], "ref": []}, "batch": {"this": [], "ref": []}}
        for _ in range(args.repeat):
            for name, tree in (("ref", base), ("this", ROOT)):
                times["check"][name].append(check_time(tree, work))
                times["batch"][name].append(timed(batch, tree, work))
        print(f"reference: {args.ref}; best of {args.repeat}, fresh processes, alternating")
        for what, label in (("check", "check: every example claim x 20, checks + JSON, Markdown, HTML"),
                            ("batch", f"batch: {args.claims:,} invented claims, one process")):
            this, ref = min(times[what]["this"]), min(times[what]["ref"])
            print(f"{label}: this tree {this:.2f} s, {args.ref} {ref:.2f} s, ratio {this / ref:.3f}")
        whole, part = significance_share(table)
        print(f"z and p of every claim read from its findings, and adjusted across the set, in this tree: "
              f"{part:.3f} s of {whole:.2f} s of batch ({100 * part / whole:.1f}%)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
