"""Helpers shared by the plan tests: the command line run in process."""

from __future__ import annotations

import io
import json

from checker.cli import run


def claimcheck(*argv):
    """(exit status, standard output, standard error) of ``claimcheck ARGV``."""
    out, err = io.StringIO(), io.StringIO()
    status = run(list(map(str, argv)), out, err)
    return status, out.getvalue(), err.getvalue()


def plan_json(*argv):
    """The JSON of ``claimcheck plan ARGV --json``, which must exit 0 and hold no
    NaN or Infinity."""
    status, out, err = claimcheck("plan", *argv, "--json")
    assert status == 0, err

    def refuse(token):
        raise ValueError(token)

    return json.loads(out, parse_constant=refuse)
