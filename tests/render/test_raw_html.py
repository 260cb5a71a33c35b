"""Tests of checker/render/raw_html.py and ``claimcheck raw --html``: the
page's sections and figures, escaping of hostile strings, byte
reproducibility, atomic writing, and the page opened in real headless
Chromium (Debian's ``chromium`` package).

The data are simulated here (``claimcheck simulate``, an invented scenario)
and small, so each run of the command takes well under a second.  The browser
tests skip only when no Chromium executable can be found, and say so.
"""

from __future__ import annotations

import io
import re
from pathlib import Path

import pytest

from checker.cli import run
from checker.raw.analysis import analyse
from checker.render.raw_html import render_raw_html
from page_tools import assert_loads_cleanly_and_draws, needs_chromium, parse_page as _parse
from page_tools import run_chromium as _chromium, yaml_quote as _yaml_quote

# A circuit label and a claim title that would run or fetch something if they
# reached the page as markup (no comma: the label sits in a CSV cell).
HOSTILE_LABEL = '<script>alert("c")</script></td><img src=x onerror=alert(2)>'
HOSTILE_TITLE = '<script>alert("t")</script> & </title><b onmouseover=alert(1)>invented chip</b>'
PAGE_IDS = ["verdict", "data", "goodness-of-fit", "figure-raw-histogram", "bootstrap", "figure-bootstrap",
            "circuits", "findings", "notes", "caution"]
RAW_ARGS = ["--bootstrap", "300", "--fit-sample", "3000", "--seed", "5"]


@pytest.fixture(scope="module")
def inputs(tmp_path_factory):
    """Simulated data (4 circuits of 10 qubits, F = 0.3; one circuit renamed to
    a hostile label) and an invented claim with a hostile title."""
    folder = tmp_path_factory.mktemp("raw-html")
    data = folder / "sim.csv"
    err = io.StringIO()
    assert run(["simulate", "--qubits", "10", "--circuits", "4", "--samples", "1500", "--fidelity", "0.3",
                "--seed", "11", "--out", str(data)], io.StringIO(), err) == 0, err.getvalue()
    lines = data.read_text(encoding="utf-8").splitlines()
    text = "\n".join([lines[0]] + [re.sub(r"^c1,", HOSTILE_LABEL.replace('"', '""').join('""') + ",", line)
                                   for line in lines[1:]]) + "\n"
    data.write_text(text, encoding="utf-8")
    claim = folder / "claim.yaml"
    # Invented claim; the estimate is printed far from what the data give, so
    # the raw-estimate check has something to flag.
    claim.write_text("title: " + _yaml_quote(HOSTILE_TITLE) + "\n"
                     "metric: linear-xeb\nqubits: 10\nestimate: 0.45\nstat_error: 0.02\nsamples: 6000\n"
                     "circuits: 4\nthreshold: 0.1\nsignificance: {sigma: 17.5}\n", encoding="utf-8")
    return folder, data, claim


def _write(inputs, name: str, *extra: str) -> tuple[int, Path, str]:
    folder, data, claim = inputs
    out = folder / name
    err = io.StringIO()
    status = run(["raw", str(data), "--claim", str(claim), "--html", str(out), *RAW_ARGS, *extra],
                 io.StringIO(), err)
    return status, out, err.getvalue()


@pytest.fixture(scope="module")
def page(inputs):
    status, out, err = _write(inputs, "page.html")
    assert status in (0, 1), err
    return out.read_text(encoding="utf-8")


def test_every_section_and_figure(page):
    tags = _parse(page).tags
    ids = [a.get("id") for _, a in tags if a.get("id")]
    for ident in PAGE_IDS:
        assert ident in ids, ident
    assert len(ids) == len(set(ids)), "duplicate ids"
    assert {a.get("data-figure") for t, a in tags if t == "svg"} >= {"raw-histogram", "bootstrap"}
    # The flag on the far-off printed estimate is a card, with its status mark.
    assert re.search(r'<article class="cc-point cc-fail" id="finding-\d+"><h3>.*Printed estimate against the raw',
                     page)


def test_page_shows_the_results_numbers(inputs, page):
    # Every headline number the page prints is the result's own, formatted.
    from checker.wording import num

    _, data, _ = inputs
    result = analyse(str(data), "linear-xeb", 10, bootstrap=300, fit_sample=3000, seed=5, threshold=0.1)
    text = " ".join(_parse(page).text)
    head = result.headline
    for value in (num(head.estimate, 4), num(head.stat_error), num(result.bootstrap.low, 4),
                  num(result.bootstrap.high, 4)):
        assert value in text
    for t in result.goodness_of_fit:
        assert num(t.statistic) in text
    assert "6,000" in text and "circuit" in text


