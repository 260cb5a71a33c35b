"""``significance``: z and p from the estimate, the threshold and the errors.

Three comparisons, each under the conventions the claim states and, when the
print disagrees, under every other convention, so the finding can say which
one reproduces it:

1. the printed sigma against the printed p-value (a sigma <-> p conversion);
2. the printed sigma against the z recomputed from estimate, threshold, errors;
3. the printed p against the recomputed p (compared as p-values, in log space).

The recomputed sigma is then held against ``required_sigma``.

References
----------
Particle Data Group, Review of Particle Physics, chapter "Statistics".
R. D. Cousins and V. L. Highland, Nucl. Instrum. Meth. A 320, 331 (1992).
"""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass, replace
from typing import Iterator

from ..claim.model import Claim, Reported
from ..report import Finding, Shown, Span
from ..stats.binomial import binomial_variance, heavy_output_sigma
from ..stats.interval import sigma_from_interval
from ..stats.precision import agrees, agrees_log, error_of_the_mean, over_box
from ..stats import student_t
from ..stats.systematics import log_p_marginalized
from ..stats.tails import log_p_from_sigma, sigma_from_log_p
from ..vocabulary import convention_text
from ..wording import num, p_range_text, span_text
from .common import fewer_samples_than_circuits, flagged_error, skipped_words, above, is_probability, printed_zero, count_for_error, finite_or_none, log_bounds, metric_of, model_inputs
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

LN10 = math.log(10.0)


def _log10_span(log_bounds_natural: tuple[float, float]) -> Span:
    return Span(log_bounds_natural[0] / LN10, log_bounds_natural[1] / LN10, "log10")

KEYS = ("sided", "systematics", "error_at")
# A mean over runs adds two: the distribution of (mean - threshold) / error ("t" or "normal")
# and how the printed stat_error is read ("error of the mean", or "sd": the runs' spread,
# whose error of the mean is stat_error / sqrt(runs)).
RUN_KEYS = ("distribution", "error_reading")
# What the claim leaves unsaid when it writes no such field, in the words of a note.
UNSTATED_WORDS = {"sided": "sidedness", "systematics": "treatment of the systematic error",
                  "error_at": "point at which the error is taken",
                  "distribution": "distribution of the statistic", "error_reading": "reading of the printed error"}
# Up to this many runs a mean's statistic is referred to Student's t on runs - 1 degrees of
# freedom, not the normal: below about 30 the two differ by more than a few per cent in the
# critical value at 2 sigma, which is the usual rule of thumb (common practice).  Above it the
# normal is the stated distribution and the t an alternative that may reproduce a print.
FEW_RUNS = 30


@dataclass(frozen=True)
class Recomputed:
    convention: dict
    sigma: tuple[float, float]
    log_p: tuple[float, float]


def runs_of(claim: Claim) -> Reported | None:
    """The runs behind a mean (metric ``mean`` with ``samples`` of at least 2), else None."""
    if claim.metric == "mean" and claim.samples is not None and claim.samples.value >= 2:
        return claim.samples
    return None


def few_runs(claim: Claim) -> bool:
    """A mean over at most :data:`FEW_RUNS` runs: its statistic is referred to Student's t."""
    runs = runs_of(claim)
    return runs is not None and runs.value <= FEW_RUNS


def stated_convention(claim: Claim) -> dict:
    s = claim.significance
    conv = {"sided": s.sided, "systematics": s.systematics, "error_at": s.error_at}
    if runs_of(claim) is not None:
        conv["distribution"] = "t" if few_runs(claim) else "normal"
        if claim.stat_error is not None:
            conv["error_reading"] = "error of the mean"
    return conv


def keys_of(conv: dict) -> tuple[str, ...]:
    return KEYS + tuple(k for k in RUN_KEYS if k in conv)


def statistical_error(claim: Claim) -> tuple[tuple[float, float] | None, str]:
    """The statistical error's interval and where it came from."""
    if claim.stat_error is not None:
        return claim.stat_error.bounds, "stat_error"
    runs = runs_of(claim)
    if runs is not None and claim.sd is not None and claim.sd.value > 0:
        # A mean over runs that prints only the runs' spread: its error is sd / sqrt(runs).
        return error_of_the_mean(claim.sd.bounds, runs.bounds), "sd"
    if claim.interval is not None:
        iv = claim.interval
        box = over_box(lambda lo, hi: sigma_from_interval(lo, hi, iv.level.value),
                       [iv.low.bounds, iv.high.bounds])
        if math.isfinite(box[0]) and box[0] > 0:
            return box, "interval"
    return None, ""


