"""``interval``: what a printed confidence interval implies.

1. Its half-width implies a standard error (width / 2z at the printed level),
   checked against a printed ``stat_error`` like any printed error.  An
   asymmetric interval is reported as such, with the error each side implies,
   never averaged silently; the printed error then has to lie between the two.
   When the print disagrees, other levels (1 and 2 sigma, 90%, 95%, 99%) are
   tried: a one-sigma interval labelled 95% is a common slip.
2. For a proportion of ``samples`` items, the interval methods papers use
   (Wald, Wilson, Clopper-Pearson, Agresti-Coull, Jeffreys) are computed for
   every whole count the printed estimate allows, and the check names the
   methods that reproduce both printed bounds.  The slack for a bound is the
   claim's tolerance times the interval's half-width, since the distance of a
   bound from the estimate is what a method determines (a relative slack on
   the bound itself would let 0.90 match anything near 0.9).

References
----------
R. G. Newcombe, Stat. Med. 17, 857 (1998), Table I.
Particle Data Group, Review of Particle Physics, "Statistics": Gaussian
critical values.
"""

from __future__ import annotations

import math
from typing import Iterator

from ..claim.model import Claim
from ..report import Finding, Shown, Span
from .no_estimate import no_estimate
from ..stats.binomial_intervals import INTERVAL_METHODS, NAMES, proportion_interval, proportion_intervals
from ..stats.denominator_search import effective_sample_size, search_denominator
from ..stats.granularity import granularity
from ..stats.interval import sigma_from_interval, z_for_level
from ..stats.precision import agrees, gap, over_box
from ..wording import like
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

# Levels a mislabelled interval is most often printed at, with their names.
OTHER_LEVELS = ((math.erf(1 / math.sqrt(2)), "1 sigma (68.27%)"), (0.90, "90%"), (0.95, "95%"),
                (math.erf(2 / math.sqrt(2)), "2 sigma (95.45%)"), (0.99, "99%"))
MAX_COUNTS = 100  # whole counts to try one by one before treating the count as continuous


def level_text(level: float) -> str:
    for value, words in OTHER_LEVELS:
        if abs(value - level) < 1e-9:
            return words
    return f"{level * 100:g}%"


def _sides(claim: Claim):
    iv = claim.interval
    est = claim.estimate
    below = over_box(lambda e, lo: e - lo, [est.bounds, iv.low.bounds])
    above = over_box(lambda e, hi: hi - e, [est.bounds, iv.high.bounds])
    return below, above


def _sigma_finding(claim: Claim, tol: float, asymmetric: bool, below, above) -> Finding:
    iv = claim.interval
    level = iv.level.value
    stat = claim.stat_error
    lt = level_text(level)

    def implied(lev):
        if asymmetric:
            # Each side's distance from the estimate over z: the error that side implies.
            z = z_for_level(lev)
            lo_side = (below[0] / z, below[1] / z)
            hi_side = (above[0] / z, above[1] / z)
            return (min(lo_side[0], hi_side[0]), max(lo_side[1], hi_side[1])), lo_side, hi_side
        box = over_box(lambda lo, hi: sigma_from_interval(lo, hi, lev), [iv.low.bounds, iv.high.bounds])
        return box, None, None

    sigma, lo_side, hi_side = implied(level)
    mid = (sigma[0] + sigma[1]) / 2
    details = {"quantity": "sigma", "level": level, "sigma_low": sigma[0], "sigma_high": sigma[1],
               "below": (below[0] + below[1]) / 2, "above": (above[0] + above[1]) / 2,
               "asymmetric": asymmetric, "tolerance": tol}
    if asymmetric:
        shape = (f"The {lt} interval [{iv.low.text}, {iv.high.text}] is asymmetric about the estimate "
                 f"{claim.estimate.text}: {like(details['below'], iv.low, 2)} below and "
                 f"{like(details['above'], iv.high, 2)} above, a standard error of "
                 f"{like((lo_side[0] + lo_side[1]) / 2, stat or iv.low)} below and "
                 f"{like((hi_side[0] + hi_side[1]) / 2, stat or iv.low)} above")
        details.update(sigma_below=(lo_side[0] + lo_side[1]) / 2, sigma_above=(hi_side[0] + hi_side[1]) / 2)
    else:
        shape = (f"The {lt} interval [{iv.low.text}, {iv.high.text}] implies a standard error of "
                 f"{like(mid, stat or iv.low)}")
    if stat is None:
        return Finding("skip", f"{shape}; no stat_error is printed to compare it with.",
                       recomputed=mid, details=details, statement="no_stat_error",
                       recomputed_range=Span(*sigma), tolerance=tol)
    about = {"field": stat.path, "statement": "stat_error", "printed": Shown.of(stat),
             "recomputed_range": Span(*sigma), "tolerance": tol}
    if agrees(stat.bounds, sigma, tol):
        where = "lies between them" if asymmetric else "agrees"
        return Finding("pass", f"{shape}; the printed stat_error {stat.text} {where}.",
                       reported=stat.value, recomputed=mid, details=details, **about)
    for lev, words in OTHER_LEVELS:
        if abs(lev - level) < 1e-9:
            continue
        if agrees(stat.bounds, implied(lev)[0], tol):
            return Finding("fail", f"{shape}, but the printed stat_error is {stat.text}; the printed "
                           f"interval is the {words} one, not the {lt} one.", reported=stat.value, recomputed=mid,
                           reproduced_by={"level": round(lev, 6)}, details=details, **about)
    return Finding("fail", f"{shape}, but the printed stat_error is {stat.text}; no usual confidence level "
                   "reconciles them.", reported=stat.value, recomputed=mid, details=details, **about)


