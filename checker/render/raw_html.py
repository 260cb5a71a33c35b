"""The HTML page of ``claimcheck raw DATA --html OUT``: one self-contained
file in the layout of :mod:`checker.render.html` (same page, tables, figures
and status marks).

What it shows, in order: the verdict (with ``--claim``), the data and the
estimates re-derived from them, the goodness of fit with the histogram of
x = D p against the Porter-Thomas mixture at the fitted F and at F = 0, the
bootstrap interval with the replicates' distribution, the per-circuit table,
the findings against the claim, and the notes.

A pure function of the :class:`~checker.raw.result.RawResult` and the claim's
report: every number drawn or printed was computed in :mod:`checker.raw`;
here they are only formatted.  Every user-supplied string (the claim title,
file names, circuit labels, messages quoting them) is escaped by the helpers
or by :func:`html.escape` here.
"""

from __future__ import annotations

from html import escape
from typing import Iterable, Sequence

from ..report import Finding, Report
from .page import figure_html, html_page, status_mark, table_html, tile, verdict_panel
from ..wording import num, p_cell
from .notes import make_point, one_line, shared_point, slip_groups, title_of
from ..vocabulary import RESAMPLING_NAMES
from .raw_text import AT_WORDS, METRIC_WORDS, TEST_WORDS, visible_findings

MAX_CIRCUIT_ROWS = 500  # beyond this the table is cut; --json has them all

def _data_section(result) -> str:
    tiles = [("data file", result.file), ("samples (rows)", f"{result.rows:,}"),
             ("circuits", f"{result.circuit_count:,}"), ("qubits", f"{result.qubits} (D = 2^{result.qubits})"),
             ("headline metric", METRIC_WORDS.get(result.metric, result.metric)), ("seed", str(result.seed))]
    if result.threshold is not None:
        tiles.append(("threshold", num(result.threshold, 4)))
    out = ['<div class="cc-tiles">' + "".join(tile(n, v) for n, v in tiles) + "</div>"]
    rows = []
    for name, est in result.combined.items():
        label = METRIC_WORDS.get(name, name) + (" (headline)" if name == result.metric else "")
        if est.estimate is None:
            rows.append([label, "not computed", est.note or "", "", "", ""])
            continue
        rows.append([label, num(est.estimate, 4), num(est.stat_error), num(est.stat_error_data),
                     num(est.ratio), f"{est.samples:,}"])
    out.append(table_html(["metric", "estimate", "model error", "data error", "data / model", "samples"], rows,
                          caption="Estimates over all circuits, each with one standard error from the metric "
                                  "model and one from the data", numeric=(1, 2, 3, 4, 5)))
    head = result.headline
    extra = []
    if head.extra.get("stat_error_circuits"):
        extra.append(["error between circuits", num(head.extra["stat_error_circuits"])])
    if "fidelity_finite_d" in head.extra and result.metric != "heavy-output":
        extra.append(["finite-D corrected fidelity", num(head.extra["fidelity_finite_d"], 4)])
    if head.extra.get("stat_error_shots"):
        extra.append(["error from shots", num(head.extra["stat_error_shots"])])
    for f in result.fits:
        extra.append([f"fidelity fitted ({f.method})", f"{num(f.fidelity, 4)} ± {num(f.stat_error)}"
                      + (" (at the edge of the range; error indicative)" if f.at_boundary else "")])
    if extra:
        out.append(table_html(["headline quantity", "value"], extra,
                              caption=f"More on the headline ({METRIC_WORDS.get(result.metric, result.metric)})",
                              numeric=(1,)))
    return "\n".join(out)


def _note(text: str) -> str:
    return f'<p class="cc-note">{escape(text)}</p>'


def _fit_section(result) -> str:
    from .figures import raw_histogram_svg

    out = []
    if result.goodness_of_fit:
        size = result.goodness_of_fit[0].samples
        rows = [[AT_WORDS.get(t.at, t.at), num(t.fidelity, 4), TEST_WORDS.get(t.test, t.test),
                 num(t.statistic), p_cell(t.p_value)] for t in result.goodness_of_fit]
        out.append(table_html(["model at", "fidelity F", "test", "statistic", "p-value"], rows,
                              caption=f"Goodness of fit of x = D p to the Porter-Thomas mixture ({size:,} samples)",
                              numeric=(1, 3, 4)))
    else:
        out.append(_note("No goodness-of-fit test was run (too few samples, or --estimate-only)."))
    h = result.histogram
    if h is None:
        out.append(_note("No histogram: it needs the fits' subsample, which this run did not keep."))
        return "\n".join(out)
    curves = {f"mixture at the fitted F = {num(h.fidelity_fitted, 3)}": h.density_fitted,
              "mixture at F = 0 (no signal)": h.density_zero}
    try:
        svg = raw_histogram_svg(h.edges, h.observed_density, curves)
    except ValueError as exc:
        out.append(_note(f"The histogram is left out: {exc}."))
        return "\n".join(out)
    caption = (f"Density of x = D p in {len(h.edges) - 1} bins from {num(h.edges[0])} to {num(h.edges[-1])} "
               f"({h.samples:,} samples; {num(100 * h.beyond, 2)}% lie beyond the last bin), against the "
               "Porter-Thomas mixture at the fitted fidelity (solid) and at F = 0 (dashed). Where the "
               "signal is real the observed bars follow the solid curve and rise above the dashed one at "
               "large x.")
    out.append(figure_html(svg, caption, "figure-raw-histogram"))
    return "\n".join(out)


