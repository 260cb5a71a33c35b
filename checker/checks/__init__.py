"""The checks, one file each, and the one registry that runs them.

A check is a function ``Claim -> Iterator[Finding]`` holding only the
statistics and the wording; :func:`run_checks` adds the check id.  Add a check
with one new file and one line in ``REGISTRY``.
"""

from __future__ import annotations

from typing import Callable, Iterable, Iterator

from ..claim.model import Claim
from ..report import Finding, Report
from . import bounds, error_floor, look_elsewhere, significance
from . import combination, heterogeneity, extrapolation, error_budget, interval, granularity, rates  # noqa: E402,I001

CheckFunction = Callable[[Claim], Iterator[Finding]]

REGISTRY: dict[str, CheckFunction] = {
    "bounds": bounds.check,
    "error-floor": error_floor.check,
    "significance": significance.check,
    "look-elsewhere": look_elsewhere.check,
    "combination": combination.check,
    "heterogeneity": heterogeneity.check,
    "extrapolation": extrapolation.check,
    "error-budget": error_budget.check,
    "interval": interval.check,
    "granularity": granularity.check,
    "rates": rates.check,
}


def run_checks(claim: Claim, only: Iterable[str] | None = None) -> Report:
    """Run the registered checks (or the ``only`` ones) on a claim."""
    selected = list(REGISTRY) if only is None else list(only)
    findings: list[Finding] = []
    for check_id in selected:
        for finding in REGISTRY[check_id](claim):
            findings.append(finding.from_check(check_id))
    return Report(title=claim.title, file=claim.file, findings=tuple(findings))


__all__ = ["REGISTRY", "run_checks"]
