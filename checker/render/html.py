"""The HTML report of one claim: one self-contained file, readable offline with
no script, built with the page toolkit of :mod:`checker.render.page`.

Layout (ours): a heavy rule under the title, a verdict panel whose border
style (double, solid, dashed) carries the verdict even in greyscale, the
claim's printed numbers as tiles, each point to raise as a card with a shape
mark (square = flag, triangle = note, disc = agrees, ring = not checked), then
the pictures, each with a table of the numbers it draws.

Every user-supplied string passes through :func:`html.escape` (the page's
Content-Security-Policy is the second guard).  The same input always gives the
same bytes (no dates, fixed SVG ids).
"""

from __future__ import annotations

import math
from html import escape
from typing import Any, Iterable, Mapping

from ..claim.model import Claim, Reported
from ..report import Finding, Report
from ..vocabulary import COMBINATION_NAMES
from ..wording import num
from .notes import (Point, SharedPoint, field_words, is_plain_number, one_line, points, printed_numbers,
                    raised_points, summary_tables)
from .page import figure_html, html_page, status_mark, table_html, tile, verdict_panel

_GROUPS = (("significance.", "Significance"), ("combination.", "Combination"),
           ("extrapolation.", "Extrapolation"), ("baseline.", "Baseline"), ("comparison.", "Comparison"),
           ("counts_table.", "Counts table"), ("rates.", "Rates"))


def _claim_section(claim: Claim) -> str:
    groups: dict[str, list[str]] = {"Headline": [tile("metric", claim.metric)]}
    for _, name in _GROUPS:
        groups[name] = []

    def place(path: str, value: str) -> None:
        for prefix, name in _GROUPS:
            if path.startswith(prefix):
                groups[name].append(tile(path[len(prefix):], value))
                return
        groups["Headline"].append(tile(path, value))

    for r in printed_numbers(claim):
        if not r.path.startswith(("parts.", "error_budget.")):
            place(r.path or "value", r.text)
    s = claim.significance
    for key in ("sided", "systematics", "error_at"):
        if key in s.stated:
            place(f"significance.{key}", getattr(s, key))
    if claim.combination is not None:
        place("combination.method", claim.combination.method)
    if claim.extrapolation is not None:
        place("extrapolation.error_to", claim.extrapolation.error_to)
    out = [f'<h3 class="cc-group">{escape(name)}</h3><div class="cc-tiles">{"".join(tiles)}</div>'
           for name, tiles in groups.items() if tiles]
    if claim.parts:
        out.append(table_html(
            ["part", "estimate", "stat_error", "samples", "circuits"],
            [[p.label] + [_text(v) for v in (p.estimate, p.stat_error, p.samples, p.circuits)]
             for p in claim.parts], caption=f"Parts ({len(claim.parts)}), as printed",
            numeric=(1, 2, 3, 4)))
    if claim.error_budget:
        out.append(table_html(
            ["component", "count", "error", "error_sd"],
            [[b.name] + [_text(v) for v in (b.count, b.error, b.error_sd)] for b in claim.error_budget],
            caption="Error budget, as printed", numeric=(1, 2, 3)))
    return "\n".join(out)


def _text(rep: Reported | None) -> str:
    return rep.text if rep is not None else "–"


def _fact_pairs(p: Point) -> list[tuple[str, str]]:
    facts = []
    if p.printed is not None:
        name = field_words(p.printed_field)
        where = f' <span class="cc-field">({escape(p.printed_field)})</span>' if p.printed_field else ""
        facts.append(("As printed", f"{escape(name) + ' ' if name else ''}<code>{escape(p.printed)}</code>{where}"))
    if p.implied is not None:
        shown = f"<code>{escape(p.implied)}</code>" if is_plain_number(p.implied) else escape(p.implied)
        facts.append(("The inputs imply", shown))
    return facts


def _dl(facts: list[tuple[str, str]]) -> str:
    return "".join(f"<dt>{escape(k)}</dt><dd>{v}</dd>" for k, v in facts)


def _point_card(n: int, p: Point) -> str:
    facts = _fact_pairs(p)
    if p.reproduced is not None:
        facts.append(("Would follow", escape(p.reproduced)))
    elif p.unmatched:
        facts.append(("Would follow", "no convention or method we tried reproduces the print"))
    if p.question:
        facts.append(("Ask the authors", escape(p.question)))
    return (f'<article class="cc-point cc-{p.status}" id="point-{n}">'
            f'<h3><span class="cc-num">{n}</span>{escape(p.heading)} {status_mark(p.status)}</h3>'
            f'<p class="cc-message">{escape(p.message)}</p><dl class="cc-facts">{_dl(facts)}</dl></article>')


