"""The checks, one file each, and the registries that run them.

A check module holds a function ``Claim -> Iterator[Finding]`` with only the
statistics and the wording, and ends with its ``SPEC`` (:class:`CheckSpec`:
id, title, the question for each statement).  :func:`run_checks` adds the
check id.  Add a check with one new file and one line in ``SPECS``.

The raw-data checks (``claimcheck raw DATA --claim CLAIM``) are checks of the
same kind whose function takes the claim and the
:class:`~checker.raw.result.RawResult` of its data file; they are listed in
``RAW_SPECS`` and run by :func:`run_raw_checks`.  Add one with a
``checks/raw_<name>.py`` and one line in ``RAW_SPECS``.
"""

from __future__ import annotations

from typing import Iterable, Mapping

from ..claim.model import Claim
from ..report import Finding, Report
from . import bounds, error_floor, look_elsewhere, significance
from . import combination, heterogeneity, extrapolation, error_budget, interval, granularity, rates  # noqa: E402,I001
from . import comparison  # noqa: E402,I001
from . import raw_circuits, raw_error, raw_estimate, raw_model, raw_rerun, raw_samples  # noqa: E402,I001
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


# The raw-data checks, in the order they report; raw-rerun last, as it repeats
# every claim check on the data's own numbers.
RAW_SPECS: tuple[CheckSpec, ...] = (
    raw_estimate.SPEC,
    raw_error.SPEC,
    raw_samples.SPEC,
    raw_circuits.SPEC,
    raw_model.SPEC,
    raw_rerun.SPEC,
)

# id -> spec, as REGISTRY; a test may add a raw-data check of its own here too.
RAW_REGISTRY: dict[str, CheckSpec] = {spec.id: spec for spec in RAW_SPECS}


def spec_for(check_id: str) -> CheckSpec | None:
    """The spec of a registered check (claim or raw-data); None for an id
    neither registry knows."""
    spec = REGISTRY.get(check_id)
    return spec if spec is not None else RAW_REGISTRY.get(check_id)


def run_checks(claim: Claim, only: Iterable[str] | None = None) -> Report:
    """Run the registered checks (or the ``only`` ones) on a claim."""
    selected = list(REGISTRY) if only is None else list(only)
    findings: list[Finding] = []
    for check_id in selected:
        for finding in REGISTRY[check_id].run(claim):
            findings.append(finding.from_check(check_id))
    return Report(title=claim.title, file=claim.file, findings=tuple(findings))


def run_raw_checks(claim: Claim, result) -> tuple[Finding, ...]:
    """Run the registered raw-data checks on a claim and the RawResult of its
    data.  Each finding gets its check's id unless it carries one (the claim
    checks that raw-rerun repeats keep their own)."""
    findings: list[Finding] = []
    for check_id, spec in RAW_REGISTRY.items():
        for finding in spec.run(claim, result):
            findings.append(finding if finding.check else finding.from_check(check_id))
    return tuple(findings)


__all__ = ["CheckSpec", "RAW_REGISTRY", "RAW_SPECS", "REGISTRY", "SPECS", "Statement", "run_checks",
           "run_raw_checks", "spec_for"]
