"""The HTML report: one self-contained file, readable offline with no script.

Layout (ours): a heavy rule under the title, a verdict panel whose border
style (double, solid, dashed) carries the verdict even in greyscale, the
claim's printed numbers as tiles, each point to raise as a card with a shape
mark (square = flag, triangle = note, disc = agrees, ring = not checked), then
the pictures, each with a table of the numbers it draws.

Every user-supplied string passes through :func:`html.escape`; the page also
carries a Content-Security-Policy that forbids scripts and outside requests,
so a string that escaped our escaping still could not run or fetch anything.
The same input always gives the same bytes (no dates, fixed SVG ids).
"""

from __future__ import annotations

import math
import re
from html import escape
from typing import Any, Iterable, Mapping, Sequence

from ..claim.model import Claim, Reported
from ..report import Finding, Report
from ..vocabulary import CAUTION, COMBINATION_NAMES, STATUS_WORDS, TALLY_WORDS, VERDICT_SENTENCES
from ..wording import num
from .notes import Point, field_words, is_plain_number, one_line, points, printed_numbers, summary_lines, summary_tables

# --- page ---------------------------------------------------------------------------

CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'"

STYLE = """
:root {
  --ink: #1f2430; --muted: #5b6270; --faint: #c9ccd3; --paper: #fffdf8; --panel: #f3f0e8;
  --accent: #1d4f91; --fail: #a3242b; --warn: #8a5200; --pass: #1f6b4f; --skip: #5b6270;
}
* { box-sizing: border-box; }
html { font-size: clamp(16px, 0.55vw + 11px, 24px); }
body {
  margin: 0; background: var(--paper); color: var(--ink); line-height: 1.5;
  font-family: "DejaVu Sans", "Liberation Sans", "Helvetica Neue", Arial, sans-serif;
}
main { max-width: 62rem; margin: 0 auto; padding: 1.6rem 2rem 3rem; }
.cc-top { border-bottom: 0.3rem solid var(--ink); padding-bottom: 1.1rem; margin-bottom: 1.4rem; }
.cc-kicker { margin: 0; font-size: 0.78rem; letter-spacing: 0.14em; text-transform: uppercase;
  color: var(--muted); font-weight: bold; }
h1 { font-size: 1.9rem; line-height: 1.2; margin: 0.35rem 0 0.5rem; overflow-wrap: anywhere; }
.cc-sub { margin: 0; color: var(--muted); overflow-wrap: anywhere; }
h2 { font-size: 1.3rem; margin: 2.4rem 0 0.9rem; padding: 0.1rem 0 0.1rem 0.7rem;
  border-left: 0.45rem solid var(--accent); }
h3 { font-size: 1.08rem; margin: 0; display: flex; gap: 0.6rem; align-items: baseline; flex-wrap: wrap; }
code, .cc-value { font-family: "DejaVu Sans Mono", "Liberation Mono", Menlo, Consolas, monospace;
  font-size: 0.92em; }
nav.cc-contents { display: flex; flex-wrap: wrap; gap: 0.4rem 1.2rem; font-size: 0.9rem;
  margin: 0.9rem 0 0; padding: 0; }
nav.cc-contents a { color: var(--accent); }
.cc-verdict { display: grid; grid-template-columns: auto 1fr; gap: 0.3rem 1rem; align-items: center;
  padding: 1rem 1.3rem; margin: 0 0 0.5rem; background: var(--panel); }
.cc-verdict.inconsistent { border: 0.45rem double var(--fail); }
.cc-verdict.consistent { border: 0.2rem solid var(--pass); }
.cc-verdict.incomplete { border: 0.2rem dashed var(--skip); }
.cc-verdict .cc-big { font-size: 1.7rem; font-weight: bold; letter-spacing: 0.02em; }
.cc-verdict .cc-big svg { width: 1.6rem; height: 1.6rem; vertical-align: -0.2rem; margin-right: 0.4rem; }
.cc-verdict p { margin: 0; grid-column: 1 / -1; }
.cc-tally { display: flex; flex-wrap: wrap; gap: 0.5rem; justify-self: end; }
.cc-tally span { border: 1px solid var(--faint); background: var(--paper); padding: 0.1rem 0.6rem;
  font-size: 0.9rem; white-space: nowrap; }
.cc-mark { display: inline-flex; align-items: center; gap: 0.3rem; font-size: 0.85rem; font-weight: bold;
  text-transform: uppercase; letter-spacing: 0.08em; white-space: nowrap; }
.cc-mark svg { width: 0.95rem; height: 0.95rem; flex: none; }
.cc-fail { color: var(--fail); } .cc-warn { color: var(--warn); }
.cc-pass { color: var(--pass); } .cc-skip { color: var(--skip); }
h3.cc-group { font-size: 0.85rem; text-transform: uppercase; letter-spacing: 0.1em; color: var(--muted);
  margin: 1rem 0 0.4rem; }
.cc-tiles { display: grid; grid-template-columns: repeat(auto-fill, minmax(11rem, 1fr)); gap: 0.55rem; }
.cc-tile { background: var(--panel); padding: 0.45rem 0.7rem; border-top: 0.2rem solid var(--faint); }
.cc-tile .cc-name { display: block; font-size: 0.78rem; color: var(--muted); overflow-wrap: anywhere; }
.cc-tile .cc-value { display: block; font-size: 1.05rem; overflow-wrap: anywhere; }
table { border-collapse: collapse; margin: 0.9rem 0 0; font-size: 0.92rem; min-width: 50%; }
caption { text-align: left; font-weight: bold; padding-bottom: 0.3rem; }
th, td { text-align: left; padding: 0.3rem 0.9rem 0.3rem 0; border-bottom: 1px solid var(--faint);
  vertical-align: top; }
th { border-bottom: 2px solid var(--ink); }
td.cc-n { font-family: "DejaVu Sans Mono", "Liberation Mono", Menlo, Consolas, monospace; }
.cc-point { margin: 0 0 1.1rem; padding: 0.9rem 1.2rem; background: var(--panel); }
.cc-point.cc-fail { border-left: 0.55rem solid var(--fail); }
.cc-point.cc-warn { border-left: 0.55rem dashed var(--warn); }
.cc-point, .cc-point p, .cc-point dd { color: var(--ink); }
.cc-num { display: inline-block; min-width: 1.7rem; height: 1.7rem; line-height: 1.7rem; text-align: center;
  background: var(--ink); color: var(--paper); border-radius: 50%; font-size: 0.95rem; }
.cc-message { margin: 0.5rem 0 0.7rem; }
.cc-facts { display: grid; grid-template-columns: minmax(9rem, 13rem) 1fr; gap: 0.25rem 1rem; margin: 0; }
.cc-facts dt { color: var(--muted); font-weight: bold; }
.cc-facts dd { margin: 0; overflow-wrap: anywhere; }
.cc-field { color: var(--muted); font-size: 0.85em; }
.cc-list { list-style: none; padding: 0; margin: 0; }
.cc-list li { display: grid; grid-template-columns: 9rem 1fr; gap: 0.8rem; padding: 0.4rem 0;
  border-bottom: 1px solid var(--faint); }
.cc-list .cc-what { font-weight: bold; display: block; }
figure.cc-figure { margin: 0.4rem 0 0; padding: 0.8rem; background: var(--paper); border: 1px solid var(--faint); }
figure.cc-figure svg.cc-plot { display: block; width: 100%; height: auto; }
figcaption { margin-top: 0.6rem; color: var(--muted); font-size: 0.92rem; }
.cc-note { color: var(--muted); font-style: italic; }
footer.cc-caution { margin-top: 2.8rem; padding: 1rem 1.2rem; border: 2px solid var(--ink);
  font-size: 1rem; }
footer.cc-caution p { margin: 0; }
@media (max-width: 44rem) {
  main { padding: 1rem; } .cc-facts, .cc-list li { grid-template-columns: 1fr; }
  .cc-tally { justify-self: start; }
}
@media print {
  html { font-size: 11pt; } main { max-width: none; } nav.cc-contents { display: none; }
  .cc-point, figure.cc-figure { break-inside: avoid; }
}
"""

