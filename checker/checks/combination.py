"""``combination``: the combined value and error recomputed from ``parts``.

The printed combination (the ``combination`` block, or the headline when no
extrapolation stands between them) is held against the stated method, over
the printed precision of every part.  Accepted besides each method's own
error: for equal weights, the error from the parts' scatter; for
inverse-variance weights, the error scaled by the Birge ratio S when S > 1
(the Particle Data Group's practice).  When the print disagrees, every other
method (Paule-Mandel included) and two common error slips are tried, and the
one that reproduces the print is named in ``reproduced_by``.

References
----------
R. DerSimonian and N. Laird, Control. Clin. Trials 7, 177 (1986).
Particle Data Group, Review of Particle Physics, Introduction, "Averages and
fits" (scale factor; from memory).
"""

from __future__ import annotations

from typing import Iterator

from ..claim.model import Claim, Reported
from ..report import Finding, Shown, Span
from ..stats.precision import agrees
from .parts_summary import (METHOD_WORDS, VARIANT_WORDS, PartsSummary, RangeOption, methods_details,
                            parts_summary, printed_combination, value_text)
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

ORDER = ("equal", "samples", "inverse-variance", "random-effects", "paule-mandel")
LEGITIMATE = (None, "spread", "scaled")
SLIPS = ("average", "quadrature")


def _error_options(summary: PartsSummary, method: str, slips: bool):
    """(variant, range option, value) the printed error may match under ``method``:
    its own error, then the accepted variants, then (with ``slips``) the slips."""
    r = summary.methods[method]
    options = []
    if r.stat_error is not None:
        options.append((None, RangeOption(r, "stat_error"), r.stat_error))
    if method == "equal" and "spread" in summary.variants:
        options.append(("spread", RangeOption(fixed=summary.variants["spread"][1]), summary.variants["spread"][0]))
    het = summary.heterogeneity
    if (method == "inverse-variance" and r.scaled_error is not None
            and het is not None and het.scale_factor > 1.0):
        options.append(("scaled", RangeOption(r, "scaled_error"), r.scaled_error))
    if slips and method in ("equal", "samples", "inverse-variance"):
        for name in SLIPS:
            if name in summary.variants:
                options.append((name, RangeOption(fixed=summary.variants[name][1]), summary.variants[name][0]))
    return options


def _match(summary, method, est: Reported | None, err: Reported | None, tol, slips=False):
    """(method, variant, error value) when the printed values agree under
    ``method``; None when they do not.  Only agreement is asked, so a searched
    range is computed only where its cheaper bounds leave the answer open."""
    r = summary.methods[method]
    if est is not None and not r.agrees("estimate", est.bounds, tol):
        return None
    if err is None:
        return (method, None, r.stat_error)
    for variant, option, value in _error_options(summary, method, slips):
        if option.agrees(err.bounds, tol):
            return (method, variant, value)
    return None


def _printed_text(est: Reported | None, err: Reported | None) -> str:
    if est is not None and err is not None:
        return f"{est.text} ± {err.text}"
    return f"error {err.text}" if est is None else est.text


def _result_text(summary, method, est, err, variant=None, error=None, count=True) -> str:
    """'the inverse-variance mean of the 10 parts, 2.238e-3 ± 0.381e-3'."""
    r = summary.methods[method]
    error = r.stat_error if error is None and variant is None else error
    words = METHOD_WORDS[method] + (f" of the {summary.count} parts" if count else "")
    if variant is not None:
        words += " " + VARIANT_WORDS[variant]
        if variant == "scaled":
            words += f" S = {summary.heterogeneity.scale_factor:.3g}"
    if est is None:
        numbers = f"error {value_text(error, err)}" if error is not None else "no error"
    elif err is None or error is None:
        numbers = value_text(r.estimate, est)
    else:
        numbers = f"{value_text(r.estimate, est)} ± {value_text(error, err)}"
    return f"{words}, {numbers}"


