"""A :class:`~.assemble.Draft` written as a claim file for a person to review:
YAML in the vocabulary's order, a comment beside each field quoting the words
it came from, a ``# guess:`` line above each choice the text did not settle,
commented-out lines for the fields a check would still need, and at the end
the numbers printed twice, the numbers left out and the fields the loader
refused.

Numbers are written the way the claim loader reads them: a plain scalar in
decimal notation (``2.24e-3``, ``1200``; PyYAML 1.1 would read ``1e-3`` as
text, which the loader expects and handles), and in double quotes whenever the
text is not such a number (``"91.3%"``, ``"< 1e-5"``).
"""

from __future__ import annotations

import json
import re

from ..stats.precision import is_number_text
from .model import Draft, Field
from .normalize import printable
from .notation import Number

ORDER = ("title", "source", "metric", "qubits", "estimate", "stat_error", "syst_error", "interval",
         "samples", "circuits", "sd", "threshold", "significance", "trials", "baseline", "comparison",
         "observed", "background", "background_error", "parts", "combination", "extrapolation",
         "error_budget", "integer_data")
SECTIONS = {
    "interval": ("low", "high", "level"),
    "significance": ("sigma", "p_value", "sided", "systematics", "error_at", "required_sigma",
                     "global_sigma", "upcrossings", "upcrossing_sigma"),
    "baseline": ("label", "estimate", "stat_error", "samples"),
    "comparison": ("paired", "discordant", "difference", "difference_error", "sigma", "p_value", "sided"),
    "combination": ("method", "estimate", "stat_error"),
    "extrapolation": ("factor", "factor_error", "error_to"),
}
LISTS = {"parts": ("label", "estimate", "stat_error", "samples", "circuits"),
         "error_budget": ("name", "count", "error", "error_sd")}
COMMENT_AT = 34
TRAILER_LIMIT = 30
_PLAIN_WORD = re.compile(r"[a-z][a-z-]*")
_YAML_WORDS = {"yes", "no", "on", "off", "y", "n", "true", "false", "null"}

HEADER = (
    "# Draft claim written by claimcheck draft from {name}.",
    "# Review every field against the paper before relying on it. Each number is quoted beside it",
    "# with the words it came from (after LaTeX and Unicode clean-up); a '# guess:' line marks a",
    "# choice the text did not settle; commented-out fields are ones a check would still need.",
    "# Nothing here is computed unless a comment says so. A flag from claimcheck check on this",
    "# draft is a question for the authors, and may also mean the draft read a number wrongly.",
)


PAIRED_GUESS = ("# guess: the text does not say whether both were measured on the same items; the checks "
                "take unpaired (the default); write 'paired: true' if they were")


def scalar(value) -> str:
    """One value as the claim loader reads it."""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, Number):
        text = value.text
        if is_number_text(text) and not text.endswith("%"):
            return text
        return json.dumps(text)
    if isinstance(value, tuple):
        return "[" + ", ".join(scalar(v) for v in value) + "]"
    text = printable(str(value))
    if _PLAIN_WORD.fullmatch(text) and text not in _YAML_WORDS:
        return text
    return json.dumps(text, ensure_ascii=False)


def _quote(f: Field) -> str:
    return f'from "{printable(f.quote, 110)}"' if f.quote else ""


def _commented(head: str, comment: str) -> str:
    if not comment:
        return head
    return f"{head.ljust(COMMENT_AT - 1)} # {comment}"


def _line(indent: str, key: str, value: str, comment: str) -> str:
    return _commented(f"{indent}{key}: {value}", comment)


def _guess(indent: str, f: Field) -> list[str]:
    return [f"{indent}# guess: {printable(f.guess, 300)}"] if f.guess else []


