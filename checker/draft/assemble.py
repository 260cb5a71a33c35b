"""From a pasted text to a :class:`Draft`: every number the rules recognise
placed in a claim field, with the words it came from, the guesses made, the
numbers printed twice, the numbers left out, and the fields a check would
still need.

Nothing is invented: a field holds a number the text prints, in the digits
it prints.  Two fields are computed from printed numbers, each with a
comment saying so: a proportion printed only as ``k/N`` (its decimal digits)
and a threshold printed as a fraction (``2/3``).  A counting experiment needs
no estimate, so its signal yield is never computed.
"""

from __future__ import annotations

import re
from dataclasses import replace
from decimal import Decimal
from fractions import Fraction
from typing import Any

from . import rules as R
from .classify import classify, is_count, sentence_cues
from .columns import Column, cell_numbers, read_columns
from .model import Draft, DraftError, Field
from .needs import missing as still_needed
from .normalize import normalize, printable, strip_control
from .notation import Mention, Number, find_mentions, number
from .sentences import QUOTE_LIMIT, Sentence, clip, sentence_of, split_sentences, text_quote
from .tables import Table, extract_tables

MAX_MENTIONS = 20_000
MAX_PARTS = 1000


# --- the builder ----------------------------------------------------------------

class _Builder:
    def __init__(self, name: str):
        self.name = name
        self.fields: list[Field] = []
        self.unplaced: list[tuple] = []
        self.notes: list[str] = []
        self.trace: list[str] = []
        self.discordant: list[Field] = []
        self.deferred: list[tuple] = []  # (role, Field-like args) resolved after the metric
        self.fallbacks: list[tuple] = []  # (Mention, quote, heading, order) for the estimate
        self.single_error: list[Field] = []
        self.error_words: dict = {}  # id(Field) -> ("sd" | "sem", quote): words after a lone ± naming it
        self.points: list[tuple] = []  # (Number, quote, rule, heading): a difference printed in points
        self.order = 0

    def add(self, path, value, quote, rule, guess="", heading=False, computed=False):
        self.order += 1
        self.fields.append(Field(tuple(path), value, quote, rule, guess, heading, self.order, computed))

    # Numbers printed with errors go to a field and its error fields.
    def measurement(self, m: Mention, base: tuple, error: tuple, quote, rule, heading, syst=None,
                    words=None):
        self.add(base, m.value, quote, rule, " ".join(m.notes), heading)
        if m.minus is not None:
            self.add(error, m.minus, quote, rule,
                     f"printed as +{m.plus.text}/-{m.minus.text}; the error below the value (towards a "
                     "threshold it exceeds) is used, since a claim file holds one symmetric error", heading)
            return
        if not m.errors:
            return
        labels = [label for _, label in m.errors]
        if base != ("estimate",):
            self.add(error, m.errors[0][0], quote, rule, "", heading)
            return
        unlabelled = [i for i, lab in enumerate(labels) if not lab]
        for i, (err, label) in enumerate(m.errors):
            guess = ""
            if label in ("stat", "sem"):
                path = ("stat_error",)
            elif label == "syst":
                path = ("syst_error",)
            elif label == "sd":
                path = ("sd",)
            elif label == "total":
                path = ("stat_error",)
                guess = "printed as the total error (statistical and systematic together)"
            elif len(m.errors) == 2 and len(unlabelled) == 2:
                path = ("stat_error",) if i == 0 else ("syst_error",)
                guess = ("two errors printed without labels: the first is taken as statistical, the "
                         "second as systematic")
            elif len(m.errors) == 2 and labels.count("syst") == 1:
                path = ("stat_error",)
            elif len(m.errors) == 2 and labels.count("stat") == 1:
                path = ("syst_error",)
            else:
                path = ("stat_error",)
            self.add(path, err, quote, rule, guess, heading)
            if path == ("stat_error",) and not label and len(m.errors) == 1:
                self.single_error.append(self.fields[-1])
                if words:
                    self.error_words[id(self.fields[-1])] = words

    def place(self, role: str, m: Mention, sentence: Sentence, quote: str, rule: str):
        heading = sentence.heading
        comparison = bool(R.COMPARISON_SENTENCE.search(sentence.text))
        group = "comparison" if comparison else "significance"
        v = m.value
        if role == "estimate":
            if m.kind == R.MEASUREMENT:
                self.measurement(m, ("estimate",), ("stat_error",), quote, rule, heading,
                                 words=_error_words(sentence.text, m))
            elif m.kind == R.RATIO:
                self.ratio(m, quote, rule, heading)
            else:
                self.add(("estimate",), v, quote, rule, heading=heading)
        elif role == "estimate_ratio":
            self.ratio(m, quote, rule, heading)
        elif role == "combination" and len(m.errors) > 1:
            # A combined value printed with its statistical and systematic
            # errors is the headline (a combination holds one error).
            self.measurement(m, ("estimate",), ("stat_error",), quote, rule, heading)
        elif role in ("baseline", "difference", "background", "factor", "combination"):
            base, error = {
                "baseline": (("baseline", "estimate"), ("baseline", "stat_error")),
                "difference": (("comparison", "difference"), ("comparison", "difference_error")),
                "background": (("background",), ("background_error",)),
                "factor": (("extrapolation", "factor"), ("extrapolation", "factor_error")),
                "combination": (("combination", "estimate"), ("combination", "stat_error")),
            }[role]
            if m.kind == R.MEASUREMENT:
                self.measurement(m, base, error, quote, rule, heading)
            else:
                self.add(base, v, quote, rule, heading=heading)
            label = R.BASELINE_LABEL.search(quote) if role == "baseline" else None
            if label:
                self.add(("baseline", "label"), " ".join(label.group().lower().split()), quote, rule,
                         heading=heading)
        elif role == "difference_points":
            plus = sentence.text[m.start:m.start + 1] == "+"
            if plus or comparison or R.BASELINE_CUE.search(sentence.text):
                self.points.append((v, quote, rule, heading))
            else:
                self.fallbacks.append((m, sentence, quote))
        elif role == "operand":
            self.unplaced.append((v.text, quote, "printed after a multiplication sign (a power of ten "
                                  "whose superscript was lost in copying?)"))
        elif role == "threshold":
            if m.kind == R.RATIO:
                self.add(("threshold",), _fraction_text(m, exact=True), quote, rule,
                         f"printed as the fraction {m.low.text}/{m.high.text}; written out as a decimal "
                         "(a threshold is exact)", heading)
            else:
                self.add(("threshold",), v, quote, rule, heading=heading)
        elif role in ("stat_error", "syst_error", "sd"):
            self.add((role,), v, quote, rule, heading=heading)
        elif role == "p_value":
            if m.relation in (">", "≥"):
                self.unplaced.append((v.text, quote, "a p-value printed as a lower bound; no field holds one"))
                return
            value: Any = v
            guess = ""
            if m.relation in ("<", "≤"):
                value = f"< {v.text}"
            elif m.relation == "≈":
                guess = "printed as approximately equal"
            self.add((group, "p_value"), value, quote, rule, guess, heading)
        elif role == "sigma":
            self.add((group, "sigma"), v, quote, rule, heading=heading)
        elif role in ("required_sigma", "global_sigma", "upcrossing_sigma"):
            self.add(("significance", role), v, quote, rule, heading=heading)
        elif role in ("samples", "circuits", "qubits", "trials", "observed"):
            if role == "qubits" and v.value > 1000:
                self.unplaced.append((v.text, quote, "more than 1000 qubits"))
                return
            self.add((role,), v, quote, rule, heading=heading)
        elif role == "upcrossings":
            self.add(("significance", "upcrossings"), v, quote, rule, heading=heading)
        elif role in ("instances", "shared_samples"):
            self.deferred.append((role, v, quote, rule, heading))
        elif role == "per_part":
            if comparison or R.BASELINE_CUE.search(sentence.text):
                self.deferred.append(("each_samples", v, quote, rule, heading))
            else:
                self.unplaced.append((v.text, quote, "a count for each part, not the total behind the estimate"))
        elif role in ("discordant_ours", "discordant_theirs", "discordant"):
            if m.kind == R.PAIR:
                for n in (m.low, m.high):
                    if is_count(n):
                        self.discordant.append(Field(("discordant",), n, quote, rule, "", heading, len(self.discordant)))
                return
            slot = {"discordant_ours": 0, "discordant_theirs": 1}.get(role, len(self.discordant))
            self.discordant.append(Field(("discordant",), v, quote, rule, "", heading, slot))
        elif role == "interval":
            self.interval(m, quote, rule, heading)
        elif role == "global_p":
            self.unplaced.append((v.text, quote, "a global p-value: the claim holds the global significance in "
                                  "sigma (significance.global_sigma)"))
        elif role == "reference":
            return
        else:  # pragma: no cover - every role above is in rules.py
            raise AssertionError(role)

    def ratio(self, m: Mention, quote, rule, heading):
        k, n = m.low, m.high
        if not (is_count(n) and k.whole and 0 <= k.value <= n.value):
            self.unplaced.append((f"{k.text}/{n.text}", quote, "not a count out of a whole"))
            return
        self.add(("estimate",), _fraction_text(m, exact=False), quote, rule,
                 f"printed as {k.text}/{n.text}: the proportion is written with ten significant digits", heading,
                 computed=True)
        self.add(("samples",), n, quote, rule, heading=heading, computed=True)

    def interval(self, m: Mention, quote, rule, heading):
        self.add(("interval", "low"), m.low, quote, rule, heading=heading)
        self.add(("interval", "high"), m.high, quote, rule, heading=heading)
        if m.level is not None:
            guess = f"the interval is named {m.method}" if m.method else ""
            self.add(("interval", "level"), m.level, quote, rule, guess, heading)
        else:
            self.notes.append("interval: no confidence level is printed beside it; the loader takes 0.95")


