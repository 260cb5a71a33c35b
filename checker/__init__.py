"""claimcheck: re-derive the numbers of a benchmark claim from its own inputs.

The public face for notebooks::

    import checker
    report = checker.check("claims_examples/some_claim.yaml")
    report.verdict, report.to_frame()
    table = checker.batch("claims_examples/survey_table.csv")   # a pandas DataFrame
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any, Mapping

from .errors import ClaimcheckError, ClaimSchemaError, DataError, InputFileError

if TYPE_CHECKING:
    from .report import Finding, Report


def __getattr__(name: str):
    # Finding and Report on first use (PEP 562): importing checker.report pulls in dataclasses
    # and inspect, a third of `claimcheck --help`'s own start-up (benchmarks/startup.py).
    if name in ("Finding", "Report"):
        from . import report

        return getattr(report, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")

# The one place the version is written: pyproject.toml reads it from here.
__version__ = "0.1.0"


def check(source: "str | Mapping[str, Any]", only=None) -> Report:
    """Check one claim given as a file path or a mapping of fields."""
    from .checks import run_checks
    from .claim import read_claim

    return run_checks(read_claim(source), only)


def batch(table, jobs: int | None = None):
    """Check every claim of a survey; one row per claim.

    Parameters
    ----------
    table : str, Path, pandas.DataFrame or list of mappings
        A CSV/TSV/Parquet table or a folder of claim files (a path), a
        DataFrame whose columns are claim fields with dots for nesting
        (``significance.sigma``), or a list of claim mappings.
    jobs : int, optional
        Worker processes (default: one for small tables, every CPU from
        2,000 claims).

    Returns
    -------
    pandas.DataFrame
        Columns ``source``, ``title``, ``verdict``, ``failed_checks``,
        ``sigma_recomputed``, ``p_recomputed``, ``p_holm``, ``p_bh``,
        ``required_sigma``, ``clears_required``, ``clears_holm``,
        ``clears_bh``, ... (see ``checker.survey.COLUMNS``).  A row that cannot
        be used has verdict ``unusable`` and the reason in ``problem``; the
        counts across the set are in ``frame.attrs["summary"]``.
    """
    from .survey import run_batch

    result = run_batch(table, jobs=jobs)
    frame = result.frame
    frame.attrs["summary"] = result.summary
    return frame


__all__ = ["__version__", "check", "batch", "Report", "Finding", "ClaimcheckError", "ClaimSchemaError",
           "InputFileError", "DataError"]