_SHAPES = {
    # Our marks: the shape alone tells the status apart, colour only helps.
    "fail": '<rect x="2" y="2" width="12" height="12" fill="currentColor"/>'
            '<rect x="7" y="4" width="2" height="5.5" fill="#fff"/><rect x="7" y="10.5" width="2" height="2" fill="#fff"/>',
    "warn": '<path d="M8 1.5 L15 14.5 L1 14.5 Z" fill="currentColor"/>'
            '<rect x="7.1" y="6" width="1.8" height="4.6" fill="#fff"/><rect x="7.1" y="11.4" width="1.8" height="1.8" fill="#fff"/>',
    "pass": '<circle cx="8" cy="8" r="6.5" fill="currentColor"/>'
            '<path d="M4.6 8.3 L7 10.6 L11.5 5.6" stroke="#fff" stroke-width="1.9" fill="none"/>',
    "skip": '<circle cx="8" cy="8" r="5.6" stroke="currentColor" stroke-width="1.8" fill="none"/>'
            '<rect x="5" y="7.2" width="6" height="1.6" fill="currentColor"/>',
}
_VERDICT_STATUS = {"inconsistent": "fail", "consistent": "pass", "incomplete": "skip"}


def _shape(status: str) -> str:
    return f'<svg viewBox="0 0 16 16" aria-hidden="true" focusable="false">{_SHAPES[status]}</svg>'


