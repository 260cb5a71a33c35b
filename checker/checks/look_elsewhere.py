"""``look-elsewhere``: the global significance after looking at many
configurations (or scanning a parameter) before reporting the best one.

The local p-value is the printed one (or the printed sigma's, or else the
recomputed one), so that this check stands apart from ``significance``.  With
``trials`` the global p is Sidak's, with Bonferroni's bound beside it; with
``upcrossings`` and ``upcrossing_sigma`` it is Gross and Vitells'.

References
----------
Z. Sidak, J. Am. Stat. Assoc. 62, 626 (1967).
E. Gross and O. Vitells, Eur. Phys. J. C 70, 525 (2010), arXiv:1005.1891.
"""

from __future__ import annotations

import math
from typing import Iterator

from ..claim.model import Claim
from ..report import Finding, Shown, Span
from ..stats.multiplicity import log_bonferroni, log_gross_vitells, log_sidak, sidak_trials
from ..stats.precision import agrees, over_box
from ..stats.tails import log_p_from_sigma, sigma_from_log_p
from ..vocabulary import CORRECTION_NAMES
from ..wording import num, p_range_text, p_text, span_text
from .common import above, is_probability, log_bounds
from .significance import recompute, stated_convention
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement


def _local(claim: Claim):
    """(log-p interval, sigma interval, where it came from) of the local significance."""
    sig = claim.significance
    sided = sig.sided
    if sig.p_value is not None and is_probability(sig.p_value):
        lp = log_bounds(sig.p_value)
        if lp[0] == -math.inf:
            lp = (lp[1], lp[1])  # "p < x": compute from the bound; check() reads results as bounds
        sigma = tuple(sorted(sigma_from_log_p(x, sided) for x in lp))
        return lp, sigma, "printed p_value"
    if sig.sigma is not None:
        sigma = sig.sigma.bounds
        lp = tuple(sorted(log_p_from_sigma(z, sided) for z in sigma))
        return lp, sigma, "printed sigma"
    mine = recompute(claim, stated_convention(claim))
    if mine is not None:
        return mine.log_p, mine.sigma, "recomputed significance"
    return None


def _methods(claim: Claim, lp, sigma, sided):
    """Global sigma intervals by method; the stated method first."""
    sig = claim.significance
    out = {}
    if sig.upcrossings is not None and sig.upcrossing_sigma is not None:
        n0, c0 = sig.upcrossings.bounds, sig.upcrossing_sigma.value

        def gv(z, n, s=sided):
            return log_gross_vitells(log_p_from_sigma(z, s), z, n, c0)

        for s in (sided, "two" if sided == "one" else "one"):
            glp = over_box(lambda z, n: gv(z, n, s), [sigma, n0])
            out[("gross-vitells", s)] = (glp, tuple(sorted(sigma_from_log_p(x, s) for x in glp)))
    if claim.trials is not None:
        n = claim.trials.value
        for name, fn in (("sidak", log_sidak), ("bonferroni", log_bonferroni)):
            for s in (sided, "two" if sided == "one" else "one"):
                # Convert the printed local significance under sidedness s.
                local = tuple(sorted(log_p_from_sigma(z, s) for z in sigma))
                glp = tuple(sorted(fn(x, n) for x in local))
                out[(name, s)] = (glp, tuple(sorted(sigma_from_log_p(x, s) for x in glp)))
    out[("none", sided)] = (lp, sigma)
    return out




def _printed_global(printed, methods, primary, summary, details, tol) -> Finding:
    """Compare the printed global sigma with the stated method, then look for
    the method (or sidedness) that reproduces it."""
    gsigma = methods[primary][1]
    mid = gsigma[0] if math.isinf(gsigma[1]) else (gsigma[0] + gsigma[1]) / 2
    common = {"reported": printed.value, "recomputed": mid, "details": details, "field": printed.path,
              "statement": "global_sigma", "printed": Shown.of(printed), "recomputed_range": Span(*gsigma),
              "tolerance": tol}
    if agrees(printed.bounds, gsigma, tol):
        return Finding("pass", f"Printed global {printed.text} sigma agrees: {summary}.", **common)
    sided = primary[1]
    other = next(((m, s) for (m, s), (_, gs) in methods.items()
                  if (m, s) != primary and agrees(printed.bounds, gs, tol)), None)
    if other is None:
        return Finding("fail", f"Printed global {printed.text} sigma, but {summary}; no method "
                       "reproduces it.", **common)
    reproduce = {"method": other[0]} | ({"sided": other[1]} if other[1] != sided else {})
    if other == ("bonferroni", sided) and primary[0] == "sidak":
        # Bonferroni is a valid bound on the Sidak value, only slightly conservative.
        return Finding("pass", f"Printed global {printed.text} sigma is the Bonferroni bound, "
                       f"slightly conservative: {summary}.", reproduced_by=reproduce, **common)
    if other[0] == "none":
        tail = "the printed value is the local one, uncorrected"
    else:
        tail = (f"the printed value is what {CORRECTION_NAMES[other[0]]}"
                f"{' (' + other[1] + '-sided)' if other[1] != sided else ''} gives")
    return Finding("fail", f"Printed global {printed.text} sigma, but {summary}; {tail}.",
                   reproduced_by=reproduce, **common)


