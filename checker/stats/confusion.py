"""The rates papers print from one table of counts (a confusion matrix), as
count over denominator, and the table's margins a slip may have divided by.

Definitions (T. Fawcett, "An introduction to ROC analysis", Pattern Recognit.
Lett. 27, 861 (2006), Fig. 1; F1 from C. J. van Rijsbergen, Information
Retrieval, 2nd ed. (1979), ch. 7, as the harmonic mean of precision and recall).
"""

from __future__ import annotations

from dataclasses import dataclass

CELLS = ("true_positive", "false_positive", "false_negative", "true_negative")


@dataclass(frozen=True)
class RateDefinition:
    """A rate as numerator cells over denominator cells; ``binomial`` says
    whether it is a proportion of its denominator's cases (F1 is not)."""

    name: str
    numerator: tuple[str, ...]
    denominator: tuple[str, ...]
    denominator_words: str
    binomial: bool = True


DEFINITIONS = {d.name: d for d in (
    RateDefinition("accuracy", ("true_positive", "true_negative"), CELLS, "all cases"),
    RateDefinition("sensitivity", ("true_positive",), ("true_positive", "false_negative"), "the positives"),
    RateDefinition("recall", ("true_positive",), ("true_positive", "false_negative"), "the positives"),
    RateDefinition("specificity", ("true_negative",), ("true_negative", "false_positive"), "the negatives"),
    RateDefinition("precision", ("true_positive",), ("true_positive", "false_positive"),
                   "the cases called positive"),
    RateDefinition("negative_predictive_value", ("true_negative",), ("true_negative", "false_negative"),
                   "the cases called negative"),
    RateDefinition("false_positive_rate", ("false_positive",), ("false_positive", "true_negative"),
                   "the negatives"),
    RateDefinition("false_negative_rate", ("false_negative",), ("false_negative", "true_positive"),
                   "the positives"),
    # F1 = 2 TP / (2 TP + FP + FN): the numerator counts TP twice.
    RateDefinition("f1", ("true_positive", "true_positive"),
                   ("true_positive", "true_positive", "false_positive", "false_negative"),
                   "2 TP + FP + FN", binomial=False),
)}

# Denominators a printed rate or interval may have used, named as a referee would.
MARGINS = (
    ("all cases", CELLS),
    ("the positives", ("true_positive", "false_negative")),
    ("the negatives", ("true_negative", "false_positive")),
    ("the cases called positive", ("true_positive", "false_positive")),
    ("the cases called negative", ("true_negative", "false_negative")),
)
# Numerators a misplaced rate may have used.
NUMERATORS = (
    ("the true positives", ("true_positive",)),
    ("the true negatives", ("true_negative",)),
    ("the false positives", ("false_positive",)),
    ("the false negatives", ("false_negative",)),
    ("the correct calls", ("true_positive", "true_negative")),
)


def total(table: dict[str, int], cells: tuple[str, ...]) -> int:
    return sum(int(table[c]) for c in cells)


def rate_fraction(table: dict[str, int], name: str) -> tuple[int, int]:
    """(numerator, denominator) of the named rate; the denominator may be 0."""
    d = DEFINITIONS[name]
    return total(table, d.numerator), total(table, d.denominator)


def margins(table: dict[str, int]) -> dict[str, int]:
    """The table's margins by name (those above zero)."""
    return {words: total(table, cells) for words, cells in MARGINS if total(table, cells) > 0}
