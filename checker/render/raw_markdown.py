"""A short Markdown summary of ``claimcheck raw DATA --markdown OUT``: what
the data give, whether the Porter-Thomas model fits, the bootstrap interval,
and (with ``--claim``) the points to raise, for pasting into a referee report.

A pure function of the result; every number was computed in
:mod:`checker.raw`.  User-supplied strings go through
:func:`checker.render.markdown.md`, so they show as written.
"""

from __future__ import annotations

from typing import Sequence

from ..report import Finding, Report
from .markdown import md
from ..vocabulary import CAUTION, STATUS_WORDS
from ..wording import num, p_equals
from .notes import make_point, shared_point, slip_groups, summary_lines, title_of
from ..vocabulary import RESAMPLING_NAMES
from .raw_text import METRIC_WORDS, TEST_WORDS, visible_findings

_AT = {"fitted": "the fitted F", "threshold": "the threshold F", "zero": "F"}


def _title(f: Finding) -> str:
    """The check's title from its spec (claim or raw-data registry)."""
    title = title_of(f.check)
    return title + (" (with the raw data's numbers)" if f.details.get("numbers") == "raw" else "")


def _point_lines(n: int, group: list[Finding]) -> list[str]:
    """One point: a finding with its question, or the findings one slip
    explains, each listed, under one question."""
    if len(group) == 1:
        f = group[0]
        lines = [f"{n}. **{md(_title(f))}** ({STATUS_WORDS[f.status]}). {md(f.message)}"]
        question = make_point(f).question  # the question its check's spec owns
    else:
        s = shared_point(group)
        lines = [f"{n}. **{md(s.heading)}** ({STATUS_WORDS[s.status]}). {md(s.opening)}"]
        named = len({_title(f) for f in group}) > 1
        lines += [f"   - {md(_title(f)) + ': ' if named else ''}{md(f.message)}" for f in group]
        question = s.question
    if question:
        lines.append(f"   - Suggested question: {md(question)}")
    return lines


def render_raw_markdown(result, report: Report | Sequence[Finding] | None = None) -> str:
    """The raw-data run in a few paragraphs of Markdown.

    Parameters
    ----------
    result : RawResult
    report : Report, sequence of Finding, or None
        The findings against the claim (``--claim``).

    Returns
    -------
    str
    """
    if report is not None and not isinstance(report, Report):
        report = Report(title="", file=result.claim_file or "", findings=tuple(report))
    if report is None and result.findings is not None:
        report = Report(title="", file=result.claim_file or "", findings=tuple(result.findings))
    name = METRIC_WORDS.get(result.metric, result.metric)
    title = report.title if report is not None and report.title else f"Raw data: {result.file}"
    lines = [f"# {md(title)}", ""]
    if report is not None:
        first, second = summary_lines(report)
        lines += [md(first), md(second), ""]
    head = result.headline
    lines += ["## What the raw data give", "",
              f"From {result.rows:,} samples over {result.circuit_count:,} circuit(s) of {result.qubits} qubits "
              f"in {md(result.file)}, the {name} estimate is {num(head.estimate, 4)} ± {num(head.stat_error)} "
              f"(standard error from the metric model; {num(head.stat_error_data)} from the data's own spread).",
              ""]
    for f in result.fits:
        lines.append(f"- Fidelity fitted ({f.method}): {num(f.fidelity, 4)} ± {num(f.stat_error)}")
    for t in result.goodness_of_fit:
        lines.append(f"- {TEST_WORDS.get(t.test, t.test)} test of the Porter-Thomas mixture at "
                     f"{_AT.get(t.at, t.at)} = {num(t.fidelity, 4)}: statistic {num(t.statistic)}, "
                     f"{p_equals(t.p_value)}")
    b = result.bootstrap
    if b is not None:
        lines.append(f"- Bootstrap ({b.replicates:,} replicates, {RESAMPLING_NAMES.get(b.resampling, b.resampling)}, "
                     f"seed {b.seed}): {num(100 * b.level, 3)}% {b.interval} interval {num(b.low, 4)} to "
                     f"{num(b.high, 4)}")
    if result.fits or result.goodness_of_fit or b is not None:
        lines.append("")
    if report is not None:
        shown, _ = visible_findings(report.findings)
        raised = slip_groups(shown)  # one slip, one point, as in the claim's notes
        lines += ["## Against the claim", ""]
        for n, group in enumerate(raised, 1):
            lines += _point_lines(n, group)
        if not raised:
            lines.append("Nothing to raise.")
        passed = [f for f in shown if f.status == "pass"]
        if passed:
            lines += ["", "Agrees: " + "; ".join(md(t) for t in dict.fromkeys(_title(f) for f in passed)) + "."]
        lines += ["", md(CAUTION)]
    if result.notes:
        lines += ["", "## Notes", ""] + [f"- {md(n)}" for n in result.notes]
    return "\n".join(lines) + "\n"
