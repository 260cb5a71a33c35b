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


def is_about_p(f: Finding) -> bool:
    """A finding about a p-value: its printed number is one (a ``p_value``
    field) or its recomputed range is kept as log10 (the scale of p-values)."""
    field = f.field or ""
    return (field == "p_value" or field.endswith(".p_value")
            or (f.recomputed_range is not None and f.recomputed_range.scale == "log10"))


def _log10(x: Any) -> float | None:
    if isinstance(x, bool) or not isinstance(x, (int, float)) or not math.isfinite(x) or x <= 0:
        return None
    return math.log10(x)


def log10_p(f: Finding) -> tuple[float | None, dict | None]:
    """For a finding about a p-value, (log10 of the printed p, {"low", "high"}:
    log10 of both ends of the recomputed p); (None, None) for any other.  They
    keep the size of a p below the double range (1e-400), where ``reported``
    and ``recomputed`` are 0."""
    if not is_about_p(f):
        return None, None
    reported = f.printed.log10_value if f.printed is not None else None
    if reported is None:
        reported = _log10(f.reported)
    r = f.recomputed_range
    if r is not None and r.scale == "log10":
        low, high = clean(float(r.low)), clean(float(r.high))
        recomputed = {"low": low, "high": high} if low is not None or high is not None else None
    else:
        one = _log10(f.recomputed)
        recomputed = {"low": one, "high": one} if one is not None else None
    return clean(reported), recomputed


def finding_to_dict(f: Finding) -> dict:
    from .notes import make_point  # the words of the referee notes: title and question

    point = make_point(f)
    log10_reported, log10_recomputed = log10_p(f)
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
        # log10 p beside every p (issue 16): null for a finding that is not about a p-value
        "log10_reported": log10_reported,
        "log10_recomputed": log10_recomputed,
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