def _counts(claim: Claim) -> list[int] | None:
    """The whole counts of ``samples`` that the printed estimate allows, when
    there are few enough to try one by one; None to treat the count as
    continuous (samples printed with limited precision, no whole count fits,
    or so many fit that neighbouring counts' intervals are indistinguishable)."""
    n = claim.samples
    est = claim.estimate
    if not n.exact:
        return None
    g = granularity(est.low, est.high, int(n.value), 0, int(n.value), keep=MAX_COUNTS + 1)
    if not g.possible or len(g.counts) > MAX_COUNTS:
        return None
    return list(g.counts)


def _continuous(claim: Claim, method: str, level: float):
    """Ranges of the method's two bounds over the printed estimate and samples."""
    est, n = claim.estimate, claim.samples

    def bound(which):
        return lambda p, size: proportion_interval(min(max(p, 0.0), 1.0) * size, size, level, method)[which]

    return over_box(bound(0), [est.bounds, n.bounds]), over_box(bound(1), [est.bounds, n.bounds])


def _method_finding(claim: Claim, tol: float, asymmetric: bool) -> Finding:
    iv = claim.interval
    level = iv.level.value
    lt = level_text(level)
    counts = _counts(claim)
    n_value = claim.samples.value
    slack = tol * (iv.high.value - iv.low.value) / 2

    def off_by(b):
        return max(gap(iv.low.bounds, (b[0], b[0])), gap(iv.high.bounds, (b[1], b[1])))

    def evaluate(m, lev):
        """(distance from the print, interval to show) for one method: the
        best single whole count, or the continuous box."""
        if counts is not None:
            # (distance, interval) per count; min keeps the first of equals, as min by key did.
            return min(((off_by(b), b) for b in proportion_intervals(counts, n_value, lev, m)),
                       key=lambda pair: pair[0])
        lo_rng, hi_rng = _continuous(claim, m, lev)
        off = max(gap(iv.low.bounds, lo_rng), gap(iv.high.bounds, hi_rng))
        p = min(max(claim.estimate.value, 0.0), 1.0)
        return off, proportion_interval(p * n_value, n_value, lev, m)

    def matches(lev):
        """Methods reproducing both bounds at ``lev``, closest first, and each
        method's interval to show."""
        found, shown = [], {}
        for m in INTERVAL_METHODS:
            off, at = evaluate(m, lev)
            shown[m] = {"low": at[0], "high": at[1]}
            if off <= slack:
                found.append((off, INTERVAL_METHODS.index(m), m))
        return [m for _, _, m in sorted(found)], shown

    agreeing, shown = matches(level)
    n_text = f"{claim.samples.text} items"
    if counts and len(counts) == 1:
        what = f"{counts[0]}/{int(n_value)}"
    elif counts:
        what = (f"{claim.estimate.text} of {n_text} (any of {counts[0]}/{int(n_value)} to "
                f"{counts[-1]}/{int(n_value)} at its printed precision)")
    else:
        what = f"{claim.estimate.text} of {n_text}"
    details = {"quantity": "method", "level": level, "methods": shown, "agreeing": agreeing,
               "asymmetric": asymmetric, "tolerance": tol,
               "count": counts[0] if counts and len(counts) == 1 else None}
    printed = f"[{iv.low.text}, {iv.high.text}]"
    # The statement is about the printed interval as a whole, quoted as printed.
    about = {"field": "interval", "statement": "method", "tolerance": tol,
             "printed": Shown(printed, iv.low.low, iv.high.high)}
    if agreeing:
        first = agreeing[0]
        also = (f" ({' and '.join(NAMES[m] for m in agreeing[1:])} agree{'s' if len(agreeing) == 2 else ''} too)"
                if len(agreeing) > 1 else "")
        lo, hi = shown[first]["low"], shown[first]["high"]
        return Finding("pass", f"The printed {lt} interval {printed} for {what} is what the {NAMES[first]} "
                       f"method gives, [{like(lo, iv.low)}, {like(hi, iv.high)}]{also}.",
                       reported=iv.low.value, recomputed=lo, details=details, **about)
    listing = "; ".join(f"{NAMES[m]} [{like(v['low'], iv.low)}, {like(v['high'], iv.high)}]"
                        for m, v in shown.items())
    for lev, words in OTHER_LEVELS:
        if abs(lev - level) < 1e-9:
            continue
        other, other_shown = matches(lev)
        if other:
            return Finding("fail", f"The printed {lt} interval {printed} for {what} matches no method at {lt} "
                           f"({listing}); it is the {NAMES[other[0]]} interval at {words}.",
                           reported=iv.low.value, recomputed=shown[other[0]]["low"],
                           reproduced_by={"method": other[0], "level": round(lev, 6)}, details=details,
                           **about)
    return _other_denominator(claim, level, lt, printed, what, listing, slack, shown, details, about)


