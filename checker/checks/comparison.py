"""``comparison``: a result against its baseline.

Recomputes the difference (estimate - baseline), its error and its
significance, and holds each printed one against them:

- unpaired: the two errors in quadrature (for proportions without printed
  errors, sqrt(p (1 - p) / n) each), z = d / se;
- paired proportions with discordant counts: the paired error and McNemar's
  test (z, chi-square with or without the continuity correction, exact
  binomial); with no ``comparison.test`` stated, any of them may be the one;
- paired without discordant counts: only the range of McNemar's z that the
  two accuracies allow, as a note.

On a disagreement the finding names the slip that reproduces the print:
``{"baseline_error": "ignored"}`` (the difference's error taken as ours
alone), ``{"pairing": "unpaired"}`` (a paired claim computed as unpaired),
``{"errors": "added"}`` (the errors added, not in quadrature),
``{"sided": "two"}``.

References
----------
Q. McNemar, Psychometrika 12, 153 (1947); A. L. Edwards, Psychometrika 13,
185 (1948); A. Agresti, "Categorical Data Analysis", 2nd ed. (2002), 10.1.
"""

from __future__ import annotations

import math
from dataclasses import replace
from typing import Iterator

from ..claim.model import Claim, Reported
from ..report import Finding, Shown, Span
from ..stats import comparison as cmp
from ..stats.binomial import binomial_variance
from ..stats.precision import agrees, agrees_log, over_box
from ..stats.ranges import binomial_variance_range, sampling_error_range
from ..stats.tails import log_p_from_sigma
from ..wording import num, p_range_text, span_text
from .common import is_probability, log_bounds
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

LN10 = math.log(10.0)
# How each way of testing the difference is named in a message.
NAMES = {"mcnemar z": "McNemar z", "mcnemar chi-square": "McNemar chi-square",
         "mcnemar chi-square-corrected": "McNemar chi-square with the continuity correction",
         "mcnemar exact": "exact binomial test on the discordant pairs",
         "unpaired": "errors in quadrature", "added": "errors added linearly",
         "ours only": "estimate's error alone (the baseline's left out)",
         "baseline only": "baseline's error alone (the estimate's left out)", "paired": "paired error"}


def _span_log(bounds):
    return Span(bounds[0] / LN10, bounds[1] / LN10, "log10")


def _error_box(value: Reported, error: Reported | None, samples: Reported | None, proportion: bool):
    """The standard error's interval: printed, or for a proportion from its samples."""
    if error is not None and error.value > 0:
        return error.bounds, "printed"
    if proportion and samples is not None:
        # sqrt(p (1 - p)/n) peaks inside the interval when it holds 1/2: not a corner formula.
        box = sampling_error_range(binomial_variance, binomial_variance_range, value.bounds, samples.bounds)
        if math.isfinite(box[0]) and box[1] > 0:
            return box, "from samples"
    return None, ""


def _candidates(claim: Claim, paired: bool):
    """Each way of getting the difference's error: name -> (reproduced_by, error box).
    The stated one is first."""
    proportion = claim.metric == "proportion"
    a, b = claim.estimate, claim.baseline
    se_a, _ = _error_box(a, claim.stat_error, claim.samples, proportion)
    se_b, _ = _error_box(b.estimate, b.stat_error, b.samples or claim.samples, proportion)
    out = {}
    c = claim.comparison
    disc = c.discordant if c is not None else None
    n = claim.samples or b.samples
    if paired and disc is not None and n is not None:
        out["paired"] = (None, over_box(lambda k: cmp.paired_difference(disc[0].value, disc[1].value, k)[1],
                                         [n.bounds]))
    if se_a is not None and se_b is not None:
        quad = over_box(lambda x, y: math.hypot(x, y), [se_a, se_b])
        out["unpaired"] = ({"pairing": "unpaired"} if paired else None, quad)
        out["added"] = ({"errors": "added"}, (se_a[0] + se_b[0], se_a[1] + se_b[1]))
    if se_a is not None:
        out["ours only"] = ({"baseline_error": "ignored"}, se_a)
    if se_b is not None:
        out["baseline only"] = ({"own_error": "ignored"}, se_b)
    return out