def test_hostile_strings_show_as_text(page):
    parsed = _parse(page)
    tags = [t for t, _ in parsed.tags]
    assert "script" not in tags and "img" not in tags and "b" not in tags
    assert not any(k.startswith("on") for _, a in parsed.tags for k in a)
    assert parsed.title == HOSTILE_TITLE
    text = " ".join(parsed.text)
    assert HOSTILE_TITLE in text and HOSTILE_LABEL in text


def test_same_input_and_seed_same_bytes(inputs, page):
    status, again, err = _write(inputs, "again.html")
    assert status in (0, 1), err
    assert again.read_bytes() == page.encode("utf-8")
    # A different seed moves the bootstrap, so the test above could fail.
    status, other, err = _write(inputs, "other.html", "--seed", "6")
    assert other.read_bytes() != page.encode("utf-8")


def test_without_a_claim_no_verdict_and_no_findings(inputs):
    _, data, _ = inputs
    result = analyse(str(data), "linear-xeb", 10, bootstrap=0, fit_sample=1000)
    page = render_raw_html(result)
    ids = {a.get("id") for _, a in _parse(page).tags}
    assert "figure-raw-histogram" in ids and "data" in ids
    assert not ids & {"verdict", "findings", "figure-bootstrap"}
    assert "No bootstrap was run" in page


def test_estimate_only_leaves_the_pictures_out_and_says_why(inputs):
    _, data, _ = inputs
    result = analyse(str(data), "linear-xeb", 10, estimate_only=True)
    page = render_raw_html(result)
    assert "<svg class" not in page
    assert "No histogram" in page and "No goodness-of-fit test was run" in page


@pytest.mark.parametrize("which", ["data", "claim"])
def test_refuses_overwriting_an_input(inputs, which):
    folder, data, claim = inputs
    target = data if which == "data" else claim
    before = target.read_bytes()
    err = io.StringIO()
    status = run(["raw", str(data), "--claim", str(claim), "--html", str(target), *RAW_ARGS], io.StringIO(), err)
    assert status == 2
    assert "is one of the input files" in err.getvalue() and "Traceback" not in err.getvalue()
    assert target.read_bytes() == before
    status = run(["raw", str(data), "--claim", str(claim), "--markdown", str(target), *RAW_ARGS],
                 io.StringIO(), io.StringIO())
    assert status == 2 and target.read_bytes() == before


def test_no_partial_file_when_writing_fails(inputs, tmp_path, monkeypatch):
    _, data, claim = inputs
    out = tmp_path / "report.html"
    out.write_text("old report", encoding="utf-8")
    import checker.output as output

    def broken_replace(src, dst):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(output.os, "replace", broken_replace)
    err = io.StringIO()
    # A full disk is an unusable output: one line and exit 2, never a traceback.
    assert run(["raw", str(data), "--claim", str(claim), "--html", str(out), *RAW_ARGS], io.StringIO(), err) == 2
    assert err.getvalue().count("\n") == 1 and "No space left" in err.getvalue()
    assert out.read_text(encoding="utf-8") == "old report"
    assert [p.name for p in tmp_path.iterdir()] == ["report.html"]  # the temporary file is gone


def test_no_file_when_rendering_fails(inputs, tmp_path, monkeypatch):
    _, data, claim = inputs
    import checker.render.raw_html as raw_html

    def broken(*args, **kwargs):
        raise RuntimeError("renderer broke")

    monkeypatch.setattr(raw_html, "render_raw_html", broken)
    with pytest.raises(RuntimeError):
        run(["raw", str(data), "--claim", str(claim), "--html", str(tmp_path / "r.html"), *RAW_ARGS],
            io.StringIO(), io.StringIO())
    assert list(tmp_path.iterdir()) == []


# --- in a real browser -----------------------------------------------------------------

@needs_chromium
@pytest.mark.parametrize("size", ["1366,768", "1920,1080"])  # a laptop, a projector
def test_browser_loads_cleanly_and_draws(inputs, page, tmp_path, size):
    assert_loads_cleanly_and_draws(inputs[0] / "page.html", tmp_path, size)


@needs_chromium
def test_browser_dom_holds_sections_figures_and_hostile_text(inputs, page, tmp_path):
    result = _chromium(inputs[0] / "page.html", tmp_path, "--dump-dom")
    dom = _parse(result.stdout)
    ids = {a.get("id") for _, a in dom.tags}
    for ident in PAGE_IDS:
        assert ident in ids, ident
    assert {a.get("data-figure") for t, a in dom.tags if t == "svg"} >= {"raw-histogram", "bootstrap"}
    assert dom.title == HOSTILE_TITLE
    assert not [t for t, _ in dom.tags if t in ("script", "img", "b")]
