"""checker.visible: control characters shown, encodings respected."""

from __future__ import annotations

import io
import json

import pytest

from checker.render.json import dumps
from checker.visible import SafeStream, ascii_spelled, for_stream, json_safe, visible


@pytest.mark.parametrize("raw, shown", [
    ("\x1b[31mred", "\\x1b[31mred"), ("bell\x07", "bell\\x07"), ("a\rb", "a\\x0db"), ("\x9b1m", "\\x9b1m"),
    ("\u202eabc", "\\u202eabc"), ("\ud800", "\\ud800"), ("nul\x00", "nul"), ("del\x7f", "del\\x7f"),
    ("tab\tand\nnewline", "tab\tand\nnewline"), ("plain ± é σ", "plain ± é σ"),
])
def test_visible(raw, shown):
    assert visible(raw) == shown
    assert visible(visible(raw)) == visible(raw)  # once is enough
    visible(raw).encode("utf-8")  # always encodable


def test_json_keeps_the_exact_string():
    title = "\x1b[2J\u202e\ud800\x9b\x00 end"
    text = dumps({"title": title})
    assert json.loads(text)["title"] == title
    assert "\x1b" not in text and "\u202e" not in text and "\x9b" not in text
    assert json_safe('{"a": "\x85"}') == '{"a": "\\u0085"}'


def test_ascii_spellings_on_streams_that_cannot_encode():
    assert ascii_spelled("2.1 ± 0.3 × 10⁻³, I² ≤ 0.5, σ") == "2.1 +- 0.3 x 10^-3, I^2 <= 0.5, sigma"
    assert for_stream("± é", "ascii") == "+- \\xe9"
    assert for_stream("± é", "latin-1") == "± é"  # latin-1 holds both
    assert for_stream("± σ", "latin-1") == "+- sigma"
    assert for_stream("±", None) == "±"  # a StringIO has no encoding


def test_safe_stream_writes_through():
    raw = io.BytesIO()
    stream = SafeStream(io.TextIOWrapper(raw, encoding="ascii", write_through=True))
    stream.write("F = 0.5 ± 0.1 \x1b[0m\n")
    assert raw.getvalue() == b"F = 0.5 +- 0.1 \\x1b[0m\n"
    assert not stream.isatty()
