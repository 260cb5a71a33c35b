"""``claimcheck plan``: how many samples (or circuits) a claim needs before the
data are taken."""

from __future__ import annotations

import argparse
import math

from .. import wording
from .arguments import finite as _finite
from .arguments import value as _value
from .arguments import whole as _whole

HELP = ("plan an experiment: the samples (circuits, for heavy-output) needed to reach a significance "
        "with a given power, the smallest detectable value, and a table over a range of counts")
HEAVY_DEFAULTS = {"threshold": 2.0 / 3.0, "sigma": 2.0}  # Cross et al. (2019): h - 2 sigma > 2/3


def _positive(text: str) -> float:
    x = _finite(text)
    if x <= 0:
        raise argparse.ArgumentTypeError(f"must be more than zero, got {text!r}")
    return x


def _not_negative(text: str) -> float:
    x = _value(text)
    if x < 0:
        raise argparse.ArgumentTypeError(f"must be zero or more, got {text!r}")
    return x


def _power(text: str) -> float:
    x = _value(text)
    if not 0.5 <= x < 1:
        hint = f" (for {text.strip()} percent, write {text.strip()}%)" if 50 <= x < 100 and "%" not in text else ""
        raise argparse.ArgumentTypeError(f"must lie in [0.5, 1), such as 0.8, 0.9 or 80%; got {text!r}{hint}")
    return x


_count = _whole(1, "")

def add_parser(sub) -> None:
    from ..metrics import METRICS

    p = sub.add_parser("plan", help=HELP, description=HELP + ". The estimate is taken to scatter by "
                       "sqrt(v/N), v the metric model's per-sample variance at the expected value; a "
                       "systematic error adds in quadrature and caps the significance at (F - T)/S.")
    p.add_argument("--metric", required=True, choices=list(METRICS), help="the metric model")
    # Option names from the claim vocabulary (estimate, threshold, required_sigma, syst_error, samples,
    # circuits, qubits, sd). The first names (--fidelity, --sigma, --syst), documented before the
    # rename, still work as hidden aliases (README says so); --help shows only the claim's names.
    p.add_argument("--estimate", dest="fidelity", type=_value, metavar="F",
                   help="the value you expect to measure: a fidelity, heavy-output probability, proportion "
                   "or mean (80%% is read as 0.8)")
    p.add_argument("--threshold", type=_value, metavar="T",
                   help="the value the claim must exceed (heavy-output: 2/3 unless given)")
    p.add_argument("--required-sigma", dest="sigma", type=_positive, metavar="Z",
                   help="the significance the claim must reach, its required_sigma (heavy-output: 2 unless given)")
    p.add_argument("--power", type=_power, default=0.8, metavar="P",
                   help="wanted probability of reaching Z (default 0.8; 80%% works too)")
    p.add_argument("--syst-error", dest="syst", type=_not_negative, default=0.0, metavar="S",
                   help="systematic error, added in quadrature (default 0)")
    p.add_argument("--fidelity", dest="fidelity", type=_value, help=argparse.SUPPRESS)
    p.add_argument("--sigma", dest="sigma", type=_positive, help=argparse.SUPPRESS)
    p.add_argument("--syst", dest="syst", type=_not_negative, default=0.0, help=argparse.SUPPRESS)
    p.add_argument("--circuits", type=_count, metavar="K",
                   help="heavy-output: the circuits you have; also report what they can detect. "
                        "linear-xeb, log-xeb (with --qubits): the circuits the samples come from, whose "
                        "own spread (about 4F^2/D per circuit for linear XEB) no number of samples removes")
    p.add_argument("--samples", type=_count, metavar="N",
                   help="the samples you have; also report what they can detect")
    p.add_argument("--qubits", type=_count, metavar="Q",
                   help="linear-xeb, log-xeb: qubits, for the exact finite-D variance and the circuit term")
    p.add_argument("--sd", type=_positive, metavar="SD", help="metric mean: the per-sample standard deviation")
    # Other kinds of claim (checker/commands/plan_kinds.py, issue 14).
    p.add_argument("--baseline", type=_value, metavar="B",
                   help="proportion: the baseline to beat; plans the items needed to detect estimate > baseline")
    p.add_argument("--paired", action="store_true",
                   help="with --baseline: both are scored on the same items (McNemar's z; needs --discordance)")
    p.add_argument("--discordance", type=_value, metavar="R",
                   help="with --paired: the share of items you expect the two to disagree on (one right, one wrong)")
    p.add_argument("--runs", action="store_true",
                   help="metric mean: the samples are runs (seeds) and the test is Student's t on runs - 1 "
                        "degrees of freedom")
    p.add_argument("--background", type=_positive, metavar="B",
                   help="metric counts: the expected background per unit of exposure (--estimate is the "
                        "expected signal per unit of exposure); plans the exposure")
    p.add_argument("--json", action="store_true", help="print the plan as JSON")


