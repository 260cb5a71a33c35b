"""Throughput of ``claimcheck batch`` against running ``claimcheck check`` once
per claim file, in the same run.

    python benchmarks/batch_throughput.py [--claims 100000] [--files 20] [--jobs N] [--profile]

Generates invented claims (seeded; every lab and number is made up), writes
them as one CSV table and, for the baseline, the first ``--files`` of them as
JSON claim files.  Times

1. ``claimcheck batch TABLE --out OUT.csv``, the whole command in a fresh
   process (imports, reading, checks, adjustment, writing);
2. ``claimcheck check FILE --json`` once per file, each a fresh process, and
   scales the mean to the table's size.

It prints the two times, their ratio and the per-claim cost, and with
``--profile`` the top of a cProfile of the batch engine on 5,000 claims in
one process.  A script, never a test: timing belongs here, not in asserts.
"""

from __future__ import annotations

import argparse
import csv
import io
import json
import math
import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np
from scipy.special import log_ndtr

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))
from checker.stats.multiplicity import log_sidak  # noqa: E402
from checker.stats.tails import sigma_from_log_p  # noqa: E402

COLUMNS = ["title", "source", "metric", "qubits", "estimate", "stat_error", "syst_error", "samples",
           "circuits", "sd", "threshold", "significance.sigma", "significance.p_value", "significance.sided",
           "significance.systematics", "significance.required_sigma", "significance.global_sigma", "trials",
           "combination.method", "interval.low", "interval.high", "interval.level"]
PARTS = 5
COLUMNS += [f"parts.{i}.{field}" for i in range(PARTS) for field in ("label", "estimate", "stat_error", "samples")]


def _g(x: float, digits: int) -> str:
    return f"{x:.{digits}g}"


def _p_text(log_p: float) -> str:
    """Two significant figures; a bound below the double range."""
    if log_p > -690:
        return _g(math.exp(log_p), 2)
    return "< 1e-300"  # below the double range: authors print a bound