def _conventions(claim: Claim) -> list[dict]:
    """Every convention the claim's inputs can express, the stated one first and
    the rest by how many choices they change."""
    stated = stated_convention(claim)
    systematics = ["none", "quadrature", "marginalized", "linear"] if claim.syst_error else ["none"]
    error_at = ["estimate"]
    model = metric_of(claim)
    if count_for_error(claim) is not None and not model.needs():
        error_at.append("threshold")
    options = [dict(zip(KEYS, combo)) for combo in
               itertools.product(("one", "two"), systematics, error_at)]
    if "distribution" in stated:
        readings = ("error of the mean", "sd") if "error_reading" in stated else (None,)
        options = [{**o, "distribution": d, **({"error_reading": r} if r else {})}
                   for o in options for d in ("t", "normal") for r in readings]
    if stated not in options:
        options.append(stated)
    keys = keys_of(stated)
    options.sort(key=lambda c: sum(c.get(k) != stated.get(k) for k in keys))
    return options


def recompute(claim: Claim, convention: dict) -> Recomputed | None:
    """z and log p over the box of the printed inputs, under one convention."""
    if claim.threshold is None or claim.estimate is None:
        return None
    t = claim.threshold.value
    sided, systematics, error_at = (convention[k] for k in KEYS)
    syst = claim.syst_error.bounds if (claim.syst_error and systematics != "none") else (0.0, 0.0)
    if error_at == "threshold":
        n = count_for_error(claim)
        if n is None:
            return None
        model = metric_of(claim)
        inputs = model_inputs(claim)
        stat = over_box(lambda count: model.standard_error(t, count, inputs), [n.bounds])
    elif convention.get("error_reading") == "sd":
        # The printed stat_error read as the runs' spread: the error of the mean is it / sqrt(runs).
        stat = error_of_the_mean(claim.stat_error.bounds, claim.samples.bounds)
    else:
        stat, _ = statistical_error(claim)
        if stat is None and per_circuit(claim):
            return _recompute_per_circuit(claim, convention, syst)
        if stat is None:
            floor = _floor_function(claim)
            return None if floor is None else _recompute_at_floor(claim, convention, syst, *floor)
    if not (math.isfinite(stat[0]) and stat[0] > 0):
        return None
    df = claim.samples.value - 1.0 if convention.get("distribution") == "t" else None
    if df is not None and systematics == "marginalized":
        return None  # the Cousins-Highland average is defined here for a normal statistic only

    def z_of(e, s, ss):
        # linear: the systematic added to the statistical error (stat + syst), a common slip
        # that overstates the error; otherwise in quadrature (or zero when left out).
        return (e - t) / ((s + ss) if systematics == "linear" else math.hypot(s, ss))

    def log_p_of(e, s, ss):
        if systematics == "marginalized" and ss > 0:
            d = e - t
            if sided == "two":
                return min(0.0, math.log(2.0) + log_p_marginalized(abs(d), s, ss))
            return log_p_marginalized(d, s, ss)
        if df is not None:
            return student_t.log_p(z_of(e, s, ss), df, sided)
        return log_p_from_sigma(z_of(e, s, ss), sided)

    boxes = [claim.estimate.bounds, stat, syst]
    log_p = over_box(log_p_of, boxes)
    if df is not None:
        # The t statistic's p given as the equivalent normal sigma, Phi^-1(1 - p) (one-sided)
        # or Phi^-1(1 - p/2) (two-sided): monotone in t, so the box's ends are the p's ends.
        sigma = tuple(sorted(sigma_from_log_p(lp, sided) for lp in log_p))
        return Recomputed(convention, sigma, log_p)
    if systematics == "marginalized":
        sigma = tuple(sorted(sigma_from_log_p(lp, sided) for lp in log_p))
        if sided == "one" and claim.estimate.value < t:
            sigma = tuple(sorted(sigma))
    else:
        sigma = over_box(z_of, boxes)
        if sided == "two":
            sigma = tuple(sorted(abs(x) for x in sigma)) if sigma[0] * sigma[1] > 0 else (0.0, max(map(abs, sigma)))
    return Recomputed(convention, sigma, log_p)