def _error_words(text: str, m: Mention) -> tuple | None:
    """("sd" | "sem", quote) when the words right after a value with one
    unlabelled error, or its sentence, say what the error is."""
    if len(m.errors) != 1 or m.errors[0][1]:
        return None
    for kind, after in (("sem", R.SEM_AFTER), ("sd", R.SD_AFTER)):
        hit = after.match(text, m.end)
        if hit:
            return kind, clip(text, max(0, m.start - 30), hit.end())
    for kind, anywhere in (("sem", R.SEM_SENTENCE), ("sd", R.SD_SENTENCE)):
        hit = anywhere.search(text)
        if hit:
            return kind, printable(clip(text, max(0, m.start - 20), m.end) + " ... " + clip(
                text, hit.start(), hit.end()), QUOTE_LIMIT)
    return None


def _fraction_text(m: Mention, exact: bool) -> Number:
    k, n = Fraction(int(m.low.value)), Fraction(int(m.high.value))
    if n == 0:
        return Number("0", 0.0)
    value = k / n
    if exact:
        text = repr(float(value))
    else:
        dec = Decimal(value.numerator) / Decimal(value.denominator)
        text = format(dec, ".10g") if dec != 0 else "0"
        if "e" in text or "E" in text:
            text = format(dec, ".9e")
        elif "." in text and len(text.replace("-", "").replace(".", "").lstrip("0")) < 10:
            digits = len(text.replace("-", "").replace(".", "").lstrip("0"))
            text = text + "0" * (10 - digits)
        elif "." not in text:
            text = format(dec, ".9e")
    return Number(text, float(value))


