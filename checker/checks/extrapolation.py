"""``extrapolation``: headline = combined value x factor, errors propagated.

The combined value c ± s_c is the printed ``combination`` (or, when none is
printed, the stated method's combination of the parts).  With a factor
f ± s_f the headline is c f; its statistical error is |f| s_c; the factor's
own error gives the systematic error |c| s_f (``error_to: syst``, the default)
or joins the statistical error in quadrature, sqrt((f s_c)^2 + (c s_f)^2)
(``error_to: stat``).  When a printed number disagrees, the common slips are
tried: the factor divided instead of multiplied, or not applied at all; the
statistical error left unscaled; the factor's error left out, put in the other
error, or not multiplied by the combined value.

References
----------
Common practice: first-order propagation of independent errors through a
product, JCGM 100:2008, Guide to the expression of uncertainty in measurement,
eq. (10).
"""

from __future__ import annotations

import math
from typing import Iterator

from ..claim.model import Claim, Reported
from ..report import Finding, Shown, Span
from .no_estimate import no_estimate
from ..stats.precision import agrees, over_box
from .parts_summary import METHOD_WORDS, parts_summary, value_text
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

SLIP_WORDS = {
    ("factor", "divided"): "the combined value divided by the factor instead of multiplied",
    ("factor", "not applied"): "the combined value with the factor not applied",
    ("stat_error", "not scaled"): "the combined error left unscaled by the factor",
    ("stat_error", "divided"): "the combined error divided by the factor instead of multiplied",
    ("factor_error", "left out"): "what it would be with the factor's error left out",
    ("factor_error", "in stat"): "what it would be with the factor's error added to the statistical error",
    ("factor_error", "in syst"): "what it would be with the factor's error counted as systematic",
    ("factor_error", "not multiplied"): "the factor's error itself, not multiplied by the combined value",
    ("factor_error", "times headline"): "the factor's error times the headline instead of the combined value",
}


def _combined(claim: Claim):
    """(estimate value, range, error value or None, error range or None, where
    it came from, the Reported used for wording)."""
    comb = claim.combination
    summary = parts_summary(claim)
    method = comb.method if comb is not None else "inverse-variance"
    r = None
    if summary is not None:
        r = summary.methods.get(method) or summary.methods.get("equal")
    if comb is not None and comb.estimate is not None:
        err = comb.stat_error
        if err is None and r is not None and r.stat_error is not None:
            # The value is printed, its error only implied by the parts.
            return (comb.estimate.value, comb.estimate.bounds, r.stat_error, r.stat_error_range,
                    "printed (error recomputed from the parts)", comb.estimate, None)
        return (comb.estimate.value, comb.estimate.bounds, err.value if err else None,
                err.bounds if err else None, "printed", comb.estimate, err)
    if r is None:
        return None
    return (r.estimate, r.estimate_range, r.stat_error, r.stat_error_range,
            f"recomputed as {METHOD_WORDS[r.method]} of the parts", None, None)