def _floor_function(claim: Claim):
    """No statistical error printed: the metric model's sampling floor at the estimate,
    sqrt(v/N + B (1/K - 1/N)) (``MetricModel.standard_error``), as a function of the
    estimate and the counts, with the counts' printed boxes.  None when the model lacks
    an input or the counts are ones ``bounds`` flags (fewer samples than circuits)."""
    n = count_for_error(claim)
    model = metric_of(claim)
    if n is None or claim.estimate is None or any(getattr(claim, f) is None for f in model.needs()):
        return None
    circuits = claim.circuits if model.count_field == "samples" else None
    if fewer_samples_than_circuits(claim.samples, claim.circuits):
        return None
    base = model_inputs(claim)

    def error(e, count, k=None):
        inputs = replace(base, circuits=k) if k is not None else base
        se = model.standard_error(e, count, inputs)
        return math.nan if se is None else se

    return error, [n.bounds] + ([circuits.bounds] if circuits is not None else [])


def floor_error(claim: Claim) -> tuple[float, float] | None:
    """The floor's range over the printed box of estimate and counts: the smallest error the
    samples allow, so a significance from it is the most they allow (None: no floor)."""
    floor = _floor_function(claim)
    if floor is None:
        return None
    error, counts = floor
    box = over_box(error, [claim.estimate.bounds, *counts])
    return box if all(math.isfinite(v) for v in box) and box[0] > 0 else None


def _recompute_at_floor(claim: Claim, convention: dict, syst: tuple[float, float], error, counts) -> Recomputed | None:
    """z and log p with the statistical error at the floor, over the joint box of estimate,
    counts and systematic (the floor moves with the estimate, so the two are not taken apart)."""
    if floor_error(claim) is None:
        return None
    t = claim.threshold.value
    # A marginalized systematic gives the quadrature p exactly for a Gaussian null (Cousins and
    # Highland 1992), which the floor's z is.
    sided, systematics = convention["sided"], convention["systematics"]

    def z_of(e, ss, *c):
        s = error(e, *c)
        return (e - t) / ((s + ss) if systematics == "linear" else math.hypot(s, ss))

    boxes = [claim.estimate.bounds, syst, *counts]
    sigma = over_box(z_of, boxes)
    if not all(math.isfinite(v) for v in sigma):
        return None
    log_p = over_box(lambda *a: log_p_from_sigma(z_of(*a), sided), boxes)
    if sided == "two":
        sigma = tuple(sorted(abs(x) for x in sigma)) if sigma[0] * sigma[1] > 0 else (0.0, max(map(abs, sigma)))
    return Recomputed(convention, sigma, log_p)


def uses_floor(claim: Claim) -> bool:
    """The significance's statistical error is the model's floor: none is printed (nor an
    interval), it is taken at the estimate, and the heavy-output criterion does not apply."""
    return (statistical_error(claim)[0] is None and claim.significance.error_at == "estimate"
            and not per_circuit(claim) and floor_error(claim) is not None)


def per_circuit(claim: Claim) -> bool:
    """Heavy output with circuits: the criterion's error over circuits,
    sqrt(h (1 - h) / circuits) at the estimate, is defined (Cross et al. 2019)."""
    return claim.metric == "heavy-output" and claim.circuits is not None and claim.circuits.low > 0


def _recompute_per_circuit(claim: Claim, convention: dict, syst: tuple[float, float]) -> Recomputed | None:
    """z and log p with the heavy-output criterion's error over circuits, taken at the estimate
    (exact at the vertices of estimate, circuits and systematic: ``heavy_output_sigma``)."""
    if convention["systematics"] in ("marginalized", "linear"):
        return None
    t = claim.threshold.value
    sided = convention["sided"]
    sigma = over_box(lambda e, k, ss: heavy_output_sigma(e, t, k, ss),
                     [claim.estimate.bounds, claim.circuits.bounds, syst])
    if not all(math.isfinite(v) for v in sigma):
        return None
    log_p = tuple(sorted(log_p_from_sigma(z, sided) for z in sigma))
    if sided == "two":
        sigma = tuple(sorted(abs(x) for x in sigma)) if sigma[0] * sigma[1] > 0 else (0.0, max(map(abs, sigma)))
        log_p = tuple(sorted(log_p_from_sigma(z, sided) for z in sigma))
    return Recomputed(convention, sigma, log_p)