def _reproduce(summary, stated, est, err, tol):
    """What reproduces the print: another method with a legitimate error, else
    a method with an error slip, else another method's value alone."""
    others = [m for m in ORDER if m in summary.methods and m != stated]
    for method in others:
        hit = _match(summary, method, est, err, tol)
        if hit is not None:
            return hit + ("both",)
    for method in ([stated] if stated else []) + others:
        hit = _match(summary, method, est, err, tol, slips=True)
        if hit is not None:
            return hit + ("slip",)
    if est is not None and err is not None:
        for method in others:
            hit = _match(summary, method, est, None, tol)
            if hit is not None:
                return (method, None, None, "value")
    return None


def _headline_against_block(claim: Claim) -> Iterator[Finding]:
    """With no extrapolation between them, the headline is the combination:
    a headline that differs from the printed ``combination`` block is flagged."""
    comb = claim.combination
    if claim.extrapolation is not None or comb is None:
        return
    pairs = [(name, head, block) for name, head, block in
             (("estimate", claim.estimate, comb.estimate), ("stat_error", claim.stat_error, comb.stat_error))
             if head is not None and block is not None]
    off = [(name, head, block) for name, head, block in pairs
           if not agrees(head.bounds, block.bounds, claim.tolerance)]
    if off:
        words = "; ".join(f"headline {name} {head.text} against {block.text}" for name, head, block in off)
        yield Finding("fail", f"The headline differs from the printed combination ({words}), and no "
                      "extrapolation factor stands between them.", reported=off[0][1].value,
                      recomputed=off[0][2].value, details={"quantity": "headline", "fields": [o[0] for o in off]},
                      field=off[0][1].path, statement="headline_vs_block", printed=Shown.of(off[0][1]),
                      recomputed_range=Span(*off[0][2].bounds), tolerance=claim.tolerance)


def check(claim: Claim) -> Iterator[Finding]:
    yield from _headline_against_block(claim)
    if len(claim.parts) < 2:
        have = "No parts are given" if not claim.parts else "Only one part is given"
        yield Finding("skip", f"{have}, so there is no combination to recompute.",
                      details={"missing": ["parts"]}, statement="needs_parts")
        return
    summary = parts_summary(claim)
    tol = claim.tolerance
    stated = claim.combination.method if claim.combination is not None else None
    est, err = printed_combination(claim)
    k = summary.count
    details = {"summary": True, "method": stated, "methods": methods_details(summary),
               "printed": {"estimate": est.value if est else None, "stat_error": err.value if err else None},
               "parts": k, "error_source": summary.error_source, "tolerance": tol}
    if summary.heterogeneity is not None:
        details["scale_factor"] = summary.heterogeneity.scale_factor
    if "spread" in summary.variants:
        details["spread_error"] = summary.variants["spread"][0]
    if stated is not None and stated not in summary.methods:
        need = "each part's samples" if stated == "samples" else "each part's stat_error, more than zero (or its samples)"
        yield Finding("skip", f"The stated method, {METHOD_WORDS[stated]}, needs {need}, which the "
                      "claim does not give.", details={**details, "missing": [need]},
                      statement="needs_inputs")
        return
    primary = stated or ("inverse-variance" if "inverse-variance" in summary.methods else "equal")
    mine = summary.methods[primary]
    if est is None and err is None:
        yield Finding("info", f"No combined value is printed to compare; {METHOD_WORDS[primary]} of the "
                      f"{k} parts is {value_text(mine.estimate, None)}.", recomputed=mine.estimate,
                      details=details, statement="not_printed", recomputed_range=_span(mine.estimate_range))
        return
    printed = _printed_text(est, err)
    about, reported, recomputed = _about(summary, primary, est, err, tol)

    if stated is None:
        # No method stated: any legitimate method that reproduces the print passes.
        for method in ORDER:
            hit = method in summary.methods and _match(summary, method, est, err, tol)
            if hit:
                _, variant, error = hit
                reproduce = {"method": method, **({"error": variant} if variant else {})}
                mine_about, reported, _ = _about(summary, method, est, err, tol)
                yield Finding("pass", f"Printed combination {printed} agrees with "
                              f"{_result_text(summary, method, est, err, variant, error)} "
                              "(the claim does not state its method).", reported=reported,
                              recomputed=summary.methods[method].estimate if est else error,
                              reproduced_by=reproduce, details=details, **mine_about)
                return
        base = (f"Printed combination {printed}, but {_result_text(summary, primary, est, err)}, and the "
                "claim does not state its method")
        yield _failure(base, _reproduce(summary, None, est, err, tol), summary, est, err, reported,
                       recomputed, details, about)
        return

    hit = _match(summary, stated, est, err, tol)
    if hit is not None:
        _, variant, error = hit
        yield Finding("pass", f"Printed combination {printed} agrees with "
                      f"{_result_text(summary, stated, est, err, variant, error)}.",
                      reported=reported, recomputed=recomputed, details=details, **about)
        return
    found = _reproduce(summary, stated, est, err, tol)
    if stated == "random-effects" and found is not None and found[0] == "paule-mandel" and found[3] == "both":
        yield Finding("warn", f"Printed combination {printed} is "
                      f"{_result_text(summary, 'paule-mandel', est, err)}, rather than "
                      f"{_result_text(summary, stated, est, err)}; worth saying which "
                      "between-part variance was used.", reported=reported, recomputed=recomputed,
                      reproduced_by={"method": "paule-mandel"}, details=details,
                      **{**about, "statement": "between_part_variance"})
        return
    numbers = _result_text(summary, stated, est, err).split(", ", 1)[1]
    base = (f"Printed combination {printed}, but {METHOD_WORDS[stated]} of the {k} parts, the stated "
            f"method, is {numbers}")
    yield _failure(base, found, summary, est, err, reported, recomputed, details, about)


