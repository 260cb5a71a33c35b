"""``raw-circuits``: the printed number of circuits against the distinct
circuits of the data file (a skip when the file has no circuit column)."""

from __future__ import annotations

from typing import TYPE_CHECKING, Iterator

from ..claim.model import Claim
from ..report import Finding
from .raw_common import count_findings
from .spec import ABOUT_THE_CLAIM, CheckSpec, Statement

if TYPE_CHECKING:
    from ..raw.result import RawResult


def check(claim: Claim, result: "RawResult") -> Iterator[Finding]:
    return count_findings(claim.circuits, result.circuit_count, "circuits", claim.tolerance,
                          result.extra.get("has_circuit", True))


SPEC = CheckSpec(
    id="raw-circuits",
    title="Printed circuit count against the raw data",
    run=check,
    quotes="value",
    statements={
        "circuits": Statement(question=("The raw data file holds a different number of circuits from {what}. "
                                        "Are these all the circuits behind the claim, or were some left out, "
                                        "and why?")),
        "not_printed": ABOUT_THE_CLAIM,
        "not_counted": Statement(),
    },
)
