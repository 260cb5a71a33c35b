"""``claimcheck raw DATA``: re-derive the estimate from raw per-sample data,
test the Porter-Thomas model behind it, bootstrap it, and (with ``--claim``)
hold the claim's printed numbers against it."""

from __future__ import annotations


from .arguments import OldName, print_old_names
from .arguments import value as _value
from .arguments import level as _level
from .arguments import whole as _whole

HELP = "re-derive an estimate from raw per-sample data and test the model it leans on"
DESCRIPTION = (HELP + ". DATA is CSV, NPY, NPZ or Parquet with one row per sample: probability (the ideal "
               "probability of the observed outcome), and optionally circuit and heavy (0/1).")
# Kept here rather than imported so that building the parser stays light.
RAW_METRICS = ("linear-xeb", "log-xeb", "heavy-output")
DEFAULT_REPLICATES = 10_000
DEFAULT_FIT_SAMPLE = 100_000
# Limits (README, "Limits"): replicates, and rows kept for the goodness-of-fit tests.
MAX_REPLICATES = 1_000_000
MAX_FIT_SAMPLE = 10_000_000


def add_parser(sub) -> None:
    p = sub.add_parser("raw", help=HELP, description=DESCRIPTION)
    p.add_argument("data", metavar="DATA", help="raw data file (.csv, .npy, .npz, .parquet)")
    p.add_argument("--claim", metavar="CLAIM", help="claim file whose printed numbers to hold against the data")
    p.add_argument("--metric", choices=RAW_METRICS, help="headline metric (default: the claim's)")
    p.add_argument("--qubits", type=_whole(1, "qubits"), metavar="N", help="qubits; D = 2**N (default: the claim's)")
    p.add_argument("--bootstrap", type=_whole(0, "bootstrap", MAX_REPLICATES), default=DEFAULT_REPLICATES, metavar="B",
                   help=f"bootstrap replicates, 0 for none (default {DEFAULT_REPLICATES:,}, at most {MAX_REPLICATES:,})")
    p.add_argument("--seed", type=_whole(0, "seed"), default=0, metavar="S",
                   help="seed of the subsample and the bootstrap (default 0)")
    p.add_argument("--level", type=_level, default=0.95, help="bootstrap interval level (default 0.95)")
    p.add_argument("--also-test-at", dest="threshold", type=_value, metavar="F",
                   help="also test the Porter-Thomas fit at this fidelity (default: the claim's threshold)")
    # --threshold is the option's first name, kept working with one line on stderr: the value is
    # only where the fit is also tested, never a threshold the data are held to.
    p.add_argument("--threshold", dest="threshold", type=_value, metavar="F", action=OldName,
                   new_name="--also-test-at", why="the value is only where the fit is also tested")
    p.add_argument("--fit-sample", type=_whole(2, "fit-sample", MAX_FIT_SAMPLE), default=DEFAULT_FIT_SAMPLE, metavar="K",
                   help=f"rows kept at random for the goodness-of-fit tests (default {DEFAULT_FIT_SAMPLE:,})")
    p.add_argument("--estimate-only", action="store_true",
                   help="only the estimates and their errors (no fits, tests or bootstrap): the fastest pass")
    p.add_argument("--json", action="store_true", help="print the result as JSON")
    p.add_argument("--html", metavar="OUT", help="also write an HTML page with the histogram and bootstrap pictures to OUT")
    p.add_argument("--markdown", metavar="OUT", help="also write a short Markdown summary to OUT")


def run(args, stdout, stderr) -> int:
    from dataclasses import replace

    from ..errors import DataError
    from ..output import check_targets, write_all_atomic
    from ..raw.analysis import analyse
    from ..render.raw_text import render_raw_text

    print_old_names(args, stderr)
    inputs = [args.data] + ([args.claim] if args.claim else [])
    # Refused before the (possibly long) pass over the data.
    check_targets({"--html": args.html, "--markdown": args.markdown}, inputs)
    claim = None
    if args.claim:
        from ..claim import read_claim

        claim = read_claim(args.claim)
        if claim.metric not in RAW_METRICS:
            raise DataError(args.claim, f"the claim's metric {claim.metric} has no raw-data estimator",
                            f"raw data give {', '.join(RAW_METRICS)}", path="metric")
        if args.metric and args.metric != claim.metric:
            raise DataError(args.claim, f"the claim's metric is {claim.metric} but --metric says {args.metric}",
                            "leave out --metric or make the two agree", path="metric")
        if args.qubits and claim.qubit_count and args.qubits != claim.qubit_count:
            raise DataError(args.claim, f"the claim says {claim.qubit_count} qubits but --qubits says {args.qubits}",
                            "leave out --qubits or make the two agree", path="qubits")
    metric = args.metric or (claim.metric if claim else None)
    qubits = args.qubits or (claim.qubit_count if claim else None)
    if metric is None:
        raise DataError(args.data, "no metric given", f"give --metric ({', '.join(RAW_METRICS)}) or --claim")
    if qubits is None:
        raise DataError(args.data, "the number of qubits is not known", "give --qubits N (or a claim with qubits)")
    threshold = args.threshold
    if threshold is None and claim is not None and claim.threshold is not None:
        threshold = claim.threshold.value
    result = analyse(args.data, metric, qubits, bootstrap=0 if args.estimate_only else args.bootstrap,
                     seed=args.seed, level=args.level, threshold=threshold, fit_sample=args.fit_sample,
                     estimate_only=args.estimate_only)
    report = None
    if claim is not None:
        result = _with_claim(result, claim, args.claim, replace)
        from ..report import Report

        report = Report(title=claim.title, file=args.claim, findings=result.findings)
    written = []
    if args.html is not None:
        from ..render.raw_html import render_raw_html

        written.append((args.html, render_raw_html(result, report)))
    if args.markdown is not None:
        from ..render.raw_markdown import render_raw_markdown

        written.append((args.markdown, render_raw_markdown(result, report)))
    write_all_atomic(written, inputs)
    if args.json:
        from ..render.json import dumps
        from ..render.raw_json import raw_result_to_dict

        stdout.write(dumps(raw_result_to_dict(result)))
    else:
        stdout.write(render_raw_text(result))
    if result.findings is not None and any(f.status == "fail" for f in result.findings):
        return 1
    return 0


def _with_claim(result, claim, claim_file, replace):
    """The result with the claim checks and the raw-data checks (checker.checks)."""
    from ..checks import run_checks, run_raw_checks
    from ..report import Report

    findings = run_checks(claim).findings + run_raw_checks(claim, result)
    report = Report(title=claim.title, file=claim_file, findings=findings)
    return replace(result, findings=report.findings, claim_file=claim_file, verdict=report.verdict)