def _difference(claim: Claim, tol: float) -> Iterator[Finding]:
    a, b, c = claim.estimate, claim.baseline.estimate, claim.comparison
    d = (a.low - b.high, a.high - b.low)
    if c is None or c.difference is None:
        return
    printed = c.difference
    about = {"field": printed.path, "statement": "difference", "printed": Shown.of(printed),
             "recomputed_range": Span(*d), "tolerance": tol}
    if agrees(printed.bounds, d, tol):
        yield Finding("pass", f"Printed difference {printed.text} agrees with estimate minus baseline, "
                      f"{a.text} - {b.text} = {span_text(d)}.", reported=printed.value,
                      recomputed=(d[0] + d[1]) / 2, details={"quantity": "difference"}, **about)
        return
    flipped = (-d[1], -d[0])
    reproduced = {"difference": "baseline minus estimate"} if agrees(printed.bounds, flipped, tol) else None
    tail = "; it is the baseline minus the estimate" if reproduced else ""
    yield Finding("fail", f"Printed difference {printed.text}, but {a.text} - {b.text} = {span_text(d)}{tail}.",
                  reported=printed.value, recomputed=(d[0] + d[1]) / 2, reproduced_by=reproduced,
                  details={"quantity": "difference"}, **about)


def _difference_error(claim: Claim, paired: bool, cands, tol: float) -> Iterator[Finding]:
    c = claim.comparison
    if c is None or c.difference_error is None:
        return
    printed = c.difference_error
    stated_name = "paired" if paired else "unpaired"
    if stated_name not in cands:
        yield Finding("skip", "Cannot recompute the difference's error; needs "
                      + ("comparison.discordant and samples" if paired else
                         "both errors (stat_error and baseline.stat_error, or samples for proportions)") + ".",
                      details={"missing": ["comparison.discordant"] if paired else ["stat_error"]},
                      statement="needs_inputs")
        return
    mine = cands[stated_name][1]
    words = "from the discordant counts" if paired else "with both errors in quadrature"
    about = {"field": printed.path, "statement": "difference_error", "printed": Shown.of(printed),
             "recomputed_range": Span(*mine), "tolerance": tol}
    if agrees(printed.bounds, mine, tol):
        yield Finding("pass", f"Printed error of the difference {printed.text} agrees with the "
                      f"{span_text(mine)} {words}.", reported=printed.value, recomputed=sum(mine) / 2,
                      details={"quantity": "difference_error"}, **about)
        return
    other = next(((name, r) for name, (r, box) in cands.items()
                  if name != stated_name and r and agrees(printed.bounds, box, tol)), None)
    tail = f"; it is the {NAMES[other[0]]}" if other else "; no way of combining the errors we tried gives it"
    yield Finding("fail", f"Printed error of the difference {printed.text}, but {words} it is "
                  f"{span_text(mine)}{tail}.", reported=printed.value, recomputed=sum(mine) / 2,
                  reproduced_by=other[1] if other else None, details={"quantity": "difference_error"}, **about)


