"""Number notations: every printed number in a normalised sentence, with the
text the claim loader will read its precision from.

A number keeps its printed digits and exponent: ``(2.24 ± 0.21) × 10^-3``
gives the value ``2.24e-3`` and the error ``0.21e-3`` (never ``0.00224``),
``2.24(21)e-3`` the same, ``0.913(8)`` gives ``0.913`` and ``0.008``,
``91.3%`` stays ``91.3%``, ``3 million`` becomes ``3e6`` and ``1,200``
becomes ``1200``.  The forms read here (after :mod:`.normalize`):

=====================  ==============================================
kind                   examples
=====================  ==============================================
``value``              ``0.913``, ``2.24e-3``, ``2.5 × 10^7``, ``10^-5``, ``91.3%``, ``3 million``, ``twelve``
``measurement``        ``x ± y``, ``x ± y (stat) ± z (syst)``, ``(x ± y) × 10^k``, ``x(y)``, ``x(y)(z)e-3``,
                       ``x^+a_-b``, ``x +a/-b``, ``x (+a, -b)``
``sigma``              ``7.9σ``, ``7.9 sigma``, ``7.9 standard deviations``, ``5-sigma``
``interval``           ``95% CI [a, b]``, ``95% confidence interval (a, b)``, ``95% CI a–b``, ``[a, b] (95% CI)``
``pair``               ``[a, b]``, ``(a, b)``, ``a–b``, ``a to b`` (an interval when the words say so)
``ratio``              ``1096/1200``, ``2/3``
=====================  ==============================================

Each mention also records the relation written just before it (``=``,
``<``, ``≈``, ``±``) and the guesses the notation itself forced (an exponent
printed once after ``x ± y`` read as applying to both).
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from decimal import Decimal, InvalidOperation


@dataclass(frozen=True)
class Number:
    """One printed number in the claim loader's notation.

    Attributes
    ----------
    text : str
        ``"2.24e-3"``, ``"91.3%"``, ``"1200"``: digits as printed.
    value : float
        Its value (a percentage divided by 100).
    whole : bool
        Written with all its digits: no point, no exponent, no percent sign.
    """

    text: str
    value: float
    whole: bool = False

    @property
    def percent(self) -> bool:
        return self.text.endswith("%")


@dataclass(frozen=True)
class Mention:
    """A number, or a group of numbers printed as one (a value with its errors)."""

    kind: str
    start: int
    end: int
    value: Number | None = None
    errors: tuple = ()  # ((Number, label), ...); label: stat, syst, sd, sem, total or ""
    plus: Number | None = None
    minus: Number | None = None
    low: Number | None = None
    high: Number | None = None
    level: Number | None = None
    method: str = ""  # the interval's name when printed (Wilson, Clopper-Pearson, ...)
    relation: str = ""
    notes: tuple = ()
    word: bool = False  # written as a word ("twelve")


MAX_NUMBER_CHARS = 200
_MANTISSA = r"(?:\d{1,3}(?:,\d{3})+(?![\d,])|\d+)(?:\.\d+)?|\.\d+"
_START = re.compile(r"(?<![\w.^_])(?<![A-Za-z]-)(?=\.?\d)")
_MANT = re.compile(_MANTISSA)
_POWER_ONLY = re.compile(r"10\s*\^\s*(?:\(\s*([-+]?\d{1,6})\s*\)|([-+]?\d{1,6}))(?!\d|\.\d)")
_EXPONENT = re.compile(
    r"[eE]([-+]?\d{1,6})(?!\w|\.\d)"
    r"|\s*×\s*10\s*\^\s*(?:\(\s*([-+]?\d{1,6})\s*\)|([-+]?\d{1,6}))(?!\d|\.\d)"
    r"|\s*×\s*10([-+]\d{1,3})(?!\d|\.\d)")
_MULTIPLIER = re.compile(r"\s*(thousand|million|billion|trillion)\b|([kKM])\b(?![-.]?\d)")
_MULTIPLIERS = {"thousand": 3, "million": 6, "billion": 9, "trillion": 12, "k": 3, "K": 3, "M": 6}
_PERCENT = re.compile(r"\s*(?:%|per\s?cent\b|percentage points?\b|pp\b)")
_PM = re.compile(r"\s*±\s*")
_LABEL_WORDS = (r"stat(?:istical|\.)?|syst(?:ematic|\.)?|sys|s\.d\.|sd|std|s\.e\.m\.|sem|s\.e\.|se"
                r"|total|tot")
_LABEL = re.compile(rf"\s*\(\s*({_LABEL_WORDS})\.?\s*\)|\s*_?\s*({_LABEL_WORDS})(?![\w])\.?", re.I)
_CONCISE = re.compile(r"\((\d+(?:\.\d+)?)\)")
# A value's error named in words in brackets: 30.2 (uncertainty 3.1), 0.913 (statistical error 0.008),
# 12.6 (± 0.4); the bracket must close right after the error.
_WORDED_ERROR = re.compile(
    r"\s*\(\s*(?:(?:(stat(?:istical)?|syst(?:ematic)?|standard)\.?\s+)?(?:uncertainty|error|unc\.)"
    r"\s*(?:of\s+|is\s+|=\s*|:\s*)?|±\s*)(?=[\d.])", re.I)
_WORDED_LABELS = {"stat": "stat", "statistical": "stat", "syst": "syst", "systematic": "syst", "standard": "sem"}
_WORDED_CLOSE = re.compile(r"\s*\)")
_ASYMMETRIC = (
    re.compile(rf"\s*\^\s*\+\s*({_MANTISSA})\s*_\s*-\s*({_MANTISSA})"),
    re.compile(rf"\s*_\s*-\s*({_MANTISSA})\s*\^\s*\+\s*({_MANTISSA})"),
    re.compile(rf"\s*\+\s*({_MANTISSA})\s*/\s*-\s*({_MANTISSA})"),
    re.compile(rf"\s*\(\s*\+\s*({_MANTISSA})\s*[,;/]\s*-\s*({_MANTISSA})\s*\)"),
)
_SIGMA = re.compile(r"\s*-?\s*(?:σ|sigma\b|standard\s+deviations?\b|s\.d\.(?!\w)|std\.?\s+devs?\b)", re.I)
_INTERVAL_WORDS = re.compile(
    r"\s*(?:(?:two|one)[- ]sided\s+)?(?:(Wilson|Wald|Clopper[- ]Pearson|Agresti[- ]Coull|Jeffreys|"
    r"bootstrap|exact|binomial|Bayesian|Feldman[- ]Cousins)(?:\s+score)?\s+)?"
    r"(?:CI|C\.I\.|c\.i\.|confidence\s+(?:interval|band|region|bounds?)|credible\s+interval|interval)"
    r"(?![\w])(?:\s*(?:of|is|was|=|:|,|from)?)\s*", re.I)
_TRAILING_LEVEL = re.compile(
    r"\s*\(?\s*(\d{1,2}(?:\.\d+)?)\s*%\s*(?:(?:two|one)[- ]sided\s+)?"
    r"(?:CI|C\.I\.|confidence(?:\s+(?:interval|level|band))?|credible\s+interval|interval)(?![\w])\s*\)?", re.I)
_OPEN = re.compile(r"[\[(]\s*")
_SEPARATOR = re.compile(r"\s*[,;]\s*")
_CLOSE = re.compile(r"\s*[\])]")
_RANGE = re.compile(r"\s*(?:–|to|-)\s*")
_RATIO = re.compile(r"\s*/\s*")
_OUT_OF = re.compile(r"\s+(?:out\s+of|of)\s+(?:the\s+|all\s+)?(?=\d)")
_WORD_NUMBERS = {
    "one": 1, "two": 2, "three": 3, "four": 4, "five": 5, "six": 6, "seven": 7, "eight": 8,
    "nine": 9, "ten": 10, "eleven": 11, "twelve": 12, "thirteen": 13, "fourteen": 14,
    "fifteen": 15, "sixteen": 16, "seventeen": 17, "eighteen": 18, "nineteen": 19, "twenty": 20,
    "thirty": 30, "forty": 40, "fifty": 50, "sixty": 60, "seventy": 70, "eighty": 80, "ninety": 90,
}
_WORD_NUMBER = re.compile(r"(?<![\w-])(%s)(?=\s+[a-z])" % "|".join(_WORD_NUMBERS), re.I)
_RELATION = re.compile(r"(=|<|>|≤|≥|≈|±)\s*$")


@dataclass(frozen=True)
class _Value:
    """A value being read: mantissa text (sign included), exponent, percent."""

    mantissa: str
    exponent: int | None
    percent: bool
    end: int


def _clean_mantissa(text: str) -> str:
    sign = "-" if text.startswith("-") else ""
    text = text.lstrip("+-").replace(",", "")
    if text.startswith("."):
        text = "0" + text
    whole, _, fraction = text.partition(".")
    whole = whole.lstrip("0") or "0"
    return sign + whole + ("." + fraction if fraction else "")


def number(mantissa: str, exponent: int | None = None, percent: bool = False) -> Number:
    """The :class:`Number` for a mantissa, a power of ten and a percent sign."""
    mantissa = _clean_mantissa(mantissa)
    text = mantissa + (f"e{exponent}" if exponent else "") + ("%" if percent else "")
    try:
        dec = Decimal(mantissa).scaleb(exponent or 0)
        value = float(dec / 100 if percent else dec)
    except (InvalidOperation, OverflowError):
        value = float("inf")
    whole = "." not in mantissa and not exponent and not percent
    return Number(text, value, whole)


def _number(v: _Value) -> Number:
    return number(v.mantissa, v.exponent, v.percent)


def _signed_start(text: str, pos: int) -> int:
    """``pos`` moved back over a sign that belongs to the number."""
    if pos >= 1 and text[pos - 1] in "-+":
        before = text[pos - 2] if pos >= 2 else " "
        if not (before.isalnum() or before in ").]%"):
            return pos - 1
    return pos


def _read_exponent(text: str, pos: int) -> tuple[int | None, int]:
    m = _EXPONENT.match(text, pos)
    if m:
        k = next(g for g in m.groups() if g is not None)
        return int(k.replace(" ", "")), m.end()
    return None, pos


def _read_value(text: str, pos: int, allow_exponent: bool = True) -> _Value | None:
    """A number at ``pos`` (a sign may precede): mantissa, exponent, percent."""
    sign = ""
    if pos < len(text) and text[pos] in "-+":
        sign, pos = text[pos], pos + 1
    m = _POWER_ONLY.match(text, pos)
    if m:
        percent = _PERCENT.match(text, m.end())
        end = percent.end() if percent else m.end()
        return _Value(sign + "1", int(m.group(1) or m.group(2)), bool(percent), end)
    m = _MANT.match(text, pos)
    if not m:
        return None
    mantissa, end = sign + m.group(), m.end()
    exponent = None
    if allow_exponent:
        exponent, end = _read_exponent(text, end)
        if exponent is None:
            mult = _MULTIPLIER.match(text, end)
            if mult:
                exponent, end = _MULTIPLIERS[mult.group(1) or mult.group(2)], mult.end()
    percent = _PERCENT.match(text, end)
    if percent and not text[percent.start():percent.end()].strip().startswith("%") and exponent:
        percent = None
    if percent:
        end = percent.end()
    return _Value(mantissa, exponent, bool(percent), end)


def _label(text: str, pos: int) -> tuple[str, int]:
    m = _LABEL.match(text, pos)
    if not m:
        return "", pos
    word = (m.group(1) or m.group(2)).lower().rstrip(".")
    label = {"statistical": "stat", "stat": "stat", "systematic": "syst", "syst": "syst",
             "sys": "syst", "s.d": "sd", "sd": "sd", "std": "sd", "s.e.m": "sem", "sem": "sem",
             "s.e": "sem", "se": "sem", "total": "total", "tot": "total"}.get(word, "")
    return label, m.end()


def _share(values: list[_Value], notes: list[str]) -> list[_Value]:
    """One exponent or percent sign printed once for a value and its errors
    applies to all of them."""
    exps = {v.exponent for v in values}
    if None in exps and len(exps) == 2:
        (k,) = exps - {None}
        if values[0].exponent is None and values[-1].exponent is not None:
            notes.append(f"the power of ten printed after the last error (10^{k}) is read as applying "
                         "to the value and every error")
        values = [_Value(v.mantissa, k if v.exponent is None else v.exponent, v.percent, v.end)
                  for v in values]
    if any(v.percent for v in values) and not all(v.percent for v in values):
        values = [_Value(v.mantissa, v.exponent, True, v.end) for v in values]
    return values


def _concise_error(mantissa: str, digits: str) -> str:
    """``2.24(21)`` -> ``0.21``: the digits in brackets count in the last
    printed place of the value (a bracket holding a point is read as is)."""
    if "." in digits:
        return digits
    places = len(mantissa.partition(".")[2])
    return format(Decimal(digits).scaleb(-places), "f")


def _measurement_after(text: str, v: _Value, start: int) -> Mention | None:
    """The errors printed after a value, if any."""
    notes: list[str] = []
    # Concise form: 2.24(21)e-3, 0.913(8), 0.913(8)(5)%.
    if v.exponent is None and not v.percent:
        m = _CONCISE.match(text, v.end)
        if m:
            errors = [m.group(1)]
            end = m.end()
            second = _CONCISE.match(text, end)
            if second:
                errors.append(second.group(1))
                end = second.end()
            exponent, end = _read_exponent(text, end)
            percent = _PERCENT.match(text, end)
            end = percent.end() if percent else end
            value = number(v.mantissa, exponent, bool(percent))
            labels = ("", "") if len(errors) == 1 else ("stat", "syst")
            errs = tuple((number(_concise_error(_clean_mantissa(v.mantissa), e), exponent, bool(percent)), lab)
                         for e, lab in zip(errors, labels))
            return Mention("measurement", start, end, value=value, errors=errs)
    # Asymmetric: x^+a_-b, x_-b^+a, x +a/-b, x (+a, -b).
    for i, pattern in enumerate(_ASYMMETRIC):
        m = pattern.match(text, v.end)
        if m:
            plus, minus = (m.group(2), m.group(1)) if i == 1 else (m.group(1), m.group(2))
            end = m.end()
            exponent, end = _read_exponent(text, end) if v.exponent is None else (v.exponent, end)
            percent = _PERCENT.match(text, end)
            end = percent.end() if percent else end
            pct = v.percent or bool(percent)
            return Mention("measurement", start, end, value=number(v.mantissa, exponent, pct),
                           plus=number(plus, exponent, pct), minus=number(minus, exponent, pct))
    # x (uncertainty y): one error, named in words in brackets.
    m = _WORDED_ERROR.match(text, v.end)
    if m:
        e = _read_value(text, m.end())
        close = _WORDED_CLOSE.match(text, e.end) if e is not None else None
        if close:
            values = _share([v, e], notes)
            label = _WORDED_LABELS.get((m.group(1) or "").lower(), "")
            return Mention("measurement", start, close.end(), value=_number(values[0]),
                           errors=((_number(values[1]), label),), notes=tuple(notes))
    # x ± y [label] [± z [label]], with a shared exponent or percent sign.
    values = [v]
    labels = []
    end = v.end
    for _ in range(2):
        m = _PM.match(text, end)
        if not m:
            break
        e = _read_value(text, m.end())
        if e is None or e.mantissa.startswith(("-", "+")):
            break
        label, end = _label(text, e.end)
        values.append(e)
        labels.append(label)
        if not label:
            end = e.end
    if len(values) == 1:
        return None
    # A power of ten or percent sign printed once after the labels:
    # 2.73 ± 0.135 (stat) ± 0.076 (syst) × 10^-3.
    if all(x.exponent is None for x in values):
        exponent, after = _read_exponent(text, end)
        if exponent is not None:
            values = [_Value(x.mantissa, exponent, x.percent, x.end) for x in values]
            end = after
    if not any(x.percent for x in values):
        percent = _PERCENT.match(text, end)
        if percent:
            values = [_Value(x.mantissa, x.exponent, True, x.end) for x in values]
            end = percent.end()
    values = _share(values, notes)
    return Mention("measurement", start, end, value=_number(values[0]),
                   errors=tuple((_number(e), lab) for e, lab in zip(values[1:], labels)),
                   notes=tuple(notes))


def _bounds(text: str, pos: int) -> tuple[_Value, _Value, int] | None:
    """``[a, b]``, ``(a, b)``, ``a–b``, ``a to b`` at ``pos``."""
    m = _OPEN.match(text, pos)
    if m:
        a = _read_value(text, m.end())
        if a is None:
            return None
        sep = _SEPARATOR.match(text, a.end)
        if not sep:
            return None
        b = _read_value(text, sep.end())
        if b is None:
            return None
        close = _CLOSE.match(text, b.end)
        if not close:
            return None
        end = close.end()
        percent = _PERCENT.match(text, end)
        if percent and text[percent.start():percent.end()].strip() == "%":
            a, b, end = _Value(a.mantissa, a.exponent, True, a.end), _Value(b.mantissa, b.exponent, True, b.end), percent.end()
        return a, b, end
    a = _read_value(text, pos)
    if a is None:
        return None
    sep = _RANGE.match(text, a.end)
    if not sep or (text[sep.start():sep.end()].strip() == "-" and " " in text[sep.start():sep.end()]):
        return None
    b = _read_value(text, sep.end())
    if b is None or b.mantissa.startswith("-"):
        return None
    return a, b, b.end


def _pair_mention(text, start, a, b, end, level=None, method=""):
    a, b = _share([a, b], [])
    kind = "interval" if level is not None else "pair"
    return Mention(kind, start, end, low=_number(a), high=_number(b), level=level, method=method)


def _parse_bracket(text: str, pos: int) -> Mention | None:
    """A group that opens with a bracket: ``(x ± y) × 10^k`` or ``[a, b]``."""
    inner = _OPEN.match(text, pos)
    v = _read_value(text, inner.end(), allow_exponent=True)
    if v is None:
        return None
    if text[pos] == "(":
        values = [v]
        labels = []
        end = v.end
        for _ in range(2):
            m = _PM.match(text, end)
            if not m:
                break
            e = _read_value(text, m.end())
            if e is None:
                break
            label, end = _label(text, e.end)
            if not label:
                end = e.end
            values.append(e)
            labels.append(label)
        close = re.compile(r"\s*\)").match(text, end)
        if len(values) > 1 and close:
            end = close.end()
            exponent, end = _read_exponent(text, end)
            percent = _PERCENT.match(text, end)
            if percent:
                end = percent.end()
            values = [_Value(x.mantissa, x.exponent if x.exponent is not None else exponent,
                             x.percent or bool(percent), x.end) for x in values]
            notes: list[str] = []
            values = _share(values, notes)
            return Mention("measurement", pos, end, value=_number(values[0]),
                           errors=tuple((_number(e), lab) for e, lab in zip(values[1:], labels)),
                           notes=tuple(notes))
    bounds = _bounds(text, pos)
    if bounds is None:
        return None
    a, b, end = bounds
    level = _TRAILING_LEVEL.match(text, end)
    if level:
        return _pair_mention(text, pos, a, b, level.end(), number(level.group(1), None, True))
    return _pair_mention(text, pos, a, b, end)


def _parse_at(text: str, pos: int) -> Mention | None:
    start = _signed_start(text, pos)
    v = _read_value(text, start)
    if v is None:
        return None
    # A confidence level followed by its interval: 95% CI [a, b].
    if v.percent or v.mantissa.startswith("0."):
        words = _INTERVAL_WORDS.match(text, v.end)
        if words:
            bounds = _bounds(text, words.end())
            if bounds is not None:
                a, b, end = bounds
                method = (words.group(1) or "").replace(" ", "-")
                level = _number(_Value(v.mantissa, v.exponent, v.percent, v.end))
                return _pair_mention(text, start, a, b, end, level, method)
    measurement = _measurement_after(text, v, start)
    if measurement is not None:
        return measurement
    sigma = _SIGMA.match(text, v.end)
    if sigma and not v.percent:
        return Mention("sigma", start, sigma.end(), value=_number(v))
    ratio = _RATIO.match(text, v.end)
    if ratio and v.exponent is None and not v.percent and re.fullmatch(r"[\d,]+", v.mantissa):
        b = _read_value(text, ratio.end(), allow_exponent=False)
        if b is not None and re.fullmatch(r"[\d,]+", b.mantissa) and not b.percent:
            return Mention("ratio", start, b.end, low=_number(v), high=_number(b))
    # k of N, k out of N: a count out of a whole when both are whole and k <= N.
    out_of = _OUT_OF.match(text, v.end)
    if out_of and v.exponent is None and not v.percent and re.fullmatch(r"[\d,]+", v.mantissa):
        b = _read_value(text, out_of.end(), allow_exponent=False)
        if (b is not None and re.fullmatch(r"[\d,]+", b.mantissa) and not b.percent
                and int(v.mantissa.replace(",", "")) <= int(b.mantissa.replace(",", ""))):
            return Mention("ratio", start, b.end, low=_number(v), high=_number(b))
    if not v.percent and v.exponent is None and "." in v.mantissa:
        rng = _RANGE.match(text, v.end)
        if rng and text[rng.start():rng.end()].strip() in ("–", "to"):
            bounds = _bounds(text, start)
            if bounds is not None:
                a, b, end = bounds
                return _pair_mention(text, start, a, b, end)
    return Mention("value", start, v.end, value=_number(v))


def _relation_before(text: str, start: int) -> str:
    m = _RELATION.search(text, max(0, start - 4), start)
    return m.group(1) if m else ""


def find_mentions(text: str, limit: int | None = None) -> list[Mention]:
    """Every number of a normalised text, in order, each read once.

    ``limit`` stops after that many mentions (a bound on the work for a
    text that is nothing but numbers).
    """
    found: list[Mention] = []
    consumed = 0
    for m in _START.finditer(text):
        pos = m.start()
        if pos < consumed:
            continue
        mention = None
        bracket = pos - 1
        while bracket >= consumed and text[bracket] == " ":
            bracket -= 1
        if bracket >= consumed and text[bracket] in "([":
            mention = _parse_bracket(text, bracket)
        if mention is None:
            mention = _parse_at(text, pos)
        if mention is None:
            continue
        if mention.end - mention.start > MAX_NUMBER_CHARS:
            # A run of hundreds of digits is no printed measurement.
            consumed = mention.end
            continue
        relation = _relation_before(text, mention.start)
        if relation:
            mention = _replace(mention, relation=relation)
        found.append(mention)
        consumed = mention.end
        if limit is not None and len(found) >= limit:
            return found
    for m in _WORD_NUMBER.finditer(text):
        if any(f.start <= m.start() < f.end for f in found):
            continue
        value = _WORD_NUMBERS[m.group(1).lower()]
        found.append(Mention("value", m.start(), m.end(), value=Number(str(value), float(value), True),
                             word=True))
    found.sort(key=lambda f: f.start)
    return found


def _replace(mention: Mention, **changes) -> Mention:
    from dataclasses import replace

    return replace(mention, **changes)
