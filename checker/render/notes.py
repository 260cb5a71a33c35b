"""The wording the Markdown and HTML reports share: each finding turned into a
point a referee can raise (what was printed, what the inputs imply, what would
reproduce the print, a question for the authors).

Nothing here computes a statistic, and nothing here is particular to one
check: it reads the Finding's own fields (the printed number it is about, the
recomputed range, the convention that reproduces the print) and the words its
check's spec owns (title, question), and chooses the words that join them.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Any, Iterable, Iterator

from .. import wording
from ..checks import spec_for
from ..claim.model import Claim, Reported
from ..report import Finding, Report
from ..visible import visible
from ..vocabulary import convention_words
from ..wording import and_list, num, num_range

_PLAIN_NUMBER = re.compile(r"-?[0-9.]+(e-?[0-9]+)?( to -?[0-9.]+(e-?[0-9]+)?)?")


def is_plain_number(text: str) -> bool:
    """A number or a range as :func:`num` writes them ("2.46e-9", "4.54 to 4.84")."""
    return bool(_PLAIN_NUMBER.fullmatch(text))


def one_line(text: Any) -> str:
    """A user-supplied string on one line (titles and labels may hold newlines),
    with its control characters shown as escapes (checker.visible)."""
    return " ".join(visible(text).split())


# --- the claim's printed numbers ---------------------------------------------

def printed_numbers(claim: Claim) -> list[Reported]:
    """Every number the claim printed, in the order of the claim vocabulary."""
    found: list[Reported] = []

    def add(*values):
        found.extend(v for v in values if isinstance(v, Reported))

    add(claim.estimate, claim.stat_error, claim.syst_error)
    if claim.interval is not None:
        add(claim.interval.low, claim.interval.high, claim.interval.level)
    add(claim.samples, claim.circuits, claim.qubits, claim.sd, claim.threshold)
    s = claim.significance
    add(s.sigma, s.p_value, s.required_sigma, s.global_sigma, s.upcrossings, s.upcrossing_sigma)
    add(claim.trials)
    for part in claim.parts:
        add(part.estimate, part.stat_error, part.samples, part.circuits)
    if claim.combination is not None:
        add(claim.combination.estimate, claim.combination.stat_error)
    if claim.extrapolation is not None:
        add(claim.extrapolation.factor, claim.extrapolation.factor_error)
    for item in claim.error_budget:
        add(item.count, item.error, item.error_sd)
    add(claim.items)
    add(claim.observed, claim.background, claim.background_error)
    if claim.baseline is not None:
        add(claim.baseline.estimate, claim.baseline.stat_error, claim.baseline.samples)
    c = claim.comparison
    if c is not None:
        add(*(c.discordant or ()), c.difference, c.difference_error, c.sigma, c.p_value)
    t = claim.counts_table
    if t is not None:
        add(t.true_positive, t.false_positive, t.false_negative, t.true_negative)
    for rate in claim.rates:
        add(rate.value)
        if rate.interval is not None:
            add(rate.interval.low, rate.interval.high, rate.interval.level)
    return found


# --- the points a referee raises -------------------------------------------------

@dataclass(frozen=True)
class Point:
    """One finding as a referee would put it.

    ``unmatched`` is true for a flag on a printed number that no convention
    or method we tried reproduces (as opposed to a flag that is not about
    reproducing a print at all, such as parts that disagree).
    """

    check: str
    status: str
    heading: str
    message: str
    printed: str | None
    printed_field: str | None
    implied: str | None
    reproduced: str | None
    question: str | None
    part: str | None
    unmatched: bool = False


def implied_text(finding: Finding) -> str | None:
    """What the claim's inputs imply, as the check's messages quote it: the
    check's own words when its spec has them; otherwise, as its messages do,
    the recomputed range (three figures; p-values from their log10 range), or
    for a check whose messages quote one value, the recomputed value written in
    the notation of the printed number."""
    spec = spec_for(finding.check)
    if spec is not None and spec.implied is not None:
        text = spec.implied(finding)
        if text is not None:
            return text
    like_this = finding.printed.text if finding.printed is not None else None
    r = finding.recomputed_range
    quotes_range = spec is None or spec.quotes == "range"
    if r is not None and (quotes_range or finding.recomputed is None):
        if r.scale == "log10":
            # p-values kept as log10 survive below the double range; shown as
            # plain p where they can be.
            if _is_number(r.high) and r.high > -300 and (not _is_number(r.low) or r.low > -300):
                low = 10.0 ** r.low if _is_number(r.low) else 0.0
                return num_range(low, 10.0 ** r.high, 2)
            if _is_number(r.high) and _is_number(r.low):
                # below the double range: from the logs (1.4e-439, never 0)
                return wording.p_range_text((r.low * wording.LN10, r.high * wording.LN10))
        elif _is_number(r.low) and _is_number(r.high):
            return num_range(r.low, r.high)
    if finding.recomputed is not None and _is_number(finding.recomputed):
        return wording.like(finding.recomputed, like_this)
    return None


def _is_number(x: Any) -> bool:
    return isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x)


# What a field is, in words, for the questions.
FIELD_WORDS = {
    "estimate": "estimate",
    "stat_error": "statistical error",
    "syst_error": "systematic error",
    "samples": "number of samples",
    "circuits": "number of circuits",
    "threshold": "threshold",
    "significance.sigma": "significance",
    "significance.p_value": "p-value",
    "significance.required_sigma": "required significance",
    "significance.global_sigma": "global significance",
    "combination.estimate": "combined value",
    "combination.stat_error": "combined error",
    "interval.low": "interval's low end",
    "interval.high": "interval's high end",
}


def field_words(path: str | None) -> str | None:
    if not path:
        return None
    tail = path.split(".", 2)[-1] if path.startswith("parts.") else path
    return FIELD_WORDS.get(path) or FIELD_WORDS.get(tail) or tail.replace("_", " ")


def _question(f: Finding, reproduced: str | None, printed: str | None, field: str | None) -> str:
    name = field_words(field)
    what = (f"the printed {name} {printed}" if name else f"the printed {printed}") if printed else "this number"
    spec = spec_for(f.check)
    statement = spec.statement(f.statement) if spec is not None else None
    asked = statement.ask(what, reproduced) if statement is not None else None
    if asked:
        return asked
    if reproduced:
        return f"Was {what} obtained {reproduced}? Please say how it was computed."
    return f"Could the authors say how {what} was obtained?"


def title_of(check_id: str) -> str:
    """The check's title from its spec; the id in words for a check no registry knows."""
    spec = spec_for(check_id)
    return spec.title if spec is not None else check_id.replace("-", " ").capitalize()