def _criterion(claim: Claim, shown: Recomputed, tol: float) -> Iterator[Finding]:
    """With a printed error beside circuits, say under which convention a heavy-output claim
    reaches its required level: the printed error (shot noise, when it is the binomial error of
    all shots) or the criterion's error over circuits, the convention the 2/3-at-two-sigma
    criterion is defined with (Cross et al. 2019).  Reaching it only under the first is flagged."""
    sig = claim.significance
    if not (per_circuit(claim) and sig.required_sigma is not None and statistical_error(claim)[0] is not None):
        return
    crit = _recompute_per_circuit(claim, {"sided": "one", "systematics": "none", "error_at": "estimate"},
                                  (0.0, 0.0))
    if crit is None:
        return
    need = sig.required_sigma
    h = claim.estimate.value
    per = math.sqrt(binomial_variance(h) / claim.circuits.value)
    printed_ok = not above(need, shown.sigma[1], tol)
    crit_ok = not above(need, crit.sigma[1], tol)
    facts = {"quantity": "criterion", "required": need.value, "sigma_printed_low": shown.sigma[0],
             "sigma_printed_high": shown.sigma[1], "sigma_circuits_low": crit.sigma[0],
             "sigma_circuits_high": crit.sigma[1], "per_circuit_error": per, "tolerance": tol}
    about = {"field": need.path, "statement": "criterion", "printed": Shown.of(need),
             "recomputed_range": Span(*crit.sigma), "tolerance": tol}
    words = (f"the criterion's error over circuits, sqrt(h(1 - h)/{claim.circuits.text}) = {num(per, 3)}, "
             f"gives {span_text(crit.sigma)} sigma")
    printed = f"the printed stat_error {claim.stat_error.text}" if claim.stat_error else "the printed interval"
    if printed_ok and not crit_ok:
        yield Finding("fail", f"The required {need.text} sigma is reached only with {printed} "
                      f"({span_text(shown.sigma)} sigma), an error below the criterion's (shot noise, say); {words}, "
                      "short of it.",
                      reported=need.value, recomputed=(crit.sigma[0] + crit.sigma[1]) / 2,
                      reproduced_by={"error": "shot noise"}, details=facts, **about)
    elif printed_ok:
        yield Finding("pass", f"The required {need.text} sigma is reached with {printed} and under the "
                      f"criterion's convention too: {words}.", reported=need.value,
                      recomputed=(crit.sigma[0] + crit.sigma[1]) / 2, details=facts, **about)
    elif crit_ok:
        yield Finding("pass", f"With {printed} the required {need.text} sigma is not reached, but {words}, "
                      "which reaches it.", reported=need.value, recomputed=(crit.sigma[0] + crit.sigma[1]) / 2,
                      details=facts, **about)
    else:
        yield Finding("fail", f"The required {need.text} sigma is reached under neither convention: "
                      f"{printed} gives {span_text(shown.sigma)} sigma and {words}.", reported=need.value,
                      recomputed=(crit.sigma[0] + crit.sigma[1]) / 2, details=facts, **about)


def central(claim: Claim, convention: dict) -> tuple[float, float] | None:
    """z and natural log p at the printed central values, under one convention:
    the numbers a survey adjusts across its claims (Holm, Benjamini-Hochberg).
    A marginalized systematic gives the quadrature value exactly for a Gaussian
    null (Cousins and Highland 1992), so it is computed as quadrature here.
    None when the claim lacks an estimate, a threshold or a positive error."""
    if claim.threshold is None or claim.estimate is None:
        return None
    t = claim.threshold.value
    if convention["error_at"] == "threshold":
        n = count_for_error(claim)
        model = metric_of(claim)
        if n is None or any(getattr(claim, f) is None for f in model.needs()):
            return None
        stat = model.standard_error(t, n.value, model_inputs(claim))
    elif claim.stat_error is not None:
        stat = claim.stat_error.value
    elif claim.interval is not None:
        iv = claim.interval
        stat = sigma_from_interval(iv.low.value, iv.high.value, iv.level.value)
    elif per_circuit(claim):
        stat = math.sqrt(binomial_variance(claim.estimate.value) / claim.circuits.value)
    elif runs_of(claim) is not None and claim.sd is not None:
        stat = claim.sd.value / math.sqrt(claim.samples.value)
    else:
        return None
    if stat is None or not (math.isfinite(stat) and stat > 0):
        return None
    syst = claim.syst_error.value if (claim.syst_error is not None and convention["systematics"] != "none") else 0.0
    syst = syst if math.isfinite(syst) else 0.0
    # A systematic added linearly widens the error itself (stat + syst); otherwise in quadrature.
    total = stat + syst if convention["systematics"] == "linear" else math.hypot(stat, syst)
    z = (claim.estimate.value - t) / total
    if not math.isfinite(z):
        return None
    sided = convention["sided"]
    if convention.get("distribution") == "t" and convention["systematics"] != "marginalized":
        log_p = student_t.log_p(z, claim.samples.value - 1.0, sided)
        return sigma_from_log_p(log_p, sided), log_p
    return (abs(z) if sided == "two" else z), log_p_from_sigma(abs(z) if sided == "two" else z, sided)


