"""``claimcheck plan`` for the kinds of claim beyond "an estimate above a threshold":
beating a baseline (two proportions, on separate or the same items), a mean over a few
runs tested with Student's t, and a counting experiment over an expected background.

The sizes come from :mod:`checker.stats.power` (Fleiss et al. for two proportions,
Connor 1987 for paired items with an assumed discordance rate, the noncentral t for
runs, the exact Poisson tail for a counting experiment); this module reads the options,
refuses what does not fit in one line, and writes text or JSON.
"""

from __future__ import annotations

import math

from .. import wording

# The multiples of the planned size the table shows, so a reader sees how the power falls
# away below the answer and how little is gained above it.
TABLE_SCALES = (0.25, 0.5, 0.75, 1.0, 1.5, 2.0)
# What each kind counts, as JSON keys and as words.
UNITS = {"two-proportions": ("items_per_arm", "items in each arm"),
         "paired-proportions": ("items", "items, each scored by both"),
         "mean-runs": ("runs", "runs"),
         "counting-exposure": ("exposure", "units of exposure")}


def kind_of(args) -> str | None:
    """Which kind of plan the options ask for; None for the threshold plan of plan.py."""
    if getattr(args, "baseline", None) is not None:
        return "paired-proportions" if args.paired else "two-proportions"
    if args.metric == "counts":
        return "counting-exposure"
    if args.metric == "mean" and getattr(args, "runs", False):
        return "mean-runs"
    return None


def _fail(option: str, problem: str, allowed: str):
    from ..errors import ClaimcheckError

    raise ClaimcheckError("claimcheck plan", problem, allowed, path=option)


def _refuse_unused(args, kind: str, allowed: set[str]) -> None:
    """Options that the kind does not read are refused, never silently ignored."""
    given = {"--threshold": args.threshold, "--syst-error": args.syst or None, "--circuits": args.circuits,
             "--samples": args.samples, "--qubits": args.qubits, "--sd": args.sd,
             "--discordance": args.discordance, "--background": args.background,
             "--paired": args.paired or None, "--runs": args.runs or None}
    for option, value in given.items():
        if value is not None and option not in allowed:
            _fail(option, f"does not apply to a {kind.replace('-', ' ')} plan", "leave it out")


def _sizes(kind: str, args, sigma: float):
    """(SampleSize, power_at(count)) for the kind."""
    from ..stats import power

    if kind == "two-proportions":
        p1, p2 = args.fidelity, args.baseline
        return power.two_proportions(p1, p2, sigma, args.power), \
            lambda n: power.two_proportions_power(p1, p2, n, sigma)
    if kind == "paired-proportions":
        delta, psi = args.fidelity - args.baseline, args.discordance
        p10, p01 = (psi + delta) / 2, (psi - delta) / 2
        return power.paired_proportions(p10, p01, sigma, args.power), \
            lambda n: power.paired_proportions_power(p10, p01, n, sigma)
    if kind == "mean-runs":
        delta = args.fidelity - args.threshold
        return power.mean_runs(delta, args.sd, sigma, args.power), \
            lambda n: power.mean_runs_power(delta, args.sd, int(n), sigma) if n >= 2 else 0.0
    s, b = args.fidelity, args.background
    return power.counting_exposure(s, b, sigma, args.power), lambda t: power.counting_power(s, b, t, sigma)


def _validate(kind: str, args) -> float:
    """The target sigma, after refusing what the kind cannot use."""
    sigma = args.sigma
    if sigma is None:
        _fail("--required-sigma", f"is needed for a {kind.replace('-', ' ')} plan",
              "give the significance the claim must reach")
    if kind in ("two-proportions", "paired-proportions"):
        if args.metric != "proportion":
            _fail("--baseline", f"plans a difference of two proportions, not of {args.metric}",
                  "use --metric proportion")
        for option, value in (("--estimate", args.fidelity), ("--baseline", args.baseline)):
            if not 0 < value < 1:
                _fail(option, f"{value:g} is not a proportion strictly between 0 and 1", "give a value in (0, 1)")
        if args.fidelity <= args.baseline:
            _fail("--baseline", f"{args.baseline:g} is not below the expected {args.fidelity:g}: there is no "
                  "difference to detect", "give a baseline below --estimate")
        allowed = {"--paired", "--discordance"} if kind == "paired-proportions" else set()
        _refuse_unused(args, kind, allowed)
        if kind == "paired-proportions":
            delta, psi = args.fidelity - args.baseline, args.discordance
            if psi is None:
                _fail("--discordance", "is needed with --paired: the share of items on which the two disagree "
                      "(one right, the other wrong)", "give it, such as 0.1")
            # p10 - p01 = delta with 0 <= p01 <= 1 - p1 and p10 <= p1 (the 2x2 table's cells)
            most = 2.0 * min(args.fidelity, 1.0 - args.baseline) - delta
            if not delta <= psi <= most:
                _fail("--discordance", f"{psi:g} cannot go with accuracies {args.fidelity:g} and {args.baseline:g}",
                      f"give a rate from their difference {delta:g} to {most:g}")
        elif args.discordance is not None:
            _fail("--discordance", "applies to paired items only", "add --paired or leave it out")
    elif kind == "mean-runs":
        if args.threshold is None or args.sd is None:
            _fail("--threshold" if args.threshold is None else "--sd",
                  "is needed for a plan of runs (threshold and the runs' sd)", "give --threshold and --sd")
        if args.fidelity <= args.threshold:
            _fail("--estimate", f"{args.fidelity:g} is not above the threshold {args.threshold:g}",
                  "give the mean you expect, above the threshold")
        _refuse_unused(args, kind, {"--threshold", "--sd", "--runs"})
    else:
        if args.background is None:
            _fail("--background", "is needed for a counting experiment: the expected background per unit of "
                  "exposure", "give it, such as 30.2")
        if args.fidelity <= 0:
            _fail("--estimate", f"{args.fidelity:g} is no signal: give the expected signal per unit of exposure",
                  "give a rate above 0")
        _refuse_unused(args, kind, {"--background"})
    return sigma