def status_mark(status: str) -> str:
    """The shape and word for a status (``fail`` -> square, "flag")."""
    return f'<span class="cc-mark cc-{status}">{_shape(status)}{STATUS_WORDS[status]}</span>'


def slug(text: str) -> str:
    s = re.sub(r"[^a-z0-9]+", "-", one_line(text).lower()).strip("-")
    return s or "section"


def html_page(title: str, sections: Sequence[tuple[str, str] | tuple[str, str, str]],
              subtitle: str | None = None, banner: str = "", kicker: str = "claimcheck report",
              footer: str = CAUTION) -> str:
    """A whole self-contained page in our layout.

    Parameters
    ----------
    title : str
        Plain text (escaped here).
    sections : sequence of (heading, html fragment) or (heading, html fragment, id)
        Headings are plain text (escaped here); fragments are HTML the caller
        has already built with every user string escaped.  The id defaults to
        the heading in lower case with dashes.
    subtitle : str, optional
        Plain text under the title (escaped here).
    banner : str
        An HTML fragment shown under the title (the verdict panel).
    kicker : str
        The small line above the title (plain text).
    footer : str
        Plain text for the closing caution.

    Returns
    -------
    str
        The HTML document, ending in a newline.
    """
    seen: set[str] = set()
    body, contents = [], []
    for entry in sections:
        heading, fragment = entry[0], entry[1]
        ident = entry[2] if len(entry) > 2 else slug(heading)
        base, n = ident, 2
        while ident in seen:
            ident, n = f"{base}-{n}", n + 1
        seen.add(ident)
        contents.append(f'<a href="#{escape(ident)}">{escape(one_line(heading))}</a>')
        body.append(f'<section id="{escape(ident)}">\n<h2>{escape(one_line(heading))}</h2>\n'
                    f'{fragment}\n</section>')
    nav = f'<nav class="cc-contents" aria-label="Contents">{"".join(contents)}</nav>' if contents else ""
    sub = f'<p class="cc-sub">{escape(one_line(subtitle))}</p>\n' if subtitle else ""
    return (
        "<!DOCTYPE html>\n"
        '<html lang="en">\n<head>\n<meta charset="utf-8">\n'
        f'<meta http-equiv="Content-Security-Policy" content="{CSP}">\n'
        '<meta name="viewport" content="width=device-width, initial-scale=1">\n'
        '<meta name="generator" content="claimcheck">\n'
        f"<title>{escape(one_line(title))}</title>\n<style>{STYLE}</style>\n</head>\n<body>\n<main>\n"
        f'<header class="cc-top">\n<p class="cc-kicker">{escape(one_line(kicker))}</p>\n'
        f"<h1>{escape(one_line(title))}</h1>\n{sub}{nav}\n</header>\n"
        f"{banner}\n" + "\n".join(body) + "\n"
        f'<footer class="cc-caution" id="caution"><p>{escape(one_line(footer))}</p></footer>\n'
        "</main>\n</body>\n</html>\n"
    )


_NUMERIC = ' class="cc-n"'


def table_html(headers: Sequence[str], rows: Iterable[Sequence[Any]], caption: str | None = None,
               numeric: Iterable[int] = ()) -> str:
    """A plain table; every cell is text and escaped here."""
    numeric = set(numeric)
    head = "".join(f'<th scope="col">{escape(one_line(h))}</th>' for h in headers)
    lines = []
    for row in rows:
        cells = "".join(f'<td{_NUMERIC if i in numeric else ""}>{escape(one_line(c))}</td>'
                        for i, c in enumerate(row))
        lines.append(f"<tr>{cells}</tr>")
    cap = f"<caption>{escape(one_line(caption))}</caption>" if caption else ""
    return f"<table>{cap}<thead><tr>{head}</tr></thead><tbody>{''.join(lines)}</tbody></table>"