class _Lazy:
    """An iterable that computes its items only as far as a search reads them,
    each at most once.  The order, and so every search's answer, is that of the
    eager list; it saves the (costly, for marginalized systematics) conventions
    that no search reaches."""

    def __init__(self, items):
        self._items = iter(items)
        self._done: list = []

    def __iter__(self):
        i = 0
        while True:
            if i == len(self._done):
                try:
                    self._done.append(next(self._items))
                except StopIteration:
                    return
            yield self._done[i]
            i += 1


def _differs(conv: dict, stated: dict) -> dict:
    return {k: conv[k] for k in keys_of(stated) if conv.get(k) != stated.get(k)}


def _p_skipped(p, statement: str) -> Finding:
    """A printed p that bounds flags (exactly 0, or outside (0, 1]) is not compared: say so."""
    return Finding("skip", f"The printed p = {p.text} is not compared: the physical-range check flags it.",
                   details={"skipped_input": p.path}, field=p.path, statement=statement, printed=Shown.of(p))


def _sigma_vs_p(claim: Claim, tol: float) -> Iterator[Finding]:
    sig = claim.significance
    sigma, p = sig.sigma, sig.p_value
    if sigma is None or p is None:
        return
    if not is_probability(p) or printed_zero(p):
        return  # bounds flags it; the comparison with the inputs says it was skipped
    printed_log = log_bounds(p)

    def implied(sided):
        return over_box(lambda z: log_p_from_sigma(z, sided), [sigma.bounds])

    stated = implied(sig.sided)
    details = {"sided": sig.sided, "p_from_sigma_low": math.exp(stated[0]) if stated[0] > -700 else 0.0,
               "log10_p_from_sigma": stated[1] / math.log(10), "tolerance": tol}
    base = f"Printed {sigma.text} sigma is p = {p_range_text(stated)} {sig.sided}-sided"
    about = {"field": p.path, "statement": "sigma_vs_p", "printed": Shown.of(p),
             "recomputed_range": _log10_span(stated), "tolerance": tol}
    if agrees_log(printed_log, stated, tol):
        yield Finding("pass", f"{base}, matching the printed p = {p.text}.",
                      reported=p.value, recomputed=math.exp(stated[1]), details=details, **about)
        return
    other = "two" if sig.sided == "one" else "one"
    if agrees_log(printed_log, implied(other), tol):
        unstated = "sided" not in sig.stated
        yield Finding("warn" if unstated else "fail",
                      f"{base}, but the printed p = {p.text} is the {other}-sided value"
                      + (f"; the claim states no sidedness, and the {other}-sided convention reproduces it."
                         if unstated else "."),
                      reported=p.value, recomputed=finite_or_none(math.exp(stated[1])),
                      reproduced_by={"sided": other}, details=details, **about)
        return
    if few_runs(claim):
        # A mean over few runs may print its t statistic as "sigma" beside the t test's p.
        df = claim.samples.value - 1.0
        as_t = over_box(lambda t: student_t.log_p(t, df, sig.sided), [sigma.bounds])
        if agrees_log(printed_log, as_t, tol):
            yield Finding("warn", f"{base}, but the printed p = {p.text} is the p of a t statistic of "
                          f"{sigma.text} on {num(df)} degrees of freedom: the printed sigma is the t statistic, "
                          "not the equivalent normal significance.",
                          reported=p.value, recomputed=finite_or_none(math.exp(stated[1])),
                          reproduced_by={"sigma": "t statistic"}, details=details, **about)
            return
    inverse = over_box(lambda lp: sigma_from_log_p(lp, sig.sided), [printed_log]) if printed_log[0] > -math.inf \
        else (sigma_from_log_p(printed_log[1], sig.sided), math.inf)
    yield Finding("fail", f"{base}, but the printed p = {p.text}, which would be "
                  f"{span_text(inverse, 3) if math.isfinite(inverse[1]) else 'at least ' + num(inverse[0])} sigma; "
                  "no sidedness reconciles them.",
                  reported=p.value, recomputed=finite_or_none(math.exp(stated[1])), details=details, **about)