def make_point(finding: Finding, claim: Claim | None = None) -> Point:
    """One finding as a point; everything comes from the finding and its
    check's spec (``claim`` is accepted for callers that have it)."""
    printed = finding.printed.quoted if finding.printed is not None else None
    field = finding.field
    reproduced = convention_words(finding.reproduced_by)
    part = finding.details.get("part")
    heading = title_of(finding.check)
    if part is not None and str(part) not in finding.message:
        heading += f", part {one_line(part)}"
    raised = finding.status in ("fail", "warn")
    spec = spec_for(finding.check)
    statement = spec.statement(finding.statement) if spec is not None else None
    unmatched = (finding.status == "fail" and reproduced is None and printed is not None
                 and statement is not None and statement.reproducible)
    return Point(check=finding.check, status=finding.status, heading=heading,
                 message=one_line(finding.message), printed=one_line(printed) if printed else None,
                 printed_field=field, implied=implied_text(finding), reproduced=reproduced,
                 question=_question(finding, reproduced, printed, field) if raised else None,
                 part=one_line(part) if part is not None else None, unmatched=unmatched)


def points(report: Report, claim: Claim | None, statuses: Iterable[str]) -> Iterator[Point]:
    """The report's findings with the given statuses, in report order."""
    wanted = tuple(statuses)
    for f in report.findings:
        if f.status in wanted:
            yield make_point(f, claim)


# --- one slip, one point ---------------------------------------------------------

@dataclass(frozen=True)
class SharedPoint:
    """Several flags or notes that one slip explains: findings of the claim (of
    the same part, or all about the headline) whose ``reproduced_by`` names the
    same convention or method, such as a two-sided p printed under a one-sided
    claim, which both the sigma-vs-p and the p-vs-inputs comparisons flag.

    Attributes
    ----------
    status : str
        ``fail`` when any member is a flag, else ``warn``.
    heading : str
        The members' headings, each once.
    reproduced : str
        The convention in words ("under the two-sided convention (both tails)").
    question : str
        One question for all the members.
    opening : str
        The sentence that opens the point ("One slip explains 2 findings: ...").
    members : tuple of Point
        The points it explains, in report order.
    """

    status: str
    heading: str
    reproduced: str
    question: str
    opening: str
    members: tuple[Point, ...]


def _slip_key(finding: Finding) -> tuple | None:
    """What makes two raised findings one slip: the same convention (as data,
    not words) on the same part; None for a finding no convention reproduces."""
    if not finding.reproduced_by:
        return None
    convention = tuple(sorted((str(k), repr(v)) for k, v in finding.reproduced_by.items()))
    part = finding.details.get("part")
    return convention, None if part is None else str(part)


def slip_groups(findings: Iterable[Finding]) -> list[list[Finding]]:
    """The flags and notes among ``findings``, one list per point a referee
    raises, in order: the findings one convention explains (:func:`_slip_key`)
    together, at the place of the first of them; every other finding alone.
    The claim notes (:func:`raised_points`) and the raw-data notes both group
    through this."""
    raised = [f for f in findings if f.status in ("fail", "warn")]
    groups: dict[tuple, list[Finding]] = {}
    out: list[list[Finding]] = []
    for f in raised:
        key = _slip_key(f)
        if key is None:
            out.append([f])
        elif key in groups:
            groups[key].append(f)
        else:
            groups[key] = [f]
            out.append(groups[key])
    return out


