"""Surveys: a table (or folder) of claims checked at once, with the p-values
adjusted across the set."""

from .run import COLUMNS, BatchResult, run_batch

__all__ = ["COLUMNS", "BatchResult", "run_batch"]
