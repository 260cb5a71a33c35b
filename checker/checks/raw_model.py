"""``raw-model``: does the Porter-Thomas mixture at the fitted fidelity describe
the raw data?  ``warn`` when the smallest goodness-of-fit p-value (Kolmogorov-
Smirnov, Cramer-von Mises) is below 0.01: the model the error bars lean on is
in doubt.  About the data, not one printed number.

References
----------
Porter, C. E. and Thomas, R. G. (1956), Fluctuations of nuclear reaction
widths, Phys. Rev. 104, 483 (the exponential law of x = D p); the 0.01 mark
is ours.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Iterator

from .. import wording
from ..claim.model import Claim
from ..report import Finding
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

if TYPE_CHECKING:
    from ..raw.result import RawResult

MODEL_P = 0.01


def check(claim: Claim, result: "RawResult") -> Iterator[Finding]:
    fitted = [t for t in result.goodness_of_fit if t.at == "fitted"]
    if not fitted:
        yield Finding("skip", "No goodness-of-fit test was run.", statement="not_run")
        return
    worst = min(fitted, key=lambda t: t.p_value)
    details = {t.test: {"statistic": t.statistic, "p_value": t.p_value} for t in fitted}
    details["fidelity"] = worst.fidelity
    details["samples"] = worst.samples
    text = ", ".join(f"{t.test} p = {wording.num(t.p_value, 2)}" for t in fitted)
    if worst.p_value < MODEL_P:
        yield Finding("warn", f"The Porter-Thomas mixture at the fitted fidelity {wording.num(worst.fidelity)} does "
                      f"not describe the data ({text}); error bars from that model are in doubt.",
                      recomputed=worst.p_value, details=details, statement="fit")
    else:
        yield Finding("pass", f"The Porter-Thomas mixture at the fitted fidelity {wording.num(worst.fidelity)} fits "
                      f"the data ({text}).", recomputed=worst.p_value, details=details, statement="fit")


SPEC = CheckSpec(
    id="raw-model",
    title="Porter-Thomas model of the raw data",
    run=check,
    quotes="value",
    statements={
        "fit": Statement(
            question=("The Porter-Thomas mixture does not describe the raw data at the fitted fidelity. Do the "
                      "claim's error bars rely on that model, and how were they checked against the data?"),
            about="claim"),
        "not_run": ABOUT_THE_CLAIM,
    },
)
