"""The wording the Markdown and HTML reports share: each finding turned into a
point a referee can raise (what was printed, what the inputs imply, what would
reproduce the print, a question for the authors).

Nothing here computes a statistic.  It reads the Finding's own fields and the
Claim's printed text, and chooses words.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Any, Iterable, Iterator, Mapping

from .. import wording
from ..visible import visible
from ..claim.model import Claim, Reported
from ..report import Finding, Report

CAUTION = ("A flag is a question for the authors, not an accusation: claimcheck re-derives the "
           "arithmetic of the printed numbers and the conventions stated with them; it says nothing "
           "about the experiment behind them.")

STATUS_WORDS = {"fail": "flag", "warn": "note", "pass": "agrees", "skip": "not checked"}

VERDICT_LINES = {
    "consistent": "consistent: every number checked follows from the claim's own inputs.",
    "inconsistent": "inconsistent: some printed numbers do not follow from the claim's own inputs.",
    "incomplete": "incomplete: the claim gives too little to check any number.",
}

# Plain-words names of the checks (ids are fixed by DESIGN.md; these titles are ours).
CHECK_TITLES = {
    "bounds": "Physical range",
    "error-floor": "Statistical error against the sampling floor",
    "significance": "Significance",
    "combination": "Combination of the parts",
    "heterogeneity": "Agreement between the parts",
    "extrapolation": "From the combined value to the headline",
    "look-elsewhere": "Significance after looking at several configurations",
    "error-budget": "Error budget against the measured value",
    "interval": "Confidence interval",
    "granularity": "Whole counts behind the printed value",
}

# Checks whose flags are about reproducing a printed number (so "nothing we tried
# reproduces it" is worth saying when reproduced_by is empty).
REPRODUCIBLE = {"significance", "look-elsewhere", "combination", "extrapolation", "interval",
                "error-floor"}

_METHOD_WORDS = {
    "equal": "with equal weights for the parts",
    "samples": "with weights in proportion to each part's samples",
    "inverse-variance": "with inverse-variance weights",
    "random-effects": "with random-effects weights (DerSimonian-Laird)",
    "paule-mandel": "with random-effects weights (Paule-Mandel)",
    "sidak": "with the Sidak correction",
    "bonferroni": "with the Bonferroni bound",
    "gross-vitells": "with the Gross-Vitells correction",
    "none": "with no correction at all",
    "wald": "with the Wald interval",
    "wilson": "with the Wilson interval",
    "clopper-pearson": "with the Clopper-Pearson interval",
    "agresti-coull": "with the Agresti-Coull interval",
    "jeffreys": "with the Jeffreys interval",
}
_SYSTEMATICS_WORDS = {
    "none": "with the systematic error left out of the significance",
    "quadrature": "with the systematic error added in quadrature",
    "marginalized": "with the p-value averaged over the systematic error (Cousins-Highland)",
}
_ERROR_AT_WORDS = {
    "estimate": "with the standard error taken at the estimate",
    "threshold": "with the standard error taken at the threshold (under the null)",
}


def num(x: Any, digits: int = 3) -> str:
    """A number as the reports print it (see checker.wording), with counts whole."""
    if isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x) \
            and float(x).is_integer() and abs(x) < 1e6 and x != 0:
        return str(int(x))  # counts read better whole: 1200, not 1.2e3
    return wording.num(float(x) if isinstance(x, int) and not isinstance(x, bool) else x, digits)


def num_range(low: Any, high: Any, digits: int = 3) -> str:
    a, b = num(low, digits), num(high, digits)
    return a if a == b else f"{a} to {b}"


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
    return found


def _part_index(claim: Claim, label: Any) -> int | None:
    for i, part in enumerate(claim.parts):
        if part.label == label:
            return i
    return None


# Where each check's reported value usually sits in the claim, most likely first.
_FIELD_HINTS = {
    "error-floor": ("stat_error",),
    "combination": ("combination.estimate", "combination.stat_error"),
    "extrapolation": ("estimate",),
    "error-budget": ("estimate",),
    "granularity": ("estimate",),
    "heterogeneity": ("combination.stat_error",),
    "interval": ("interval.low", "interval.high"),
    "look-elsewhere": ("significance.global_sigma", "significance.required_sigma"),
}
_QUANTITY_FIELDS = {
    "sigma": "significance.sigma",
    "p_value": "significance.p_value",
    "required_sigma": "significance.required_sigma",
}


def printed_for(finding: Finding, claim: Claim) -> Reported | None:
    """The printed number a finding is about, found by its field path when the
    finding names one and otherwise by its reported value."""
    numbers = printed_numbers(claim)
    by_path = {r.path: r for r in numbers}
    details = finding.details
    hints: list[str] = []
    if isinstance(details.get("field"), str):
        hints.append(details["field"])
    if details.get("quantity") in _QUANTITY_FIELDS:
        hints.append(_QUANTITY_FIELDS[details["quantity"]])
    if finding.check == "significance" and "p_from_sigma_low" in details:
        hints.append("significance.p_value")
    if finding.check == "look-elsewhere" and "required" in details:
        hints.insert(0, "significance.required_sigma")
    index = _part_index(claim, details.get("part"))
    if index is not None:
        for hint in _FIELD_HINTS.get(finding.check, ("estimate",)):
            hints.append(f"parts.{index}.{hint.split('.')[-1]}")
    hints.extend(_FIELD_HINTS.get(finding.check, ()))
    for hint in hints:
        rep = by_path.get(hint)
        if rep is not None and (finding.reported is None or rep.value == finding.reported):
            return rep
    if finding.reported is None:
        return None
    matches = [r for r in numbers if r.value == finding.reported]
    if index is not None:
        mine = [r for r in matches if r.path.startswith(f"parts.{index}.")]
        matches = mine or matches
    return matches[0] if matches else None


# --- reproduced_by in words -----------------------------------------------------

def convention_words(reproduced_by: Mapping[str, Any] | None) -> str | None:
    """``{"sided": "two"}`` -> "under the two-sided convention (both tails)", a
    phrase that reads after "computed" or "would follow"; None when there is none."""
    if not reproduced_by:
        return None
    words = []
    for key, value in reproduced_by.items():
        if key == "sided":
            tails = {"one": "one tail", "two": "both tails"}.get(value, "")
            words.append(f"under the {one_line(value)}-sided convention" + (f" ({tails})" if tails else ""))
        elif key == "systematics":
            words.append(_SYSTEMATICS_WORDS.get(value, f"with systematics {one_line(value)}"))
        elif key == "error_at":
            words.append(_ERROR_AT_WORDS.get(value, f"with the error taken at the {one_line(value)}"))
        elif key in ("method", "interval_method", "combination"):
            words.append(_METHOD_WORDS.get(value, one_line(value)))
        elif key in ("samples", "circuits", "count", "items"):
            words.append(f"with about {num(value)} {key}")
        else:
            shown = num(value) if isinstance(value, (int, float)) and not isinstance(value, bool) \
                else one_line(value)
            words.append(f"with {key.replace('_', ' ')} {shown}")
    return " and ".join(words)


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


# Where a finding's details keep the recomputed range: (low key, high key, kind).
_RANGE_KEYS = {
    ("significance", "sigma"): ("sigma_low", "sigma_high", "plain"),
    ("significance", "required_sigma"): ("sigma_low", "sigma_high", "plain"),
    ("significance", "p_value"): ("log10_p_low", "log10_p_high", "log10"),
    ("significance", "p_from_sigma"): ("p_from_sigma_low", "log10_p_from_sigma", "mixed"),
    ("error-floor", None): ("floor_low", "floor_high", "plain"),
    ("look-elsewhere", None): ("global_sigma_low", "global_sigma_high", "plain"),
}


def _implied(finding: Finding) -> str | None:
    d = finding.details
    if finding.check == "heterogeneity" and _is_number(d.get("Q")) and _is_number(d.get("df")):
        bits = [f"Cochran's Q = {num(d['Q'])} on {num(d['df'])} degrees of freedom"]
        if _is_number(d.get("p_Q")):
            bits.append(f"p = {num(d['p_Q'], 2)}")
        if _is_number(d.get("I2")):
            bits.append(f"I² = {num(100 * d['I2'], 2)}%")
        if _is_number(d.get("H")):
            bits.append(f"Birge ratio {num(d['H'])}")
        return ", ".join(bits)
    if finding.check == "error-budget" and _is_number(d.get("predicted")):
        text = f"predicted {num(d['predicted'])}"
        if _is_number(d.get("predicted_sd")):
            text += f" ± {num(d['predicted_sd'], 2)}"
        if _is_number(d.get("ratio")):
            text += f" (measured / predicted = {num(d['ratio'], 2)})"
        return text
    quantity = d.get("quantity")
    if finding.check == "significance" and "p_from_sigma_low" in d:
        quantity = "p_from_sigma"
    keys = _RANGE_KEYS.get((finding.check, quantity)) or _RANGE_KEYS.get((finding.check, None))
    if finding.check == "look-elsewhere" and "required" in d:
        keys = None  # the reported value is the requirement, not a printed result
    if keys:
        low, high, kind = d.get(keys[0]), d.get(keys[1]), keys[2]
        if _is_number(low) and _is_number(high):
            # The p-value ranges are kept as log10 so that they survive below
            # the double-precision range; shown here as plain p when they can be.
            if kind in ("log10", "mixed") and high > -300 and (kind == "mixed" or low > -300):
                high = 10.0 ** high
                low = low if kind == "mixed" else 10.0 ** low
                return num_range(low, high, 2)
            if kind == "plain":
                return num_range(low, high)
    if finding.recomputed is not None:
        return num(finding.recomputed)
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
    d = f.details
    name = field_words(field)
    what = (f"the printed {name} {printed}" if name else f"the printed {printed}") if printed else "this number"
    if f.check == "bounds":
        return (f"Could the authors confirm {what}? As printed it lies outside the range the quantity "
                "can take; is it a typo, or a different quantity from the one named?")
    if f.check == "error-floor":
        if f.status == "fail":
            return ("How was the statistical error estimated, and how many samples stand behind it? "
                    "As printed it is smaller than sampling alone allows"
                    + (f"; it would follow {reproduced}." if reproduced else "."))
        return ("What besides sampling noise does the statistical error include (drift, "
                "circuit-to-circuit spread)? A sentence on it would help readers.")
    if f.check == "significance":
        if d.get("quantity") == "required_sigma":
            return ("On what basis does the claim reach the required significance, given that the "
                    "printed estimate, threshold and errors give less?")
        if reproduced:
            return (f"Was {what} computed {reproduced}? If so, please state that convention "
                    "beside the number and use it throughout; if not, please say how it was computed.")
        return ("How was the significance computed from the estimate, the threshold and the errors? "
                "None of the conventions we tried reproduces the printed value.")
    if f.check == "look-elsewhere":
        if "required" in d:
            return ("How many configurations were examined before this one was reported, and does the "
                    "claim still pass once the significance is corrected for them?")
        if reproduced:
            return (f"Was the global significance obtained {reproduced}? Please name the "
                    "correction and the number of configurations it counts.")
        return "How was the global significance obtained from the local one and the number of configurations?"
    if f.check == "combination":
        if reproduced:
            return (f"The printed combination would follow {reproduced}, not with the method stated. "
                    "Which weights were used to combine the parts?")
        return "How were the parts combined into the printed value? No method we tried reproduces it."
    if f.check == "heterogeneity":
        return ("The parts disagree with each other more than their errors allow. Was the combined "
                "error scaled for that spread (for example by the Birge ratio, or a random-effects "
                "model), and what might make the parts differ?")
    if f.check == "extrapolation":
        return ("How was the headline obtained from the combined value and the extrapolation factor, "
                "and which error does the factor's uncertainty enter?")
    if f.check == "error-budget":
        return ("The component error model and the measured value differ by more than a factor of 2. "
                "What accounts for the difference: missing error sources, correlated errors, or a "
                "different model?")
    if f.check == "interval":
        if reproduced:
            return f"Was the interval made {reproduced}? Please name the method beside it."
        return "Which method produced the printed interval? None of the usual methods reproduces it."
    if f.check == "granularity":
        return ("How many samples or responses stand behind the printed value? No whole count gives it "
                "with the number printed.")
    if reproduced:
        return f"Was {what} obtained {reproduced}? Please say how it was computed."
    return f"Could the authors say how {what} was obtained?"


def make_point(finding: Finding, claim: Claim) -> Point:
    rep = printed_for(finding, claim)
    printed = rep.text if rep is not None else (num(finding.reported) if finding.reported is not None else None)
    field = rep.path if rep is not None else None
    reproduced = convention_words(finding.reproduced_by)
    part = finding.details.get("part")
    heading = CHECK_TITLES.get(finding.check, finding.check.replace("-", " ").capitalize())
    if part is not None and str(part) not in finding.message:
        heading += f", part {one_line(part)}"
    raised = finding.status in ("fail", "warn")
    unmatched = (finding.status == "fail" and reproduced is None and finding.check in REPRODUCIBLE
                 and finding.reported is not None and finding.details.get("quantity") != "required_sigma"
                 and "required" not in finding.details)
    return Point(check=finding.check, status=finding.status, heading=heading,
                 message=one_line(finding.message), printed=one_line(printed) if printed else None,
                 printed_field=field, implied=_implied(finding), reproduced=reproduced,
                 question=_question(finding, reproduced, printed, field) if raised else None,
                 part=one_line(part) if part is not None else None, unmatched=unmatched)


def points(report: Report, claim: Claim, statuses: Iterable[str]) -> Iterator[Point]:
    """The report's findings with the given statuses, in report order."""
    wanted = tuple(statuses)
    for f in report.findings:
        if f.status in wanted:
            yield make_point(f, claim)


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
                 f"in {checked} {'comparison' if checked == 1 else 'comparisons'}: {_join(parts)}"
                 + (f"; {c['skip']} more could not be made for want of inputs." if c["skip"] else "."))
    verdict = report.verdict
    if verdict == "inconsistent":
        flagged = ", ".join(CHECK_TITLES.get(i, i).lower() for i in report.failed_checks())
        second = f"Verdict: inconsistent. Worth raising with the authors: {flagged}."
    elif verdict == "consistent" and c["warn"]:
        second = "Verdict: consistent, with points worth a sentence from the authors."
    elif verdict == "consistent":
        second = "Verdict: consistent. Nothing in the arithmetic needs raising."
    else:
        second = "Verdict: incomplete. The claim would need the inputs listed under 'Not checked'."
    return first, second


def _join(items: list[str]) -> str:
    if len(items) <= 1:
        return "".join(items)
    return ", ".join(items[:-1]) + " and " + items[-1]