def run_kind(kind: str, args, stdout) -> int:
    sigma = _validate(kind, args)
    size, power_at = _sizes(kind, args, sigma)
    rows = []
    if size.reachable:
        for scale in TABLE_SCALES:
            count = size.count * scale
            count = count if kind == "counting-exposure" else max(2 if kind == "mean-runs" else 1, math.ceil(count))
            rows.append({"count": count, "power": power_at(count)})
    key, words = UNITS[kind]
    # required_sigma is the claim vocabulary's name; target_sigma stays for scripts that read it.
    data = {"metric": args.metric, "kind": kind, "required_sigma": sigma, "target_sigma": sigma,
            "power": args.power,
            key: (size.count if size.reachable else None), "samples": None, "reachable": size.reachable,
            "achieved_power": size.achieved_power if size.reachable else None, "best_sigma": None,
            "inputs": _inputs(kind, args),
            "table": [{key: r["count"], "power": r["power"]} for r in rows]}
    if kind != "counting-exposure":
        data["samples"] = data[key]  # the design's count under its usual name
    else:
        del data["samples"]
        if size.reachable:
            data["expected_background"] = args.background * size.count
            data["expected_events"] = (args.background + args.fidelity) * size.count
    if args.json:
        from ..render.json import dumps

        stdout.write(dumps(data))
    else:
        stdout.write(_text(kind, args, size, rows, words))
    return 0


def _inputs(kind: str, args) -> dict:
    if kind == "two-proportions":
        return {"estimate": args.fidelity, "baseline": args.baseline}
    if kind == "paired-proportions":
        return {"estimate": args.fidelity, "baseline": args.baseline, "discordance": args.discordance}
    if kind == "mean-runs":
        return {"estimate": args.fidelity, "threshold": args.threshold, "sd": args.sd}
    return {"signal_rate": args.fidelity, "background_rate": args.background}


def _g(x, digits: int = 4) -> str:
    return wording.num(x, digits)


def _count_text(kind: str, n) -> str:
    return _g(n, 4) if kind == "counting-exposure" else wording.count(n)


def _text(kind, args, size, rows, words) -> str:
    z, pw = _g(size.target_sigma), _g(args.power)
    if kind == "two-proportions":
        head = (f"Plan: {_g(args.fidelity)} against a baseline of {_g(args.baseline)} on separate items, "
                f"{z} sigma (one-sided, errors in quadrature) with power {pw}")
        how = ("n per arm = (z_a + z_b)^2 (p1 q1 + p2 q2) / (p1 - p2)^2 (Fleiss, Levin and Paik 2003, "
               "section 4.2, without the continuity correction)")
    elif kind == "paired-proportions":
        head = (f"Plan: {_g(args.fidelity)} against a baseline of {_g(args.baseline)} on the same items, "
                f"assuming they disagree on {_g(args.discordance)} of them, {z} sigma (McNemar's z, one-sided) "
                f"with power {pw}")
        how = ("n = (z_a sqrt(psi) + z_b sqrt(psi - delta^2))^2 / delta^2, psi the discordance rate and delta "
               "the difference (Connor 1987); a lower discordance needs fewer items")
    elif kind == "mean-runs":
        head = (f"Plan: a mean of {_g(args.fidelity)} over runs of sd {_g(args.sd)} against {_g(args.threshold)}, "
                f"{z} sigma (Student's t on runs - 1 degrees of freedom, one-sided) with power {pw}")
        how = ("the smallest number of runs whose t test reaches the power under the noncentral t "
               "(noncentrality (mean - threshold) sqrt(runs) / sd)")
    else:
        head = (f"Plan: a signal of {_g(args.fidelity)} over a background of {_g(args.background)} events per "
                f"unit of exposure, {z} sigma (exact Poisson tail, one-sided) with power {pw}")
        how = ("the first exposure at which the exact Poisson test reaches the power; the power of a test on "
               "whole counts rises and falls with the exposure, so a little more can be a little worse")
    lines = [head]
    if not size.reachable:
        lines.append(f"  {z} sigma cannot be reached: there is no effect to detect.")
        return "\n".join(lines) + "\n"
    lines.append(f"  {words} needed: {_count_text(kind, size.count)} (reaches {z} sigma in "
                 f"{100 * size.achieved_power:.1f}% of such experiments)")
    if kind == "counting-exposure":
        lines.append(f"  expected: {_g(args.background * size.count)} background and "
                     f"{_g((args.background + args.fidelity) * size.count)} events in all")
    lines += ["", f"  {words:>28}  power"]
    for r in rows:
        lines.append(f"  {_count_text(kind, r['count']):>28}  {_g(r['power'], 3)}")
    lines += ["", f"  Sizes from {how}."]
    return "\n".join(lines) + "\n"
