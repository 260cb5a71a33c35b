"""The page toolkit every HTML report is built with: one self-contained page
(no script, no outside request), its style, the status marks, tables, figures,
tiles and the verdict panel.  The claim report (:mod:`checker.render.html`),
the raw-data page (:mod:`checker.render.raw_html`) and the batch page
(:mod:`checker.render.survey_html`) all use it.

Every user-supplied string passes through :func:`html.escape`; the page also
carries a Content-Security-Policy that forbids scripts and outside requests,
so a string that escaped our escaping still could not run or fetch anything.
The same input always gives the same bytes (no dates, fixed SVG ids).
"""

from __future__ import annotations

import re
from html import escape
from typing import Any, Iterable, Sequence

from ..report import Report, tally_statuses
from ..vocabulary import CAUTION, STATUS_WORDS, TALLY_WORDS, VERDICT_SENTENCES
from .notes import one_line, summary_lines

CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'"

STYLE = """
:root {
  --ink: #1f2430; --muted: #5b6270; --faint: #c9ccd3; --paper: #fffdf8; --panel: #f3f0e8;
  --accent: #1d4f91; --fail: #a3242b; --warn: #8a5200; --pass: #1f6b4f; --skip: #5b6270; --info: #2d5f8a;
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
.cc-pass { color: var(--pass); } .cc-skip { color: var(--skip); } .cc-info { color: var(--info); }
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

SHAPES = {
    # Our marks: the shape alone tells the status apart, colour only helps.
    "fail": '<rect x="2" y="2" width="12" height="12" fill="currentColor"/>'
            '<rect x="7" y="4" width="2" height="5.5" fill="#fff"/><rect x="7" y="10.5" width="2" height="2" fill="#fff"/>',
    "warn": '<path d="M8 1.5 L15 14.5 L1 14.5 Z" fill="currentColor"/>'
            '<rect x="7.1" y="6" width="1.8" height="4.6" fill="#fff"/><rect x="7.1" y="11.4" width="1.8" height="1.8" fill="#fff"/>',
    "pass": '<circle cx="8" cy="8" r="6.5" fill="currentColor"/>'
            '<path d="M4.6 8.3 L7 10.6 L11.5 5.6" stroke="#fff" stroke-width="1.9" fill="none"/>',
    "skip": '<circle cx="8" cy="8" r="5.6" stroke="currentColor" stroke-width="1.8" fill="none"/>'
            '<rect x="5" y="7.2" width="6" height="1.6" fill="currentColor"/>',
    # for information: a diamond holding an "i" (a value recomputed, nothing printed to compare)
    "info": '<path d="M8 1 L15 8 L8 15 L1 8 Z" fill="currentColor"/>'
            '<rect x="7.1" y="7" width="1.8" height="5" fill="#fff"/><rect x="7.1" y="4.2" width="1.8" height="1.8" fill="#fff"/>',
}
VERDICT_STATUS = {"inconsistent": "fail", "consistent": "pass", "incomplete": "skip"}


def shape(status: str) -> str:
    return f'<svg viewBox="0 0 16 16" aria-hidden="true" focusable="false">{SHAPES[status]}</svg>'


def status_mark(status: str) -> str:
    """The shape and word for a status (``fail`` -> square, "flag")."""
    return f'<span class="cc-mark cc-{status}">{shape(status)}{STATUS_WORDS[status]}</span>'


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


NUMERIC = ' class="cc-n"'


def table_html(headers: Sequence[str], rows: Iterable[Sequence[Any]], caption: str | None = None,
               numeric: Iterable[int] = ()) -> str:
    """A plain table; every cell is text and escaped here."""
    numeric = set(numeric)
    head = "".join(f'<th scope="col">{escape(one_line(h))}</th>' for h in headers)
    lines = []
    for row in rows:
        cells = "".join(f'<td{NUMERIC if i in numeric else ""}>{escape(one_line(c))}</td>'
                        for i, c in enumerate(row))
        lines.append(f"<tr>{cells}</tr>")
    cap = f"<caption>{escape(one_line(caption))}</caption>" if caption else ""
    return f"<table>{cap}<thead><tr>{head}</tr></thead><tbody>{''.join(lines)}</tbody></table>"


def figure_html(svg: str, caption: str, figure_id: str, extra: str = "") -> str:
    """An inline SVG figure with a plain-text caption (escaped here); ``extra``
    is an HTML fragment (a table of the plotted numbers) placed after it."""
    return (f'<figure class="cc-figure" id="{escape(figure_id)}">\n{svg}'
            f"<figcaption>{escape(one_line(caption))}</figcaption>\n</figure>{extra}")


def verdict_panel(report: Report) -> str:
    verdict = report.verdict
    first, second = summary_lines(report)
    c = report.counts()
    tally = "".join(f"<span>{c[s]} {escape(TALLY_WORDS[s][c[s] != 1])}</span>"
                    for s in tally_statuses(c))
    return (f'<section class="cc-verdict {verdict}" id="verdict" aria-label="Verdict">'
            f'<div class="cc-big cc-{VERDICT_STATUS[verdict]}">{shape(VERDICT_STATUS[verdict])}'
            f"{escape(verdict)}</div><div class=\"cc-tally\">{tally}</div>"
            f"<p>{escape(sentence(VERDICT_SENTENCES[verdict]))}.</p>"
            f"<p>{escape(first)}</p></section>")


def sentence(text: str) -> str:
    return text[:1].upper() + text[1:]


def tile(name: str, value: str) -> str:
    return (f'<div class="cc-tile"><span class="cc-name">{escape(name)}</span>'
            f'<span class="cc-value">{escape(one_line(value))}</span></div>')