# --- the whole text ------------------------------------------------------------------

def _first_text_rules(text: str) -> dict:
    """role -> (rule, match) for the first match of each whole-text role
    (for the metric: a specific metric first, else the earliest word)."""
    found: dict = {}
    generic = []
    for rule in R.TEXT:
        m = rule.regex.search(text)
        if not m:
            continue
        if rule.role == "metric":
            if rule.name in R.SPECIFIC_METRICS:
                found.setdefault("metric", (rule, m))
            else:
                generic.append((m.start(), rule, m))
            continue
        found.setdefault(rule.role, (rule, m))
    if "metric" not in found and generic:
        generic.sort(key=lambda g: g[0])
        found["metric"] = (generic[0][1], generic[0][2])
    return found


def _budget(b: _Builder, sentence: Sentence) -> list[tuple[int, int]]:
    spans = []
    i = len([f for f in b.fields if f.path[0] == "error_budget" and f.path[2] == "name"])
    word = re.search(r"\bbudget\b", sentence.text, re.I)
    for m in R.BUDGET_ITEM.finditer(sentence.text, word.end() if word else 0):
        name = m.group("name").strip()
        count = number(m.group("count"))
        error = _plain_number(m.group("error"))
        if error is None or not is_count(count):
            continue
        quote = clip(sentence.text, m.start(), m.end())
        b.add(("error_budget", i, "name"), name, quote, "error-budget", heading=sentence.heading)
        b.add(("error_budget", i, "count"), count, quote, "error-budget", heading=sentence.heading)
        b.add(("error_budget", i, "error"), error, quote, "error-budget", heading=sentence.heading)
        sd = _plain_number(m.group("sd")) if m.group("sd") else None
        if sd is not None:
            b.add(("error_budget", i, "error_sd"), sd, quote, "error-budget", heading=sentence.heading)
        spans.append((m.start(), m.end()))
        i += 1
    return spans


