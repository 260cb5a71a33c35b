"""What every finding must say about itself (issue 10), for the tests that
generate claims: the claim path of the printed number it is about, a
statement its check declares, and whole-claim findings that say so."""

from __future__ import annotations

from checker.checks import spec_for
from checker.checks.spec import WHOLE_CLAIM
from checker.claim.model import Reported

_MISSING = object()


def resolve(claim, path: str):
    """The value at a dotted claim path (``parts.2.estimate``); _MISSING when
    the claim has nothing there."""
    node = claim
    for key in path.split("."):
        if key.isdigit():
            index = int(key)
            if not isinstance(node, tuple) or index >= len(node):
                return _MISSING
            node = node[index]
        else:
            node = getattr(node, key, _MISSING)
        if node is _MISSING or node is None:
            return _MISSING
    return node


def problems(finding, claim) -> list[str]:
    """Everything wrong with how a finding describes itself; empty when nothing is."""
    out = []
    where = f"{finding.check}/{finding.statement or '?'} ({finding.status}): {finding.message[:80]}"
    spec = spec_for(finding.check)
    if spec is None:
        return [f"{where}: no spec for check {finding.check!r}"]
    statement = spec.statement(finding.statement)
    if statement is None:
        return [f"{where}: statement {finding.statement!r} is not declared by {finding.check}"]
    if finding.field is None:
        if statement.about != WHOLE_CLAIM:
            out.append(f"{where}: names no field, yet its statement is about one number")
    else:
        if statement.about == WHOLE_CLAIM:
            out.append(f"{where}: names field {finding.field}, yet its statement is about the whole claim")
        value = resolve(claim, finding.field)
        if value is _MISSING:
            out.append(f"{where}: field {finding.field} does not exist in the claim")
        elif isinstance(value, Reported):
            if finding.printed is None or finding.printed.text != value.text:
                out.append(f"{where}: printed {finding.printed!r} is not the claim's {value.text!r}")
            if finding.reported is not None and finding.reported != value.value:
                out.append(f"{where}: reported {finding.reported!r} is not the value of {finding.field}")
    if finding.status in ("fail", "warn") and statement.question is None:
        out.append(f"{where}: raised, but its statement has no question for the authors")
    return out