def _bootstrap_section(result) -> str:
    from .figures import bootstrap_svg

    b = result.bootstrap
    if b is None:
        return _note("No bootstrap was run (--bootstrap 0 or --estimate-only).")
    rows = [["interval level", f"{num(100 * b.level, 3)}%"],
            [f"{b.interval} interval", f"{num(b.low, 4)} to {num(b.high, 4)}"],
            *([["percentile interval", f"{num(b.percentile_low, 4)} to {num(b.percentile_high, 4)}"]]
              if b.interval != "percentile" else []),
            ["basic interval", f"{num(b.basic_low, 4)} to {num(b.basic_high, 4)}"],
            ["standard deviation of the replicates", num(b.sd)],
            ["replicates", f"{b.replicates:,}"],
            ["resampling", RESAMPLING_NAMES.get(b.resampling, b.resampling)],
            ["seed", str(b.seed)]]
    if b.resampling == "binned":
        rows.append(["within-bin share of the variance", num(b.within_share, 2)])
    out = [table_html(["bootstrap of the headline", "value"], rows, numeric=(1,))]
    if not b.histogram_counts:
        out.append(_note("No picture: the run kept no histogram of the replicates."))
        return "\n".join(out)
    try:
        svg = bootstrap_svg(b.histogram_edges, b.histogram_counts, b.low, b.high)
    except ValueError as exc:
        out.append(_note(f"The picture is left out: {exc}."))
        return "\n".join(out)
    caption = (f"The headline estimate in each of {b.replicates:,} bootstrap replicates; the shaded band "
               f"between dashed lines is the {num(100 * b.level, 3)}% {b.interval} interval, "
               f"{num(b.low, 4)} to {num(b.high, 4)}. The estimate from all the data is "
               f"{num(result.headline.estimate, 4)}.")
    out.append(figure_html(svg, caption, "figure-bootstrap"))
    return "\n".join(out)


def _circuit_section(result) -> str:
    rows = []
    for label, metrics in result.circuits[:MAX_CIRCUIT_ROWS]:
        m = metrics.get(result.metric)
        if m is None or m.estimate is None:
            rows.append([label, "", f"no {METRIC_WORDS.get(result.metric, result.metric)}", "", "", ""])
            continue
        rows.append([label, f"{m.samples:,}", num(m.estimate, 4), num(m.stat_error), num(m.stat_error_data),
                     num(m.ratio)])
    shown = (f"first {MAX_CIRCUIT_ROWS:,} of {result.circuit_count:,}; --json lists them all"
             if result.circuit_count > MAX_CIRCUIT_ROWS else f"{result.circuit_count:,}")
    return table_html(["circuit", "samples", "estimate", "model error", "data error", "data / model"], rows,
                      caption=f"{METRIC_WORDS.get(result.metric, result.metric)} per circuit ({shown})",
                      numeric=(1, 2, 3, 4, 5))


def _heading(f: Finding) -> str:
    """The check's title from its spec (claim or raw-data registry)."""
    title = title_of(f.check)
    if f.details.get("numbers") == "raw":
        title += " (with the raw data's numbers)"
    return title


def _card(n: int, f: Finding) -> str:
    facts = []
    if isinstance(f.reported, (int, float)):
        facts.append(("As printed", num(f.reported, 4)))
    if isinstance(f.recomputed, (int, float)):
        facts.append(("Re-derived", num(f.recomputed, 4)))
    if f.reproduced_by:
        facts.append(("Would follow", ", ".join(f"{k} = {v}" for k, v in f.reproduced_by.items())))
    question = make_point(f).question  # the question its check's spec owns
    if question:
        facts.append(("Ask the authors", question))
    dl = "".join(f"<dt>{escape(k)}</dt><dd>{escape(one_line(v))}</dd>" for k, v in facts)
    return (f'<article class="cc-point cc-{f.status}" id="finding-{n}">'
            f'<h3><span class="cc-num">{n}</span>{escape(_heading(f))} {status_mark(f.status)}</h3>'
            f'<p class="cc-message">{escape(one_line(f.message))}</p>'
            + (f'<dl class="cc-facts">{dl}</dl>' if dl else "") + "</article>")


