"""The Claim: frozen dataclasses in which every number is a Reported value,
the float together with the interval its printed digits stand for."""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, replace
from fractions import Fraction
from typing import Any

from ..errors import ClaimSchemaError
from ..stats.precision import count_is_exact, parse_printed
from .load import Document, dotted

DEFAULT_TOLERANCE = 0.02
# Limits (README, "Limits"): the checks of a claim's parts and error budget grow
# with their number; beyond these the claim is refused with one line.
MAX_PARTS = 1_000
MAX_BUDGET_ITEMS = 1_000

# Definitions are exact however they are printed.
EXACT_FIELDS = {
    ("threshold",), ("tolerance",), ("trials",), ("interval", "level"),
    ("significance", "required_sigma"), ("significance", "upcrossing_sigma"),
}
# An exact definition may be written as a fraction ("threshold: 2/3"); the schema
# allows it only for these fields.
FRACTION = re.compile(r"[+-]?(0|[1-9][0-9]*)/[1-9][0-9]*")
COUNT_FIELDS = {"qubits", "samples", "circuits", "trials", "items", "count"}
# Whole numbers that may be zero: events seen, discordant items.
ZERO_COUNT_FIELDS = {"observed", "discordant"}
# Fields where a percentage means nothing: counts, and significances in sigma.
NO_PERCENT_FIELDS = COUNT_FIELDS | ZERO_COUNT_FIELDS | {"background", "background_error", "sigma", "required_sigma", "global_sigma", "upcrossings", "upcrossing_sigma"}


# Printed errors that ``error_level`` describes: each is divided by the level's multiple of the
# standard error when the claim is built, so every check reads one-sigma errors.
ERROR_FIELDS = {"stat_error", "syst_error", "difference_error", "factor_error", "background_error"}
SIGMA_LEVEL = re.compile(r"\s*(?P<k>[0-9]*\.?[0-9]+)\s*(?:-\s*)?(?:sigma|σ|sd|se)\s*", re.IGNORECASE)


@dataclass(frozen=True)
class ErrorLevel:
    """What a printed error stands for: ``multiple`` standard errors (1.96 for a 95% half-width,
    2 for a two-sigma bar), with the words a message shows ("95% half-width", "2-sigma bar")."""

    multiple: float
    words: str


@dataclass(frozen=True)
class Reported:
    """A number as the claim printed it.

    Attributes
    ----------
    value : float
        The printed value.
    low, high : float
        The interval its printed digits stand for (equal for exact values).
    text : str
        The printed text ("2.24e-3", "91.2%", "< 0.001").
    path : str
        Dotted field path, for messages.
    line : int or None
        Line in the claim file.
    """

    value: float
    low: float
    high: float
    text: str
    path: str = ""
    line: int | None = None
    log_low: float = math.nan  # natural logs of low/high, exact beyond the double range
    log_high: float = math.nan
    # A printed error at ``error_level`` (Builder.one_sigma): value, low, high and the logs are one
    # standard error, text says both ("0.4e-3 (95% half-width: 0.204e-3 at one sigma)"), and these
    # keep the level and the bare print ("0.4e-3"). None for a number printed at one sigma.
    level: "ErrorLevel | None" = None
    as_printed: str | None = None

    @property
    def bounds(self) -> tuple[float, float]:
        return (self.low, self.high)

    @property
    def exact(self) -> bool:
        return self.low == self.high

    @property
    def is_upper_bound(self) -> bool:
        return self.text.lstrip().startswith("<")

    @classmethod
    def exact_value(cls, value: float, path: str = "") -> "Reported":
        log_value = math.log(value) if value > 0 else (-math.inf if value == 0 else math.nan)
        return cls(float(value), float(value), float(value), repr(value), path, None, log_value, log_value)


