"""Shared fixtures: claim files written into a temporary folder and checked.

The folders under tests/ have no ``__init__.py``; pytest runs with
--import-mode=importlib (pyproject.toml), so helpers are fixtures here rather
than modules to import.
"""

from __future__ import annotations

import datetime
import os
import textwrap

import pytest
from hypothesis import settings

from checker.checks import run_checks
from checker.claim import read_claim

# Property tests draw the same examples on every run unless asked otherwise (profile
# "fixed", loaded by `make test` and .ci/run), so a run can never hang or fail on a lucky
# draw; every example has a deadline unless its test sets its own.  "explore" searches
# afresh, for local use: `make search`, or CLAIMCHECK_HYPOTHESIS=explore (DEVELOPERS.md).
# The hard limit on any one test is pytest-timeout's (pyproject.toml).
settings.register_profile("fixed", derandomize=True, database=None, print_blob=True,
                          deadline=datetime.timedelta(seconds=10))
settings.register_profile("explore", derandomize=False, print_blob=True,
                          deadline=datetime.timedelta(seconds=10))
settings.load_profile(os.environ.get("CLAIMCHECK_HYPOTHESIS", "fixed"))


@pytest.fixture
def write_claim(tmp_path):
    """write_claim(text, name="claim.yaml") -> Path of a claim file holding ``text``
    (dedented, so tests can indent their YAML)."""
    counter = iter(range(10**6))

    def write(text: str | bytes, name: str | None = None):
        path = tmp_path / (name or f"claim{next(counter)}.yaml")
        if isinstance(text, bytes):
            path.write_bytes(text)
        else:
            path.write_text(textwrap.dedent(text), encoding="utf-8")
        return path

    return write


@pytest.fixture
def check_claim(write_claim):
    """check_claim(text, only=None, name=None) -> Report for a claim written as ``text``."""

    def check(text: str, only=None, name: str | None = None):
        return run_checks(read_claim(write_claim(text, name)), only)

    return check


def findings_of(report, check_id, **details):
    """The findings of one check whose details contain the given items."""
    return [f for f in report.findings if f.check == check_id
            and all(f.details.get(k) == v for k, v in details.items())]


@pytest.fixture
def findings():
    return findings_of