def _shared_card(n: int, group: list[Finding]) -> str:
    """The findings one slip explains: one card, each finding listed, one question
    (the claim page's and the raw Markdown's grouping, :func:`notes.slip_groups`)."""
    s = shared_point(group)
    named = len({_heading(f) for f in group}) > 1
    items = "".join(f"<li>{status_mark(f.status)}<span>"
                    + (f'<span class="cc-what">{escape(_heading(f))}</span>' if named else "")
                    + f"{escape(one_line(f.message))}</span></li>" for f in group)
    facts = [("Would follow", s.reproduced), ("Ask the authors", s.question)]
    dl = "".join(f"<dt>{escape(k)}</dt><dd>{escape(one_line(v))}</dd>" for k, v in facts if v)
    return (f'<article class="cc-point cc-{s.status}" id="finding-{n}">'
            f'<h3><span class="cc-num">{n}</span>{escape(s.heading)} {status_mark(s.status)}</h3>'
            f'<p class="cc-message">{escape(s.opening)}</p><ul class="cc-list">{items}</ul>'
            f'<dl class="cc-facts">{dl}</dl></article>')


def _brief(findings: Iterable[Finding]) -> str:
    rows = [f"<li>{status_mark(f.status)}<span><span class=\"cc-what\">{escape(_heading(f))}</span>"
            f"{escape(one_line(f.message))}</span></li>" for f in findings]
    return f'<ul class="cc-list">{"".join(rows)}</ul>'


def _findings_section(findings: Sequence[Finding]) -> str:
    shown, same = visible_findings(findings)
    raised = slip_groups(shown)  # one slip, one point, as in the claim's notes
    rest = [f for f in shown if f.status in ("pass", "info", "skip")]
    out = []
    if raised:
        out.append("\n".join(_card(n, g[0]) if len(g) == 1 else _shared_card(n, g)
                              for n, g in enumerate(raised, 1)))
    else:
        out.append(_note("Nothing to raise: no finding is a flag or a note."))
    if rest:
        what = "Agrees, for information, or not checked" if any(f.status == "info" for f in rest) \
            else "Agrees, or not checked"
        out.append(f'<h3 class="cc-group">{what}</h3>' + _brief(rest))
    if same:
        out.append(_note(f"{same} claim check(s) rerun with the raw data's numbers say the same as with the "
                         "printed numbers and are not repeated; --json lists them."))
    return "\n".join(out)


def render_raw_html(result, report: Report | Sequence[Finding] | None = None) -> str:
    """The HTML page for one raw-data run.

    Parameters
    ----------
    result : RawResult
    report : Report, sequence of Finding, or None
        The findings against the claim (``--claim``); a Report also gives the
        page its title (the claim's).  None when no claim was given.

    Returns
    -------
    str
        A self-contained HTML document; the same input gives the same bytes.
    """
    if report is not None and not isinstance(report, Report):
        report = Report(title="", file=result.claim_file or "", findings=tuple(report))
    if report is None and result.findings is not None:
        report = Report(title="", file=result.claim_file or "", findings=tuple(result.findings))
    sections = [("The data and the estimates", _data_section(result), "data"),
                ("Does the Porter-Thomas model fit?", _fit_section(result), "goodness-of-fit"),
                ("Bootstrap interval", _bootstrap_section(result), "bootstrap"),
                ("Per circuit", _circuit_section(result), "circuits")]
    if report is not None:
        sections.append(("Against the claim", _findings_section(report.findings), "findings"))
    if result.notes:
        sections.append(("Notes", '<ul class="cc-notes">' + "".join(f"<li>{escape(one_line(n))}</li>"
                                                                     for n in result.notes) + "</ul>", "notes"))
    name = METRIC_WORDS.get(result.metric, result.metric)
    if report is not None and report.title:
        title = report.title
    else:
        title = f"Raw data re-derived: {name} from {result.file}"
    bits = [f"data {result.file}"]
    if report is not None and report.file:
        bits.append(f"claim {report.file}")
    bits.append(f"metric {name}")
    banner = verdict_panel(report) if report is not None else ""
    return html_page(title, sections, subtitle=" · ".join(bits), banner=banner,
                     kicker="claimcheck raw-data report")


__all__ = ["render_raw_html"]