def _shared_card(n: int, s: SharedPoint) -> str:
    """One slip that explains several findings: one card, what it explains, one question."""
    named = len({p.heading for p in s.members}) > 1
    items = "".join(
        f"<li>{status_mark(p.status)}<span>"
        + (f'<span class="cc-what">{escape(p.heading)}</span>' if named else "")
        + f'{escape(p.message)}<dl class="cc-facts">{_dl(_fact_pairs(p))}</dl></span></li>'
        for p in s.members)
    facts = [("Would follow", escape(s.reproduced)), ("Ask the authors", escape(s.question))]
    return (f'<article class="cc-point cc-{s.status}" id="point-{n}">'
            f'<h3><span class="cc-num">{n}</span>{escape(s.heading)} {status_mark(s.status)}</h3>'
            f'<p class="cc-message">{escape(s.opening)}</p><ul class="cc-list">{items}</ul>'
            f'<dl class="cc-facts">{_dl(facts)}</dl></article>')


def _brief_list(items: Iterable[Point]) -> str:
    rows = [f"<li>{status_mark(p.status)}<span><span class=\"cc-what\">{escape(p.heading)}</span>"
            f"{escape(p.message)}</span></li>" for p in items]
    return f'<ul class="cc-list">{"".join(rows)}</ul>'


def _findings(report: Report, check: str) -> list[Finding]:
    return [f for f in report.findings if f.check == check]


def _is_num(x: Any) -> bool:
    return isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x)


def _significance_figure(report: Report, claim: Claim) -> str | None:
    from .figures import significance_svg

    found = _findings(report, "significance")
    if not found or all(f.status == "skip" for f in found):
        return None
    if claim.threshold is None or claim.stat_error is None or not claim.stat_error.value > 0:
        return None
    if claim.estimate is None:
        return None
    sig = claim.significance
    width, label = claim.stat_error.value, "stat_error"
    syst = claim.syst_error.value if claim.syst_error is not None else None
    if any(f.details.get("syst_in_error") for f in found) and syst:
        # The check says the systematic error entered the significance: the null drawn is that wide.
        width, label = math.hypot(width, syst), "stat_error and syst_error in quadrature"
    recomputed = None
    for f in found:
        r = f.recomputed_range
        if (f.statement in ("sigma_vs_inputs", "inputs_only") and r is not None and r.scale == "linear"
                and _is_num(r.low) and _is_num(r.high)):
            recomputed = (r.low, r.high)
            break
    printed = sig.sigma.value if sig.sigma is not None else None
    svg = significance_svg(claim.estimate.value, claim.threshold.value, width,
                           stat_error=claim.stat_error.value, syst_error=syst, printed_sigma=printed,
                           recomputed_sigma=recomputed,
                           mirror=sig.sided == "two" and claim.estimate.value < claim.threshold.value,
                           width_label=label, estimate_text=claim.estimate.text,
                           threshold_text=claim.threshold.text, error_text=claim.stat_error.text,
                           syst_text=claim.syst_error.text if claim.syst_error is not None else None)
    rows = [["estimate", claim.estimate.text, "as printed"],
            ["threshold", claim.threshold.text, "as printed"],
            [label, claim.stat_error.text if label == "stat_error" else num(width), "width of the null drawn"]]
    if sig.sigma is not None:
        rows.append(["sigma", sig.sigma.text, "as printed"])
    if recomputed is not None:
        rows.append(["sigma", f"{num(recomputed[0])} to {num(recomputed[1])}",
                     "recomputed under the stated convention"])
    if sig.p_value is not None:
        rows.append(["p-value", sig.p_value.text, "as printed"])
    caption = (f"The null distribution: a Gaussian centred on the threshold with width {label}. "
               "The dot is the estimate with its error bar; the dashed line marks the printed sigma "
               "and the hatched band the recomputed range, each placed that many widths from the threshold"
               + (" (the claim divides by the error at the threshold; the width drawn is the "
                  "printed one)" if sig.error_at == "threshold" else "") + ".")
    return figure_html(svg, caption, "figure-significance",
                       table_html(["quantity", "value", "from"], rows, numeric=(1,)))