def _fail(option: str, problem: str, allowed: str):
    from ..errors import ClaimcheckError

    raise ClaimcheckError("claimcheck plan", problem, allowed, path=option)


def run(args, stdout, stderr) -> int:
    from ..metrics import METRICS, ModelInputs
    from ..stats.planning import pass_probability, plan_experiment, smallest_detectable
    from ..stats.porter_thomas import dimension_of

    from .plan_kinds import kind_of, run_kind

    kind = kind_of(args)
    if kind is not None:
        return run_kind(kind, args, stdout)
    for option, given in (("--paired", args.paired), ("--discordance", args.discordance is not None),
                          ("--runs", args.runs), ("--background", args.background is not None)):
        if given:
            _fail(option, f"does not apply to a {args.metric} plan without "
                  + ("--baseline" if option in ("--paired", "--discordance") else
                     "--metric mean" if option == "--runs" else "--metric counts"), "leave it out")
    model = METRICS[args.metric]
    if args.fidelity is None:  # not required=True in argparse: --fidelity, the hidden first name, also sets it
        _fail("--estimate", "is needed: the value you expect to measure", "give --estimate F (80% reads as 0.8)")
    count_name = model.count_field
    other = "samples" if count_name == "circuits" else "circuits"
    xeb = args.metric in ("linear-xeb", "log-xeb")
    if xeb and args.circuits is not None and args.qubits is None:
        _fail("--circuits", "needs --qubits: the spread between circuits depends on D = 2^qubits", "give --qubits")
    if getattr(args, other) is not None and not xeb:
        _fail(f"--{other}", f"does not apply: {args.metric} counts {count_name}", f"give --{count_name}")
    threshold, sigma = args.threshold, args.sigma
    if args.metric == "heavy-output":
        threshold = HEAVY_DEFAULTS["threshold"] if threshold is None else threshold
        sigma = HEAVY_DEFAULTS["sigma"] if sigma is None else sigma
    for option, value in (("--threshold", threshold), ("--required-sigma", sigma)):
        if value is None:
            _fail(option, f"is needed for {args.metric}", "give the value the plan must reach")
    if args.metric == "mean" and args.sd is None:
        _fail("--sd", "is needed for the mean model (the per-sample standard deviation)", "give --sd")
    if args.qubits is not None and not xeb:
        _fail("--qubits", f"enters only the XEB variances, not {args.metric}'s", "leave it out")
    if not model.lowest <= args.fidelity <= model.highest:
        _fail("--estimate", f"{args.fidelity:g} lies outside [{model.lowest:g}, {model.highest:g}], "
              f"the range of a {model.summary}", "give a value the metric can take")
    inputs = ModelInputs(dimension=dimension_of(args.qubits) if xeb else None, sd=args.sd)
    k = args.circuits if xeb else None

    def variance_at(value: float) -> float:
        # With K circuits: the within-circuit part v - B scales with 1/N, B/K stays.
        return model.within_variance(value, inputs) if k else model.variance(value, inputs)

    def spread_at(value: float) -> float:
        return model.circuit_variance(value, inputs) / k

    given = getattr(args, count_name)
    try:
        spread = spread_at if k else None
        plan = plan_experiment(args.fidelity, threshold, variance_at, sigma, args.power, args.syst,
                               highest=model.highest, counts=(given,) if given else (), spread_at=spread,
                               circuits=k)
        at = None
        if given:
            at = {count_name: given,
                  "smallest_detectable": smallest_detectable(threshold, variance_at, given, sigma, args.power,
                                                             args.syst, model.highest, spread),
                  "pass_probability": pass_probability(args.fidelity, threshold, plan.variance, given, sigma,
                                                       args.syst, plan.spread)}
    except ArithmeticError:  # OverflowError, ZeroDivisionError: numbers beyond double precision
        from ..errors import ClaimcheckError

        raise ClaimcheckError("claimcheck plan", "the values given put the sample count beyond double precision "
                              "(a difference F - T or a systematic too small or too large)",
                              "give --estimate, --threshold, --syst-error and --sd of ordinary size") from None
    if args.json:
        from ..render.json import dumps

        stdout.write(dumps(_as_dict(args, plan, count_name, at)))
    else:
        stdout.write(_as_text(args, plan, count_name, at))
    return 0


