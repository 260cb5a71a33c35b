"""checker/render/survey_html.py: one self-contained page, every string escaped."""

import re
from html.parser import HTMLParser

from checker.render.survey_html import render_batch_html
from checker.survey import run_batch


class _Cells(HTMLParser):
    def __init__(self):
        super().__init__()
        self.rows, self.tags, self._cell = [], [], None

    def handle_starttag(self, tag, attrs):
        self.tags.append((tag, dict(attrs)))
        if tag == "tr":
            self.rows.append([])
        if tag in ("td", "th"):
            self._cell = ""

    def handle_endtag(self, tag):
        if tag in ("td", "th"):
            self.rows[-1].append(self._cell)
            self._cell = None

    def handle_data(self, data):
        if self._cell is not None:
            self._cell += data


def test_strings_are_escaped_and_the_page_stands_alone(tmp_path):
    path = tmp_path / "t.csv"
    path.write_text('title,metric,estimate,stat_error,samples,threshold,significance.sigma\n'
                    '"<script>alert(1)</script> & co",proportion,0.62,0.022,500,0.5,5.5\n'
                    '"<b>bad</b>",fidelity,0.62,0.022,500,0.5,5.5\n')
    result = run_batch(path)
    page = render_batch_html(result.frame, result.summary)
    assert "<script" not in page and "<b>" not in page
    assert "&lt;script&gt;alert(1)&lt;/script&gt; &amp; co" in page
    # Self-contained: no scripts, no outside stylesheets, images or links.
    assert not re.search(r"\b(src|href)=", page)
    parser = _Cells()
    parser.feed(page)
    header, *rows = parser.rows
    assert header[:4] == ["source", "claim", "verdict", "flagged checks"]
    assert len(rows) == 2
    assert rows[0][1] == "<script>alert(1)</script> & co"  # the text, shown as text
    assert rows[1][1] == "<b>bad</b>" and rows[1][2] == "unusable"
    assert "metric is 'fidelity'" in rows[1][-1]
    classes = [attrs.get("class") for tag, attrs in parser.tags if tag == "tr"][1:]
    assert classes == ["consistent", "unusable"]
