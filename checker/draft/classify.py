"""Which rule decides a number's role: the words after it, the words before
it back to the previous number, and the words earlier in its sentence (see
the strengths in :mod:`.rules`)."""

from __future__ import annotations

import math
from dataclasses import dataclass

from . import rules as R
from .notation import Mention, Number

@dataclass(frozen=True)
class Decision:
    rule: R.Rule | None
    cue_start: int  # where the deciding words start (sentence offsets)
    cue_end: int


def is_count(n: Number | None) -> bool:
    return (n is not None and math.isfinite(n.value) and n.value >= 1 and n.value == int(n.value)
            and not n.percent)


def sentence_cues(sentence: str) -> dict:
    """The first match of each sentence-wide rule, found once per sentence."""
    return {rule.name: rule.regex.search(sentence) for rule in R.SENTENCE}


def classify(sentence: str, mention: Mention, left_from: int, right_to: int,
             cues: dict | None = None) -> Decision:
    """The rule that decides a mention's role (None: the default for its kind)."""
    cues = sentence_cues(sentence) if cues is None else cues
    left = sentence[max(left_from, mention.start - 90):mention.start]
    left_offset = max(left_from, mention.start - 90)
    right = sentence[mention.end:min(right_to, mention.end + 80)]
    whole = mention.kind == R.VALUE and is_count(mention.value)
    best = None  # (strength, -distance, -order)
    for order, rule in enumerate(R.RIGHT):
        if mention.kind not in rule.kinds or (rule.whole and not whole):
            continue
        m = rule.regex.match(right)
        if m:
            key = (rule.strength, 0, -order)
            if best is None or key > best[0]:
                best = (key, rule, mention.start, mention.end + m.end())
    if mention.word:
        return Decision(best[1], best[2], best[3]) if best else Decision(None, mention.start, mention.end)
    for order, rule in enumerate(R.LEFT):
        if mention.kind not in rule.kinds or (rule.whole and not whole):
            continue
        last = None
        for m in rule.regex.finditer(left):
            last = m
        if last is None:
            continue
        distance = len(left) - last.end()
        if distance > rule.reach:
            continue
        key = (rule.strength, -distance, -order - 100)
        if best is None or key > best[0]:
            best = (key, rule, left_offset + last.start(), mention.end)
    for order, rule in enumerate(R.SENTENCE):
        if mention.kind not in rule.kinds or (rule.whole and not whole and mention.kind == R.VALUE):
            continue
        m = cues.get(rule.name)
        if m and m.end() <= mention.start:
            key = (rule.strength, 0, -order - 200)
            if best is None or key > best[0]:
                best = (key, rule, m.start(), mention.end)
    if best is None:
        return Decision(None, max(left_from, mention.start - 30), mention.end)
    return Decision(best[1], best[2], best[3])
