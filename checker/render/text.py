"""Terminal text: one line per finding (status, check id, one sentence), then
the verdict."""

from __future__ import annotations

from ..report import Report, tally_statuses
from ..visible import visible
from ..vocabulary import CAUTION_SHORT, COUNT_WORDS, STATUS_MARKS, verdict_line


def render_text(report: Report) -> str:
    width = max((len(f.check) for f in report.findings), default=8)
    lines = [f"{report.title}", f"  from {report.file}", ""]
    for f in report.findings:
        label = f" [{f.details['part']}]" if "part" in f.details and f.details["part"] not in f.message else ""
        lines.append(f"{STATUS_MARKS[f.status]} {f.check:<{width}}  {f.message}{label}")
    counts = report.counts()
    tally = ", ".join(f"{counts[s]} {COUNT_WORDS[s]}" for s in tally_statuses(counts))
    lines += ["", f"verdict: {verdict_line(report.verdict)} ({tally})"]
    if report.verdict == "inconsistent" or counts["warn"]:
        lines.append(CAUTION_SHORT)
    return visible("\n".join(lines) + "\n")  # a title or label cannot drive the terminal


def render_verdict_line(report: Report) -> str:
    counts = report.counts()
    failed = ", ".join(report.failed_checks())
    extra = f" ({failed})" if failed else ""
    tally = ", ".join(f"{counts[s]} {COUNT_WORDS[s]}" for s in ("fail", "warn", "pass"))
    return f"{report.verdict}{extra}; {tally}\n"
