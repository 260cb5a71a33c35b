"""The words every output shares, in one place: status words and marks,
verdict sentences, the standing caution, and the names of conventions and
methods.  The terminal text, the JSON messages, the Markdown notes, the HTML
pages and the batch summary all read them from here, so a status or a method
is called the same everywhere.

A leaf module: it imports nothing of ours but :mod:`checker.visible` and,
for a number inside a phrase, :func:`checker.wording.num` (how numbers are
written lives beside it, in :mod:`checker.wording`, itself a leaf).
"""

from __future__ import annotations

from typing import Any, Mapping

from .visible import visible
from .wording import num

# --- statuses and verdicts ------------------------------------------------------

# A finding's status in one word, as the reports print it beside each point.
# "info" is a value recomputed where nothing was printed to compare it with: for information.
STATUS_WORDS = {"fail": "flag", "warn": "note", "pass": "agrees", "skip": "not checked",
                "info": "for information"}
# The same, five characters wide, for the terminal's first column.
STATUS_MARKS = {"pass": "  ok ", "warn": " note", "fail": "FLAG ", "skip": "  -- ", "info": " info"}
# Counting findings of each status: "2 flagged, 1 noted, 5 agree, 1 not checked".
COUNT_WORDS = {"fail": "flagged", "warn": "noted", "pass": "agree", "skip": "not checked",
               "info": "for information"}
# A tally of one and of several: "1 flag", "3 flags".
TALLY_WORDS = {"fail": ("flag", "flags"), "warn": ("note", "notes"), "pass": ("agrees", "agree"),
               "skip": ("not checked", "not checked"), "info": ("for information", "for information")}

# The verdict and what it means, one sentence (no closing full stop: each output adds its own).
VERDICT_SENTENCES = {
    "consistent": "every number checked follows from the claim's own inputs",
    "inconsistent": "some printed numbers do not follow from the claim's own inputs",
    "incomplete": "the claim gives too little to check any number",
}


def verdict_line(verdict: str) -> str:
    """``inconsistent: some printed numbers do not follow from the claim's own inputs``."""
    return f"{verdict}: {VERDICT_SENTENCES[verdict]}"


# The standing caution: a flag is a question, not an accusation.  The reports
# carry the full sentence; the terminal and the batch summary the short one.
CAUTION = ("A flag is a question for the authors, not an accusation: claimcheck re-derives the "
           "arithmetic of the printed numbers and the conventions stated with them; it says nothing "
           "about the experiment behind them.")
CAUTION_SHORT = ("A flag is a question for the authors, not proof of an error: claimcheck checks the "
                 "arithmetic and the stated conventions, not the experiment.")

# --- methods and conventions ---------------------------------------------------

# Combination methods: a short name (tables, figure labels) and the mean they give (messages).
COMBINATION_NAMES = {"equal": "equal weights", "samples": "weights by samples",
                     "inverse-variance": "inverse-variance", "random-effects": "random effects (DL)",
                     "paule-mandel": "random effects (Paule-Mandel)"}
COMBINATION_MEANS = {
    "equal": "the equal-weight mean",
    "samples": "the mean weighted by samples",
    "inverse-variance": "the inverse-variance mean",
    "random-effects": "the random-effects mean (DerSimonian-Laird)",
    "paule-mandel": "the random-effects mean with the Paule-Mandel between-part variance",
}
# Look-elsewhere corrections.
CORRECTION_NAMES = {"gross-vitells": "Gross-Vitells", "sidak": "Sidak", "bonferroni": "Bonferroni",
                    "none": "no correction"}
# Metrics and goodness-of-fit tests, as the raw-data pages name them.
METRIC_NAMES = {"linear-xeb": "linear XEB", "log-xeb": "log XEB", "heavy-output": "heavy output"}
FIT_TEST_NAMES = {"kolmogorov-smirnov": "Kolmogorov-Smirnov", "cramer-von-mises": "Cramer-von Mises"}
# How a bootstrap resampled the data.
RESAMPLING_NAMES = {"circuits": "whole circuits resampled", "binned": "samples resampled by value bins",
                    "binomial": "binomial draws of the heavy count"}