def _forest_figure(report: Report, claim: Claim) -> str | None:
    from .figures import forest_svg

    main = next((f for f in _findings(report, "combination") if f.details.get("summary") is True), None)
    if main is None or not claim.parts:
        return None
    d = main.details
    methods = d.get("methods")
    stated = d.get("method") or (claim.combination.method if claim.combination else None)
    combined, rows = [], []
    if isinstance(methods, Mapping):
        for key, value in methods.items():
            if not isinstance(value, Mapping) or not _is_num(value.get("estimate")):
                continue
            err = value.get("stat_error") if _is_num(value.get("stat_error")) else None
            label = COMBINATION_NAMES.get(key, one_line(key))
            combined.append((label, value["estimate"], err, key == stated))
            rows.append([label + (" (stated)" if key == stated else ""), num(value["estimate"]), num(err)])
    printed = None
    pd = d.get("printed")
    if isinstance(pd, Mapping) and _is_num(pd.get("estimate")):
        printed = (pd["estimate"], pd.get("stat_error") if _is_num(pd.get("stat_error")) else None)
    elif claim.combination is not None and claim.combination.estimate is not None:
        c = claim.combination
        printed = (c.estimate.value, c.stat_error.value if c.stat_error is not None else None)
    if printed is not None:
        rows.append(["as printed", num(printed[0]), num(printed[1])])
    parts = [(p.label, p.estimate.value, p.stat_error.value if p.stat_error is not None else None)
             for p in claim.parts]
    svg = forest_svg(parts, combined, printed)
    caption = ("Each part with one standard error (dots), each combination method's result (diamonds; "
               "filled for the method the claim states) and the printed combination (square, dashed line).")
    extra = table_html(["combination", "estimate", "stat_error"], rows, numeric=(1, 2),
                       caption="Combined values")
    het = next((f for f in _findings(report, "heterogeneity") if "Q" in f.details), None)
    if het is not None:
        h = het.details
        names = [("Q", "Cochran's Q"), ("df", "degrees of freedom"), ("p_Q", "p-value of Q"),
                 ("I2", "I²"), ("H", "H (Birge ratio)"), ("scale_factor", "scale factor"),
                 ("tau2", "between-part variance tau²")]
        extra += table_html(["quantity", "value"],
                            [[label, f"{num(100 * h[key], 3)}%" if key == "I2" and _is_num(h[key])
                              else num(h.get(key))] for key, label in names if key in h],
                            caption="Agreement between the parts", numeric=(1,))
    return figure_html(svg, caption, "figure-forest", extra)


def _budget_figure(report: Report, claim: Claim) -> str | None:
    from .figures import budget_svg

    main = next((f for f in _findings(report, "error-budget")
                 if isinstance(f.details.get("components"), (list, tuple))), None)
    if main is None:
        return None
    d = main.details
    comps, rows = [], []
    for c in d["components"]:
        if not isinstance(c, Mapping) or not _is_num(c.get("survival")):
            continue
        comps.append((one_line(c.get("name", "")), c["survival"]))
        rows.append([one_line(c.get("name", "")), num(c.get("count")), num(c.get("error")), num(c["survival"])])
    if not comps or not _is_num(d.get("predicted")):
        return None
    measured = d.get("measured") if _is_num(d.get("measured")) else None
    sd = d.get("predicted_sd") if _is_num(d.get("predicted_sd")) else None
    expo = d.get("predicted_exponential") if _is_num(d.get("predicted_exponential")) else None
    svg = budget_svg(comps, d["predicted"], sd, measured, expo,
                     measured_text=claim.estimate.text if claim.estimate and measured == claim.estimate.value
                     else None)
    rows.append(["predicted (product)", "", "", num(d["predicted"]) + (f" ± {num(sd)}" if sd else "")])
    if measured is not None:
        shown = claim.estimate.text if claim.estimate and measured == claim.estimate.value else num(measured)
        rows.append(["measured (estimate)", "", "", shown])
    if _is_num(d.get("ratio")):
        rows.append(["measured / predicted", "", "", num(d["ratio"])])
    caption = ("What each component leaves surviving, (1 - error) to the power count, on a log axis "
               "running down from 1, so each bar's length is that component's share of the loss. "
               "The shaded band spans a factor of 2 either side of the prediction.")
    return figure_html(svg, caption, "figure-budget",
                       table_html(["component", "count", "error", "surviving"], rows, numeric=(1, 2, 3)))