@dataclass(frozen=True)
class Significance:
    sigma: Reported | None = None
    p_value: Reported | None = None
    sided: str = "one"
    systematics: str = "none"
    error_at: str = "estimate"
    required_sigma: Reported | None = None
    global_sigma: Reported | None = None
    upcrossings: Reported | None = None
    upcrossing_sigma: Reported | None = None
    stated: frozenset = frozenset()  # which of sided/systematics/error_at were written


@dataclass(frozen=True)
class Interval:
    low: Reported
    high: Reported
    level: Reported


@dataclass(frozen=True)
class Part:
    label: str
    estimate: Reported
    stat_error: Reported | None = None
    samples: Reported | None = None
    circuits: Reported | None = None


@dataclass(frozen=True)
class Combination:
    method: str
    estimate: Reported | None = None
    stat_error: Reported | None = None


@dataclass(frozen=True)
class Extrapolation:
    factor: Reported
    factor_error: Reported | None = None
    error_to: str = "syst"


@dataclass(frozen=True)
class BudgetItem:
    name: str
    error: Reported
    count: Reported
    error_sd: Reported | None = None


@dataclass(frozen=True)
class CountsTable:
    """A table of counts (a confusion matrix) as printed: whole numbers."""

    true_positive: Reported
    false_positive: Reported
    false_negative: Reported
    true_negative: Reported


@dataclass(frozen=True)
class PrintedRate:
    """A rate printed from a counts table (``name`` as in the vocabulary:
    ``recall``, ``specificity``, ...), with its interval when one is printed."""

    name: str
    value: Reported
    interval: Interval | None = None


@dataclass(frozen=True)
class Baseline:
    """The result a claim says it beats."""

    estimate: Reported
    label: str = "baseline"
    stat_error: Reported | None = None
    samples: Reported | None = None


@dataclass(frozen=True)
class Comparison:
    """The difference from the baseline as printed, and how it was tested."""

    paired: bool = False
    discordant: tuple[Reported, Reported] | None = None  # (only ours right, only the baseline right)
    difference: Reported | None = None
    difference_error: Reported | None = None
    sigma: Reported | None = None
    p_value: Reported | None = None
    sided: str = "one"
    test: str | None = None  # None: every paired test is tried
    stated: frozenset = frozenset()  # which of paired/sided/test were written


# The estimate may be left out only by these kinds of claim (README, "Claim format").
ESTIMATE_OPTIONAL = ("a counting experiment (metric counts), a claim that prints only its significances "
                     "(a local sigma or p and a global sigma), a comparison that prints its difference, "
                     "or a table of rates (counts_table)")


@dataclass(frozen=True)
class Claim:
    """One benchmark claim, as printed.  ``estimate`` is None only for the kinds
    of :data:`ESTIMATE_OPTIONAL`; every check reads it through a guard."""

    file: str
    title: str
    metric: str
    estimate: Reported | None = None
    source: str | None = None
    qubits: Reported | None = None
    stat_error: Reported | None = None
    syst_error: Reported | None = None
    interval: Interval | None = None
    samples: Reported | None = None
    circuits: Reported | None = None
    sd: Reported | None = None
    threshold: Reported | None = None
    significance: Significance = Significance()
    trials: Reported | None = None
    parts: tuple[Part, ...] = ()
    combination: Combination | None = None
    extrapolation: Extrapolation | None = None
    error_budget: tuple[BudgetItem, ...] = ()
    integer_data: bool = False
    items: Reported | None = None
    tolerance: float = DEFAULT_TOLERANCE
    error_level: ErrorLevel | None = None  # None: printed errors are one standard error
    counts_table: CountsTable | None = None
    rates: tuple[PrintedRate, ...] = ()
    observed: Reported | None = None
    background: Reported | None = None
    background_error: Reported | None = None
    baseline: Baseline | None = None
    comparison: Comparison | None = None

    @property
    def qubit_count(self) -> int | None:
        return int(self.qubits.value) if self.qubits is not None else None