def _significances(claim: Claim, paired: bool, cands) -> dict:
    """Candidate significances: key -> (reproduced_by or None for a stated one,
    sigma box, log-p box), under the stated sidedness and the other."""
    c = claim.comparison
    sided = c.sided if c is not None else "one"
    other = "two" if sided == "one" else "one"
    a, b = claim.estimate, claim.baseline.estimate
    out = {}
    disc = c.discordant if c is not None else None
    n = claim.samples or claim.baseline.samples
    for s in (sided, other):
        flip = {"sided": s} if s != sided else {}
        if paired and disc is not None and n is not None:
            tests = [c.test] if c.test else list(cmp.PAIRED_TESTS)
            for test in tests:
                r = cmp.mcnemar(disc[0].value, disc[1].value, n.value, test, s)
                z = abs(r.sigma) if s == "two" else r.sigma
                out[(f"mcnemar {test}", s)] = (flip or None, (z, z), (r.log_p, r.log_p))
        for name, (reproduced, err) in cands.items():
            if name == "paired":
                continue
            if not (math.isfinite(err[0]) and err[0] > 0):
                continue
            if reproduced is None and paired:
                continue  # paired claims get the McNemar forms as their stated ones

            def z_of(x, y, e):
                return (x - y) / e
            sig = over_box(z_of, [a.bounds, b.bounds, err])
            if s == "two":
                sig = tuple(sorted(abs(v) for v in sig)) if sig[0] * sig[1] > 0 else (0.0, max(map(abs, sig)))
            lp = over_box(lambda x, y, e: log_p_from_sigma(z_of(x, y, e), s), [a.bounds, b.bounds, err])
            rep = {**(reproduced or {}), **flip} or None
            out[(name, s)] = (rep, sig, lp)
    return out


def _printed_significance(claim: Claim, paired: bool, sigs: dict, tol: float) -> Iterator[Finding]:
    c = claim.comparison
    if c is None:
        return
    sided = c.sided
    stated = {k: v for k, v in sigs.items() if v[0] is None}
    for printed, quantity in ((c.sigma, "sigma"), (c.p_value, "p_value")):
        if printed is None:
            continue
        if quantity == "p_value" and not is_probability(printed):
            continue
        pick = (lambda v: v[1]) if quantity == "sigma" else (lambda v: v[2])
        pb = printed.bounds if quantity == "sigma" else log_bounds(printed)
        agree = (lambda x, y: agrees(x, y, tol)) if quantity == "sigma" else (lambda x, y: agrees_log(x, y, tol))
        shown = (lambda v: f"{span_text(v[1])} sigma") if quantity == "sigma" else \
            (lambda v: f"p = {p_range_text(v[2])}")
        word = f"Printed {printed.text} sigma" if quantity == "sigma" else f"Printed p = {printed.text}"
        if not stated:
            continue
        first_key, first = next(iter(stated.items()))
        span = Span(*first[1]) if quantity == "sigma" else _span_log(first[2])
        about = {"field": printed.path, "statement": quantity, "printed": Shown.of(printed),
                 "recomputed_range": span, "tolerance": tol}
        details = {"quantity": quantity, "test": first_key[0], "sided": sided,
                   "tests": {f"{k[0]} ({k[1]}-sided)": list(pick(v)) for k, v in sigs.items()}}
        match = next((k for k, v in stated.items() if agree(pb, pick(v))), None)
        if match is not None:
            yield Finding("pass", f"{word} agrees with {shown(stated[match])} by the {NAMES[match[0]]} "
                          f"({sided}-sided).",
                          reported=printed.value, details={**details, "test": match[0]}, **about)
            continue
        # The slip with the fewest changes first, a sidedness slip before the others.
        slips = sorted((k for k, v in sigs.items() if v[0] is not None and agree(pb, pick(v))),
                       key=lambda k: (len(sigs[k][0]), "sided" not in sigs[k][0]))
        slip = slips[0] if slips else None
        tail = (f"; it would follow with the {NAMES[slip[0]]}, {slip[1]}-sided" if slip else
                "; nothing we tried reproduces it")
        yield Finding("fail", f"{word}, but the {NAMES[first_key[0]]} ({sided}-sided) gives {shown(first)}{tail}.",
                      reported=printed.value, reproduced_by=dict(sigs[slip][0]) if slip else None,
                      details=details, **about)