def invented_claims(n: int, seed: int = 20240611) -> list[dict]:
    """``n`` invented claims with the mix a survey might hold (the issue's
    realistic table): five metrics, proportions and means among them, a fifth
    with a systematic (1 in 100 marginalized), some two-sided, some with trials,
    about one in ten with a slip (the other sidedness, a mistyped sigma, an
    error below the sampling floor, an uncorrected global sigma); 10% with 5
    parts (per-circuit or per-subset results whose samples-weighted mean is the
    headline) and 10% with a 95% interval (Wilson for proportions, estimate
    +- 1.96 standard errors for the others)."""
    rng = np.random.default_rng(seed)
    extra_rng = np.random.default_rng(seed + 1)  # parts and intervals, leaving the rest of the mix as it was
    metrics = rng.choice(["linear-xeb", "heavy-output", "proportion", "log-xeb", "mean"], size=n,
                         p=[0.4, 0.15, 0.2, 0.1, 0.15])
    claims = []
    for i, metric in enumerate(metrics):
        row = {"title": f"Invented claim {i + 1} ({metric})", "source": f"invented survey, entry {i + 1}",
               "metric": str(metric)}
        if metric in ("linear-xeb", "log-xeb"):
            qubits = int(rng.integers(12, 40))
            fidelity = float(10 ** rng.uniform(-3, -1))
            samples = float(_g(10 ** rng.uniform(5, 7.5), 2))
            samples = max(samples, float(_g(9.0 * 1.6 ** 2 / fidelity ** 2, 2)))  # z of 3 or more
            variance = 1 + 2 * fidelity - fidelity ** 2 if metric == "linear-xeb" else math.pi ** 2 / 6 - fidelity ** 2
            se = math.sqrt(variance / samples) * rng.uniform(1.0, 1.6)
            threshold = 0.0 if rng.random() < 0.5 else float(_g(fidelity / 2, 1))
            row.update(qubits=str(qubits), samples=_g(samples, 2))
        elif metric == "heavy-output":
            fidelity = float(rng.uniform(0.7, 0.84))
            circuits = int(rng.integers(100, 1000))
            se = math.sqrt(fidelity * (1 - fidelity) / circuits)
            threshold = 0.666667
            row.update(qubits=str(int(rng.integers(4, 12))), circuits=str(circuits))
        elif metric == "proportion":
            fidelity = float(rng.uniform(0.55, 0.95))
            samples = int(rng.integers(200, 20000))
            se = math.sqrt(fidelity * (1 - fidelity) / samples)
            threshold = 0.5
            row.update(samples=str(samples))
        else:
            fidelity = float(rng.uniform(0.1, 2.0))
            sd = float(rng.uniform(0.5, 3.0))
            samples = int(rng.integers(50, 5000))
            se = sd / math.sqrt(samples)
            threshold = float(_g(fidelity * rng.uniform(0.3, 0.9), 2))
            row.update(samples=str(samples), sd=_g(sd, 3))
        estimate = float(_g(fidelity + se * rng.normal(), 3))
        stat = float(_g(se, 2))
        row.update(estimate=_g(estimate, 3), stat_error=_g(stat, 2), threshold=repr(threshold))
        syst = 0.0
        if rng.random() < 0.2:
            syst = float(_g(stat * rng.uniform(0.2, 1.0), 1))
            row["syst_error"] = _g(syst, 1)
            row["significance.systematics"] = "marginalized" if rng.random() < 0.05 else "quadrature"
        two = rng.random() < 0.1
        if two:
            row["significance.sided"] = "two"
        z = (estimate - threshold) / math.hypot(stat, syst)
        z_print = abs(z) if two else z
        log_p = min(0.0, math.log(2) + float(log_ndtr(-abs(z)))) if two else float(log_ndtr(-z))
        slip = rng.random()
        if slip < 0.03:  # the other sidedness's p-value
            log_p = log_p + (-math.log(2) if two else math.log(2))
        elif slip < 0.05:  # a mistyped sigma
            z_print += 0.9
        elif slip < 0.07 and "samples" in row:  # an error below the sampling floor
            row["stat_error"] = _g(stat / 4, 2)
        row["significance.sigma"] = _g(z_print, 3)
        if rng.random() < 0.5:
            row["significance.p_value"] = _p_text(log_p)
        reached = z_print
        if rng.random() < 0.15:
            trials = int(rng.integers(2, 50))
            row["trials"] = str(trials)
            glp = log_sidak(min(log_p, -1e-300), trials)
            global_sigma = sigma_from_log_p(glp, "two" if two else "one")
            reached = max(global_sigma, 0.0)
            row["significance.global_sigma"] = _g(z_print if 0.07 <= slip < 0.08 else reached, 3)
        # Most claims state a level they reach; one in fifty states one it misses.
        levels = [level for level in (2, 3, 5) if level <= reached]
        if levels and rng.random() < 0.7:
            level = int(rng.choice(levels)) if rng.random() > 0.02 else 5
            row["significance.required_sigma"] = str(level)
        kind = extra_rng.random()
        with_parts = 0.0 if metric == "heavy-output" else 0.1 / 0.85  # 10% of all: heavy output has no samples
        if kind < with_parts:
            _add_parts(row, metric, estimate, stat, extra_rng)
        elif kind < with_parts + 0.1:
            _add_interval(row, metric, estimate, stat)
        claims.append(row)
    return claims


