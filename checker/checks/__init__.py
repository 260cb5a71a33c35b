"""The checks, one file each, and the one registry that runs them.

A check module holds a function ``Claim -> Iterator[Finding]`` with only the
statistics and the wording, and ends with its ``SPEC`` (:class:`CheckSpec`:
id, title, the question for each statement).  :func:`run_checks` adds the
check id.  Add a check with one new file and one line in ``SPECS``.
"""

from __future__ import annotations

from typing import Iterable, Mapping

from ..claim.model import Claim
from ..report import Finding, Report
from . import bounds, error_floor, look_elsewhere, significance
from . import combination, heterogeneity, extrapolation, error_budget, interval, granularity, rates  # noqa: E402,I001
from . import comparison  # noqa: E402,I001
from .spec import CheckSpec, Statement

SPECS: tuple[CheckSpec, ...] = (
    bounds.SPEC,
    error_floor.SPEC,
    significance.SPEC,
    look_elsewhere.SPEC,
    combination.SPEC,
    heterogeneity.SPEC,
    extrapolation.SPEC,
    error_budget.SPEC,
    interval.SPEC,
    granularity.SPEC,
    rates.SPEC,
    comparison.SPEC,
)

# id -> spec, in the order above; the CLI's --only reads its keys.  A test may
# add a check of its own here (monkeypatch.setitem) and every renderer shows it.
REGISTRY: dict[str, CheckSpec] = {spec.id: spec for spec in SPECS}


def spec_for(check_id: str) -> CheckSpec | None:
    """The spec of a registered check; None for an id the registry does not know."""
    return REGISTRY.get(check_id)


def run_checks(claim: Claim, only: Iterable[str] | None = None) -> Report:
    """Run the registered checks (or the ``only`` ones) on a claim."""
    selected = list(REGISTRY) if only is None else list(only)
    findings: list[Finding] = []
    for check_id in selected:
        for finding in REGISTRY[check_id].run(claim):
            findings.append(finding.from_check(check_id))
    return Report(title=claim.title, file=claim.file, findings=tuple(findings))


__all__ = ["CheckSpec", "REGISTRY", "SPECS", "Statement", "run_checks", "spec_for"]