def render_yaml(draft: Draft) -> str:
    """The draft as YAML text with comments (always one document)."""
    lines = [h.format(name=printable(draft.name, 200)) for h in HEADER]
    for note in draft.notes:
        lines.append(f"# note: {printable(note, 300)}")
    by_path = {f.path: f for f in draft.fields}
    missing = {path: why for path, why in draft.missing}
    for key in ORDER:
        if key in SECTIONS:
            lines += _section(key, draft, missing)
        elif key in LISTS:
            lines += _list(key, draft)
        elif (key,) in by_path:
            f = by_path[(key,)]
            lines += _guess("", f)
            lines.append(_line("", key, scalar(f.value), _quote(f)))
        elif (key,) in missing:
            lines.append(_commented(f"# {key}:", missing[(key,)]))
    lines += _trailer(draft)
    return "\n".join(lines) + "\n"


def _section(key: str, draft: Draft, missing: dict) -> list[str]:
    fields = {f.path[1]: f for f in draft.fields if f.path[0] == key and len(f.path) == 2}
    wanted = [(sub, why) for (head, *rest), why in missing.items() if head == key and rest for sub in rest]
    unpaired = (key == "comparison" and "paired" not in fields
                and any(f.path == ("baseline", "estimate") for f in draft.fields))
    if not fields:
        if not wanted and not unpaired:
            return []
        out = [f"# {key}:"]
        if unpaired:
            out.append("#   paired: false    " + PAIRED_GUESS)
        out += [_commented(f"#   {sub}:", why) for sub, why in wanted]
        return out
    out = [f"{key}:"]
    for sub in SECTIONS[key]:
        if sub in fields:
            f = fields[sub]
            out += _guess("  ", f)
            out.append(_line("  ", sub, scalar(f.value), _quote(f)))
    if unpaired:
        out.append("  # paired: false    " + PAIRED_GUESS)
    for sub, why in wanted:
        out.append(_commented(f"  # {sub}:", why))
    if key in ("significance", "comparison") and "sided" not in fields and ({"sigma", "p_value"} & set(fields)):
        out.append("  # sided: one    # guess: the text does not say one- or two-sided; the checks take "
                   "one-sided (the default); write 'sided: two' if the paper means two-sided")
    if key == "significance" and "systematics" not in fields and "syst_error" in {
            f.path[0] for f in draft.fields} and ({"sigma", "p_value"} & set(fields)):
        out.append("  # systematics: none    # guess: the text does not say whether the systematic error "
                   "entered the significance (none, quadrature, marginalized or linear)")
    if key == "extrapolation" and "error_to" not in fields and "factor_error" in fields:
        out.append("  # error_to: syst    # guess: the text does not say where the factor's error goes; "
                   "systematic is the default")
    return out


def _list(key: str, draft: Draft) -> list[str]:
    items: dict = {}
    for f in draft.fields:
        if f.path[0] == key and len(f.path) == 3:
            items.setdefault(f.path[1], {})[f.path[2]] = f
    if not items:
        return []
    out = [f"{key}:"]
    for index in sorted(items):
        item = items[index]
        body = ", ".join(f"{sub}: {scalar(item[sub].value)}" for sub in LISTS[key] if sub in item)
        quote = next(iter(item.values())).quote
        out.append(_commented("  - {" + body + "}", f'from "{printable(quote, 110)}"' if quote else ""))
    return out


def _trailer(draft: Draft) -> list[str]:
    out = []
    sections = (
        ("Printed again (the value above is the first one printed):",
         [f"{'.'.join(map(str, f.path))}: {scalar(f.value)} {_quote(f)}" for f in draft.also]),
        ("Numbers not placed in a field:",
         [f"{text} in \"{printable(quote, 100)}\": {why}" for text, quote, why in draft.unplaced]),
        ("Dropped: the claim file refused these as drafted:",
         [f"{'.'.join(map(str, f.path))}: {scalar(f.value)} {_quote(f)}; {why}" for f, why in draft.dropped]),
    )
    for title, items in sections:
        if not items:
            continue
        out.append(f"# {title}")
        for item in items[:TRAILER_LIMIT]:
            out.append(f"#   {printable(item, 400)}")
        if len(items) > TRAILER_LIMIT:
            out.append(f"#   ... and {len(items) - TRAILER_LIMIT:,} more")
    return out
