"""Pasted text to one plain notation, so that the number notations and the
sentence rules meet each number in one spelling.

Text copied from a PDF, LaTeX source and Markdown spell the same number in
many ways: ``$(2.24 \\pm 0.21)\\times10^{-3}$``, ``(2.24 ± 0.21) × 10⁻³``,
``(2.24 +/- 0.21) x 10^-3``.  After :func:`normalize` all of these read
``(2.24 ± 0.21) × 10^-3``:

- control characters become spaces (line breaks stay), zero-width characters
  go, PDF hyphenation at a line end is joined, single line breaks inside a
  paragraph become spaces;
- LaTeX: math delimiters go; ``\\pm``, ``\\times``, ``\\cdot``, ``\\sigma``,
  ``\\approx``, ``\\le``, ``\\%`` become their symbols; ``\\text{..}``,
  ``\\mathrm{..}`` and the like keep their content; ``\\frac{a}{b}`` becomes
  ``a/b``; ``\\cite``, ``\\ref`` and ``\\label`` go with their argument; braces
  go (``10^{-3}`` -> ``10^-3``, ``1{,}200`` -> ``1,200``); a bare ``%`` starts a
  comment only in LaTeX source (text holding ``\\%`` or ``\\documentclass``);
- Unicode: minus signs become ``-``, an en dash stays (it marks a range),
  superscripts become ``^`` and ASCII (``10⁻³`` -> ``10^-3``), thin and
  no-break spaces become spaces (or vanish between digit groups:
  ``25 000 000``), ``·``/``⋅`` become ``×``, ``∼``/``≃`` become ``≈``, and the
  rest is NFKC-normalised (ligatures such as ``ﬁ``).

Quotes in a draft are taken from the normalised text: what a person reads in
the comment is the notation the rules saw.
"""

from __future__ import annotations

import html
import re
import unicodedata

# Characters PyYAML refuses in a document or that would end a comment line
# (NEL and the Unicode line separators count as line breaks in YAML 1.1).
_UNPRINTABLE = re.compile("[^\t\n\x20-\x7e\xa0-\u2027\u202a-\ud7ff\ue000-\ufefe\uff00-\ufffd"
                          "\U00010000-\U0010ffff]")
_CONTROL = re.compile("[\x00-\x08\x0e-\x1f\x7f-\x9f]")
_ZERO_WIDTH = re.compile("[\u200b\u200c\u200d\u2060\ufeff\u00ad]")

_SUPERSCRIPTS = {"⁰": "0", "¹": "1", "²": "2", "³": "3", "⁴": "4", "⁵": "5", "⁶": "6", "⁷": "7",
                 "⁸": "8", "⁹": "9", "⁺": "+", "⁻": "-", "⁼": "="}
_SUBSCRIPTS = {"₀": "0", "₁": "1", "₂": "2", "₃": "3", "₄": "4", "₅": "5", "₆": "6", "₇": "7",
               "₈": "8", "₉": "9", "₊": "+", "₋": "-"}
_SUPER_RUN = re.compile("[⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻⁼]+")
_SUB_RUN = re.compile("[₀₁₂₃₄₅₆₇₈₉₊₋]+")

# One character -> its plain spelling (applied before NFKC, which would turn
# some of them into something less useful).
_CHARACTERS = {
    "\u2212": "-", "\u2010": "-", "\u2011": "-", "\ufe63": "-", "\uff0d": "-", "\u2012": "–",
    "\u2013": "–", "\u2014": "—", "\u2015": "—",
    "\u00d7": "×", "\u22c5": "×", "\u00b7": "×", "\u2219": "×", "\u2715": "×", "\u2716": "×",
    "\u00b1": "±", "\u2213": "±",
    "\u03c3": "σ", "\U0001d70e": "σ", "\U0001d748": "σ", "\U0001d6d4": "σ",
    "\u2248": "≈", "\u2243": "≈", "\u2245": "≈", "\u223c": "≈", "\u2272": "<", "\u2273": ">",
    "\u2264": "≤", "\u2a7d": "≤", "\u2265": "≥", "\u2a7e": "≥", "\u226a": "<", "\u226b": ">",
    "\u2044": "/", "\u2215": "/", "\uff05": "%", "\u066a": "%",
    "\u2018": "'", "\u2019": "'", "\u201c": '"', "\u201d": '"',
    "\u2026": "...",
}
# Spaces that are no space in a number: thin, narrow no-break, figure, hair.
_GROUPING_SPACE = "\u00a0\u2009\u202f\u2007\u200a\u2006\u2005"
_DIGIT_GROUPS = re.compile(rf"(?<=\d)[{_GROUPING_SPACE}](?=\d{{3}}(?!\d))")
_OTHER_SPACE = re.compile("[\u00a0\u2000-\u200a\u202f\u205f\u3000]")