def _other_denominator(claim, level, lt, printed, what, listing, slack, shown, details, about) -> Finding:
    """No method gives the print with the stated samples: an interval wider than
    every method is a design effect (a note); otherwise name the whole N with
    which a method gives it (stats/denominator_search.py)."""
    iv = claim.interval
    kept = dict(reported=iv.low.value, recomputed=shown["wilson"]["low"], **about)
    half = (iv.high.value - iv.low.value) / 2
    widest = max(v["high"] - v["low"] for v in shown.values())
    n = claim.samples.value
    n_eff = effective_sample_size(claim.estimate.value, half, level) if 0 < claim.estimate.value < 1 else 0.0
    if 2 * half > widest and 0.0 < n_eff < math.inf and math.isfinite(n / n_eff):
        deff = n / n_eff
        return Finding("warn", f"The printed {lt} interval {printed} for {what} is {2 * half / widest:.2g} times "
                       f"as wide as the widest binomial interval ({listing}); it implies about {n_eff:.3g} "
                       f"effective items, a design effect of {deff:.3g}. A clustered analysis is a legitimate "
                       "reason; the paper should say so.",
                       details={**details, "effective_samples": n_eff, "design_effect": deff},
                       **{**kept, "statement": "design_effect"})
    search = search_denominator(claim.estimate.bounds, iv.low.bounds, iv.high.bounds, level, slack)
    if search.fits:
        fit = search.fits[0]
        span = (f"N = {fit.n_low}" if fit.n_low == fit.n_high
                else f"N = {fit.n_low} to {fit.n_high} (closest {fit.n_best})")
        return Finding("fail", f"The printed {lt} interval {printed} for {what} matches no method ({listing}); "
                       f"the {NAMES[fit.method]} interval gives it with {span} instead of the printed samples "
                       f"{claim.samples.text}.", reproduced_by={"method": fit.method, "samples": fit.n_best},
                       details={**details, "search": {"method": fit.method, "n_low": fit.n_low,
                                                      "n_high": fit.n_high}},
                       **{**kept, "statement": "denominator"})
    return Finding("fail", f"The printed {lt} interval {printed} for {what} matches no method "
                   f"({listing}).", details=details, **kept)


def check(claim: Claim) -> Iterator[Finding]:
    iv = claim.interval
    if iv is None:
        yield Finding("skip", "No interval is printed.", details={"missing": ["interval"]},
                      statement="needs_inputs")
        return
    if claim.estimate is None:
        yield no_estimate(claim, "the interval's sides")
        return
    if iv.low.value > iv.high.value:
        yield Finding("skip", "The interval's ends are reversed (bounds reports it).", details={},
                      statement="reversed")
        return
    tol = claim.tolerance
    below, above = _sides(claim)
    scale = max(abs(below[1]), abs(above[1]))
    asymmetric = gap(below, above) > tol * scale
    proportion = (claim.metric == "proportion" and claim.samples is not None
                  and 0.0 <= claim.estimate.value <= 1.0)
    sigma = _sigma_finding(claim, tol, asymmetric, below, above)
    if sigma.status != "skip" or not proportion:
        yield sigma
    if proportion:
        yield _method_finding(claim, tol, asymmetric)


SPEC = CheckSpec(
    id="interval",
    title="Confidence interval",
    run=check,
    quotes="value",
    statements={
        "stat_error": Statement(
            question="Which confidence level does the printed interval have? None of the usual levels "
                     "reconciles it with the printed statistical error.",
            if_reproduced="Was the interval made {reproduced}? Please name the level beside it.",
            reproducible=True),
        "method": Statement(
            question="Which method produced the printed interval? None of the usual methods reproduces it.",
            if_reproduced="Was the interval made {reproduced}? Please name the method beside it.",
            reproducible=True),
        "design_effect": Statement(
            question=("The printed interval is wider than any binomial interval for the printed samples. "
                      "Was it made from a clustered analysis, and how large is the design effect?")),
        "denominator": Statement(
            question="How many items stand behind the printed interval? No method gives it with the printed samples.",
            if_reproduced=("How many items stand behind the printed interval? It would follow {reproduced}, "
                           "not with the printed samples."),
            reproducible=True),
        "no_stat_error": ABOUT_THE_CLAIM,
        "needs_inputs": ABOUT_THE_CLAIM,
        "no_estimate": ABOUT_THE_CLAIM,
        "reversed": ABOUT_THE_CLAIM,
    },
)