def _span(bounds: tuple[float, float]) -> str:
    return f"at least {num(bounds[0])}" if math.isinf(bounds[1]) else span_text(bounds)


def _trials_text(n: float) -> str:
    return "no limit" if math.isinf(n) else num(n, 3)


def _implied_trials(claim: Claim) -> Iterator[Finding]:
    """A claim printing a local and a global significance but no trials: the number of
    independent trials the pair implies under Sidak's rule, N = log(1 - p_global) /
    log(1 - p_local), over the printed digits (N falls as the local p falls and rises
    with the global p, so the box's ends are its ends).  Nothing is compared, so the
    finding is for information; a global significance above the local one implies fewer
    than one trial and is flagged."""
    sig = claim.significance
    local = _local(claim) if (sig.p_value is not None or sig.sigma is not None) else None
    if local is None:
        yield Finding("skip", "A global significance is printed without the local one; needs "
                      "significance.sigma or p_value to say how many trials they imply.",
                      details={"missing": ["significance.sigma"]}, statement="needs_inputs")
        return
    lp, sigma, origin = local
    sided = sig.sided
    g = sig.global_sigma
    tol = claim.tolerance
    glp = tuple(sorted(log_p_from_sigma(z, sided) for z in g.bounds))
    bounded = origin == "printed p_value" and sig.p_value.is_upper_bound
    if bounded:  # "p < x": the local significance is bounded from below only
        lp, sigma = (-math.inf, lp[1]), (sigma[0], math.inf)
    # the fewest trials: the largest local p with the smallest global p; the most: the reverse
    fewest = sidak_trials(lp[1], glp[0])
    most = sidak_trials(lp[0], glp[1]) if lp[0] > -math.inf else math.inf
    # the Bonferroni ratio at the printed central values (from the printed p when there is one)
    if origin == "printed p_value":
        lp_mid = math.log(sig.p_value.value) if sig.p_value.value > 0 else lp[1]
    elif origin == "printed sigma":
        lp_mid = log_p_from_sigma(sig.sigma.value, sided)
    else:
        lp_mid = (lp[0] + lp[1]) / 2 if lp[0] > -math.inf else lp[1]
    ratio = log_p_from_sigma(g.value, sided) - lp_mid
    bonferroni = math.exp(ratio) if ratio < 709.0 else math.inf
    at_centre = sidak_trials(lp_mid, log_p_from_sigma(g.value, sided)) if lp_mid > -math.inf else math.inf
    details = {"method": "sidak", "sided": sided, "local_from": origin, "local_sigma_low": sigma[0],
               "local_sigma_high": sigma[1], "global_sigma_low": g.low, "global_sigma_high": g.high,
               "trials_low": fewest, "trials_high": most if math.isfinite(most) else None,
               "bonferroni_trials": bonferroni if math.isfinite(bonferroni) else None,
               "trials_central": at_centre if math.isfinite(at_centre) else None, "tolerance": tol}
    words = (f"{_trials_text(fewest)}" if math.isclose(fewest, most, rel_tol=1e-9) else
             f"at least {_trials_text(fewest)}" if math.isinf(most) else
             f"{_trials_text(fewest)} to {_trials_text(most)}")
    about = {"field": g.path, "statement": "implied_trials", "printed": Shown.of(g),
             "recomputed_range": Span(fewest, most), "tolerance": tol, "reported": g.value}
    pair = (f"The printed local {_span(sigma)} sigma ({origin}) and global {g.text} sigma "
            f"({sided}-sided)")
    if most < 1.0 and above(g, sigma[1], tol):
        yield Finding("fail", f"{pair} imply {words} trials under Sidak's rule: a global significance above "
                      "the local one, which no look-elsewhere correction gives.", recomputed=most,
                      details=details, **about)
        return
    yield Finding("info", f"{pair} imply {words} effective independent trials under Sidak's rule, "
                  f"N = log(1 - p_global)/log(1 - p_local) (the Bonferroni ratio p_global/p_local is "
                  f"{'at least ' if bounded else ''}{_trials_text(bonferroni)}); state the number of configurations examined (trials) so "
                  "the correction can be checked.",
                  recomputed=fewest if math.isinf(most) else (fewest + most) / 2, details=details, **about)