_LATEX_SYMBOLS = {
    "pm": "±", "mp": "±", "textpm": "±", "times": "×", "cdot": "×", "cdotp": "×",
    "sigma": "σ", "varsigma": "σ", "approx": "≈", "simeq": "≈", "sim": "≈", "lesssim": "<",
    "gtrsim": ">", "le": "≤", "leq": "≤", "leqslant": "≤", "lt": "<", "ge": "≥", "geq": "≥",
    "geqslant": "≥", "gt": ">", "ll": "<", "gg": ">", "textendash": "–", "textemdash": "—",
    "dots": "...", "ldots": "...", "cdots": "...", "tau": "τ", "chi": "χ", "mu": "μ",
    "alpha": "α", "beta": "β", "gamma": "γ", "delta": "δ", "Delta": "Δ", "epsilon": "ε",
    "varepsilon": "ε", "lambda": "λ", "pi": "π", "rho": "ρ", "theta": "θ", "eta": "η",
    "nu": "ν", "phi": "φ", "Phi": "Φ", "psi": "ψ", "omega": "ω", "Omega": "Ω",
    "quad": " ", "qquad": " ", "enspace": " ", "thinspace": " ", "negthinspace": "",
    "newline": "\n", "par": "\n\n", "item": "\n", "%": "%", "&": "&", "$": "$", "#": "#", "_": "_",
    ",": " ", ";": " ", ":": " ", "!": "", " ": " ", "\\": "\n",
}
# Commands dropped with their one argument.
_DROP_WITH_ARGUMENT = ("cite", "citep", "citet", "ref", "eqref", "autoref", "cref", "Cref", "label",
                       "url", "href", "includegraphics", "footnotemark", "vspace", "hspace",
                       "bibitem", "bibliography", "bibliographystyle", "documentclass",
                       "usepackage", "input", "include")
_FRACTION = re.compile(r"\\[dt]?frac\s*\{([^{}]*)\}\s*\{([^{}]*)\}")
_SI = re.compile(r"\\SI\s*(?:\[[^\]]*\])?\s*\{([^{}]*)\}\s*\{([^{}]*)\}")
_DROP = re.compile(r"\\(?:%s)\*?\s*(?:\[[^\]]*\])?\s*\{[^{}]*\}" % "|".join(_DROP_WITH_ARGUMENT))
_ANY_COMMAND = re.compile(r"\\[A-Za-z]{2,}")
_COMMAND = re.compile(r"\\([A-Za-z]+|[%&$#_,;:! \\])")
_LATEX_COMMENT = re.compile(r"(?<!\\)%[^\n]*")
_MATH_DELIMITER = re.compile(r"\\[()\[\]]|\$")
_BRACED_COMMA = re.compile(r"\{,\}")
_BEGIN_END = re.compile(r"\\(?:begin|end)\s*\{[A-Za-z*]+\}")

_HTML_ENTITY = re.compile(r"&(?:#[0-9]{1,7}|#x[0-9a-fA-F]{1,6}|[A-Za-z]{2,8});")
_HTML_SUP = re.compile(r"<sup>\s*([^<]{0,12}?)\s*</sup>", re.I)
_HTML_SUB = re.compile(r"<sub>\s*([^<]{0,12}?)\s*</sub>", re.I)
_HTML_TAG = re.compile(r"</?[A-Za-z][A-Za-z0-9]*(?:\s[^<>]{0,200})?>")

_PLUS_MINUS = re.compile(r"\+\s*/\s*-|\+-(?=\s*[0-9.])")
_LETTER_TIMES = re.compile(r"(?<=[0-9)\s])[xX*]\s*(?=10\s*\^|10[-−][0-9])")
_POWER_STARS = re.compile(r"(?<=10)\*\*")
_MARKDOWN_LINK = re.compile(r"\[([^\[\]]{1,200})\]\((?:https?://|www\.)[^()\s]{0,500}\)")
_MARKDOWN_EMPHASIS = re.compile(r"\*\*|__(?=\w)|(?<=\w)__|`+|(?<![\w*])\*(?=\S)|(?<=\S)\*(?![\w*])")
_SCRIPT_SPACE = re.compile(r"([_^])[ \t]+(?=[A-Za-z0-9+-])")
_HYPHEN_BREAK = re.compile(r"(?<=[a-z])-\n[ \t]*(?=[a-z])")
_SPACES = re.compile(r"[ \t]+")
_LINE_SPACES = re.compile(r" *\n *")
_PARAGRAPH = re.compile(r"\n{2,}")


def looks_like_latex(text: str) -> bool:
    """LaTeX source: a bare ``%`` there starts a comment."""
    return "\\%" in text or "\\documentclass" in text or "\\begin{document}" in text