class _Builder:
    def __init__(self, doc: Document):
        self.doc = doc
        self.error_level = self._error_level(doc.data.get("error_level"))

    def _error_level(self, raw) -> ErrorLevel | None:
        """``error_level``: a coverage (0.95, 95%: the half-width of a central interval of that
        probability, z = Phi^-1((1 + c)/2)) or a multiple of the standard error ("2 sigma")."""
        if raw is None:
            return None
        path = ("error_level",)
        text = (self.doc.texts.get(path) or str(raw)).strip()
        allowed = "a coverage such as 0.95 or 95% (a 95% half-width), or a multiple such as '2 sigma'"
        sigma = SIGMA_LEVEL.fullmatch(text)
        if sigma:
            k = float(sigma.group("k"))
            if not 0 < k <= 40:
                self.fail(path, f"error_level {text} must be a multiple of the standard error above 0", allowed)
            return ErrorLevel(k, f"{sigma.group('k')}-sigma bar")
        try:
            coverage = parse_printed(text, exact=True).value
        except ValueError:
            self.fail(path, f"error_level must be a coverage or a multiple of sigma, got {_shortened(text)!r}",
                      allowed)
        if not 0.0 < coverage < 1.0:
            self.fail(path, f"error_level {text} is not a coverage between 0 and 1"
                      + (f" (for {text} standard errors write '{text} sigma')" if coverage >= 1 else ""), allowed)
        # The standard library's normal quantile (Wichura's AS 241, accurate to about 1e-16),
        # so that building a claim needs no scipy.
        from statistics import NormalDist

        shown = text if text.endswith("%") else f"{coverage:.6g}"
        return ErrorLevel(NormalDist().inv_cdf((1.0 + coverage) / 2.0), f"{shown} half-width")

    def one_sigma(self, rep: Reported | None) -> Reported | None:
        """A printed error at ``error_level`` as one standard error, its text saying so
        ("0.4e-3 (95% half-width: 0.204e-3 at one sigma)")."""
        level = self.error_level
        if rep is None or level is None or level.multiple == 1.0:
            return rep
        from ..wording import at_one_sigma

        k = level.multiple
        shift = math.log(k)
        return replace(rep, value=rep.value / k, low=rep.low / k, high=rep.high / k,
                       text=at_one_sigma(rep.text, level.words, rep.value / k),
                       log_low=rep.log_low - shift, log_high=rep.log_high - shift,
                       level=level, as_printed=rep.text)

    def fail(self, path, problem, allowed):
        raise ClaimSchemaError(self.doc.file, problem, allowed, path=dotted(path),
                               line=self.doc.line_of(path))

    def number(self, container, path: tuple, name: str | None = None) -> Reported | None:
        key = path[-1]
        if isinstance(container, dict):
            if key not in container or container[key] is None:
                return None
        elif not (isinstance(key, int) and key < len(container)):
            return None
        raw = container[key]
        text = self.doc.texts.get(path)
        if text is None or isinstance(raw, str):
            text = str(raw)
        text = text.strip()
        name = name or str(key)
        if text.startswith("<"):
            bound = self._parse(text[1:], path, name, exact=True, shown=text)
            return Reported(bound.value, 0.0, bound.value, text, dotted(path), self.doc.line_of(path),
                            -math.inf, bound.log_high)
        if path in EXACT_FIELDS and FRACTION.fullmatch(text):
            return self._fraction(text, path)
        counting = name in COUNT_FIELDS
        from_zero = name in ZERO_COUNT_FIELDS
        if name in NO_PERCENT_FIELDS and text.endswith("%"):
            what = ("a count" if counting or from_zero else "a number of events" if name.startswith("background")
                    else "a significance in sigma")
            self.fail(path, f"{name} is {what}, so the percentage {text} means nothing",
                      "write it without a percent sign, such as " + ("30 or 2.5e7" if counting or from_zero else "4.2"))
        exact = path in EXACT_FIELDS or ((counting or from_zero) and count_is_exact(text))
        printed = self._parse(text, path, name, exact)
        if from_zero and (printed.value < 0 or printed.value != math.floor(printed.value)):
            self.fail(path, f"{name} must be a whole number of at least 0, got {text}",
                      "counts of events or items are whole numbers such as 0, 47 or 1200")
        if counting and (printed.value < 1 or printed.value != math.floor(printed.value)):
            self.fail(path, f"{name} must be a whole number of at least 1, got {text}",
                      "counts are whole numbers such as 30 or 2.5e7")
        rep = Reported(printed.value, printed.low, printed.high, text, dotted(path),
                       self.doc.line_of(path), printed.log_low, printed.log_high)
        return self.one_sigma(rep) if name in ERROR_FIELDS else rep

    def _fraction(self, text: str, path: tuple) -> Reported:
        """An exact fraction: its value as near as a double holds it, no printed
        interval, and its log from the whole numbers (exact beyond the double range)."""
        ratio = Fraction(text)
        value = float(ratio)
        if ratio > 0:
            log_value = math.log(ratio.numerator) - math.log(ratio.denominator)
        else:
            log_value = -math.inf if ratio == 0 else math.nan
        return Reported(value, value, value, text, dotted(path), self.doc.line_of(path), log_value, log_value)

    def _parse(self, text, path, name, exact, shown=None):
        try:
            return parse_printed(text, exact=exact)
        except ValueError as exc:
            if "beyond" in str(exc):  # a number, but too large or too small to work with
                self.fail(path, f"{name} {_shortened(shown or text)} is {str(exc).split(' is ', 1)[1]}",
                          "numbers up to about 1.8e308 in size, and as small as 1e-999999")
            self.fail(path, f"{name} must be a number, got {_shortened(shown or text)!r}",
                      "write digits such as 2.24e-3, 0.0224 or 2.24%")

    def build(self) -> Claim:
        d: dict[str, Any] = self.doc.data
        num = lambda key: self.number(d, (key,))  # noqa: E731
        sig_raw = d.get("significance") or {}
        sig = Significance(
            sigma=self.number(sig_raw, ("significance", "sigma")),
            p_value=self.number(sig_raw, ("significance", "p_value")),
            sided=sig_raw.get("sided") or "one",
            systematics=sig_raw.get("systematics") or "none",
            error_at=sig_raw.get("error_at") or "estimate",
            required_sigma=self.number(sig_raw, ("significance", "required_sigma")),
            global_sigma=self.number(sig_raw, ("significance", "global_sigma")),
            upcrossings=self.number(sig_raw, ("significance", "upcrossings")),
            upcrossing_sigma=self.number(sig_raw, ("significance", "upcrossing_sigma")),
            stated=frozenset(k for k in ("sided", "systematics", "error_at") if sig_raw.get(k)),
        )
        interval = self.interval(d.get("interval"), ("interval",))
        counts_table, rates = self.counts_and_rates(d)
        for key, limit in (("parts", MAX_PARTS), ("error_budget", MAX_BUDGET_ITEMS)):
            listed = d.get(key) or ()
            if len(listed) > limit:
                self.fail((key,), f"{key} lists {len(listed):,} entries; claimcheck checks at most {limit:,}",
                          f"give at most {limit:,} {key.replace('_', ' ')} entries (combine the rest first)")
        parts = tuple(
            Part(label=str(p.get("label") or f"part {i + 1}"),
                 estimate=self.number(p, ("parts", i, "estimate")),
                 stat_error=self.number(p, ("parts", i, "stat_error")),
                 samples=self.number(p, ("parts", i, "samples")),
                 circuits=self.number(p, ("parts", i, "circuits")))
            for i, p in enumerate(d.get("parts") or ())
        )
        combination = None
        if d.get("combination"):
            c = d["combination"]
            combination = Combination(c["method"], self.number(c, ("combination", "estimate")),
                                      self.number(c, ("combination", "stat_error")))
        extrapolation = None
        if d.get("extrapolation"):
            e = d["extrapolation"]
            extrapolation = Extrapolation(self.number(e, ("extrapolation", "factor")),
                                          self.number(e, ("extrapolation", "factor_error")),
                                          e.get("error_to") or "syst")
        budget = tuple(
            BudgetItem(name=str(b["name"]),
                       error=self.number(b, ("error_budget", i, "error")),
                       count=self.number(b, ("error_budget", i, "count"))
                       or Reported.exact_value(1, f"error_budget.{i}.count"),
                       error_sd=self.number(b, ("error_budget", i, "error_sd")))
            for i, b in enumerate(d.get("error_budget") or ())
        )
        tolerance = num("tolerance")
        baseline, comparison = self._baseline(d), self._comparison(d)
        observed, background = num("observed"), num("background")
        estimate = num("estimate")
        self._kind_inputs(d, estimate, sig, comparison, observed, background)
        qubits = num("qubits")
        if qubits is not None and qubits.value > 1000:
            self.fail(("qubits",), f"qubits must be at most 1000, got {qubits.text}",
                      "give the number of qubits of the device")
        return Claim(
            file=self.doc.file, title=str(d["title"]), metric=d["metric"],
            estimate=estimate, source=d.get("source"), qubits=qubits,
            stat_error=num("stat_error"), syst_error=num("syst_error"), interval=interval,
            samples=num("samples"), circuits=num("circuits"), sd=num("sd"),
            threshold=num("threshold"), significance=sig, trials=num("trials"), parts=parts,
            combination=combination, extrapolation=extrapolation, error_budget=budget,
            integer_data=bool(d.get("integer_data", False)), items=num("items"),
            tolerance=tolerance.value if tolerance is not None else DEFAULT_TOLERANCE,
            counts_table=counts_table, rates=rates,
            observed=observed, background=background, background_error=num("background_error"),
            baseline=baseline, comparison=comparison, error_level=self.error_level,
        )

    def interval(self, iv: dict | None, path: tuple) -> Interval | None:
        if not iv:
            return None
        level = self.number(iv, path + ("level",)) or Reported.exact_value(0.95, dotted(path + ("level",)))
        if not 0.0 < level.value < 1.0:
            self.fail(path + ("level",), f"level must lie between 0 and 1, got {level.text}",
                      "write 0.95 or 95%")
        return Interval(self.number(iv, path + ("low",)), self.number(iv, path + ("high",)), level)

    def counts_and_rates(self, d: dict) -> tuple[CountsTable | None, tuple[PrintedRate, ...]]:
        table = None
        if d.get("counts_table"):
            raw = d["counts_table"]
            cells = {}
            for name in ("true_positive", "false_positive", "false_negative", "true_negative"):
                path = ("counts_table", name)
                cell = self.number(raw, path)
                if cell.text.endswith("%") or cell.value < 0 or cell.value != math.floor(cell.value):
                    self.fail(path, f"{name} must be a whole number of at least 0, got {cell.text}",
                              "counts are whole numbers such as 0, 35 or 1200")
                # A count in a table is exact however it is printed.
                cells[name] = replace(cell, low=cell.value, high=cell.value)
            if sum(c.value for c in cells.values()) < 1:
                self.fail(("counts_table",), "counts_table holds no cases (all four counts are 0)",
                          "give the table's counts as printed")
            table = CountsTable(**cells)
        rates = []
        for name, raw in (d.get("rates") or {}).items():
            path = ("rates", name)
            if isinstance(raw, dict):
                value = self.number(raw, path + ("value",))
                interval = self.interval(raw.get("interval"), path + ("interval",))
            else:
                value, interval = self.number(d["rates"], path), None
            if not 0.0 <= value.value <= 1.0:
                self.fail(path, f"the rate {name} must lie between 0 and 1, "
                          f"got {value.text}", "write 0.8333 or 83.33%")
            rates.append(PrintedRate(name, value, interval))
        if rates and table is None:
            self.fail(("rates",), "rates are printed but no counts_table gives the counts they come from",
                      "add counts_table: {true_positive, false_positive, false_negative, true_negative}")
        return table, tuple(rates)
    def _baseline(self, d: dict) -> Baseline | None:
        b = d.get("baseline")
        if not b:
            return None
        return Baseline(estimate=self.number(b, ("baseline", "estimate")),
                        label=str(b.get("label") or "baseline"),
                        stat_error=self.number(b, ("baseline", "stat_error")),
                        samples=self.number(b, ("baseline", "samples")))

    def _comparison(self, d: dict) -> Comparison | None:
        c = d.get("comparison")
        if not c:
            return None
        discordant = None
        if c.get("discordant") is not None:
            pair = c["discordant"]
            discordant = tuple(self.number(pair, ("comparison", "discordant", i), name="discordant") for i in (0, 1))
        return Comparison(paired=bool(c.get("paired", False)), discordant=discordant,
                          difference=self.number(c, ("comparison", "difference")),
                          difference_error=self.number(c, ("comparison", "difference_error")),
                          sigma=self.number(c, ("comparison", "sigma")),
                          p_value=self.number(c, ("comparison", "p_value")),
                          sided=c.get("sided") or "one", test=c.get("test"),
                          stated=frozenset(k for k in ("paired", "sided", "test") if k in c))

    def _kind_inputs(self, d, estimate, sig, comparison, observed, background) -> None:
        """What the schema cannot say: which kinds may leave the estimate out,
        and the inputs a counting experiment needs."""
        counting = d["metric"] == "counts"
        if counting:
            for key, value in (("observed", observed), ("background", background)):
                if value is None:
                    self.fail((key,), f"a counting experiment (metric counts) needs {key}",
                              "give observed (events seen) and background (events expected without a signal)")
            if background.value <= 0:
                self.fail(("background",), f"background must be above 0, got {background.text}",
                          "the expected number of background events, such as 30.2")
        else:
            for key in ("observed", "background", "background_error"):
                if d.get(key) is not None:
                    self.fail((key,), f"{key} belongs to a counting experiment, but metric is {d['metric']}",
                              "write metric: counts, or leave out observed, background and background_error")
        if d.get("integer_data") is True and d["metric"] != "mean":
            # A field of another kind of claim, refused like observed above: integer_data says how
            # a mean's responses were scored, which no other metric has.
            kind = ("a proportion is already a count over whole items, and granularity tests it as one"
                    if d["metric"] == "proportion" else f"a {d['metric']} estimate is not a mean of responses")
            self.fail(("integer_data",), f"integer_data belongs to metric mean (a mean of whole-number "
                      f"responses), but metric is {d['metric']}; {kind}",
                      "leave integer_data out, or write metric: mean")
        if estimate is not None or counting or d.get("counts_table"):
            return
        only_significances = (sig.sigma is not None or sig.p_value is not None) and sig.global_sigma is not None
        printed_difference = comparison is not None and comparison.difference is not None
        if not (only_significances or printed_difference):
            self.fail(("estimate",), "estimate is missing", "give the headline value as printed; only "
                      + ESTIMATE_OPTIONAL + " may leave it out")


def _shortened(text: str, keep: int = 40) -> str:
    """A printed text as quoted in a message: a 400-digit number is shown by its
    first digits and its length."""
    return text if len(text) <= keep else f"{text[:keep]}... ({len(text):,} characters)"


def build_claim(doc: Document) -> Claim:
    """Turn a schema-valid Document into a Claim.

    Raises
    ------
    ClaimSchemaError
        For what the schema cannot say: a count that is not whole, a level
        outside (0, 1).
    """
    return _Builder(doc).build()