def _span(bounds) -> Span | None:
    return Span(*bounds) if bounds is not None else None


def _about(summary: PartsSummary, method: str, est: Reported | None, err: Reported | None, tol: float):
    """(finding fields, reported, recomputed) for the printed number a
    combination finding is about: the estimate, unless it agrees with
    ``method`` and the printed error is what does not (or only the error is
    printed)."""
    r = summary.methods[method]
    on_error = err is not None and (est is None or (r.agrees("estimate", est.bounds, tol)
                                                    and r.stat_error_range is not None
                                                    and not r.agrees("stat_error", err.bounds, tol)))
    rep, value, rng = (err, r.stat_error, r.stat_error_range) if on_error else (est, r.estimate, r.estimate_range)
    about = {"field": rep.path, "statement": "combined", "printed": Shown.of(rep),
             "recomputed_range": _span(rng), "tolerance": tol}
    return about, rep.value, value


def _failure(base, found, summary, est, err, reported, recomputed, details, about) -> Finding:
    if found is None:
        return Finding("fail", f"{base}; no method reproduces the print.", reported=reported,
                       recomputed=recomputed, details=details, **about)
    method, variant, error, kind = found
    reproduce = {"method": method, **({"error": variant} if variant else {})}
    if kind == "value":
        r = summary.methods[method]
        tail = (f"; the printed value is {METHOD_WORDS[method]} ({value_text(r.estimate, est)}), "
                "though no method gives its error")
    else:
        tail = f"; the print is {_result_text(summary, method, est, err, variant, error, count=False)}"
    return Finding("fail", f"{base}{tail}.", reported=reported, recomputed=recomputed,
                   reproduced_by=reproduce, details=details, **about)


SPEC = CheckSpec(
    id="combination",
    title="Combination of the parts",
    run=check,
    quotes="value",
    statements={
        "combined": Statement(
            question="How were the parts combined into the printed value? No method we tried reproduces it.",
            if_reproduced=("The printed combination would follow {reproduced}, not with the method stated. "
                           "Which weights were used to combine the parts?"),
            reproducible=True),
        "between_part_variance": Statement(
            question=("Which estimate of the between-part variance does the random-effects combination use "
                      "(DerSimonian-Laird, Paule-Mandel, another)? The printed value follows {reproduced}."),
            reproducible=True),
        "headline_vs_block": Statement(
            question=("The headline and the printed combination differ, with no extrapolation between "
                      "them. Which of the two is the result, and how was the other obtained?")),
        "not_printed": ABOUT_THE_CLAIM,
        "needs_parts": ABOUT_THE_CLAIM,
        "needs_inputs": ABOUT_THE_CLAIM,
    },
)
