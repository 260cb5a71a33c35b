"""A survey's results as one self-contained HTML page: a short summary and a
table, one row per claim.  No scripts, no outside files; every string from
the table is escaped."""

from __future__ import annotations

import math
from html import escape

from .page import CSP

from ..vocabulary import CAUTION_SHORT
from ..wording import LN10, p_text, plural
from .survey_text import frame_records, look_elsewhere_sentence, verb

_COLUMNS = (
    ("source", "source"), ("title", "claim"), ("verdict", "verdict"), ("failed_checks", "flagged checks"),
    ("sigma_printed", "sigma printed"), ("sigma_recomputed", "sigma recomputed"),
    ("p_recomputed", "p recomputed"), ("p_holm", "p Holm"), ("p_bh", "p BH"),
    ("required_sigma", "required sigma"), ("clears_required", "clears"), ("clears_holm", "after Holm"),
    ("clears_bh", "after BH"), ("look_elsewhere", "look-elsewhere"), ("sigma_global", "global sigma"),
    ("problem", "why unusable"),
)

_STYLE = """
body { font-family: system-ui, sans-serif; margin: 2em; color: #222; }
table { border-collapse: collapse; font-size: 0.9em; }
th, td { border: 1px solid #ccc; padding: 0.25em 0.5em; text-align: left; vertical-align: top; }
th { background: #f0f0f0; }
td.num { text-align: right; font-variant-numeric: tabular-nums; }
tr.inconsistent td { background: #fff1e6; }
tr.unusable td { background: #f4f4f4; color: #666; }
p.caution { font-style: italic; }
div.wide { max-width: 100%; overflow-x: auto; }
div.wide td { max-width: 30em; overflow-wrap: anywhere; }
"""


_P_COLUMNS = ("p_recomputed", "p_holm", "p_bh")


def _p(key: str, value: float, row: dict | None) -> str:
    """A p-value cell, written from its log10 column (exact where p underflows:
    1.4e-439, never 0)."""
    log10 = (row or {}).get("log10_" + key)
    if value < 1e-300 and isinstance(log10, float) and math.isfinite(log10):
        return p_text(log10 * LN10, 3)
    return f"{value:.3g}"


def _cell(key: str, value, row: dict | None = None) -> str:
    if value is None:
        return '<td></td>'
    if isinstance(value, bool):
        return f"<td>{'yes' if value else 'no'}</td>"
    if isinstance(value, float):
        if not math.isfinite(value):
            return '<td class="num"></td>'
        if key in _P_COLUMNS:
            return f'<td class="num">{escape(_p(key, value, row))}</td>'
        text = f"{value:.4g}" if key.startswith("sigma") or key == "required_sigma" else f"{value:.3g}"
        return f'<td class="num">{escape(text)}</td>'
    text = str(value)
    if key == "failed_checks":
        text = text.replace(";", ", ")
    return f"<td>{escape(text)}</td>"


def render_batch_html(frame, summary: dict) -> str:
    v = summary["verdicts"]
    clear = summary["clear_required_sigma"]
    need = summary["with_required_sigma"]
    facts = [
        f"{plural(summary['rows'], summary.get('unit', 'row'))}; {plural(summary['checked'], 'claim')} checked; "
        f"{plural(summary['unusable'], summary.get('unit', 'row'))} could not be used.",
        f"Verdicts: {v['consistent']:,} consistent, {v['inconsistent']:,} inconsistent, "
        f"{v['incomplete']:,} incomplete.",
        f"Of {plural(need, 'claim')} that {verb(need, 'state')} a required sigma, "
        f"{clear['recomputed']:,} {verb(clear['recomputed'], 'clear')} it as recomputed, "
        f"{clear['holm']:,} after Holm and {clear['bh']:,} after Benjamini-Hochberg adjustment across "
        f"{plural(summary['tested'], 'recomputed p-value')}.",
    ]
    corrected = look_elsewhere_sentence(summary)
    if corrected:
        facts.append(corrected[:1].upper() + corrected[1:] + ".")
    head = "".join(f"<th>{escape(label)}</th>" for _, label in _COLUMNS)
    body = []
    for row in frame_records(frame):
        verdict = str(row.get("verdict") or "")
        cells = "".join(_cell(key, row.get(key), row) for key, _ in _COLUMNS)
        body.append(f'<tr class="{escape(verdict, quote=True)}">{cells}</tr>')
    title = f"claimcheck batch: {summary['table']}"
    return (
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
        f'<meta http-equiv="Content-Security-Policy" content="{CSP}">\n'  # the claim reports' policy
        f"<title>{escape(title)}</title>\n<style>{_STYLE}</style>\n</head>\n<body>\n"
        f"<h1>{escape(title)}</h1>\n"
        + "".join(f"<p>{escape(f)}</p>\n" for f in facts)
        + f'<p class="caution">{escape(CAUTION_SHORT)}</p>\n'
        # A wide table scrolls inside its own box instead of running off the page; the box takes
        # the keyboard focus so that it scrolls without a mouse too.
        + '<div class="wide" role="region" aria-label="claims" tabindex="0">\n'
        + f"<table>\n<thead><tr>{head}</tr></thead>\n<tbody>\n" + "\n".join(body) + "\n</tbody>\n</table>\n</div>\n"
        + "</body>\n</html>\n"
    )
