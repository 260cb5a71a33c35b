"""``raw-samples``: the printed number of samples against the rows of the data file."""

from __future__ import annotations

from typing import TYPE_CHECKING, Iterator

from ..claim.model import Claim
from ..report import Finding
from .raw_common import count_findings
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

if TYPE_CHECKING:
    from ..raw.result import RawResult


def check(claim: Claim, result: "RawResult") -> Iterator[Finding]:
    return count_findings(claim.samples, result.rows, "samples", claim.tolerance, True)


SPEC = CheckSpec(
    id="raw-samples",
    title="Printed sample count against the raw data",
    run=check,
    quotes="value",
    statements={
        "samples": Statement(question=("The raw data file holds a different number of samples from {what}. "
                                       "Are these all the data behind the claim, or were some left out, and why?")),
        "not_printed": ABOUT_THE_CLAIM,
        "not_counted": Statement(),
    },
)
