"""``significance`` for a counting experiment (metric ``counts``): n events
over an expected background b (+- sigma_b).

The correct significances are the exact Poisson tail and the asymptotic
formula of Cowan et al. (2011, Eq. 97) when b is known, and the profile
likelihood or Z_Bi of Cousins et al. (2008) when it carries an error; a
printed sigma or p agreeing with any of them agrees.  Otherwise the finding
names the formula that reproduces it: ``{"method": "naive"}`` (s / sqrt(b)),
``{"background_error": "ignored", ...}``, ``{"sided": "two"}``.

References
----------
G. Cowan, K. Cranmer, E. Gross and O. Vitells, Eur. Phys. J. C 71, 1554 (2011).
R. D. Cousins, J. T. Linnemann and J. Tucker, Nucl. Instrum. Meth. A 595, 480 (2008).
"""

from __future__ import annotations

import math
from dataclasses import replace
from typing import Iterator

from ..claim.model import Claim
from ..report import Finding, Shown, Span
from ..stats import counts
from ..stats.precision import agrees, agrees_log, over_box
from ..wording import p_range_text, span_text
from .common import above, is_probability, log_bounds

LN10 = math.log(10.0)
METHOD_WORDS = {"exact": "the exact Poisson tail", "asymptotic": "the asymptotic formula (Cowan et al. Eq. 97)",
                "naive": "s / sqrt(b)", "profile": "the profile likelihood with the background's error",
                "z_bi": "Z_Bi (Cousins et al.)"}


def _results(claim: Claim) -> dict:
    """(method, uses the background error, sided) -> (sigma box, log-p box)."""
    n = claim.observed.value
    b = claim.background.bounds
    err = claim.background_error.bounds if claim.background_error is not None else (0.0, 0.0)
    out = {}
    for sided in ("one", "two"):
        for method in counts.COUNT_METHODS:
            for with_error in ((True, False) if method in counts.WITH_BACKGROUND_ERROR else (False,)):
                if with_error and err[1] <= 0:
                    continue
                e_box = err if with_error else (0.0, 0.0)

                def sig(bb, ee, m=method, s=sided):
                    r = counts.significance(m, n, bb, ee)
                    return abs(r.sigma) if s == "two" else r.sigma

                def lp(bb, ee, m=method, s=sided):
                    return counts.significance(m, n, bb, ee).log_p_sided(s)

                out[(method, with_error, sided)] = (over_box(sig, [b, e_box]), over_box(lp, [b, e_box]))
    return out


def _stated(claim: Claim, key) -> bool:
    method, with_error, sided = key
    if sided != claim.significance.sided:
        return False
    has_error = claim.background_error is not None and claim.background_error.value > 0
    if has_error:
        return with_error and method in ("profile", "z_bi")
    return method in ("exact", "asymptotic")


def _reproduced(claim: Claim, key) -> dict:
    method, with_error, sided = key
    out = {"method": method}
    if claim.background_error is not None and claim.background_error.value > 0 and not with_error:
        out["background_error"] = "ignored"
    if sided != claim.significance.sided:
        out["sided"] = sided
    return out


def _printed(claim: Claim, results: dict, tol: float) -> Iterator[Finding]:
    sig = claim.significance
    stated = [k for k in results if _stated(claim, k)]
    first = stated[0]
    for printed, quantity in ((sig.sigma, "sigma"), (sig.p_value, "p_value")):
        if printed is None or (quantity == "p_value" and not is_probability(printed)):
            continue
        pick = 0 if quantity == "sigma" else 1
        pb = printed.bounds if quantity == "sigma" else log_bounds(printed)

        def agree(box):
            return agrees(pb, box, tol) if quantity == "sigma" else agrees_log(pb, box, tol)

        def shown(box):
            return f"{span_text(box)} sigma" if quantity == "sigma" else f"p = {p_range_text(box)}"

        word = f"Printed {printed.text} sigma" if quantity == "sigma" else f"Printed p = {printed.text}"
        box = results[first][pick]
        span = Span(*box) if quantity == "sigma" else Span(box[0] / LN10, box[1] / LN10, "log10")
        about = {"field": printed.path, "statement": "sigma_vs_inputs" if quantity == "sigma" else "p_vs_inputs",
                 "printed": Shown.of(printed), "recomputed_range": span, "tolerance": tol}
        details = {"quantity": quantity, "counts": {f"{m}{' with error' if e else ''} ({s}-sided)": list(v[pick])
                                                    for (m, e, s), v in results.items()}}
        where = f"{claim.observed.text} events over a background of {claim.background.text}" + (
            f" ± {claim.background_error.text}" if claim.background_error is not None else "")
        match = next((k for k in stated if agree(results[k][pick])), None)
        if match is not None:
            yield Finding("pass", f"{word} agrees with {shown(results[match][pick])} from {where} by "
                          f"{METHOD_WORDS[match[0]]} ({match[2]}-sided).", reported=printed.value,
                          details={**details, "method": match[0]}, **about)
            continue
        others = sorted((k for k in results if k not in stated and agree(results[k][pick])),
                        key=lambda k: len(_reproduced(claim, k)))
        slip = others[0] if others else None
        tail = (f"; it follows from {METHOD_WORDS[slip[0]]}"
                + (" with the background's error left out" if "background_error" in _reproduced(claim, slip) else "")
                + (f", {slip[2]}-sided" if slip[2] != sig.sided else "") if slip else
                "; no formula we tried reproduces it")
        yield Finding("fail", f"{word}, but {where} give {shown(box)} by {METHOD_WORDS[first[0]]} "
                      f"({sig.sided}-sided){tail}.", reported=printed.value,
                      reproduced_by=_reproduced(claim, slip) if slip else None, details=details, **about)