def _without_discordant(claim: Claim, tol: float) -> Iterator[Finding]:
    """A paired proportion claim without discordant counts: the range of
    McNemar's z the two accuracies on the same items allow."""
    c, b = claim.comparison, claim.baseline
    n = claim.samples or b.samples
    if claim.metric != "proportion" or n is None or (b.samples is not None and claim.samples is not None
                                                    and b.samples.value != claim.samples.value):
        yield Finding("skip", "A paired claim without comparison.discordant: its significance cannot be "
                      "recomputed (and for proportions needs samples to bound it).",
                      details={"missing": ["comparison.discordant"]}, statement="discordant_missing")
        return
    k_a = round(claim.estimate.value * n.value)
    k_b = round(b.estimate.value * n.value)
    rng = cmp.discordant_range(k_a, k_b, int(n.value))
    box = (rng.sigma_low, rng.sigma_high)
    details = {"correct": [k_a, k_b], "net": rng.net, "discordant_fewest": rng.fewest,
               "discordant_most": rng.most, "sigma_low": box[0], "sigma_high": box[1]}
    base = (f"Paired, but no discordant counts are printed: {k_a} and {k_b} right of {int(n.value)} "
            f"allow {rng.fewest} to {rng.most} discordant items, so McNemar's z lies in "
            f"{span_text(box)}")
    printed = c.sigma
    about = {"field": "comparison.discordant", "statement": "discordant_missing",
             "recomputed_range": Span(*box), "tolerance": tol}
    if printed is not None and not agrees(printed.bounds, box, tol):
        yield Finding("fail", f"{base}; the printed {printed.text} sigma lies outside it.",
                      reported=printed.value, details=details,
                      **{**about, "field": printed.path, "printed": Shown.of(printed)})
        return
    # about the printed sigma when there is one, else about the pairing the claim states
    # (comparison.discordant is what is missing, so it is no field of the claim)
    where = {"field": printed.path, "printed": Shown.of(printed)} if printed is not None else \
        {"field": "comparison.paired"}
    yield Finding("warn", f"{base}; please print the discordant counts (items only one of the two got right).",
                  reported=printed.value if printed else None, details=details, **{**about, **where})


def central(claim: Claim, paired: bool) -> dict | None:
    """The two values, their errors, the difference, its error and its significance at the
    printed central values, under the stated pairing (McNemar's z for paired proportions with
    discordant counts, else the errors in quadrature): what the report's difference picture
    draws and a batch's columns hold.  None when an error is missing."""
    proportion = claim.metric == "proportion"
    a, b, c = claim.estimate, claim.baseline, claim.comparison

    def at_centre(value, error, samples):
        # the printed error, or a proportion's binomial error at its printed value
        if error is not None and error.value > 0:
            return error.value
        if proportion and samples is not None and samples.value > 0:
            return cmp.proportion_error(value.value, samples.value)
        return None

    se_a = at_centre(a, claim.stat_error, claim.samples)
    se_b = at_centre(b.estimate, b.stat_error, b.samples or claim.samples)
    sided = c.sided if c is not None else "one"
    n = claim.samples or b.samples
    if paired and c is not None and c.discordant is not None and n is not None:
        r = cmp.mcnemar(c.discordant[0].value, c.discordant[1].value, n.value, c.test or "z", sided)
        d, err = cmp.paired_difference(c.discordant[0].value, c.discordant[1].value, n.value)
        how = "paired"
    elif not paired and se_a is not None and se_b is not None and se_a > 0 and se_b > 0:
        r = cmp.unpaired(a.value, se_a, b.estimate.value, se_b, sided)
        d, err, how = r.difference, r.error, "unpaired"
    elif paired:
        # no discordant counts: the difference is known, its paired error is not
        r, d, err, how = None, a.value - b.estimate.value, None, "paired, no discordant counts"
    else:
        return None
    sigma = None if r is None else (abs(r.sigma) if sided == "two" else r.sigma)
    log10_p = None if r is None or not math.isfinite(r.log_p) else r.log_p / LN10
    if not all(x is None or math.isfinite(x) for x in (d, err, sigma)):
        return None
    return {"estimate": a.value, "estimate_error": se_a, "baseline": b.estimate.value, "baseline_error": se_b,
            "baseline_label": b.label or "baseline", "difference": d, "difference_error": err, "error_from": how,
            "sigma": sigma, "log10_p": log10_p, "sided": sided}


