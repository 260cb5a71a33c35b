"""claimcheck: re-derive the numbers of a benchmark claim from its own inputs.

The public face for notebooks::

    import checker
    report = checker.check("claims_examples/some_claim.yaml")
    report.verdict, report.to_frame()
"""

from __future__ import annotations

from typing import Any, Mapping

from .errors import ClaimcheckError, ClaimSchemaError, DataError, InputFileError
from .report import Finding, Report


def check(source: "str | Mapping[str, Any]", only=None) -> Report:
    """Check one claim given as a file path or a mapping of fields."""
    from .checks import run_checks
    from .claim import read_claim

    return run_checks(read_claim(source), only)


__all__ = ["check", "Report", "Finding", "ClaimcheckError", "ClaimSchemaError",
           "InputFileError", "DataError"]
