"""The Claim: frozen dataclasses in which every number is a Reported value,
the float together with the interval its printed digits stand for."""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
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
COUNT_FIELDS = {"qubits", "samples", "circuits", "trials", "items", "count"}
# Fields where a percentage means nothing: counts, and significances in sigma.
NO_PERCENT_FIELDS = COUNT_FIELDS | {"sigma", "required_sigma", "global_sigma", "upcrossings", "upcrossing_sigma"}


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
class Claim:
    """One benchmark claim, as printed."""

    file: str
    title: str
    metric: str
    estimate: Reported
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
    counts_table: CountsTable | None = None
    rates: tuple[PrintedRate, ...] = ()

    @property
    def qubit_count(self) -> int | None:
        return int(self.qubits.value) if self.qubits is not None else None


class _Builder:
    def __init__(self, doc: Document):
        self.doc = doc

    def fail(self, path, problem, allowed):
        raise ClaimSchemaError(self.doc.file, problem, allowed, path=dotted(path),
                               line=self.doc.line_of(path))

    def number(self, container: dict, path: tuple) -> Reported | None:
        key = path[-1]
        if key not in container or container[key] is None:
            return None
        raw = container[key]
        text = self.doc.texts.get(path)
        if text is None or isinstance(raw, str):
            text = str(raw)
        text = text.strip()
        name = str(key)
        if text.startswith("<"):
            bound = self._parse(text[1:], path, name, exact=True, shown=text)
            return Reported(bound.value, 0.0, bound.value, text, dotted(path), self.doc.line_of(path),
                            -math.inf, bound.log_high)
        counting = name in COUNT_FIELDS
        if name in NO_PERCENT_FIELDS and text.endswith("%"):
            what = "a count" if counting else "a significance in sigma"
            self.fail(path, f"{name} is {what}, so the percentage {text} means nothing",
                      "write it without a percent sign, such as " + ("30 or 2.5e7" if counting else "4.2"))
        exact = path in EXACT_FIELDS or (counting and count_is_exact(text))
        printed = self._parse(text, path, name, exact)
        if counting and (printed.value < 1 or printed.value != math.floor(printed.value)):
            self.fail(path, f"{name} must be a whole number of at least 1, got {text}",
                      "counts are whole numbers such as 30 or 2.5e7")
        return Reported(printed.value, printed.low, printed.high, text, dotted(path),
                        self.doc.line_of(path), printed.log_low, printed.log_high)

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
        qubits = num("qubits")
        if qubits is not None and qubits.value > 1000:
            self.fail(("qubits",), f"qubits must be at most 1000, got {qubits.text}",
                      "give the number of qubits of the device")
        return Claim(
            file=self.doc.file, title=str(d["title"]), metric=d["metric"],
            estimate=num("estimate"), source=d.get("source"), qubits=qubits,
            stat_error=num("stat_error"), syst_error=num("syst_error"), interval=interval,
            samples=num("samples"), circuits=num("circuits"), sd=num("sd"),
            threshold=num("threshold"), significance=sig, trials=num("trials"), parts=parts,
            combination=combination, extrapolation=extrapolation, error_budget=budget,
            integer_data=bool(d.get("integer_data", False)), items=num("items"),
            tolerance=tolerance.value if tolerance is not None else DEFAULT_TOLERANCE,
            counts_table=counts_table, rates=rates,
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