def _plain_number(text: str | None) -> Number | None:
    found = find_mentions(text or "", limit=1)
    return found[0].value if found and found[0].kind == R.VALUE else None


def draft_text(text: str, name: str, require_estimate: bool = True) -> Draft:
    """Draft a claim from pasted text.

    Raises
    ------
    DraftError
        When the text holds no number, or no number reads as the estimate.
    """
    cleaned = strip_control(text)
    tables, prose = extract_tables(cleaned)
    norm = normalize(prose)
    b = _Builder(name)
    sentences = split_sentences(norm)
    table_words = " ".join(normalize(" ".join(t.header) + " " + t.caption) for t in tables)
    whole_text = norm + "\n" + table_words
    text_rules = _first_text_rules(whole_text)
    budget_on = "budget" in text_rules
    count = 0
    any_number = bool(tables)
    for sentence in sentences:
        skip: list[tuple[int, int]] = []
        if budget_on and re.search(r"\bbudget\b|\berrors?\b", sentence.text, re.I):
            skip = _budget(b, sentence)
            if skip:
                b.trace.append("error-budget")
        limit = MAX_MENTIONS - count
        if limit <= 0:
            b.notes.append(f"the text holds more than {MAX_MENTIONS:,} numbers; only the first {MAX_MENTIONS:,} were read")
            break
        mentions = find_mentions(sentence.text, limit=limit)
        count += len(mentions)
        mentions = [m for m in mentions if not any(s <= m.start < e for s, e in skip)]
        any_number = any_number or bool(mentions)
        # Each number's words run back to the previous number and on to the
        # next (numbers written as words do not bound them).
        bounds = []
        last_end = 0
        for m in mentions:
            bounds.append(last_end)
            if not m.word:
                last_end = m.end
        next_start = len(sentence.text)
        nexts = [0] * len(mentions)
        for i in range(len(mentions) - 1, -1, -1):
            nexts[i] = next_start
            if not mentions[i].word:
                next_start = mentions[i].start
        cues = sentence_cues(sentence.text)
        for i, m in enumerate(mentions):
            prev_end, next_start = bounds[i], nexts[i]
            decision = classify(sentence.text, m, prev_end, next_start, cues)
            quote = clip(sentence.text, max(decision.cue_start, m.start - 60), decision.cue_end)
            rule = decision.rule
            if rule is not None:
                b.trace.append(rule.name)
                b.place(rule.role, m, sentence, quote, rule.name)
                continue
            if m.word:
                continue
            default = R.DEFAULTS.get(m.kind)
            if default is not None:
                b.trace.append(f"default-{m.kind}")
                b.place(default, m, sentence, quote, f"default-{m.kind}")
            elif m.kind in (R.VALUE, R.RATIO):
                b.fallbacks.append((m, sentence, clip(sentence.text, m.start - 30, m.end + 10)))
            else:
                b.unplaced.append((_mention_text(m), clip(sentence.text, m.start - 30, m.end + 10),
                                   "no words say which field it is"))
    if not any_number and not re.search(r"\d", norm):
        raise DraftError(name, "holds no number", "paste the sentences that print the claim's numbers "
                         "(an estimate such as 0.913 ± 0.008, counts, a threshold, sigma or p)")
    results = _tables(b, tables)
    _text_fields(b, text_rules, whole_text, tables)
    return _resolve(b, text_rules, whole_text, sentences, results, require_estimate)


def _mention_text(m: Mention) -> str:
    if m.value is not None:
        return m.value.text
    if m.low is not None:
        return f"{m.low.text}, {m.high.text}"
    return "?"