def _comparison_figure(report: Report, claim: Claim) -> str | None:
    """Both estimates with their errors and the difference with its error, from the central
    values the comparison check found (its first finding's ``details["central"]``)."""
    from .figures import comparison_svg

    d = next((f.details["central"] for f in _findings(report, "comparison")
              if isinstance(f.details.get("central"), Mapping)), None)
    if d is None or not all(_is_num(d.get(k)) for k in ("estimate", "baseline", "difference")):
        return None

    def err(key):
        return d[key] if _is_num(d.get(key)) else None

    c = claim.comparison
    printed = None
    if c is not None and c.difference is not None:
        printed = (c.difference.value, c.difference_error.value if c.difference_error is not None else None)
    how = one_line(d.get("error_from", ""))
    svg = comparison_svg(("estimate", d["estimate"], err("estimate_error")),
                         (one_line(d.get("baseline_label", "baseline")), d["baseline"], err("baseline_error")),
                         (d["difference"], err("difference_error")), printed, f"recomputed ({how})")
    rows = [["estimate", claim.estimate.text, num(err("estimate_error"))],
            [one_line(d.get("baseline_label", "baseline")), claim.baseline.estimate.text, num(err("baseline_error"))],
            [f"difference, recomputed ({how})", num(d["difference"]), num(err("difference_error"))]]
    if printed is not None:
        rows.append(["difference, as printed", c.difference.text,
                     c.difference_error.text if c.difference_error is not None else ""])
    if _is_num(d.get("sigma")):
        rows.append(["sigma of the difference, recomputed", num(d["sigma"]), ""])
    caption = ("Left: the estimate and the baseline, each with one standard error (printed, or for a "
               "proportion from its samples). Right: their difference with its error as recomputed "
               + ("from the discordant counts" if how == "paired" else "with both errors in quadrature"
                  if how == "unpaired" else "(no error without discordant counts)")
               + (", the printed difference above it" if printed else "") + ", and a dashed line at zero.")
    return figure_html(svg, caption, "figure-comparison",
                       table_html(["quantity", "value", "standard error"], rows, numeric=(1, 2)))


_FIGURES = (
    ("The significance picture", "section-significance", _significance_figure),
    ("The estimate against its baseline", "section-comparison", _comparison_figure),
    ("The parts and their combination", "section-forest", _forest_figure),
    ("Error budget against the measured value", "section-budget", _budget_figure),
)


def render_html(report: Report, claim: Claim) -> str:
    """The HTML report for one claim: verdict, the claim as printed, every
    finding, and the pictures the findings allow.

    Parameters
    ----------
    report : Report
    claim : Claim

    Returns
    -------
    str
        A self-contained HTML document; the same input always gives the same bytes.
    """
    sections: list[tuple[str, str, str]] = [("What the claim prints", _claim_section(claim), "claim")]
    raised = raised_points(report, claim)
    if raised:
        cards = "\n".join(_shared_card(n, p) if isinstance(p, SharedPoint) else _point_card(n, p)
                          for n, p in enumerate(raised, 1))
        sections.append(("Points to raise with the authors", cards, "points"))
    for heading, ident, build in _FIGURES:
        try:
            fragment = build(report, claim)
        except ValueError as exc:  # values a picture cannot show (a zero on a log axis)
            fragment = f'<p class="cc-note">This picture is left out: {escape(str(exc))}.</p>'
        if fragment:
            sections.append((heading, fragment, ident))
    for n, table in enumerate(summary_tables(report), 1):
        sections.append((table.caption, table_html(table.headers, table.rows), f"summary-{n}"))
    agreed = list(points(report, claim, ("pass",)))
    if agreed:
        sections.append(("What agrees", _brief_list(agreed), "agrees"))
    informed = list(points(report, claim, ("info",)))
    if informed:
        sections.append(("For information", _brief_list(informed), "for-information"))
    skipped = list(points(report, claim, ("skip",)))
    if skipped:
        sections.append(("Not checked", _brief_list(skipped), "not-checked"))
    subtitle_bits = [f"read from {report.file}", f"metric {claim.metric}"]
    if claim.source:
        subtitle_bits.insert(0, f"source: {claim.source}")
    return html_page(claim.title, sections, subtitle=" · ".join(subtitle_bits),
                     banner=verdict_panel(report))