def raised_points(report: Report, claim: Claim | None = None) -> list[Point | SharedPoint]:
    """The flags and notes as the points a referee raises, in report order, one
    point per slip (:func:`slip_groups`): findings that one convention explains
    become one :class:`SharedPoint`; every other finding is its own :class:`Point`."""
    return [make_point(g[0], claim) if len(g) == 1 else shared_point(g, claim)
            for g in slip_groups(report.findings)]


def shared_point(group: list[Finding], claim: Claim | None = None) -> SharedPoint:
    """Several findings one slip explains (a group of :func:`slip_groups`) as one point."""
    members = tuple(make_point(f, claim) for f in group)
    reproduced = members[0].reproduced or ""
    headings = list(dict.fromkeys(p.heading for p in members))
    # One question about every printed number the slip explains, each named once.
    named = []
    for p in members:
        if p.printed is None:
            continue
        name = field_words(p.printed_field)
        named.append(f"the printed {name} {p.printed}" if name else f"the printed {p.printed}")
    named = list(dict.fromkeys(named))
    what = and_list(named) if named else "these numbers"
    first = group[0]
    spec = spec_for(first.check)
    statement = spec.statement(first.statement) if spec is not None else None
    question = statement.ask(what, reproduced) if statement is not None else None
    if not question:
        question = f"Was {what} obtained {reproduced}? Please say how it was computed."
    status = "fail" if any(p.status == "fail" for p in members) else "warn"
    prints = "the print" if len({(p.printed_field, p.printed) for p in members}) == 1 else "each print"
    opening = f"One slip explains {len(members)} findings: {prints} would follow {reproduced}."
    return SharedPoint(status=status, heading=and_list(headings), reproduced=reproduced,
                       question=question, opening=opening, members=members)


def brief_passes(agreed: list[Point]) -> list[tuple[str, tuple[str, ...], tuple[str, ...] | None]]:
    """The passes briefly, one line per check: ``(label, messages, where)``.
    ``where`` is set for a check that agreed on the headline and on every part
    (the line then says where it agrees, without repeating the sentence);
    otherwise the line is the label and the messages."""
    by_check: dict[str, list[Point]] = {}
    for p in agreed:
        by_check.setdefault(p.check, []).append(p)
    lines = []
    for group in by_check.values():
        title = title_of(group[0].check)
        if len(group) == 1:
            lines.append((group[0].heading, (group[0].message,), None))
        elif all(p.part is not None for p in group[1:]) and sum(p.part is None for p in group) <= 1:
            where = ("the headline",) * (group[0].part is None) + tuple(f"part {p.part}" for p in group if p.part)
            lines.append((title, (), where))
        else:
            lines.append((title, tuple(p.message for p in group), None))
    return lines


def summary_lines(report: Report) -> tuple[str, str]:
    """The two-line summary both reports open with."""
    c = report.counts()
    checked = c["fail"] + c["warn"] + c["pass"]
    if checked == 0:
        first = (f"claimcheck could compare none of this claim's printed numbers with its inputs "
                 f"({c['skip']} {'check lacks its' if c['skip'] == 1 else 'checks lack their'} inputs).")
    else:
        parts = []
        if c["fail"]:
            parts.append(f"{c['fail']} {'does' if c['fail'] == 1 else 'do'} not follow")
        if c["warn"]:
            parts.append(f"{c['warn']} {'deserves' if c['warn'] == 1 else 'deserve'} a word from the authors")
        parts.append(f"{c['pass']} {'agrees' if c['pass'] == 1 else 'agree'}")
        first = (f"claimcheck held this claim's printed numbers against what its own inputs imply, "
                 f"in {checked} {'comparison' if checked == 1 else 'comparisons'}: {and_list(parts)}"
                 + (f"; {c['skip']} more could not be made for want of inputs." if c["skip"] else "."))
    if c.get("info"):
        first += (f" {c['info']} {'value is' if c['info'] == 1 else 'values are'} recomputed for "
                  "information, with nothing printed to compare.")
    verdict = report.verdict
    if verdict == "inconsistent":
        flagged = ", ".join(title_of(i).lower() for i in report.failed_checks())
        second = f"Verdict: inconsistent. Worth raising with the authors: {flagged}."
    elif verdict == "consistent" and c["warn"]:
        second = "Verdict: consistent, with points worth a sentence from the authors."
    elif verdict == "consistent":
        second = "Verdict: consistent. Nothing in the arithmetic needs raising."
    else:
        second = "Verdict: incomplete. The claim would need the inputs listed under 'Not checked'."
    return first, second



def summary_tables(report: Report) -> list:
    """The tables the checks make of their own findings (``CheckSpec.summary``),
    in registry order, for the reports to show."""
    from ..checks import REGISTRY

    tables = []
    for check_id, spec in REGISTRY.items():
        if spec.summary is None:
            continue
        mine = [f for f in report.findings if f.check == check_id]
        table = spec.summary(mine) if mine else None
        if table is not None:
            tables.append(table)
    return tables
