"""``raw-rerun``: every claim check again, on the data's own numbers.

:func:`claim_with_raw_numbers` returns the claim with the raw estimate, error
and counts in place of the printed ones, each rounded to the digits the claim
printed it with; the claim checks run on it and each finding is marked
(:func:`with_raw_label`), keeping its own check id and statement.  When the
headline is extrapolated from the measured value there is no raw headline to
put in its place, and the check says so (a skip of its own).
"""

from __future__ import annotations

import math
from dataclasses import replace
from typing import TYPE_CHECKING, Iterator

from .. import wording
from ..claim.model import Claim, Reported
from ..report import Finding
from .spec import ABOUT_THE_CLAIM, CheckSpec

if TYPE_CHECKING:
    from ..raw.result import RawResult

RAW_PREFIX = "With the raw data's numbers: "


def exact(value: float, path: str) -> Reported:
    """A count or value taken as given, with no printed precision."""
    return Reported(float(value), float(value), float(value), wording.num(value, 4), path)


def like_printed(value: float, printed: Reported | None, path: str) -> Reported:
    """``value`` as the claim would have printed it: rounded to the printed
    field's last digit, with the interval those digits stand for.  Exact
    when the field is not printed."""
    if printed is None or printed.exact:
        return exact(value, path)
    step = printed.high - printed.low  # one unit in the last printed digit
    if not step > 0 or not math.isfinite(value):
        return exact(value, path)
    rounded = round(value / step) * step
    decimals = max(0, -math.floor(math.log10(step) + 1e-9))
    text = f"{rounded:.{decimals}f}" if abs(value) >= 1e-4 or value == 0 else f"{rounded:.3g}"
    return Reported(rounded, rounded - step / 2.0, rounded + step / 2.0, text, path)


def claim_with_raw_numbers(claim: Claim, result: "RawResult") -> Claim | None:
    """The claim with its estimate, error and counts taken from the data; None
    when the headline is not the raw estimate itself (an extrapolation) or the
    data give no estimate."""
    if claim.extrapolation is not None:
        return None
    head = result.headline
    if head.estimate is None:
        return None
    changes = {"estimate": like_printed(head.estimate, claim.estimate, "estimate"),
               "samples": exact(result.rows, "samples")}
    # Over several circuits the data's own error is the between-circuit one: it holds the
    # circuits' spread, which the per-sample error leaves out.
    data_error = head.extra.get("stat_error_circuits") or head.stat_error_data
    if data_error:
        changes["stat_error"] = like_printed(data_error, claim.stat_error, "stat_error")
    if result.extra.get("has_circuit", True):
        changes["circuits"] = exact(result.circuit_count, "circuits")
    return replace(claim, interval=None, **changes)


def with_raw_label(finding: Finding) -> Finding:
    """A claim-check finding computed from the raw numbers, marked as such."""
    return replace(finding, message=RAW_PREFIX + finding.message, details={**finding.details, "numbers": "raw"})


def check(claim: Claim, result: "RawResult") -> Iterator[Finding]:
    from . import run_checks  # the claim registry, which lists this module's neighbours

    substituted = claim_with_raw_numbers(claim, result)
    if substituted is None and claim.extrapolation is not None:
        yield Finding("skip", "The claim checks were not rerun on the raw numbers: the headline is "
                      "extrapolated from the measured value.", statement="extrapolated")
        return
    if substituted is None:
        yield Finding("skip", f"The claim checks were not rerun on the raw numbers: the raw data give no "
                      f"{result.metric} estimate.", statement="no_raw_estimate")
        return
    for finding in run_checks(substituted).findings:
        yield with_raw_label(finding)


SPEC = CheckSpec(
    id="raw-rerun",
    title="Claim checks on the raw data's numbers",
    run=check,
    statements={"extrapolated": ABOUT_THE_CLAIM, "no_raw_estimate": ABOUT_THE_CLAIM},
)
