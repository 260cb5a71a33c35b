"""``heterogeneity``: do the parts agree with each other within their errors?

Cochran's Q across the parts, its p-value, I^2, H (the Birge ratio) and the
Particle Data Group scale factor S = max(1, H).  When the parts disagree
(p_Q < 0.01 however the parts' printed digits are rounded) the combined error
must allow for it: scaled by S, taken from a random-effects fit, or taken from
the parts' scatter.  A printed combined error that does none of these fails,
and the finding says what the scaled error would be.

References
----------
W. G. Cochran, Biometrics 10, 101 (1954) (from memory).
J. P. T. Higgins and S. G. Thompson, Stat. Med. 21, 1539 (2002).
Particle Data Group, Review of Particle Physics, Introduction, "Averages and
fits": S = sqrt(chi^2/(N - 1)), applied only when S > 1 (from memory).
"""

from __future__ import annotations

import math
from typing import Iterator

from ..claim.model import Claim
from ..report import Finding, Shown, Span
from ..stats.precision import agrees
from ..wording import num, p_text
from .parts_summary import METHOD_WORDS, RangeOption, parts_summary, printed_combination, value_text
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

P_LIMIT = 0.01
LOG_P_LIMIT = math.log(P_LIMIT)


def check(claim: Claim) -> Iterator[Finding]:
    if len(claim.parts) < 2:
        yield Finding("skip", "Fewer than two parts are given, so there is no scatter to measure.",
                      details={"missing": ["parts"]}, statement="needs_inputs")
        return
    summary = parts_summary(claim)
    het = summary.heterogeneity
    if het is None:
        yield Finding("skip", "Cochran's Q needs each part's stat_error (or its samples, for the "
                      "metric model to give one).", details={"missing": ["parts.stat_error"]},
                      statement="needs_inputs")
        return
    if not math.isfinite(het.q):
        yield Finding("skip", "Cochran's Q overflows: some part's stat_error is too small to weigh "
                      "against the others.", details={"missing": []}, statement="needs_inputs")
        return
    tol = claim.tolerance
    s = het.scale_factor
    details = {"Q": het.q, "df": het.df, "p_Q": het.p_q, "I2": het.i2, "H": het.h,
               "scale_factor": s, "tau2": het.tau2, "log10_p_Q": het.log_p_q / math.log(10),
               "Q_low": summary.q_range[0] if summary.q_range else None,
               "Q_high": summary.q_range[1] if summary.q_range else None, "tolerance": tol}
    stats_text = (f"Q = {num(het.q, 4)} on {het.df} degrees of freedom, p_Q = {p_text(het.log_p_q)}, "
                  f"I^2 = {het.i2 * 100:.0f}%")
    stated = claim.combination.method if claim.combination is not None else None
    base_method = stated if stated in ("equal", "samples", "inverse-variance") else "inverse-variance"
    base = summary.methods.get(base_method)
    scaled = base.scaled_error if base is not None else None
    details["scaled_error"] = scaled
    _, err = printed_combination(claim)
    log_p_high = summary.log_p_q_high if summary.log_p_q_high is not None else het.log_p_q
    if log_p_high >= LOG_P_LIMIT:
        yield Finding("pass", f"The {summary.count} parts agree within their errors ({stats_text}).",
                      reported=err.value if err else None, recomputed=scaled, details=details,
                      statement="parts_agree", tolerance=tol)
        return

    # The parts disagree: which errors allow for the scatter?
    allowing = []  # (words, value, range option): the searched ranges computed only for the one shown
    if base is not None and base.scaled_error_range is not None:
        allowing.append((f"{METHOD_WORDS[base_method]}'s error scaled by S = {s:.3g}", base.scaled_error,
                         RangeOption(fixed=base.scaled_error_range)))
    for method in ("random-effects", "paule-mandel"):
        r = summary.methods.get(method)
        if r is not None and r.stat_error is not None:
            allowing.append((f"the error of {METHOD_WORDS[method]}", r.stat_error, RangeOption(r, "stat_error")))
    if "spread" in summary.variants:
        value, rng = summary.variants["spread"]
        allowing.append(("the error from the parts' scatter", value, RangeOption(fixed=rng)))
    re_fit = summary.methods.get("random-effects")
    suggestion = (f"scaled by S = {s:.3g} it would be {value_text(scaled, err)}"
                  + (f", and a random-effects fit gives {value_text(re_fit.stat_error, err)}"
                     if re_fit is not None and re_fit.stat_error is not None else ""))
    if err is None:
        if stated in ("random-effects",):
            yield Finding("pass", f"The parts disagree ({stats_text}); the stated random-effects fit "
                          "allows for it.", recomputed=scaled, details=details, statement="no_combined_error",
                          tolerance=tol)
        else:
            yield Finding("warn", f"The parts disagree ({stats_text}) and no combined error is printed to "
                          f"judge; an error that allows for the scatter: {suggestion}.",
                          recomputed=scaled, details=details, statement="no_combined_error", tolerance=tol)
        return
    about = {"field": err.path, "printed": Shown.of(err), "tolerance": tol,
             "recomputed_range": Span(*base.scaled_error_range) if base is not None and base.scaled_error_range
             else None}
    for words, value, option in allowing:
        if option.agrees(err.bounds, tol):
            yield Finding("pass", f"The parts disagree ({stats_text}), and the printed combined error "
                          f"{err.text} allows for it: it is {words} ({value_text(value, err)}).",
                          reported=err.value, recomputed=value, details=details, statement="scatter_allowed",
                          **{**about, "recomputed_range": Span(*option.range)})
            return
    plain = next((m for m in ("inverse-variance", "samples", "equal")
                  if m in summary.methods and summary.methods[m].stat_error_range is not None
                  and agrees(err.bounds, summary.methods[m].stat_error_range, tol)), None)
    if plain is not None:
        what = f"is {METHOD_WORDS[plain]}'s error, not scaled for the scatter"
        reproduce = {"method": plain, "scaled": False}
    else:
        what = "neither is scaled for the scatter nor comes from a random-effects fit"
        reproduce = None
    yield Finding("fail", f"The parts disagree ({stats_text}), yet the printed combined error {err.text} "
                  f"{what}; {suggestion}.", reported=err.value, recomputed=scaled,
                  reproduced_by=reproduce, details=details, statement="scatter_not_allowed", **about)


