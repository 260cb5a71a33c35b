"""Pasted text to one plain notation: LaTeX, Markdown, HTML and PDF-copied Unicode."""

from __future__ import annotations

import pytest

from checker.draft.normalize import normalize, printable, strip_control


@pytest.mark.parametrize("text, plain", [
    (r"$(2.24 \pm 0.21)\times 10^{-3}$", "(2.24 ± 0.21)× 10^-3"),
    ("(2.24 ± 0.21) × 10⁻³", "(2.24 ± 0.21) × 10^-3"),
    ("(2.24 +/- 0.21) x 10^-3", "(2.24 ± 0.21) × 10^-3"),
    ("2.24 +- 0.21", "2.24 ± 0.21"),
    (r"$7.9\sigma$", "7.9σ"),
    ("7.9\U0001d70e", "7.9σ"),
    ("\u22120.12 \u00b1 0.05", "-0.12 ± 0.05"),
    (r"0.21_{\rm stat}", "0.21_stat"),
    (r"$\mathcal{F}_{\mathrm{XEB}} = 0.5$", "F_XEB = 0.5"),
    (r"above $\frac{2}{3}$", "above 2/3"),
    (r"\num{1.85e-3}", "1.85e-3"),
    (r"1{,}200 items", "1,200 items"),
    ("25\u2009000\u2009000 samples", "25000000 samples"),
    ("91.3\u00a0%", "91.3 %"),
    ("p \u2248 0.003", "p ≈ 0.003"),
    ("p ~ 0.003", "p ≈ 0.003"),
    (r"p $\lesssim 10^{-5}$", "p < 10^-5"),
    (r"91.3\% of items", "91.3% of items"),
    ("2.5*10^7 shots", "2.5× 10^7 shots"),
    ("2.5 · 10^7", "2.5 × 10^7"),
    ("con\ufb01gurations", "configurations"),
    ("10<sup>-3</sup>", "10^-3"),
    ("&plusmn; 0.2 &times; 10", "± 0.2 × 10"),
    ("**0.913** ± `0.008`", "0.913 ± 0.008"),
    ("see [the table](https://example.org/t) here", "see the table here"),
    ("configu-\nrations", "configurations"),
    ("one line\nnext line", "one line next line"),
    ("# Title\nbody", "# Title\nbody"),
    (r"0.85--0.91", "0.85–0.91"),
    (r"as shown in \cite{smith2020} and Fig.~\ref{fig:3}", "as shown in and Fig."),
])
def test_normalize(text, plain):
    assert normalize(text) == plain


def test_latex_comment_only_in_latex_source():
    assert normalize("91.3\\% accuracy % a comment 42\nnext") == "91.3% accuracy next"
    assert normalize("91.3% accuracy") == "91.3% accuracy"


def test_control_characters_become_spaces_and_breaks_stay():
    assert strip_control("a\x00b\x07c\r\nd\re\x0cf\u200bg") == "a b c\nd\ne\nfg"


def test_printable_is_one_yaml_safe_line():
    text = printable("a\u2028b\x85c\ufeffd\ud800e\tf\n g", 100)
    assert text == "a b c d e f g"
    assert printable("word " * 50, 20).endswith("…") and len(printable("word " * 50, 20)) <= 20