def _add_parts(row: dict, metric: str, estimate: float, stat: float, rng) -> None:
    """Five parts of equal samples whose mean is the headline estimate (their
    deviations sum to zero), each with sqrt(5) times the headline's error."""
    deviations = rng.normal(size=PARTS)
    deviations -= deviations.mean()
    part_error = stat * math.sqrt(PARTS)
    if metric == "proportion":
        total = int(row["samples"])
        sizes = [total // PARTS] * (PARTS - 1) + [total - (PARTS - 1) * (total // PARTS)]
        sizes_text = [str(k) for k in sizes]
        # Whole counts per part (a proportion is k/n), adding up to the headline's count.
        counts = [min(max(round((estimate + part_error * deviations[i]) * sizes[i]), 0), sizes[i])
                  for i in range(PARTS - 1)]
        counts.append(min(max(round(estimate * total) - sum(counts), 0), sizes[-1]))
        values = [k / size for k, size in zip(counts, sizes)]
    else:
        sizes_text = [_g(float(row["samples"]) / PARTS, 2)] * PARTS
        values = [estimate + part_error * d for d in deviations]
    for i in range(PARTS):
        row[f"parts.{i}.label"] = f"subset {i + 1}"
        row[f"parts.{i}.estimate"] = _g(values[i], 4)
        row[f"parts.{i}.stat_error"] = _g(part_error, 2)
        row[f"parts.{i}.samples"] = sizes_text[i]
    row["combination.method"] = "samples"


def _add_interval(row: dict, metric: str, estimate: float, stat: float) -> None:
    if metric == "proportion" and 0 < estimate < 1:
        n, z = int(row["samples"]), 1.959964
        centre = (estimate + z * z / (2 * n)) / (1 + z * z / n)
        half = z / (1 + z * z / n) * math.sqrt(estimate * (1 - estimate) / n + z * z / (4 * n * n))
        low, high = centre - half, centre + half
    else:
        low, high = estimate - 1.96 * stat, estimate + 1.96 * stat
    row.update({"interval.low": _g(low, 3), "interval.high": _g(high, 3), "interval.level": "0.95"})


def write_table(claims: list[dict], path: Path) -> None:
    with open(path, "w", newline="", encoding="utf-8") as handle:
        handle.write("# invented claims generated by benchmarks/batch_throughput.py\n")
        writer = csv.DictWriter(handle, fieldnames=COLUMNS)
        writer.writeheader()
        writer.writerows(claims)


def nested(row: dict) -> dict:
    out: dict = {}
    for key, value in row.items():
        parts = key.split(".")
        node = out
        for p in parts[:-1]:
            node = node.setdefault(p, {})
        node[parts[-1]] = value
    return _lists(out)


def _lists(node):
    """Mappings numbered 0, 1, ... (``parts.0.estimate``) as lists, as the table reader reads them."""
    if not isinstance(node, dict):
        return node
    node = {k: _lists(v) for k, v in node.items()}
    if node and all(k.isdigit() for k in node):
        return [node[str(i)] for i in range(len(node))]
    return node


def cost_by_kind(claims: list[dict], count: int = 300) -> dict:
    """Milliseconds per claim of run_batch in this process (one worker), for
    claims without parts or an interval, with 5 parts, and with an interval."""
    from checker.survey import run_batch

    groups = {"plain": [r for r in claims if "parts.0.estimate" not in r and "interval.low" not in r],
              "with 5 parts": [r for r in claims if "parts.0.estimate" in r],
              "with an interval": [r for r in claims if "interval.low" in r]}
    out = {}
    for name, rows in groups.items():
        rows = (rows * (count // max(len(rows), 1) + 1))[:count]
        if not rows:
            continue
        run_batch([nested(r) for r in rows[:50]], jobs=1)  # warm: imports and caches of the code
        start = time.perf_counter()
        run_batch([nested(r) for r in rows], jobs=1)
        out[name] = 1e3 * (time.perf_counter() - start) / len(rows)
    return out


def search_share(claims: list[dict], count: int = 100) -> float:
    """Share of run_batch's time on claims with parts spent in the combination
    ranges' bounded search (stats/combination_ranges.py, _search), by cProfile."""
    import cProfile
    import pstats

    from checker.survey import run_batch

    rows = [nested(r) for r in claims if "parts.0.estimate" in r][:count]
    if not rows:
        return 0.0
    prof = cProfile.Profile()
    prof.enable()
    run_batch(rows, jobs=1)
    prof.disable()
    stats = pstats.Stats(prof).stats
    total = max(v[3] for v in stats.values())
    inner = sum(v[3] for k, v in stats.items() if k[0].endswith("combination_ranges.py") and k[2] == "_search")
    return inner / total if total else 0.0


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--claims", type=int, default=100_000)
    ap.add_argument("--files", type=int, default=20)
    ap.add_argument("--jobs", type=int, default=None)
    ap.add_argument("--profile", action="store_true")
    args = ap.parse_args()
    exe = Path(sys.executable).parent / "claimcheck"
    command = [str(exe)] if exe.exists() else [sys.executable, "-m", "checker.cli"]
    claims = invented_claims(args.claims)
    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        table = tmp / "invented.csv"
        write_table(claims, table)
        files = []
        for i, row in enumerate(claims[: args.files]):
            f = tmp / f"claim_{i + 1:03d}.json"
            f.write_text(json.dumps(nested(row)), encoding="utf-8")
            files.append(f)

        cmd = command + ["batch", str(table), "--out", str(tmp / "out.csv")]
        if args.jobs:
            cmd += ["--jobs", str(args.jobs)]
        load = os.getloadavg()[0]
        before = resource.getrusage(resource.RUSAGE_CHILDREN)
        t0 = time.perf_counter()
        done = subprocess.run(cmd, capture_output=True, text=True)
        batch_seconds = time.perf_counter() - t0
        after = resource.getrusage(resource.RUSAGE_CHILDREN)
        batch_cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
        if done.returncode not in (0, 1, 2) or not (tmp / "out.csv").exists():
            sys.stderr.write(done.stderr)
            return 1
        first_lines = done.stdout.splitlines()[:3]

        before = resource.getrusage(resource.RUSAGE_CHILDREN)
        t0 = time.perf_counter()
        for f in files:
            r = subprocess.run(command + ["check", str(f), "--json"], capture_output=True, text=True)
            if r.returncode not in (0, 1):
                sys.stderr.write(r.stderr)
                return 1
        per_file = (time.perf_counter() - t0) / len(files)
        after = resource.getrusage(resource.RUSAGE_CHILDREN)
        per_file_cpu = ((after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)) / len(files)

    scaled = per_file * args.claims
    print(f"claims: {args.claims:,} invented (seed 20240611); CPUs available: {len(os.sched_getaffinity(0))}; "
          f"load average before the batch: {load:.1f}")
    for line in first_lines:
        print(f"  batch says: {line}")
    print(f"claimcheck batch (--out CSV): {batch_seconds:.1f} s wall, {batch_cpu:.1f} s CPU over all its "
          f"processes ({1e3 * batch_seconds / args.claims:.3f} ms wall per claim)")
    print(f"claimcheck check once per file: {per_file:.3f} s wall ({per_file_cpu:.3f} s CPU) per file over "
          f"{len(files)} files, scaled to {args.claims:,} claims: {scaled:,.0f} s wall")
    print(f"ratio (per-file scaled / batch), wall: {scaled / batch_seconds:,.0f}x; CPU: "
          f"{per_file_cpu * args.claims / batch_cpu:,.0f}x")

    at_100k = batch_seconds * 100_000 / args.claims
    ratio = scaled / batch_seconds
    kinds = cost_by_kind(claims)
    share = search_share(claims)
    print("in process, one worker, 300 claims of each kind: "
          + "; ".join(f"{name} {ms:.2f} ms per claim" for name, ms in kinds.items()))
    print(f"profile of 100 claims with parts: {share:.0%} of their time in the combination ranges' bounded search "
          "(stats/combination_ranges.py _search, scipy L-BFGS-B over the parts' printed boxes)")
    print(f"GOAL | batch of {args.claims:,} invented claims (five metrics; 10% with 5 parts, 10% with an interval), scaled to "
          f"100,000 | {at_100k:.0f} s wall; {ratio:,.0f}x one `check` per file | < 60 s wall and >= 300x | "
          + ("met" if at_100k < 60 and ratio >= 300 else
             f"missed by {at_100k - 60:.0f} s: {at_100k:.0f} s wall (load average {load:.1f} on 2 shared cores); in "
             "process per claim: " + ", ".join(f"{name} {ms:.2f} ms" for name, ms in kinds.items())
             + f"; profile: {share:.0%} of a parts claim's time is the combination ranges' bounded search"))

    if args.profile:
        import cProfile
        import pstats

        from checker.survey import run_batch

        buffer = io.StringIO()
        writer = csv.DictWriter(buffer, fieldnames=COLUMNS)
        writer.writeheader()
        writer.writerows(claims[:5000])
        with tempfile.TemporaryDirectory() as tmp:
            small = Path(tmp) / "small.csv"
            small.write_text(buffer.getvalue(), encoding="utf-8")
            profiler = cProfile.Profile()
            profiler.enable()
            run_batch(str(small), jobs=1)
            profiler.disable()
        pstats.Stats(profiler).sort_stats("cumulative").print_stats(25)
    return 0


if __name__ == "__main__":
    sys.exit(main())