def figure_html(svg: str, caption: str, figure_id: str, extra: str = "") -> str:
    """An inline SVG figure with a plain-text caption (escaped here); ``extra``
    is an HTML fragment (a table of the plotted numbers) placed after it."""
    return (f'<figure class="cc-figure" id="{escape(figure_id)}">\n{svg}'
            f"<figcaption>{escape(one_line(caption))}</figcaption>\n</figure>{extra}")


# --- the claim report ------------------------------------------------------------------

def _verdict_panel(report: Report) -> str:
    verdict = report.verdict
    first, second = summary_lines(report)
    c = report.counts()
    tally = "".join(f"<span>{c[s]} {escape(TALLY_WORDS[s][c[s] != 1])}</span>"
                    for s in ("fail", "warn", "pass", "skip"))
    return (f'<section class="cc-verdict {verdict}" id="verdict" aria-label="Verdict">'
            f'<div class="cc-big cc-{_VERDICT_STATUS[verdict]}">{_shape(_VERDICT_STATUS[verdict])}'
            f"{escape(verdict)}</div><div class=\"cc-tally\">{tally}</div>"
            f"<p>{escape(_sentence(VERDICT_SENTENCES[verdict]))}.</p>"
            f"<p>{escape(first)}</p></section>")


def _sentence(text: str) -> str:
    return text[:1].upper() + text[1:]


def _tile(name: str, value: str) -> str:
    return (f'<div class="cc-tile"><span class="cc-name">{escape(name)}</span>'
            f'<span class="cc-value">{escape(one_line(value))}</span></div>')


_GROUPS = (("significance.", "Significance"), ("combination.", "Combination"),
           ("extrapolation.", "Extrapolation"))


def _claim_section(claim: Claim) -> str:
    groups: dict[str, list[str]] = {"Headline": [_tile("metric", claim.metric)]}
    for _, name in _GROUPS:
        groups[name] = []

    def place(path: str, value: str) -> None:
        for prefix, name in _GROUPS:
            if path.startswith(prefix):
                groups[name].append(_tile(path[len(prefix):], value))
                return
        groups["Headline"].append(_tile(path, value))

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


def _point_card(n: int, p: Point) -> str:
    facts = []
    if p.printed is not None:
        name = field_words(p.printed_field)
        where = f' <span class="cc-field">({escape(p.printed_field)})</span>' if p.printed_field else ""
        facts.append(("As printed", f"{escape(name) + ' ' if name else ''}<code>{escape(p.printed)}</code>{where}"))
    if p.implied is not None:
        shown = f"<code>{escape(p.implied)}</code>" if is_plain_number(p.implied) else escape(p.implied)
        facts.append(("The inputs imply", shown))
    if p.reproduced is not None:
        facts.append(("Would follow", escape(p.reproduced)))
    elif p.unmatched:
        facts.append(("Would follow", "no convention or method we tried reproduces the print"))
    if p.question:
        facts.append(("Ask the authors", escape(p.question)))
    dl = "".join(f"<dt>{escape(k)}</dt><dd>{v}</dd>" for k, v in facts)
    return (f'<article class="cc-point cc-{p.status}" id="point-{n}">'
            f'<h3><span class="cc-num">{n}</span>{escape(p.heading)} {status_mark(p.status)}</h3>'
            f'<p class="cc-message">{escape(p.message)}</p><dl class="cc-facts">{dl}</dl></article>')


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
        if claim.significance.systematics == "linear":
            width, label = width + syst, "stat_error + syst_error (added linearly)"
        else:
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


_FIGURES = (
    ("The significance picture", "section-significance", _significance_figure),
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
    raised = list(points(report, claim, ("fail", "warn")))
    if raised:
        cards = "\n".join(_point_card(n, p) for n, p in enumerate(raised, 1))
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
    skipped = list(points(report, claim, ("skip",)))
    if skipped:
        sections.append(("Not checked", _brief_list(skipped), "not-checked"))
    subtitle_bits = [f"read from {report.file}", f"metric {claim.metric}"]
    if claim.source:
        subtitle_bits.insert(0, f"source: {claim.source}")
    return html_page(claim.title, sections, subtitle=" · ".join(subtitle_bits),
                     banner=_verdict_panel(report))