def _compare(printed_words, printed, printed_bounds, results, mine, pick, agree, recomputed_words,
             agree_words, recomputed, stated, conv_words, details, about, stated_keys=()) -> Finding:
    """One printed quantity (sigma, or p in log space) against its recomputation
    under the stated convention; on a disagreement, the first other convention
    (fewest changes first) that reproduces the print."""
    if agree(printed_bounds, pick(mine)):
        return Finding("pass", f"{printed_words} agrees with {agree_words} ({conv_words}).",
                       reported=printed.value, recomputed=recomputed, details=details, **about)
    other = next((r for r in results if r is not mine and agree(printed_bounds, pick(r))), None)
    reproduce = _differs(other.convention, stated) if other else None
    tail = f"; it would follow with {convention_text(reproduce)}" if other else "; no convention reproduces it"
    # A convention the claim did not state, under which the print follows, is a note naming it;
    # a stated convention that does not reproduce the print stays a flag.
    unstated = bool(reproduce) and not set(reproduce) & set(stated_keys)
    if unstated:
        tail = (f"; the claim states no {' or '.join(UNSTATED_WORDS[k] for k in reproduce)}, and the print "
                f"follows with {convention_text(reproduce)}, a usual convention")
    return Finding("warn" if unstated else "fail",
                   f"{printed_words}, but estimate, threshold and errors give {recomputed_words} "
                   f"({conv_words}){tail}.", reported=printed.value, recomputed=recomputed,
                   reproduced_by=reproduce, details=details, **about)


def _systematic_not_printed(claim: Claim) -> Finding:
    """``systematics: quadrature`` (or any treatment) with no ``syst_error``: the stated
    convention has nothing to act on, which is a question for the authors (the paper may
    name the treatment yet print no systematic error), not a reason to refuse the file."""
    how = claim.significance.systematics
    return Finding("warn", f"The claim states how the systematic error entered the significance "
                   f"(systematics: {how}) but prints no syst_error, so only the statistical error can "
                   "enter the recomputed significance.",
                   details={"systematics": how, "missing": ["syst_error"]}, field="significance.systematics",
                   statement="systematics_unprinted")


def _against_floor(claim: Claim, mine: Recomputed, tol: float, conv_words: str,
                   details: dict) -> Iterator[Finding]:
    """With the statistical error at the model's sampling floor (none printed), the recomputed
    sigma is the most the samples allow and the recomputed p the least: a printed sigma above
    it (a p below it) is flagged, one at or below it agrees with sampling, since a real analysis
    may hold more error than sampling alone (circuit spread, drift)."""
    sig = claim.significance
    if sig.sigma is not None:
        most = mine.sigma[1]
        about = {"field": sig.sigma.path, "statement": "sigma_vs_inputs", "printed": Shown.of(sig.sigma),
                 "recomputed_range": Span(*mine.sigma), "tolerance": tol}
        facts = {**details, "quantity": "sigma"}
        if above(sig.sigma, most, tol):
            yield Finding("fail", f"Printed {sig.sigma.text} sigma is more than the at most {span_text(mine.sigma)} "
                          f"sigma that estimate, threshold and samples allow ({conv_words}).",
                          reported=sig.sigma.value, recomputed=(mine.sigma[0] + most) / 2, details=facts, **about)
        else:
            yield Finding("pass", f"Printed {sig.sigma.text} sigma is within the at most {span_text(mine.sigma)} "
                          f"sigma that estimate, threshold and samples allow ({conv_words}).",
                          reported=sig.sigma.value, recomputed=(mine.sigma[0] + most) / 2, details=facts, **about)
    p = sig.p_value
    if p is not None and is_probability(p) and not printed_zero(p):
        printed = log_bounds(p)
        about = {"field": p.path, "statement": "p_vs_inputs", "printed": Shown.of(p),
                 "recomputed_range": _log10_span(mine.log_p), "tolerance": tol}
        facts = {**details, "quantity": "p_value"}
        p_mid = finite_or_none(math.exp((mine.log_p[0] + mine.log_p[1]) / 2))
        # Below the least p the samples allow, by more than the relative tolerance (README).
        if mine.log_p[0] - printed[1] > math.log1p(tol):
            yield Finding("fail", f"Printed p = {p.text} is below the least p = {p_range_text(mine.log_p)} that "
                          f"estimate, threshold and samples allow ({conv_words}).",
                          reported=p.value, recomputed=p_mid, details=facts, **about)
        else:
            yield Finding("pass", f"Printed p = {p.text} is no smaller than the least p = {p_range_text(mine.log_p)} "
                          f"that estimate, threshold and samples allow ({conv_words}).",
                          reported=p.value, recomputed=p_mid, details=facts, **about)