def _tables(b: _Builder, tables: list[Table]) -> Table | None:
    """Parts from the first results table, an error budget from a table with
    a count column; returns the results table."""
    results = None
    for table in tables:
        label, columns, guesses = read_columns(table)
        fields = [c.field if c else None for c in columns]
        if "count" in fields and label is not None:
            _budget_table(b, table, label, columns)
            continue
        if "estimate" not in fields or results is not None:
            if "estimate" in fields:
                b.notes.append("a second table of results was not read; draft it alone")
            continue
        results = table
        b.notes.extend(guesses)
        if len(table.rows) > MAX_PARTS:
            raise DraftError(b.name, f"holds a table of {len(table.rows):,} rows",
                             f"a claim holds at most {MAX_PARTS:,} parts; use --table for one claim per row")
        i = 0
        for row, line in zip(table.rows, table.lines):
            quote = printable(normalize(line), QUOTE_LIMIT)
            cells = dict()
            for col, cell in zip(columns, row):
                if col is None or col.field not in ("estimate", "stat_error", "samples", "circuits"):
                    continue
                value, stat, _ = cell_numbers(cell, col)
                if value is None:
                    continue
                if col.field == "estimate":
                    cells.setdefault("estimate", value)
                    if stat is not None:
                        cells.setdefault("stat_error", stat)
                elif col.field in ("samples", "circuits"):
                    if is_count(value):
                        cells.setdefault(col.field, value)
                else:
                    cells.setdefault(col.field, value)
            text_label = normalize(row[label]) if label is not None and label < len(row) else ""
            if "estimate" not in cells:
                continue
            if text_label and R.COMBINED_ROW.match(text_label):
                b.add(("combination", "estimate"), cells["estimate"], quote, "table-combined-row")
                if "stat_error" in cells:
                    b.add(("combination", "stat_error"), cells["stat_error"], quote, "table-combined-row")
                if "samples" in cells:
                    b.add(("samples",), cells["samples"], quote, "table-combined-row")
                b.trace.append("table-combined-row")
                continue
            if text_label:
                b.add(("parts", i, "label"), printable(text_label, 80), quote, "table")
            for key in ("estimate", "stat_error", "samples", "circuits"):
                if key in cells:
                    b.add(("parts", i, key), cells[key], quote, "table")
            i += 1
        if i:
            b.trace.append("table")
    return results


def _budget_table(b: _Builder, table: Table, label: int, columns: list[Column | None]) -> None:
    i = len([f for f in b.fields if f.path[0] == "error_budget" and f.path[2] == "name"])
    # In a budget table "error" columns hold the component's error rate, and
    # a spread column its uncertainty.
    roles = {"count": "count", "stat_error": "error", "estimate": "error", "sd": "error_sd"}
    for row, line in zip(table.rows, table.lines):
        quote = printable(normalize(line), QUOTE_LIMIT)
        item = {}
        for col, cell in zip(columns, row):
            if col is None or col.field not in roles:
                continue
            value, stat, _ = cell_numbers(cell, col)
            if value is None:
                continue
            key = roles[col.field]
            if key == "error" and "error" in item:
                key = "error_sd"
            item.setdefault(key, value)
            if key == "error" and stat is not None:
                item.setdefault("error_sd", stat)
        name = normalize(row[label]) if label < len(row) else ""
        if not name or "error" not in item or ("count" in item and not is_count(item["count"])):
            continue
        b.add(("error_budget", i, "name"), printable(name, 80), quote, "table-budget")
        for key in ("count", "error", "error_sd"):
            if key in item:
                b.add(("error_budget", i, key), item[key], quote, "table-budget")
        i += 1
    b.trace.append("table-budget")


def _text_fields(b: _Builder, found: dict, text: str, tables) -> None:
    for role, (rule, m) in found.items():
        quote = text_quote(text, m.start(), m.end())
        if role in ("metric", "budget"):
            continue
        b.trace.append(rule.name)
        if role == "sided":
            b.deferred.append(("sided", "two" if rule.name == "sided-two" else "one", quote, rule.name,
                               bool(R.COMPARISON_SENTENCE.search(sentence_of(text, m.start(), m.end())))))
        elif role == "systematics":
            b.add(("significance", "systematics"), rule.name.split("-", 1)[1], quote, rule.name)
        elif role == "error_at":
            b.add(("significance", "error_at"), "threshold" if rule.name == "error-at-threshold" else "estimate",
                  quote, rule.name)
        elif role == "paired":
            b.deferred.append(("paired", rule.name == "paired-yes", quote, rule.name, False))
        elif role == "method":
            b.add(("combination", "method"), rule.name.split("-", 1)[1], quote, rule.name)
        elif role == "error_to":
            b.add(("extrapolation", "error_to"), rule.name.rsplit("-", 1)[1], quote, rule.name)
        elif role == "threshold_zero":
            b.deferred.append(("threshold_zero", Number("0", 0.0, True), quote, rule.name, False))
        elif role == "integer_data":
            b.add(("integer_data",), True, quote, rule.name)