# Conventions briefly, as a check's message names the one it used: "one-sided, statistical error only".
# Student's t names its degrees of freedom where they are known ("on 9 degrees of freedom").
_STUDENT_T = "Student's t{on}, its p given as the equivalent normal sigma"
_CONVENTION_BRIEF = {
    ("sided", "one"): "one-sided", ("sided", "two"): "two-sided",
    ("systematics", "none"): "statistical error only",
    ("systematics", "quadrature"): "systematic error added in quadrature",
    ("systematics", "marginalized"): "systematic error marginalized",
    ("systematics", "linear"): "systematic error added linearly (stat + syst)",
    ("error_at", "estimate"): "error taken at the estimate",
    ("error_at", "threshold"): "error taken at the threshold",
    ("method", "sidak"): "the Sidak correction", ("method", "bonferroni"): "the Bonferroni bound",
    ("method", "gross-vitells"): "the Gross-Vitells correction", ("method", "none"): "no correction",
    ("distribution", "t"): _STUDENT_T.format(on=""),
    ("distribution", "normal"): "the normal distribution",
    ("error_reading", "error of the mean"): "the printed error as the error of the mean",
    ("error_reading", "sd"): "the printed error as the runs' sd (error of the mean = it / sqrt(runs))",
}


def convention_text(conv: Mapping[str, Any], degrees_of_freedom: float | None = None) -> str:
    """A convention briefly: ``{"sided": "two"}`` -> "two-sided"; with
    ``degrees_of_freedom``, Student's t names them: ``{"distribution": "t"}``, 9
    -> "Student's t on 9 degrees of freedom, its p given as the equivalent
    normal sigma"."""
    def brief(key: str, value: Any) -> str:
        if degrees_of_freedom is not None and (key, value) == ("distribution", "t"):
            return _STUDENT_T.format(on=f" on {num(degrees_of_freedom)} degrees of freedom")
        return _CONVENTION_BRIEF.get((key, value), f"{key} {value}")

    return ", ".join(brief(k, v) for k, v in conv.items())


# Conventions and methods as a phrase that reads after "computed" or "would follow".
METHOD_PHRASES = {
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
SYSTEMATICS_PHRASES = {
    "none": "with the systematic error left out of the significance",
    "quadrature": "with the systematic error added in quadrature",
    "marginalized": "with the p-value averaged over the systematic error (Cousins-Highland)",
    "linear": "with the systematic error added linearly to the statistical error (stat + syst)",
}
ERROR_AT_PHRASES = {
    "estimate": "with the standard error taken at the estimate",
    "threshold": "with the standard error taken at the threshold (under the null)",
}
# A mean over runs: the distribution its statistic is referred to, and how its printed error is read.
RUN_PHRASES = {
    ("distribution", "normal"): "with the normal distribution in place of Student's t",
    ("distribution", "t"): "with Student's t on runs - 1 degrees of freedom",
    ("error_reading", "sd"): "with the printed error taken as the runs' sd (the error of the mean "
                             "being it divided by sqrt(runs))",
    ("error_reading", "error of the mean"): "with the printed error taken as the error of the mean",
    ("sigma", "t statistic"): "with the t statistic printed as the sigma",
    ("error_reading", "sd times root n"): "with the printed sd being in fact the error of the mean "
                                          "(the spread of the runs is sqrt(runs) times it)",
}
COUNT_KEYS = ("samples", "circuits", "count", "items")


def _one_line(text: Any) -> str:
    return " ".join(visible(text).split())


def convention_words(reproduced_by: Mapping[str, Any] | None) -> str | None:
    """``{"sided": "two"}`` -> "under the two-sided convention (both tails)", a
    phrase that reads after "computed" or "would follow"; None when there is none."""
    from .wording import num

    if not reproduced_by:
        return None
    words = []
    for key, value in reproduced_by.items():
        if key == "sided":
            tails = {"one": "one tail", "two": "both tails"}.get(value, "")
            words.append(f"under the {_one_line(value)}-sided convention" + (f" ({tails})" if tails else ""))
        elif key == "systematics":
            words.append(SYSTEMATICS_PHRASES.get(value, f"with systematics {_one_line(value)}"))
        elif key == "error_at":
            words.append(ERROR_AT_PHRASES.get(value, f"with the error taken at the {_one_line(value)}"))
        elif key in ("distribution", "error_reading", "sigma") and (key, value) in RUN_PHRASES:
            words.append(RUN_PHRASES[(key, value)])
        elif key in ("method", "interval_method", "combination"):
            words.append(METHOD_PHRASES.get(value, _one_line(value)))
        elif key == "denominator":
            words.append(f"with N = {num(value)}")
        elif key == "margin":
            words.append(f"taking {_one_line(value)} as N")
        elif key == "numerator":
            words.append(f"counting {_one_line(value)}")
        elif key == "rate":
            words.append(f"as the {_one_line(value).replace('_', ' ')}")
        elif key in COUNT_KEYS:
            words.append(f"with about {num(value)} {key}")
        else:
            shown = num(value) if isinstance(value, (int, float)) and not isinstance(value, bool) \
                else _one_line(value)
            words.append(f"with {key.replace('_', ' ')} {shown}")
    return " and ".join(words)