def implied(finding: Finding) -> str | None:
    """Cochran's Q with its degrees of freedom, p, I^2 and the Birge ratio."""
    d = finding.details
    if not (_is_number(d.get("Q")) and _is_number(d.get("df"))):
        return None
    bits = [f"Cochran's Q = {num(d['Q'])} on {num(d['df'])} degrees of freedom"]
    if _is_number(d.get("p_Q")):
        bits.append(f"p = {num(d['p_Q'], 2)}")
    if _is_number(d.get("I2")):
        bits.append(f"I² = {num(100 * d['I2'], 2)}%")
    if _is_number(d.get("H")):
        bits.append(f"Birge ratio {num(d['H'])}")
    return ", ".join(bits)


def _is_number(x) -> bool:
    return isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x)


SPEC = CheckSpec(
    id="heterogeneity",
    title="Agreement between the parts",
    run=check,
    statements={
        "scatter_not_allowed": Statement(
            question=("The parts disagree with each other more than their errors allow. Was the combined "
                      "error scaled for that spread (for example by the Birge ratio, or a random-effects "
                      "model), and what might make the parts differ?")),
        "no_combined_error": Statement(
            question=("The parts disagree with each other more than their errors allow, and no combined "
                      "error is printed. What error do the authors give the combined value, and does it "
                      "allow for that spread?"),
            about="claim"),
        "scatter_allowed": Statement(),
        "parts_agree": ABOUT_THE_CLAIM,
        "needs_inputs": ABOUT_THE_CLAIM,
    },
    implied=implied,
)
