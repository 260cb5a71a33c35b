"""Number notations: each printed number read once, keeping its printed digits."""

from __future__ import annotations

import pytest

from checker.draft.normalize import normalize
from checker.draft.notation import find_mentions, number


def read(text):
    return [m for m in find_mentions(normalize(text))]


def one(text):
    found = read(text)
    assert len(found) == 1, found
    return found[0]


@pytest.mark.parametrize("text, value, errors", [
    ("(2.24 ± 0.21) × 10^-3", "2.24e-3", [("0.21e-3", "")]),
    (r"$(2.24 \pm 0.21)\times10^{-3}$", "2.24e-3", [("0.21e-3", "")]),
    (r"$(2.24 \pm 0.21) \cdot 10^{-3}$", "2.24e-3", [("0.21e-3", "")]),
    ("(2.24 ± 0.21) × 10⁻³", "2.24e-3", [("0.21e-3", "")]),
    ("(2.24 ± 0.21) × 10\u22123", "2.24e-3", [("0.21e-3", "")]),  # a PDF copy that lost the superscript
    ("(2.24 +/- 0.21) x 10^-3", "2.24e-3", [("0.21e-3", "")]),
    ("2.24e-3 ± 0.21e-3", "2.24e-3", [("0.21e-3", "")]),
    ("2.24E-3 ± 0.21E-3", "2.24e-3", [("0.21e-3", "")]),
    ("2.24(21)e-3", "2.24e-3", [("0.21e-3", "")]),
    ("2.24(21) × 10^-3", "2.24e-3", [("0.21e-3", "")]),
    ("0.913(8)", "0.913", [("0.008", "")]),
    ("12.3(1.2)", "12.3", [("1.2", "")]),
    ("1234(56)", "1234", [("56", "")]),
    ("1.2(3)(1)e-3", "1.2e-3", [("0.3e-3", "stat"), ("0.1e-3", "syst")]),
    ("1.85 ± 0.20 (stat) ± 0.08 (syst)", "1.85", [("0.20", "stat"), ("0.08", "syst")]),
    (r"2.24 \pm 0.21_{\rm stat} \pm 0.08_{\rm syst}", "2.24", [("0.21", "stat"), ("0.08", "syst")]),
    ("2.73 ± 0.135 (stat) ± 0.076 (syst) × 10^-3", "2.73e-3", [("0.135e-3", "stat"), ("0.076e-3", "syst")]),
    ("(1.85 ± 0.20 (stat) ± 0.08 (syst)) × 10^-3", "1.85e-3", [("0.20e-3", "stat"), ("0.08e-3", "syst")]),
    ("0.874 ± 0.052 (sd)", "0.874", [("0.052", "sd")]),
    ("0.742 ± 0.031 (s.e.m.)", "0.742", [("0.031", "sem")]),
    ("91.3 ± 0.8%", "91.3%", [("0.8%", "")]),
    ("91.3% ± 0.8%", "91.3%", [("0.8%", "")]),
    ("91.3 % ± 0.8 %", "91.3%", [("0.8%", "")]),
    ("\u22120.12 \u00b1 0.05", "-0.12", [("0.05", "")]),
    ("0.00730 ± 0.000183", "0.00730", [("0.000183", "")]),
    ("2.24 ± 0.21 × 10^-3", "2.24e-3", [("0.21e-3", "")]),
    # The error named in words in brackets.
    ("30.2 (uncertainty 3.1)", "30.2", [("3.1", "")]),
    ("30.2 (uncertainty of 3.1)", "30.2", [("3.1", "")]),
    ("0.913 (statistical error 0.008)", "0.913", [("0.008", "stat")]),
    ("0.913 (standard error: 0.008)", "0.913", [("0.008", "sem")]),
    ("0.0018 (systematic uncertainty 0.0003)", "0.0018", [("0.0003", "syst")]),
    ("91.3% (error 0.8%)", "91.3%", [("0.8%", "")]),
    ("12.6 (± 0.4)", "12.6", [("0.4", "")]),
])
def test_measurements(text, value, errors):
    m = one(text)
    assert m.kind == "measurement"
    assert m.value.text == value
    assert [(e.text, label) for e, label in m.errors] == errors


def test_a_shared_power_of_ten_printed_once_is_noted():
    assert one("2.24 ± 0.21 × 10^-3").notes
    assert not one("(2.24 ± 0.21) × 10^-3").notes


