"""The JSON report, exactly per the output contract; never NaN or Infinity."""

from __future__ import annotations

import json
import math
from dataclasses import asdict
from typing import Any

from ..report import Finding, Report
from ..visible import json_safe


def clean(value: Any) -> Any:
    """Plain JSON values: non-finite floats become null, mappings dicts."""
    if isinstance(value, float):
        return value if math.isfinite(value) else None
    if isinstance(value, bool) or value is None or isinstance(value, (int, str)):
        return value
    if hasattr(value, "items"):
        return {str(k): clean(v) for k, v in value.items()}
    if isinstance(value, (list, tuple, set, frozenset)):
        return [clean(v) for v in value]
    if hasattr(value, "item"):  # numpy scalar
        return clean(value.item())
    return str(value)


def finding_to_dict(f: Finding) -> dict:
    from .notes import make_point  # the words of the referee notes: title and question

    point = make_point(f)
    return {
        "check": f.check,
        "status": f.status,
        "message": f.message,
        "reported": clean(f.reported),
        "recomputed": clean(f.recomputed),
        "reproduced_by": clean(f.reproduced_by) if f.reproduced_by else None,
        "details": clean(f.details),
        "field": f.field,
        "statement": f.statement or None,
        "printed": clean(asdict(f.printed)) if f.printed is not None else None,
        "recomputed_range": clean(asdict(f.recomputed_range)) if f.recomputed_range is not None else None,
        "tolerance": clean(f.tolerance),
        "title": point.heading,
        "question": point.question,
    }


def report_to_dict(report: Report) -> dict:
    return {
        "title": report.title,
        "file": report.file,
        "verdict": report.verdict,
        # How many findings of each status; "info" is a value recomputed where nothing was
        # printed to compare it with, counted neither as agreeing nor as checked.
        "counts": report.counts(),
        "findings": [finding_to_dict(f) for f in report.findings],
    }


def dumps(obj: Any) -> str:
    """JSON text with a trailing newline; raises if a non-finite number slipped through.
    Control characters, bidirectional overrides and lone surrogates in strings
    are written as \\u escapes (json_safe), so the text is safe on a terminal."""
    return json_safe(json.dumps(clean(obj), indent=2, allow_nan=False, ensure_ascii=False)) + "\n"


def render_json(report: Report) -> str:
    return dumps(report_to_dict(report))