def _against_recomputed(claim: Claim, tol: float) -> Iterator[Finding]:
    sig = claim.significance
    stated = stated_convention(claim)
    conventions = _conventions(claim)
    results = _Lazy(r for r in (recompute(claim, c) for c in conventions) if r is not None)
    if stated["systematics"] != "none" and claim.syst_error is None:
        yield _systematic_not_printed(claim)
    mine = next((r for r in results if r.convention == stated), None)
    if mine is None and flagged_error(claim.stat_error):
        yield Finding("skip", f"Cannot recompute the significance; {skipped_words(claim.stat_error)}.",
                      details={"skipped_input": claim.stat_error.path}, statement="needs_inputs")
        return
    if mine is None:
        missing = []
        if claim.estimate is None:
            missing.append("estimate")
        if claim.threshold is None:
            missing.append("threshold")
        if (statistical_error(claim)[0] is None and stated["error_at"] == "estimate" and not per_circuit(claim)
                and floor_error(claim) is None):
            missing.append("stat_error (or interval), or samples for the model's floor")
        if stated["error_at"] == "threshold" and count_for_error(claim) is None:
            missing.append(metric_of(claim).count_field)
        yield Finding("skip", f"Cannot recompute the significance; needs {' and '.join(missing) or 'more inputs'}.",
                      details={"missing": missing}, statement="needs_inputs")
        return
    # A stated treatment of a systematic error that is not printed adds nothing: say what was
    # used (the statistical error alone), not the stated treatment, and note the gap.
    unprinted = stated["systematics"] != "none" and claim.syst_error is None
    degrees = claim.samples.value - 1 if stated.get("distribution") == "t" else None
    conv_words = convention_text({**stated, "systematics": "none"} if unprinted else stated, degrees)
    if unprinted:
        conv_words += f"; the claim states systematics: {stated['systematics']} but prints no syst_error"
    # With few runs the t is not a convention but the distribution of the statistic, and the
    # printed error is the error of the mean: a print that follows only otherwise is flagged.
    stated_keys = set(sig.stated) | ({"distribution"} if few_runs(claim) else set()) \
        | ({"error_reading"} if "error_reading" in stated else set())
    # Whether the systematic error widened the null (the HTML picture draws it so).
    syst_in = stated["systematics"] != "none" and claim.syst_error is not None and claim.syst_error.value > 0
    if statistical_error(claim)[0] is None and stated["error_at"] == "estimate" and per_circuit(claim):
        conv_words += ", the criterion's error over circuits sqrt(h(1 - h)/circuits)"
    floor = stated["error_at"] == "estimate" and uses_floor(claim)
    if floor:
        n = count_for_error(claim)
        conv_words += (f"; no stat_error is printed, so the statistical error is the {metric_of(claim).name} "
                       f"model's sampling floor for {n.text} {metric_of(claim).count_field}, the least they allow")
    at_centre = central(claim, stated)
    details = {"convention": stated, "stated": sorted(sig.stated), "syst_in_error": syst_in,
               # z and log10 p at the printed central values, which a survey adjusts across its claims
               "sigma_central": at_centre[0] if at_centre else None,
               "log10_p_central": at_centre[1] / LN10 if at_centre else None,
               "sigma_low": mine.sigma[0], "sigma_high": mine.sigma[1],
               "log10_p_low": mine.log_p[0] / math.log(10), "log10_p_high": mine.log_p[1] / math.log(10),
               "tolerance": tol}
    sigma_mid = (mine.sigma[0] + mine.sigma[1]) / 2
    if floor:
        details["error_from"] = "floor"
        yield from _against_floor(claim, mine, tol, conv_words, details)
    if sig.sigma is not None and not floor:
        yield _compare(f"Printed {sig.sigma.text} sigma", sig.sigma, sig.sigma.bounds, results, mine,
                       lambda r: r.sigma, lambda a, b: agrees(a, b, tol),
                       f"{span_text(mine.sigma)} sigma",
                       f"the {span_text(mine.sigma)} recomputed from estimate, threshold and errors",
                       sigma_mid, stated, conv_words,
                       {**details, "quantity": "sigma"},
                       {"field": sig.sigma.path, "statement": "sigma_vs_inputs", "printed": Shown.of(sig.sigma),
                        "recomputed_range": Span(*mine.sigma), "tolerance": tol}, stated_keys)
    if sig.p_value is not None and not (is_probability(sig.p_value) and not printed_zero(sig.p_value)):
        yield _p_skipped(sig.p_value, "p_vs_inputs")
    elif sig.p_value is not None and not floor:
        p_mid = finite_or_none(math.exp((mine.log_p[0] + mine.log_p[1]) / 2))
        yield _compare(f"Printed p = {sig.p_value.text}", sig.p_value, log_bounds(sig.p_value), results, mine,
                       lambda r: r.log_p, lambda a, b: agrees_log(a, b, tol),
                       f"p = {p_range_text(mine.log_p)}", f"the recomputed p = {p_range_text(mine.log_p)}",
                       p_mid, stated, conv_words,
                       {**details, "quantity": "p_value"},
                       {"field": sig.p_value.path, "statement": "p_vs_inputs", "printed": Shown.of(sig.p_value),
                        "recomputed_range": _log10_span(mine.log_p), "tolerance": tol}, stated_keys)
    if sig.sigma is None and sig.p_value is None:
        yield Finding("info", f"No significance is printed; estimate, threshold and errors give "
                      f"{span_text(mine.sigma)} sigma, p = {p_range_text(mine.log_p)} ({conv_words}).",
                      recomputed=sigma_mid, details={**details, "quantity": "sigma"}, statement="inputs_only",
                      recomputed_range=Span(*mine.sigma), tolerance=tol)
    if sig.required_sigma is not None:
        need = sig.required_sigma.value
        facts = {**details, "quantity": "required_sigma", "required": need}
        about = {"field": sig.required_sigma.path, "statement": "required_sigma",
                 "printed": Shown.of(sig.required_sigma), "recomputed_range": Span(*mine.sigma),
                 "tolerance": tol}
        at_most = " (with the statistical error at its sampling floor, the most the samples allow)" if floor else ""
        if above(sig.required_sigma, mine.sigma[1], tol):
            yield Finding("fail", f"Recomputed {span_text(mine.sigma)} sigma falls short of the required "
                          f"{sig.required_sigma.text} sigma{at_most}.", reported=need, recomputed=sigma_mid, details=facts, **about)
        elif mine.sigma[0] < need:
            yield Finding("warn", f"Recomputed {span_text(mine.sigma)} sigma reaches the required "
                          f"{sig.required_sigma.text} sigma only within printed precision{at_most}.",
                          reported=need, recomputed=sigma_mid, details=facts, **about)
        else:
            yield Finding("pass", f"Recomputed {span_text(mine.sigma)} sigma clears the "
                          f"required {sig.required_sigma.text} sigma" + (
                              f"{at_most}; any error beyond sampling would lower it"
                              if floor else "") + ".", reported=need, recomputed=sigma_mid, details=facts, **about)
        yield from _criterion(claim, mine, tol)