@pytest.mark.parametrize("text, value, plus, minus", [
    (r"$1.85^{+0.22}_{-0.18}$", "1.85", "0.22", "0.18"),
    (r"$1.85_{-0.18}^{+0.22} \times 10^{-3}$", "1.85e-3", "0.22e-3", "0.18e-3"),
    ("1.85 +0.22/-0.18", "1.85", "0.22", "0.18"),
    ("1.85 (+0.22, -0.18)", "1.85", "0.22", "0.18"),
])
def test_asymmetric(text, value, plus, minus):
    m = one(text)
    assert (m.value.text, m.plus.text, m.minus.text) == (value, plus, minus)


@pytest.mark.parametrize("text, value", [
    ("0.913", "0.913"), ("2.24e-3", "2.24e-3"), ("2.5 × 10^7", "2.5e7"), ("2.5×10^{7}", "2.5e7"),
    ("10^7", "1e7"), ("10^{-5}", "1e-5"), ("10⁻⁵", "1e-5"), ("91.3%", "91.3%"), ("91.3 percent", "91.3%"),
    ("3 million", "3e6"), ("2.5 million", "2.5e6"), ("1.2 billion", "1.2e9"), ("200k", "200e3"),
    ("1,200", "1200"), ("25,000,000", "25000000"), ("007", "7"), (".5", "0.5"), ("1e-348", "1e-348"),
    ("2.5 × 10^(7)", "2.5e7"), ("4.0e+06", "4.0e6"),
])
def test_values(text, value):
    m = one(text)
    assert m.kind == "value" and m.value.text == value


def test_whole_and_exact_counts():
    assert number("1200").whole and not number("2.5", 7).whole and not number("12", None, True).whole
    assert number("2.5", 7).value == 25_000_000


@pytest.mark.parametrize("text", ["7.9σ", "7.9 sigma", "7.9 standard deviations", r"$7.9\sigma$",
                                  "7.9-sigma", "7.9 s.d."])
def test_sigma(text):
    m = one(text)
    assert m.kind == "sigma" and m.value.text == "7.9"


@pytest.mark.parametrize("text, low, high, level, method", [
    ("95% CI [0.85, 0.91]", "0.85", "0.91", "95%", ""),
    ("95% confidence interval (0.85, 0.91)", "0.85", "0.91", "95%", ""),
    ("95% CI: 89.5–92.6%", "89.5%", "92.6%", "95%", ""),
    ("95% CI 89.5% to 92.6%", "89.5%", "92.6%", "95%", ""),
    ("95% Wilson interval [89.5%, 92.6%]", "89.5%", "92.6%", "95%", "Wilson"),
    ("[0.85, 0.91] (95% CI)", "0.85", "0.91", "95%", ""),
    ("68.3% CI [1.2e-3, 2.4e-3]", "1.2e-3", "2.4e-3", "68.3%", ""),
])
def test_intervals(text, low, high, level, method):
    m = one(text)
    assert m.kind == "interval"
    assert (m.low.text, m.high.text, m.level.text, m.method) == (low, high, level, method)


@pytest.mark.parametrize("text, low, high", [("[0.85, 0.91]", "0.85", "0.91"), ("(0.85, 0.91)", "0.85", "0.91"),
                                             ("0.85–0.91", "0.85", "0.91"), ("0.85 to 0.91", "0.85", "0.91")])
def test_pairs(text, low, high):
    m = one(text)
    assert (m.kind, m.low.text, m.high.text) == ("pair", low, high)


def test_ratio_and_relations():
    m = one("1096/1200")
    assert (m.kind, m.low.text, m.high.text) == ("ratio", "1096", "1200")
    assert one("p < 10^{-5}").relation == "<"
    assert one("p = 1.4 × 10^{-15}").relation == "="
    assert one("p ≈ 0.003").relation == "≈"


def test_word_numbers_and_names():
    found = read("twelve circuits on the Kestrel-30 device, a 30-qubit chip, version v2, one-sided")
    assert [(m.value.text, m.word) for m in found] == [("12", True), ("30", False)]


def test_a_sentence_end_is_not_part_of_a_number():
    m = one("the threshold of 1.0e-3.")
    assert m.value.text == "1.0e-3"
    m = one("give (1.78 ± 0.20) × 10^-3.")
    assert m.value.text == "1.78e-3"


def test_limit_bounds_the_work():
    text = " ".join(str(i) for i in range(1000))
    assert len(find_mentions(text, limit=10)) == 10


def test_words_in_brackets_that_do_not_close_on_the_error_are_no_error():
    # "30.2 (uncertainty 3.1 from the sidebands)" leaves the bracket open: two numbers, as before.
    assert [m.kind for m in read("30.2 (uncertainty 3.1 from the sidebands)")] == ["value", "value"]
    assert [m.kind for m in read("30.2 (error rate 0.01)")] == ["value", "value"]
