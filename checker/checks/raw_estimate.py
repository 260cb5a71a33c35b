"""``raw-estimate``: the printed estimate against the estimate the raw data give.

``pass`` when the print reproduces the raw estimate (over the printed
precision and the claim's tolerance) or lies within one standard error of it,
``warn`` within three, ``fail`` beyond; ``reproduced_by`` names another
estimator (finite-D corrected, maximum likelihood, another metric) that
reproduces the print when the stated one does not.  With an extrapolated
headline the raw estimate is held against the printed combined value, or,
when none is printed, multiplied by the factor first.

References
----------
Common practice: a printed value against a re-derived one in units of the
latter's standard error; the one- and three-standard-error marks are ours.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, Iterator

from .. import wording
from ..claim.model import Claim
from ..report import Finding
from ..stats.precision import agrees, gap
from .raw_common import about, target
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

if TYPE_CHECKING:  # the check reads the result; it never imports the raw-data layer at run time
    from ..raw.result import RawResult

WARN_SIGMA = 3.0


def alternatives(result: "RawResult") -> dict:
    """Other estimators' values, by the name a finding would give them."""
    out = {}
    head = result.headline
    fd = head.extra.get("fidelity_finite_d")
    if fd is not None and head.estimate is not None and abs(fd - head.estimate) > 0:
        out["finite-D corrected"] = fd
    ml = result.fit("maximum-likelihood")
    if ml is not None and result.metric != "heavy-output":
        out["maximum likelihood"] = ml.fidelity
    for name, est in result.combined.items():
        if name != result.metric and est.estimate is not None and name != "heavy-output":
            out[name] = est.estimate
    return out


def check(claim: Claim, result: "RawResult") -> Iterator[Finding]:
    aim = target(claim)
    printed, factor, what = aim.estimate, aim.factor, aim.what
    head = result.headline
    tol = claim.tolerance
    if head.estimate is None:
        yield Finding("skip", f"The raw data give no {result.metric} estimate ({head.note}).",
                      statement="no_raw_estimate")
        return
    if printed is None:
        yield Finding("skip", "The claim prints no estimate to compare with the data's.", statement="not_printed")
        return
    raw = (head.estimate * factor[0], head.estimate * factor[1])
    raw = (min(raw), max(raw))
    se = head.stat_error_data or head.stat_error
    se = se * max(factor) if se else None
    mid = 0.5 * (raw[0] + raw[1])
    details = {"metric": result.metric, "compared_with": what, "raw_low": raw[0], "raw_high": raw[1],
               "raw_stat_error": se, "tolerance": tol}
    facts = {"reported": printed.value, "recomputed": mid, **about(printed, "estimate", raw[0], raw[1], tol)}
    base = f"Printed {what} {printed.text} against {wording.num(mid, 4)} from {result.rows:,} raw samples"
    if agrees(printed.bounds, raw, tol):
        yield Finding("pass", f"{base}: the data reproduce it.", details=details, **facts)
        return
    distance = gap(printed.bounds, raw)
    z = distance / se if se else math.inf
    details["standard_errors"] = z
    other = None
    for name, value in alternatives(result).items():
        iv = (value * factor[0], value * factor[1])
        if agrees(printed.bounds, (min(iv), max(iv)), tol):
            other = name
            break
    tail = f"; the {other} estimator reproduces the print" if other else ""
    reproduce = {"estimator": other} if other else None
    apart = f"{base}: {wording.num(z, 2)} standard errors apart"
    if z <= 1.0:
        yield Finding("pass", f"{apart}, within its error{tail}.", reproduced_by=reproduce, details=details, **facts)
    elif z <= WARN_SIGMA:
        yield Finding("warn", f"{apart}{tail}; are these the data behind the print?", reproduced_by=reproduce,
                      details=details, **facts)
    else:
        yield Finding("fail", f"{apart}{tail or '; no estimator tried reproduces it'}.", reproduced_by=reproduce,
                      details=details, **facts)


SPEC = CheckSpec(
    id="raw-estimate",
    title="Printed estimate against the raw data",
    run=check,
    quotes="value",
    statements={
        "estimate": Statement(
            question=("The raw data give a different value from {what}. Are these the data behind the print, "
                      "and which estimator does the claim use?"),
            if_reproduced=("The raw data reproduce {what} only {reproduced}. Is that the estimator the claim "
                           "uses? Saying so would let readers recompute it."),
            reproducible=True),
        "not_printed": ABOUT_THE_CLAIM,
        "no_raw_estimate": ABOUT_THE_CLAIM,
    },
)