def _choose(fields: list[Field]) -> tuple[list[Field], list[Field]]:
    """One field per path: body text before headings, then first printed."""
    chosen: dict = {}
    also = []
    for f in sorted(fields, key=lambda f: (f.heading, f.computed, f.order)):
        if f.path in chosen:
            if _text(f.value) != _text(chosen[f.path].value) and not f.computed:
                also.append(f)
            continue
        chosen[f.path] = f
    return sorted(chosen.values(), key=lambda f: f.order), also


def _text(value) -> str:
    if isinstance(value, Number):
        return value.text
    if isinstance(value, tuple):
        return "[" + ", ".join(_text(v) for v in value) + "]"
    return str(value)


def _resolve(b: _Builder, text_rules: dict, text: str, sentences, results, require_estimate) -> Draft:
    fields, also = _choose(b.fields)
    have = {f.path for f in fields}
    extra: list[Field] = []

    def add(path, value, quote, rule, guess=""):
        b.order += 1
        f = Field(tuple(path), value, quote, rule, guess, False, b.order)
        extra.append(f)
        have.add(f.path)

    notes = list(dict.fromkeys(b.notes))
    # A combined value without a named weighting is the headline itself
    # (the combination group needs its method).
    if ("combination", "method") not in have:
        parts = any(p[0] == "parts" for p in have)
        for f in [f for f in fields if f.path[0] == "combination"]:
            fields.remove(f)
            have.discard(f.path)
            target = ("estimate",) if f.path[1] == "estimate" else ("stat_error",)
            if target in have:
                also.append(f)
                continue
            add(target, f.value, f.quote, f.rule,
                "printed as the combination of the parts, with no weighting named" if parts else "")
    # The estimate: a number the rules did not place, when nothing else is.
    if ("estimate",) not in have:
        combined = next((f for f in fields if f.path == ("combination", "estimate")), None)
        if combined is not None:
            add(("estimate",), combined.value, combined.quote, combined.rule,
                "the only headline value printed is the combination of the parts")
            err = next((f for f in fields if f.path == ("combination", "stat_error")), None)
            if err is not None and ("stat_error",) not in have:
                add(("stat_error",), err.value, err.quote, err.rule, "the combination's error")
        else:
            for m, sentence, quote in b.fallbacks:
                if m.kind == R.VALUE and not (is_count(m.value) and m.value.value >= 1900 and m.value.whole):
                    add(("estimate",), m.value, quote, "fallback-estimate",
                        "no words mark this number as the result; it is the first number not placed elsewhere")
                    b.trace.append("fallback-estimate")
                    break
                if m.kind == R.RATIO:
                    b.ratio(m, quote, "fallback-estimate", sentence.heading)
                    new = b.fields[-2:]
                    for f in new:
                        add(f.path, f.value, f.quote, f.rule, f.guess)
                    b.trace.append("fallback-estimate")
                    break
    used_fallback = {id(m) for m, _, _ in b.fallbacks[:1]} if any(f.rule == "fallback-estimate" for f in extra) else set()
    unplaced = list(b.unplaced) + [(_mention_text(m), quote, "no words say which field it is")
                                   for m, _, quote in b.fallbacks if id(m) not in used_fallback]
    # The metric.
    metric_rule = text_rules.get("metric")
    metric_guess = ""
    if metric_rule is not None:
        rule, m = metric_rule
        metric = R.METRIC_OF_RULE[rule.name]
        metric_quote = text_quote(text, m.start(), m.end())
        b.trace.append(rule.name)
    elif R.FIDELITY_WORD.search(text):
        m = R.FIDELITY_WORD.search(text)
        metric, metric_quote = "linear-xeb", text_quote(text, m.start(), m.end())
        metric_guess = ("the text says fidelity without naming how it was estimated: linear XEB is a guess "
                        "(a GHZ or state fidelity from counts is metric proportion)")
        b.trace.append("metric-fidelity")
    else:
        estimate = next((f for f in fields + extra if f.path == ("estimate",)), None)
        pct = estimate is not None and isinstance(estimate.value, Number) and estimate.value.percent
        ratio = estimate is not None and "proportion is written" in estimate.guess
        metric = "proportion" if pct or ratio else "mean"
        metric_quote = ""
        metric_guess = ("the text names no metric; " + (
            "a percentage reads as a proportion" if pct else "a count out of a whole reads as a proportion"
            if ratio else "mean is the model that assumes least (a per-sample sd is then needed)"))
    named_background = any(f.path == ("background",) and f.rule not in R.WEAK_BACKGROUND for f in fields)
    if ("observed",) in have or named_background:
        if metric != "counts":
            metric_guess = "events over a background: a counting experiment"
        metric = "counts"
    add(("metric",), metric, metric_quote, metric_rule[0].name if metric_rule else "metric-guess", metric_guess)
    if metric == "mean":
        for f in b.single_error:
            if f not in fields:
                continue
            words = b.error_words.get(id(f))
            if words and words[0] == "sd" and ("sd",) not in have:
                # The words say the ± is the spread of the runs, not the error of their mean.
                fields[fields.index(f)] = replace(f, path=("sd",), quote=words[1])
                have.discard(("stat_error",))
                have.add(("sd",))
            elif words and words[0] == "sem":
                fields[fields.index(f)] = replace(f, quote=words[1])
            else:
                fields[fields.index(f)] = replace(
                    f, guess="one error printed without a label: read as the standard error of the mean; "
                    "if it is the spread of the runs, rename the field sd")
    # Deferred roles.
    for role, value, quote, rule, flag in b.deferred:
        if role == "instances":
            path = ("circuits",) if metric in ("linear-xeb", "log-xeb", "heavy-output") else ("samples",)
            if path not in have:
                add(path, value, quote, rule)
        elif role == "shared_samples":
            if ("samples",) not in have:
                add(("samples",), value, quote, rule)
            if ("baseline", "estimate") in have and ("baseline", "samples") not in have:
                add(("baseline", "samples"), value, quote, rule, "the same items as the estimate")
        elif role == "each_samples":
            if ("baseline", "estimate") in have and not any(p[0] in ("parts", "circuits") for p in have):
                guess = f"printed as {value.text} each: read as the items behind each of the two results"
                if ("samples",) not in have:
                    add(("samples",), value, quote, rule, guess)
                if ("baseline", "samples") not in have:
                    add(("baseline", "samples"), value, quote, rule, guess)
            else:
                unplaced.append((value.text, quote, "a count for each part, not the total behind the estimate"))
        elif role == "paired":
            if ("baseline", "estimate") in have and ("comparison", "paired") not in have:
                add(("comparison", "paired"), value, quote, rule)
        elif role == "threshold_zero":
            if ("threshold",) not in have and metric != "counts":
                add(("threshold",), value, quote, rule, "printed in words (zero)")
    # Sigma and p go with the comparison only when there is a baseline, or a difference printed
    # without one (a difference-only comparison: its sigma is the difference's, comparison.sigma).
    baseline = ("baseline", "estimate") in have
    compared = baseline or ("comparison", "difference") in have
    moved = []
    for f in fields + extra:
        if f.path[0] == "comparison" and f.path[1] in ("sigma", "p_value") and not compared:
            moved.append((f, ("significance", f.path[1])))
    # A difference printed without a baseline, and no threshold (nor a counting experiment or a
    # look-elsewhere) for a significance to be measured from: a sigma or p printed in a sentence
    # of its own ("This is significant at 2.8σ") is the difference's.
    if compared and not baseline and metric != "counts" and not any(
            p == ("threshold",) or p in (("significance", "global_sigma"), ("significance", "upcrossings"))
            or p == ("trials",) for p in have):
        moved += [(f, ("comparison", f.path[1])) for f in fields + extra
                  if f.path[0] == "significance" and f.path[1] in ("sigma", "p_value")]
    for f, path in moved:
        target = fields if f in fields else extra
        if path in have:
            target.remove(f)
            also.append(f)
        else:
            target[target.index(f)] = replace(f, path=path)
            have.discard(f.path)
            have.add(path)
    for role, value, quote, rule, comparison in b.deferred:
        if role != "sided":
            continue
        group = "comparison" if (comparison and compared) or (compared and not any(
            p[0] == "significance" and p[1] in ("sigma", "p_value") for p in have)) else "significance"
        add((group, "sided"), value, quote, rule)
    # A difference printed in points: percentage points when the two results are percentages.
    if b.points and baseline and ("comparison", "difference") not in have:
        v, quote, rule, heading = b.points[0]
        estimate = next((f for f in fields + extra if f.path == ("estimate",)), None)
        pct = estimate is not None and isinstance(estimate.value, Number) and estimate.value.percent
        if pct:
            add(("comparison", "difference"), Number(v.text + "%", v.value / 100), quote, rule,
                f"printed as {v.text} points: read as percentage points, since the results are printed in percent")
        else:
            add(("comparison", "difference"), v, quote, rule)
    elif b.points:
        unplaced.extend((v.text, quote, "a difference in points, but no baseline is printed")
                        for v, quote, _, _ in b.points)
    # Discordant counts: two of them, ours first.
    if b.discordant and baseline:
        ds = sorted(b.discordant, key=lambda f: f.order)[:2]
        if len(ds) == 2:
            if ("comparison", "paired") not in have:
                add(("comparison", "paired"), True, ds[0].quote, ds[0].rule,
                    "the text does not say paired, but prints discordant counts, which only a comparison "
                    "on the same items has")
            guess = ("the counts name no side: the first printed is taken as the items only the claim's "
                     "method got right" if ds[0].rule in ("discordant", "discordant-only-by") else "")
            add(("comparison", "discordant"), (ds[0].value, ds[1].value),
                printable(ds[0].quote + (" ... " + ds[1].quote if ds[1].quote != ds[0].quote else ""), QUOTE_LIMIT),
                ds[0].rule, guess)
    # Fields that mean nothing without their group.
    final = [f for f in fields + extra if _belongs(f, have, metric)]
    dropped_quietly = [f for f in fields + extra if f not in final]
    for f in dropped_quietly:
        if f.path[0] in ("significance",) and f.path[1] in ("systematics", "error_at"):
            continue
        unplaced.append((_text(f.value), f.quote, f"read as {'.'.join(map(str, f.path))}, which needs fields "
                         "the text does not print"))
    # Title.
    heading = next((s.text for s in sentences if s.heading and not R.GENERIC_HEADING.match(s.text.strip())), None)
    title_guess = ""
    if heading:
        title, title_quote, title_rule = printable(heading, 200), "", "heading"
    elif results is not None and results.caption:
        title, title_quote, title_rule = printable(normalize(results.caption), 160), "", "caption"
        title = re.sub(r"^(?:table|tab\.)\s*[A-Z]?\d*[A-Za-z]?\s*[:.]\s*", "", title, flags=re.I) or title
    elif results is not None and not any(f.path == ("estimate",) and not f.rule.startswith("table")
                                         for f in final):
        title = printable("Results table: " + ", ".join(normalize(h) for h in results.header if h.strip()), 160)
        title_quote, title_rule = "", "table-heading"
        title_guess = "the text has no heading or caption: name the claim"
    else:
        estimate = next((f for f in final if f.path == ("estimate",)), None)
        source = estimate.quote if estimate else ""
        body = [s for s in sentences if not s.heading and len(s.text.split()) >= 4]
        first = body[0].text if body else (sentences[0].text if sentences else source)
        title = printable(first, 100).rstrip(".") or f"Claim drafted from {b.name}"
        title_quote, title_rule = "", "title-sentence"
        title_guess = "the text's first sentence: shorten it to what the claim is about"
    final.insert(0, Field(("title",), title, title_quote, title_rule, title_guess, False, -1))
    # Estimate or nothing.
    # The kinds of claim the loader lets go without one (claim.model.ESTIMATE_OPTIONAL) go on
    # to the loader, which has the last word.
    without_estimate = metric == "counts" or any(f.path in (("significance", "global_sigma"),
                                                            ("comparison", "difference")) for f in final)
    if require_estimate and not any(f.path == ("estimate",) for f in final) and not without_estimate:
        raise DraftError(name_of(b), "prints no number that reads as the estimate",
                         "paste the sentence with the result (such as 'an accuracy of 91.3% ± 0.8%' or "
                         "'a fidelity of (2.24 ± 0.21) × 10^-3')")
    missing = still_needed(final, metric)
    return Draft(b.name, tuple(final), tuple(also), tuple(unplaced), tuple(missing), tuple(notes), (),
                 tuple(dict.fromkeys(b.trace)))


def name_of(b: _Builder) -> str:
    return b.name


def _belongs(f: Field, have: set, metric: str) -> bool:
    """A field is kept when what it describes is there too."""
    head = f.path[0]
    if head == "significance" and f.path[1] in ("systematics", "error_at"):
        return any(p[0] == "significance" and p[1] in ("sigma", "p_value") for p in have) or ("threshold",) in have
    if head == "extrapolation" and f.path[1] != "factor":
        return ("extrapolation", "factor") in have
    if head == "comparison" and f.path[1] == "paired":
        return ("baseline", "estimate") in have
    if head in ("observed", "background", "background_error"):
        return metric == "counts"
    return True