def check(claim: Claim) -> Iterator[Finding]:
    ex = claim.extrapolation
    if ex is None:
        yield Finding("skip", "No extrapolation factor is given.", details={"missing": ["extrapolation"]},
                      statement="needs_inputs")
        return
    if claim.estimate is None:
        yield no_estimate(claim, "the extrapolated headline")
        return
    got = _combined(claim)
    if got is None:
        yield Finding("skip", "The extrapolation needs the combined value: print combination.estimate, "
                      "or give at least two parts.", details={"missing": ["combination.estimate"]},
                      statement="needs_inputs")
        return
    c, c_box, sc, sc_box, origin, c_rep, sc_rep = got
    tol = claim.tolerance
    f_rep = ex.factor
    fe_rep = ex.factor_error
    f, f_box = f_rep.value, f_rep.bounds
    fe = fe_rep.value if fe_rep is not None else 0.0
    fe_box = fe_rep.bounds if fe_rep is not None else (0.0, 0.0)
    to_stat = ex.error_to == "stat"
    c_text = c_rep.text if c_rep is not None else value_text(c, claim.estimate)
    details = {"combined": c, "combined_error": sc, "combined_from": origin, "factor": f,
               "factor_error": fe_rep.value if fe_rep else None, "error_to": ex.error_to, "tolerance": tol}

    # 1. The headline value.
    expected = over_box(lambda a, b: a * b, [c_box, f_box])
    # A factor printed as 1e-400 reads as zero: no slip divides by it.
    slips = {("factor", "divided"): over_box(lambda a, b: a / b if b else math.nan, [c_box, f_box]),
             ("factor", "not applied"): c_box}
    yield _compare(claim.estimate, "Headline", expected, c * f,
                   f"the combined {c_text} times the factor {f_rep.text}", slips, tol,
                   {**details, "quantity": "estimate"}, "estimate")

    # 2. The statistical error.
    stat = claim.stat_error
    if sc is None:
        if stat is not None:
            yield Finding("skip", "The combined value has no error to scale: print combination.stat_error "
                          "or give the parts' errors.", details={**details, "quantity": "stat_error"},
                          statement="needs_inputs")
    elif stat is not None:
        def with_factor(s, a, b, e):
            return math.hypot(b * s, a * e)

        scaled = over_box(lambda s, b: abs(b) * s, [sc_box, f_box])
        quadrature = over_box(with_factor, [sc_box, c_box, f_box, fe_box])
        expected = quadrature if to_stat else scaled
        mid = math.hypot(f * sc, c * fe) if to_stat else abs(f) * sc
        slips = {("stat_error", "not scaled"): sc_box,
                 ("stat_error", "divided"): over_box(lambda s, b: s / abs(b) if b else math.nan,
                                                           [sc_box, f_box])}
        if fe_rep is not None and fe > 0:
            if to_stat:
                slips[("factor_error", "left out")] = scaled
            else:
                slips[("factor_error", "in stat")] = quadrature
        how = (f"the combined error {sc_rep.text if sc_rep else value_text(sc, stat)} times the factor "
               f"{f_rep.text}" + (f", with the factor's error {fe_rep.text} times the combined value in "
                                  "quadrature" if to_stat and fe_rep is not None else ""))
        yield _compare(stat, "Headline stat_error", expected, mid, how, slips, tol,
                       {**details, "quantity": "stat_error"}, "stat_error")

    # 3. The systematic error the factor's own error brings.
    if fe_rep is None or to_stat or fe_rep.value <= 0:
        return
    expected = over_box(lambda a, e: abs(a) * e, [c_box, fe_box])
    mid = abs(c) * fe
    how = f"the factor's error {fe_rep.text} times the combined {c_text}"
    facts = {**details, "quantity": "syst_error", "syst_low": expected[0], "syst_high": expected[1]}
    syst = claim.syst_error
    if syst is None:
        yield Finding("fail", f"The headline prints no systematic error, yet {how} gives "
                      f"{value_text(mid, c_rep or claim.estimate)}; the factor's own error is left out.",
                      recomputed=mid, reproduced_by={"factor_error": "left out"}, details=facts,
                      statement="syst_missing", recomputed_range=Span(*expected), tolerance=tol)
        return
    about = _about(syst, "syst_error", expected, tol)
    if agrees(syst.bounds, expected, tol):
        yield Finding("pass", f"Headline syst_error {syst.text} agrees with {how}, "
                      f"{value_text(mid, syst)}.", reported=syst.value, recomputed=mid, details=facts, **about)
        return
    slips = {("factor_error", "not multiplied"): fe_box,
             ("factor_error", "times headline"): over_box(lambda a, b, e: abs(a * b) * e,
                                                          [c_box, f_box, fe_box])}
    found = _compare(syst, "Headline syst_error", expected, mid, how, slips, tol, facts, "syst_error")
    if syst.low > expected[1] and found.reproduced_by is None:
        # Larger than the factor alone gives, and no slip explains it: other
        # systematic errors may be folded in.
        found = Finding("warn", f"Headline syst_error {syst.text} is larger than {how}, "
                        f"{value_text(mid, syst)}: other systematic errors may be included that the claim "
                        "does not list.", reported=syst.value, recomputed=mid, details=facts,
                        **{**about, "statement": "syst_larger"})
    yield found


def _about(printed: Reported, statement: str, expected, tol: float) -> dict:
    return {"field": printed.path, "statement": statement, "printed": Shown.of(printed),
            "recomputed_range": Span(*expected), "tolerance": tol}


def _compare(printed: Reported, what: str, expected, mid: float, how: str, slips: dict, tol: float,
             details: dict, statement: str) -> Finding:
    about = _about(printed, statement, expected, tol)
    if agrees(printed.bounds, expected, tol):
        return Finding("pass", f"{what} {printed.text} agrees with {how}, {value_text(mid, printed)}.",
                       reported=printed.value, recomputed=mid, details=details, **about)
    for (field, slip), rng in slips.items():
        if all(math.isfinite(v) for v in rng) and agrees(printed.bounds, rng, tol):
            words = SLIP_WORDS[(field, slip)]
            return Finding("fail", f"{what} {printed.text}, but {how} gives {value_text(mid, printed)}; "
                           f"the print is {words} ({value_text((rng[0] + rng[1]) / 2, printed)}).",
                           reported=printed.value, recomputed=mid, reproduced_by={field: slip},
                           details=details, **about)
    return Finding("fail", f"{what} {printed.text}, but {how} gives {value_text(mid, printed)}; no common "
                   "slip reproduces the print.", reported=printed.value, recomputed=mid, details=details, **about)


_HOW = ("How was the headline obtained from the combined value and the extrapolation factor, "
        "and which error does the factor's uncertainty enter?")

SPEC = CheckSpec(
    id="extrapolation",
    title="From the combined value to the headline",
    run=check,
    quotes="value",
    statements={
        "estimate": Statement(question=_HOW, reproducible=True),
        "stat_error": Statement(question=_HOW, reproducible=True),
        "syst_error": Statement(question=_HOW, reproducible=True),
        "syst_missing": Statement(
            question=("The headline prints no systematic error, yet the extrapolation factor has an "
                      "uncertainty of its own. Which error does it enter, and how large is it?"),
            about="claim"),
        "syst_larger": Statement(
            question=("Which systematic errors besides the extrapolation factor's does the printed "
                      "systematic error include? Listing them would let readers follow it.")),
        "needs_inputs": ABOUT_THE_CLAIM,
        "no_estimate": ABOUT_THE_CLAIM,
    },
)