def check(claim: Claim) -> Iterator[Finding]:
    found = list(_check(claim))
    # The central values ride on the check's first finding that is not a skip.
    facts = None
    if claim.baseline is not None and claim.estimate is not None:
        facts = central(claim, bool(claim.comparison and claim.comparison.paired))
    for i, f in enumerate(found):
        if facts is not None and f.status != "skip":
            found[i] = replace(f, details={**f.details, "central": facts})
            break
    else:
        c = claim.comparison
        if facts is not None and facts["sigma"] is not None and (c is None or (c.sigma is None and c.p_value is None)):
            # Nothing printed to compare with: the difference's significance for information.
            how = "McNemar's z on the discordant counts" if facts["error_from"] == "paired" else \
                "both errors in quadrature"
            found.append(Finding(
                "info", f"No significance of the difference is printed; {claim.estimate.text} against "
                f"{claim.baseline.estimate.text} gives a difference of {num(facts['difference'], 3)} ± "
                f"{num(facts['difference_error'], 3)}, {num(facts['sigma'], 3)} sigma ({how}, "
                f"{facts['sided']}-sided).", recomputed=facts["sigma"], details={"central": facts},
                statement="inputs_only"))
    yield from found


def _check(claim: Claim) -> Iterator[Finding]:
    tol = claim.tolerance
    if claim.baseline is None:
        yield Finding("skip", "No baseline is given.", details={"missing": ["baseline"]}, statement="needs_inputs")
        return
    if claim.estimate is None:
        yield Finding("skip", "No estimate is printed, so the difference from the baseline cannot be "
                      "recomputed.", details={"missing": ["estimate"]}, statement="needs_inputs")
        return
    c = claim.comparison
    paired = bool(c and c.paired)
    yield from _difference(claim, tol)
    cands = _candidates(claim, paired)
    yield from _difference_error(claim, paired, cands, tol)
    if paired and (c.discordant is None):
        yield from _without_discordant(claim, tol)
        return
    sigs = _significances(claim, paired, cands)
    if not any(v[0] is None for v in sigs.values()):
        if c is not None and (c.sigma is not None or c.p_value is not None):
            yield Finding("skip", "Cannot recompute the difference's significance; needs both errors "
                          "(stat_error and baseline.stat_error, or samples for proportions).",
                          details={"missing": ["stat_error", "baseline.stat_error"]}, statement="needs_inputs")
        return
    yield from _printed_significance(claim, paired, sigs, tol)


SPEC = CheckSpec(
    id="comparison",
    title="Comparison with the baseline",
    run=check,
    statements={
        "difference": Statement(
            question="How was {what} obtained? The estimate minus the baseline gives another value.",
            if_reproduced="Was {what} computed {reproduced}? Please say which way the difference is taken.",
            reproducible=True),
        "difference_error": Statement(
            question="How was {what} computed? Neither the errors in quadrature nor the paired error give it.",
            if_reproduced=("Was {what} computed {reproduced}? The difference of two measured values "
                           "carries both their errors."),
            reproducible=True),
        "sigma": Statement(
            question="How was {what} obtained from the difference and its error?",
            if_reproduced=("Was {what} computed {reproduced}? The difference's significance needs the "
                           "error of the difference, paired when both were scored on the same items."),
            reproducible=True),
        "p_value": Statement(
            question="How was {what} obtained from the difference and its error?",
            if_reproduced=("Was {what} computed {reproduced}? The difference's significance needs the "
                           "error of the difference, paired when both were scored on the same items."),
            reproducible=True),
        "discordant_missing": Statement(
            question=("Could the authors print the discordant counts (items only one of the two got right)? "
                      "Without them the paired significance can only be bounded.")),
        "needs_inputs": ABOUT_THE_CLAIM,
        "inputs_only": ABOUT_THE_CLAIM,
    },
)