def check(claim: Claim) -> Iterator[Finding]:
    if claim.metric == "counts":
        from . import significance_counts
        yield from significance_counts.check(claim, _sigma_vs_p)
        return
    tol = claim.tolerance
    found = list(_sigma_vs_p(claim, tol)) + list(_against_recomputed(claim, tol))
    yield from found


SPEC = CheckSpec(
    id="significance",
    title="Significance",
    run=check,
    statements={
        "sigma_vs_p": Statement(
            question=("How was {what} obtained from the printed significance? Neither sidedness "
                      "turns the one into the other."),
            if_reproduced=("Was {what} computed {reproduced}? If so, please state that convention "
                           "beside the number and use it throughout; if not, please say how it was computed."),
            reproducible=True),
        "sigma_vs_inputs": Statement(
            question=("How was the significance computed from the estimate, the threshold and the errors? "
                      "None of the conventions we tried reproduces the printed value."),
            if_reproduced=("Was {what} computed {reproduced}? If so, please state that convention "
                           "beside the number and use it throughout; if not, please say how it was computed."),
            reproducible=True),
        "p_vs_inputs": Statement(
            question=("How was the p-value computed from the estimate, the threshold and the errors? "
                      "None of the conventions we tried reproduces the printed value."),
            if_reproduced=("Was {what} computed {reproduced}? If so, please state that convention "
                           "beside the number and use it throughout; if not, please say how it was computed."),
            reproducible=True),
        "required_sigma": Statement(
            question=("On what basis does the claim reach the required significance, given that the "
                      "printed estimate, threshold and errors give less?")),
        "criterion": Statement(
            question=("Under which error does the claim reach {what}? The heavy-output criterion takes the "
                      "error over circuits, sqrt(h(1 - h)/circuits), and with it the level is not reached."),
            if_reproduced=("Is {what} reached only {reproduced}? The heavy-output criterion takes the error "
                           "over circuits, sqrt(h(1 - h)/circuits), and with it the level is not reached.")),
        "systematics_unprinted": Statement(
            question=("What systematic error entered the significance? The claim says how it was treated "
                      "but prints none.")),
        "inputs_only": ABOUT_THE_CLAIM,
        "needs_inputs": ABOUT_THE_CLAIM,
        "signal_yield": Statement(
            question="How was {what} obtained? The observed count minus the expected background gives "
                     "another value."),
    },
)