def strip_control(text: str) -> str:
    """Line breaks kept (``\\r\\n``, ``\\r``, form feed, vertical tab -> ``\\n``);
    tabs kept; every other control character becomes a space."""
    text = text.replace("\r\n", "\n").replace("\r", "\n").replace("\f", "\n").replace("\v", "\n")
    text = _CONTROL.sub(" ", text)
    return _ZERO_WIDTH.sub("", text)


def _latex(text: str) -> str:
    latex = _ANY_COMMAND.search(text) is not None
    if looks_like_latex(text):
        text = _LATEX_COMMENT.sub("", text)
    text = _BEGIN_END.sub(" ", text)
    text = _DROP.sub("", text)
    # Twice: one level of nesting inside a fraction or \SI (\frac{\text{2}}{3}).
    for _ in range(2):
        text = _FRACTION.sub(lambda m: f"{m.group(1)}/{m.group(2)}", text)
        text = _SI.sub(lambda m: f"{m.group(1)} {m.group(2)}", text)
    text = _COMMAND.sub(lambda m: _LATEX_SYMBOLS.get(m.group(1), " " if m.group(1) in ("rm", "it", "bf") else ""), text)
    text = _MATH_DELIMITER.sub("", text)
    text = _BRACED_COMMA.sub(",", text)
    # A tilde is a no-break space in LaTeX and "about" in plain text.
    tilde = " " if latex else "≈"
    text = text.replace("{", "").replace("}", "").replace("~", tilde)
    return text.replace("---", "—").replace("--", "–")


def _unicode(text: str) -> str:
    text = _SUPER_RUN.sub(lambda m: "^" + "".join(_SUPERSCRIPTS[c] for c in m.group()), text)
    text = _SUB_RUN.sub(lambda m: "_" + "".join(_SUBSCRIPTS[c] for c in m.group()), text)
    text = _DIGIT_GROUPS.sub("", text)
    text = _OTHER_SPACE.sub(" ", text)
    out = []
    for char in text:
        if char < "\x80":
            out.append(char)
        elif char in _CHARACTERS:
            out.append(_CHARACTERS[char])
        else:
            plain = unicodedata.normalize("NFKC", char)
            out.append(_CHARACTERS.get(plain, plain) if len(plain) == 1 else plain)
    return "".join(out)


def _markup(text: str) -> str:
    text = _HTML_SUP.sub(lambda m: "^" + m.group(1), text)
    text = _HTML_SUB.sub(lambda m: "_" + m.group(1), text)
    text = _HTML_TAG.sub(" ", text)
    text = _HTML_ENTITY.sub(lambda m: html.unescape(m.group()), text)
    text = _MARKDOWN_LINK.sub(lambda m: m.group(1), text)
    return _MARKDOWN_EMPHASIS.sub("", text)


def normalize(text: str) -> str:
    """The plain notation of a pasted text (see the module docstring).

    Paragraph breaks stay as one blank line; a single line break inside a
    paragraph becomes a space unless the line is a Markdown heading or list
    item.
    """
    text = strip_control(text)
    text = _latex(text)
    text = _markup(text)
    text = _unicode(text)
    text = _PLUS_MINUS.sub("±", text)
    text = _POWER_STARS.sub("^", text)
    text = _LETTER_TIMES.sub("× ", text)
    text = _SCRIPT_SPACE.sub(r"\1", text)
    text = text.replace("\t", " ")
    text = _HYPHEN_BREAK.sub("", text)
    text = _SPACES.sub(" ", text)
    text = _LINE_SPACES.sub("\n", text)
    return _join_lines(text).strip()


_KEEP_LINE = re.compile(r"^(?:#{1,6}\s|[-*+]\s|\d{1,2}[.)]\s|(?:title|source)\s*:)", re.I)


def _join_lines(text: str) -> str:
    """Single line breaks inside a paragraph become spaces (a PDF copy breaks
    every line); headings and list items keep their own line."""
    paragraphs = []
    for block in _PARAGRAPH.split(text):
        lines = block.split("\n")
        joined = [lines[0]]
        for line in lines[1:]:
            if _KEEP_LINE.match(line) or _KEEP_LINE.match(joined[-1]):
                joined.append("\n" + line)
            else:
                joined.append(" " + line)
        paragraphs.append("".join(joined))
    return "\n\n".join(paragraphs)


def printable(text: str, limit: int | None = None) -> str:
    """``text`` made safe for a YAML comment or quoted string: one line, only
    characters YAML accepts, at most ``limit`` characters (cut at a word)."""
    text = _UNPRINTABLE.sub(" ", text.replace("\t", " "))
    text = " ".join(text.split())
    if limit is not None and len(text) > limit:
        cut = text.rfind(" ", 0, limit - 1)
        text = text[: cut if cut > limit // 2 else limit - 1].rstrip(" ,;:") + "…"
    return text