def check(claim: Claim) -> Iterator[Finding]:
    sig = claim.significance
    if claim.trials is None and sig.upcrossings is None and sig.global_sigma is not None:
        yield from _implied_trials(claim)
        return
    if claim.trials is None and sig.upcrossings is None:
        yield Finding("skip", "No look-elsewhere correction to check; needs trials or upcrossings.",
                      details={"missing": ["trials", "upcrossings"]}, statement="needs_inputs")
        return
    if sig.upcrossings is not None and sig.upcrossing_sigma is None:
        yield Finding("skip", "Upcrossings are given without the reference level; needs "
                      "significance.upcrossing_sigma.", details={"missing": ["significance.upcrossing_sigma"]},
                      statement="needs_inputs")
        if claim.trials is None:
            return
    local = _local(claim)
    if local is None:
        yield Finding("skip", "No local significance to correct; needs significance.sigma or p_value "
                      "(or threshold and errors).", details={"missing": ["significance.sigma"]},
                      statement="needs_inputs")
        return
    lp, sigma, origin = local
    sided = sig.sided
    methods = _methods(claim, lp, sigma, sided)
    bounded = origin == "printed p_value" and sig.p_value.is_upper_bound
    if bounded:
        # "p < x" bounds the local significance from below only, so every global
        # value computed from x is a lower bound too.
        sigma = (sigma[0], math.inf)
        methods = {k: ((-math.inf, g[0][1]), (g[1][0], math.inf)) for k, g in methods.items()}
    primary = ("gross-vitells", sided) if ("gross-vitells", sided) in methods else ("sidak", sided)
    glp, gsigma = methods[primary]
    tol = claim.tolerance
    how = (f"{num(sig.upcrossings.value)} upcrossings at {num(sig.upcrossing_sigma.value)} sigma"
           if primary[0] == "gross-vitells" else f"{int(claim.trials.value)} trials")
    # A factor beyond the double range (a 39-sigma local p made global p ~ 1) is not worth a number.
    trials_factor = math.exp(glp[1] - lp[1]) if lp[1] > -math.inf and glp[1] - lp[1] < 700 else None
    details = {"method": primary[0], "sided": sided, "local_from": origin,
               "local_sigma_low": sigma[0], "local_sigma_high": sigma[1],
               "global_sigma_low": gsigma[0], "global_sigma_high": gsigma[1],
               "log10_global_p_high": glp[1] / math.log(10), "trials_factor": trials_factor,
               "tolerance": tol}
    if ("bonferroni", sided) in methods:
        details["bonferroni_sigma_low"] = methods[("bonferroni", sided)][1][0]
    mid = gsigma[0] if bounded else (gsigma[0] + gsigma[1]) / 2
    p_words = f"p below {p_text(glp[1])}" if bounded else f"p = {p_range_text(glp)}"
    summary = (f"local {_span(sigma)} sigma ({origin}) with {how} is global "
               f"{_span(gsigma)} sigma ({p_words}, {CORRECTION_NAMES[primary[0]]}, {sided}-sided)")
    if sig.global_sigma is not None:
        yield _printed_global(sig.global_sigma, methods, primary, summary, details, tol)
    if sig.required_sigma is not None:
        need = sig.required_sigma.value
        about = {"field": sig.required_sigma.path, "statement": "required_sigma",
                 "printed": Shown.of(sig.required_sigma), "recomputed_range": Span(*gsigma), "tolerance": tol}
        if above(sig.required_sigma, gsigma[1], tol):
            yield Finding("fail", f"After the look-elsewhere correction the claim reaches "
                          f"{span_text(gsigma)} sigma, below the required {sig.required_sigma.text}: {summary}.",
                          reported=need, recomputed=mid, details={**details, "required": need}, **about)
        elif gsigma[0] < need:
            words = (f"the printed bound on p shows {_span(gsigma)} sigma, which does not settle the required "
                     f"{sig.required_sigma.text}" if bounded else
                     f"the claim reaches {_span(gsigma)} sigma, which clears the required "
                     f"{sig.required_sigma.text} only within printed precision")
            yield Finding("warn", f"After the look-elsewhere correction {words}: {summary}.",
                          reported=need, recomputed=mid, details={**details, "required": need}, **about)
        elif sig.global_sigma is None:
            yield Finding("pass", f"The global significance clears the required "
                          f"{sig.required_sigma.text} sigma: {summary}.", reported=need, recomputed=mid,
                          details={**details, "required": need}, **about)
    elif sig.global_sigma is None:
        yield Finding("info", f"No global significance is printed; {summary}.", recomputed=mid, details=details,
                      statement="global_only", recomputed_range=Span(*gsigma), tolerance=tol)


SPEC = CheckSpec(
    id="look-elsewhere",
    title="Significance after looking at several configurations",
    run=check,
    statements={
        "global_sigma": Statement(
            question="How was the global significance obtained from the local one and the number of configurations?",
            if_reproduced=("Was the global significance obtained {reproduced}? Please name the "
                           "correction and the number of configurations it counts."),
            reproducible=True),
        "required_sigma": Statement(
            question=("How many configurations were examined before this one was reported, and does the "
                      "claim still pass once the significance is corrected for them?")),
        "global_only": ABOUT_THE_CLAIM,
        "implied_trials": Statement(
            question=("How many configurations (or how wide a scan) does the global significance count? "
                      "The printed local and global values imply the number of trials given here; a global "
                      "value above the local one needs an explanation.")),
        "needs_inputs": ABOUT_THE_CLAIM,
    },
)