def _as_dict(args, plan, count_name, at) -> dict:
    # The claim vocabulary's names (estimate, required_sigma, syst_error), as the options have them;
    # the first names (fidelity, target_sigma, syst) stay beside them for scripts that read them.
    return {
        "metric": args.metric,
        "estimate": plan.value,
        "threshold": plan.threshold,
        "required_sigma": plan.target_sigma,
        "power": plan.power,
        "syst_error": plan.syst,
        "fidelity": plan.value,
        "target_sigma": plan.target_sigma,
        "syst": plan.syst,
        count_name: _json_count(plan.count),
        "reachable": plan.reachable,
        "best_sigma": plan.best_sigma if math.isfinite(plan.best_sigma) else None,
        "reason": plan.reason or None,
        "per_sample_variance": plan.variance,
        **({"circuits": args.circuits, "circuit_spread": plan.spread or None,
            "circuits_needed": math.ceil(plan.circuits_needed) if plan.circuits_needed else None}
           if count_name == "samples" else {}),
        "at": {k: _json_count(v) if k == count_name else v for k, v in at.items()} if at else at,
        "table": [{count_name: _json_count(r.count), "standard_error": r.standard_error, "expected_sigma": r.expected_sigma,
                   "pass_probability": r.pass_probability, "smallest_detectable": r.smallest_detectable}
                  for r in plan.table],
    }


def _json_count(n):
    """A count as JSON: whole while its digits are true, else the double it is
    (1e300, not 301 digits of which 285 are noise)."""
    if isinstance(n, int) and abs(n) >= wording.EXACT_COUNT_DIGITS:
        return float(n)
    return n


def _g(x, digits: int = 4) -> str:
    return wording.num(x, digits)

def _as_text(args, plan, count_name, at) -> str:
    syst = f"systematic {_g(plan.syst)} in quadrature" if plan.syst else "no systematic"
    lines = [f"Plan for {args.metric}: expected value {_g(plan.value)} against threshold {_g(plan.threshold)}, "
             f"{_g(plan.target_sigma)} sigma with power {_g(plan.power)}, {syst}"]
    if plan.reachable:
        row = next(r for r in plan.table if r.count == plan.count)
        lines.append(f"  {count_name} needed: {wording.count(plan.count)} (standard error {_g(row.standard_error, 3)}, "
                     f"expected {_g(row.expected_sigma, 3)} sigma, passes in {100 * row.pass_probability:.1f}% "
                     "of such experiments)")
        if plan.syst:
            lines.append(f"  best achievable with this systematic: {_g(plan.best_sigma, 3)} sigma")
    else:
        lines.append(f"  {plan.target_sigma:g} sigma cannot be reached at any number of {count_name}: {plan.reason}.")
        if plan.syst and math.isfinite(plan.best_sigma):
            lines.append(f"  best achievable sigma: {_g(plan.best_sigma, 3)} (with unlimited {count_name})")
    if at is not None:
        lines.append(f"  with {wording.count(at[count_name])} {count_name}: the smallest value reaching "
                     f"{_g(plan.target_sigma)} sigma with power {_g(plan.power)} is "
                     f"{_g(at['smallest_detectable'], 5)}; the expected value passes with probability "
                     f"{_g(at['pass_probability'], 3)}")
    lines += ["", f"  {count_name:>12}  {'std error':>10}  {'expected sigma':>14}  {'P(pass)':>8}  smallest detectable"]
    for r in plan.table:
        lines.append(f"  {wording.count(r.count):>12}  {_g(r.standard_error, 3):>10}  {_g(r.expected_sigma, 3):>14}  "
                     f"{_g(r.pass_probability, 3):>8}  {_g(r.smallest_detectable, 5)}")
    if plan.spread:
        lines += ["", f"The estimate is taken to scatter by sqrt(v/N + B/K), v = {_g(plan.variance)} the "
                  f"{args.metric} variance of a sample within its circuit and B/K = {_g(plan.spread)} the spread of "
                  f"the {args.circuits:,} circuits' own means, at the expected value; P(pass) is the chance that "
                  "(estimate - threshold) / sqrt(se^2 + syst^2) reaches the target."]
    else:
        lines += ["", f"The estimate is taken to scatter by sqrt(v/N), v = {_g(plan.variance)} the {args.metric} "
                  "per-sample variance at the expected value; P(pass) is the chance that (estimate - threshold) / "
                  "sqrt(se^2 + syst^2) reaches the target."]
    return "\n".join(lines) + "\n"
