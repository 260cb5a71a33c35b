"""Terminal text: one line per finding (status, check id, one sentence), then
the verdict."""

from __future__ import annotations

from ..report import Report
from ..visible import visible

MARKS = {"pass": "  ok ", "warn": " note", "fail": "FLAG ", "skip": "  -- "}
VERDICT_WORDS = {
    "consistent": "consistent: no printed number contradicts the claim's own inputs",
    "inconsistent": "inconsistent: some printed numbers do not follow from the claim's own inputs",
    "incomplete": "incomplete: the claim gives too little to check anything",
}
CAUTION = ("A flag is a question for the authors, not proof of an error: claimcheck checks the "
           "arithmetic and the stated conventions, not the experiment.")


def render_text(report: Report) -> str:
    width = max((len(f.check) for f in report.findings), default=8)
    lines = [f"{report.title}", f"  from {report.file}", ""]
    for f in report.findings:
        label = f" [{f.details['part']}]" if "part" in f.details and f.details["part"] not in f.message else ""
        lines.append(f"{MARKS[f.status]} {f.check:<{width}}  {f.message}{label}")
    counts = report.counts()
    tally = ", ".join(f"{counts[s]} {word}" for s, word in
                      (("fail", "flagged"), ("warn", "noted"), ("pass", "agree"), ("skip", "not checked")))
    lines += ["", f"verdict: {VERDICT_WORDS[report.verdict]} ({tally})"]
    if report.verdict == "inconsistent" or counts["warn"]:
        lines.append(CAUTION)
    return visible("\n".join(lines) + "\n")  # a title or label cannot drive the terminal


def render_verdict_line(report: Report) -> str:
    counts = report.counts()
    failed = ", ".join(report.failed_checks())
    extra = f" ({failed})" if failed else ""
    return f"{report.verdict}{extra}; {counts['fail']} flagged, {counts['warn']} noted, {counts['pass']} agree\n"