def _yield(claim: Claim, tol: float) -> Iterator[Finding]:
    est = claim.estimate
    if est is None:
        return
    n, b = claim.observed, claim.background
    s = (n.value - b.high, n.value - b.low)
    about = {"field": est.path, "statement": "signal_yield", "printed": Shown.of(est),
             "recomputed_range": Span(*s), "tolerance": tol}
    if agrees(est.bounds, s, tol):
        yield Finding("pass", f"Printed signal yield {est.text} is observed minus background, "
                      f"{n.text} - {b.text} = {span_text(s)}.", reported=est.value, recomputed=sum(s) / 2, **about)
    else:
        yield Finding("fail", f"Printed signal yield {est.text}, but observed minus background is "
                      f"{n.text} - {b.text} = {span_text(s)}.", reported=est.value, recomputed=sum(s) / 2, **about)


def central(claim: Claim) -> tuple[float, float] | None:
    """z and natural log p at the printed central values by the first correct formula (the exact
    Poisson tail without a background error, the profile likelihood with one): the numbers a
    survey adjusts across its claims."""
    has_error = claim.background_error is not None and claim.background_error.value > 0
    method = "profile" if has_error else "exact"
    r = counts.significance(method, claim.observed.value, claim.background.value,
                            claim.background_error.value if has_error else 0.0)
    sided = claim.significance.sided
    log_p = r.log_p_sided(sided)
    sigma = abs(r.sigma) if sided == "two" else r.sigma
    return (sigma, log_p) if math.isfinite(sigma) and math.isfinite(log_p) else None


def check(claim: Claim, sigma_vs_p) -> Iterator[Finding]:
    """The counting-experiment findings; ``sigma_vs_p`` is the significance
    check's own sigma <-> p comparison, which holds for counts unchanged.  The first
    finding that is not a skip carries the central z and log10 p (``sigma_central``,
    ``log10_p_central``) as the threshold claims' findings do."""
    found = list(_check(claim, sigma_vs_p))
    at = central(claim) if claim.observed is not None and claim.background is not None else None
    for i, f in enumerate(found):
        if at is not None and f.status != "skip":
            found[i] = replace(f, details={**f.details, "sigma_central": at[0], "log10_p_central": at[1] / LN10})
            break
    yield from found


def _check(claim: Claim, sigma_vs_p) -> Iterator[Finding]:
    tol = claim.tolerance
    yield from sigma_vs_p(claim, tol)
    yield from _yield(claim, tol)
    results = _results(claim)
    stated = [k for k in results if _stated(claim, k)]
    sig = claim.significance
    yield from _printed(claim, results, tol)
    box = results[stated[0]][0]
    if sig.sigma is None and sig.p_value is None:
        yield Finding("info", f"No significance is printed; {claim.observed.text} events over "
                      f"{claim.background.text} give {span_text(box)} sigma by {METHOD_WORDS[stated[0][0]]}.",
                      recomputed=sum(box) / 2, statement="inputs_only", recomputed_range=Span(*box), tolerance=tol)
    if sig.required_sigma is not None:
        # every correct formula must clear the level for the claim to clear it
        low = min(results[k][0][0] for k in stated)
        high = max(results[k][0][1] for k in stated)
        need = sig.required_sigma
        about = {"field": need.path, "statement": "required_sigma", "printed": Shown.of(need),
                 "recomputed_range": Span(low, high), "tolerance": tol}
        if above(need, high, tol):
            yield Finding("fail", f"The counts give {span_text((low, high))} sigma, short of the required "
                          f"{need.text} sigma.", reported=need.value, **about)
        elif low < need.value:
            yield Finding("warn", f"The counts give {span_text((low, high))} sigma: the required {need.text} "
                          "sigma is reached only by some of the correct formulas.", reported=need.value, **about)
        else:
            yield Finding("pass", f"The counts give {span_text((low, high))} sigma, clearing the required "
                          f"{need.text} sigma.", reported=need.value, **about)
