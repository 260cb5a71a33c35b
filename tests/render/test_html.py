"""Tests of checker/render/html.py: the page's structure and escaping, byte
reproducibility, and the report opened in real headless Chromium (Debian's
``chromium`` package): no console errors, every expected section and figure
in the DOM, a screenshot that is not blank.

The browser tests skip only when no Chromium executable can be found, and say
so; .ci/run installs the package when it is missing and CI runs as root.
"""

from __future__ import annotations

import io
import re
from pathlib import Path

import numpy as np
import pytest

from checker.cli import run
from checker.render.html import render_html
from checker.render.page import figure_html, html_page, status_mark, table_html
from checker.report import Report
from page_tools import assert_loads_cleanly_and_draws, console_lines as _console_lines, needs_chromium, parse_page as _parse
from page_tools import run_chromium as _chromium, yaml_quote as _yaml_quote

from render_fixtures import BASE_CHECKS, CLAIMS, four_parts_report, sidedness_report

FOUR_PARTS_IDS = ["verdict", "claim", "points", "section-significance", "figure-significance",
                  "section-forest", "figure-forest", "section-budget", "figure-budget", "agrees",
                  "not-checked", "caution", "point-1", "point-2", "point-3"]


@pytest.fixture(scope="module")
def four_parts():
    with pytest.MonkeyPatch.context() as mp:
        report, claim = four_parts_report(mp)
    return render_html(report, claim), report, claim


def test_every_section_and_figure(four_parts):
    page, report, _ = four_parts
    ids = [a.get("id") for _, a in _parse(page).tags if a.get("id")]
    for ident in FOUR_PARTS_IDS:
        assert ident in ids
    assert len(ids) == len(set(ids)), "duplicate ids"
    # Every finding's message appears on the page.
    for f in report.findings:
        assert f.message.replace("'", "&#x27;") in page


def test_pictures_only_where_findings_allow(monkeypatch):
    report, claim = sidedness_report(monkeypatch)
    page = render_html(report, claim)
    assert 'id="figure-significance"' in page
    assert 'id="figure-forest"' not in page and 'id="figure-budget"' not in page
    only_bounds = Report(report.title, report.file, tuple(f for f in report.findings if f.check == "bounds"))
    page = render_html(only_bounds, claim)
    assert "<svg class" not in page and 'data-figure=' not in page


def test_every_printed_number_shown(four_parts):
    page, _, claim = four_parts
    from checker.render.notes import printed_numbers

    text = " ".join(_parse(page).text)
    for rep in printed_numbers(claim):
        assert rep.text in text, rep.path


NEW_KINDS = ["comparison_paired_clean.yaml", "comparison_paired_no_discordant.yaml",
             "counts_background_error_ignored.yaml", "screening_rates_clean.yaml",
             "significances_only_local_global.yaml", "mean_sd_printed_as_error.yaml"]


@pytest.mark.parametrize("name", NEW_KINDS)
def test_every_printed_number_of_each_kind_shown(name):
    """The claim section lists the baseline, comparison, counting, table and rate
    fields as printed, each under its own path."""
    from checker.claim import read_claim
    from checker.checks import run_checks
    from checker.render.notes import printed_numbers

    claim = read_claim(Path(__file__).parents[2] / "claims_examples" / name)
    numbers = printed_numbers(claim)
    kind_fields = [r for r in numbers if r.path.startswith(("baseline.", "comparison.", "observed", "background",
                                                            "counts_table.", "rates."))]
    if name != "mean_sd_printed_as_error.yaml" and name != "significances_only_local_global.yaml":
        assert kind_fields, name
    page = render_html(run_checks(claim), claim)
    claim_part = page[page.index('id="claim"'):page.index('id="points"') if 'id="points"' in page else None]
    text = " ".join(_parse(claim_part).text)
    for rep in numbers:
        assert rep.text in text, rep.path


def test_self_contained_and_scriptless(four_parts):
    page, _, _ = four_parts
    tags = _parse(page).tags
    assert not [t for t, _ in tags if t in ("script", "iframe", "object", "embed", "link", "img")]
    for _, attrs in tags:
        for key in ("src", "href"):
            value = attrs.get(key)
            assert value is None or value.startswith("#"), f"{key}={value}"
        assert not any(k.startswith("on") for k in attrs)
    assert "default-src 'none'" in page
    assert not re.search(r"@import|url\((?!#)", page)


def test_same_input_same_bytes(four_parts, monkeypatch):
    again = render_html(*four_parts_report(monkeypatch))
    assert again.encode() == four_parts[0].encode()


HOSTILE_TITLE = '<script>alert("t")</script> & "quotes" </title><img src=x onerror=alert(1)>'


def _hostile_claim(tmp_path: Path) -> Path:
    path = tmp_path / "hostile.yaml"
    path.write_text(
        "title: " + _yaml_quote(HOSTILE_TITLE) + "\n"
        "source: " + _yaml_quote("</style><script>alert(2)</script>") + "\n"
        "metric: linear-xeb\nqubits: 20\nestimate: 2.0e-3\nstat_error: 0.25e-3\nsamples: 2e7\n"
        "threshold: 1.0e-3\nsignificance: {sigma: 4.0}\n"
        "parts:\n"
        "  - {label: " + _yaml_quote("<svg onload=alert(3)>") + ", estimate: 2.1e-3, stat_error: 0.35e-3, samples: 1e7}\n"
        "  - {label: " + _yaml_quote("$\\alpha$ & </text>") + ", estimate: 1.9e-3, stat_error: 0.35e-3, samples: 1e7}\n"
        "combination: {method: inverse-variance, estimate: 2.0e-3, stat_error: 0.25e-3}\n"
        "error_budget:\n  - {name: " + _yaml_quote("<b onmouseover=alert(4)>gates</b>") + ", count: 100, error: 0.01}\n",
        encoding="utf-8")
    return path


@pytest.fixture()
def hostile(tmp_path, monkeypatch):
    from checker.checks import run_checks
    from checker.claim import read_claim

    from render_fixtures import budget_finding, combination_findings

    path = _hostile_claim(tmp_path)
    monkeypatch.chdir(tmp_path)
    claim = read_claim(path.name)
    base = run_checks(claim, BASE_CHECKS)
    report = Report(base.title, base.file,
                    base.findings + tuple(combination_findings(claim)) + (budget_finding(claim),))
    return render_html(report, claim), claim


def test_hostile_strings_show_as_text(hostile):
    page, claim = hostile
    parsed = _parse(page)
    tags = [t for t, _ in parsed.tags]
    assert "script" not in tags and "img" not in tags and "b" not in tags
    assert not any(k.startswith("on") for _, a in parsed.tags for k in a)
    assert parsed.title == HOSTILE_TITLE
    assert sum(t == "svg" for t in tags) == 3 + len(re.findall(r"<svg viewBox=\"0 0 16 16\"", page))
    text = " ".join(parsed.text)
    for raw in (HOSTILE_TITLE, "</style><script>alert(2)</script>", "<svg onload=alert(3)>",
                "$\\alpha$ & </text>", "<b onmouseover=alert(4)>gates</b>"):
        assert raw in text


def test_html_page_escapes_its_arguments():
    page = html_page("<i>t</i>", [("<b>h</b>", "<p>fragment</p>"), ("<b>h</b>", "<p>again</p>", "x\"y")],
                     subtitle="<u>s</u>", kicker="<k>", footer="<f>")
    parsed = _parse(page)
    tags = [t for t, _ in parsed.tags]
    assert "i" not in tags and "b" not in tags and "u" not in tags and "k" not in tags and "f" not in tags
    assert tags.count("p") >= 2  # the fragments are the caller's HTML
    ids = [a["id"] for t, a in parsed.tags if t == "section"]
    assert ids == ["b-h-b", 'x"y']
    assert '<section id="x&quot;y">' in page


def test_html_page_dedupes_section_ids():
    page = html_page("t", [("Same", "<p>1</p>"), ("Same", "<p>2</p>")])
    assert '<section id="same">' in page and '<section id="same-2">' in page


def test_helpers_escape():
    table = table_html(["<h>"], [["<c>", 1.5]], caption="<cap>")
    assert "<h>" not in table and "&lt;c&gt;" in table and "<td>1.5</td>" in table
    fig = figure_html("<svg></svg>", "<cap & more>", 'f"1')
    assert 'id="f&quot;1"' in fig and "&lt;cap &amp; more&gt;" in fig
    assert "flag" in status_mark("fail") and "agrees" in status_mark("pass")


def test_raw_pictures_fit_the_page():
    from checker.render.figures import bootstrap_svg, raw_histogram_svg

    edges = np.linspace(0, 6, 13)
    centres = (edges[:-1] + edges[1:]) / 2
    hist = raw_histogram_svg(edges, 500 * np.exp(-centres), {"at fitted F": 500 * (0.2 * centres + 0.8) * np.exp(-centres),
                                                             "at F = 0": 500 * np.exp(-centres)})
    boot = bootstrap_svg(np.linspace(0.1, 0.3, 11), np.arange(10), 0.15, 0.26)
    page = html_page("Raw data (made-up numbers)", [
        ("Histogram", figure_html(hist, "x = D p", "figure-raw-histogram")),
        ("Bootstrap", figure_html(boot, "replicates", "figure-bootstrap"))])
    ids = [a.get("id") for _, a in _parse(page).tags]
    assert "figure-raw-histogram" in ids and "figure-bootstrap" in ids
    assert len([i for i in ids if i]) == len({i for i in ids if i})


def test_cli_writes_html_atomically_and_refuses_the_input(tmp_path):
    source = CLAIMS / "four_parts.yaml"
    out = tmp_path / "report.html"
    out.write_text("old", encoding="utf-8")
    status = run(["check", str(source), "--only", ",".join(BASE_CHECKS), "--html", str(out)],
                 io.StringIO(), io.StringIO())
    assert status == 0
    page = out.read_text(encoding="utf-8")
    assert page.startswith("<!DOCTYPE html>") and 'id="figure-significance"' in page
    assert [p.name for p in tmp_path.iterdir()] == ["report.html"]  # no temporary file left
    stderr = io.StringIO()
    assert run(["check", str(source), "--html", str(source)], io.StringIO(), stderr) == 2
    assert "is one of the input files" in stderr.getvalue()


# --- in a real browser -----------------------------------------------------------------

@pytest.fixture(scope="module")
def written(tmp_path_factory, four_parts):
    """The four-part report written to disk once."""
    folder = tmp_path_factory.mktemp("pages")
    (folder / "four_parts.html").write_text(four_parts[0], encoding="utf-8")
    return folder


@needs_chromium
def test_browser_catches_console_errors(tmp_path):
    # The detector itself: a page with a script error and a blocked outside
    # image must produce console lines, or the next test could never fail.
    bad = tmp_path / "bad.html"
    bad.write_text(html_page("bad", [("s", '<img src="http://127.0.0.1:9/x.png"><script>nope()</script>')]),
                   encoding="utf-8")
    lines = _console_lines(_chromium(bad, tmp_path, "--enable-logging=stderr", "--v=0", "--dump-dom"))
    assert any("Content Security Policy" in line for line in lines)


@needs_chromium
@pytest.mark.parametrize("size", ["1366,768", "1920,1080"])  # a laptop, a projector
def test_browser_loads_cleanly_and_draws(written, tmp_path, size):
    assert_loads_cleanly_and_draws(written / "four_parts.html", tmp_path, size)


@needs_chromium
def test_browser_dom_holds_every_section_and_figure(written, tmp_path):
    result = _chromium(written / "four_parts.html", tmp_path, "--dump-dom")
    dom = _parse(result.stdout)
    ids = {a.get("id") for _, a in dom.tags}
    for ident in FOUR_PARTS_IDS:
        assert ident in ids
    figures_drawn = {a.get("data-figure") for t, a in dom.tags if t == "svg"}
    assert {"significance", "forest", "budget"} <= figures_drawn


@needs_chromium
def test_browser_shows_hostile_title_as_text(hostile, tmp_path):
    page, _ = hostile
    path = tmp_path / "hostile.html"
    path.write_text(page, encoding="utf-8")
    result = _chromium(path, tmp_path, "--enable-logging=stderr", "--v=0", "--dump-dom")
    assert _console_lines(result) == []
    dom = _parse(result.stdout)
    assert dom.title == HOSTILE_TITLE
    assert not [t for t, _ in dom.tags if t in ("script", "img", "b")]


def test_consistent_claim_panel_and_no_points(monkeypatch):
    report, claim = sidedness_report(monkeypatch)
    passes = Report(report.title, report.file, tuple(f for f in report.findings if f.status == "pass"))
    page = render_html(passes, claim)
    assert '<section class="cc-verdict consistent" id="verdict"' in page
    assert 'id="points"' not in page and "Every number checked follows" in page


@pytest.mark.parametrize("details", [
    {"summary": True, "methods": "not a mapping"},
    {"summary": True, "methods": {"equal": {"estimate": "x"}, "odd": None}, "printed": [1, 2]},
    {"summary": True, "methods": {"equal": {"estimate": float("nan"), "stat_error": 1.0}}},
])
def test_malformed_combination_details_leave_the_picture_plain(monkeypatch, details):
    from checker.report import Finding

    report, claim = four_parts_report(monkeypatch)
    kept = tuple(f for f in report.findings if f.check not in ("combination", "error-budget"))
    odd = Finding("fail", "odd details", details=details, check="combination")
    page = render_html(Report(report.title, report.file, kept + (odd,)), claim)
    # The parts and the printed combination still make a forest plot.
    assert 'id="figure-forest"' in page and "odd details" in page


@pytest.mark.parametrize("details", [
    {"components": [{"name": "gates", "survival": 0.0}], "predicted": 0.0},
    {"components": [{"name": "gates", "survival": "high"}], "predicted": 0.5},
    {"components": "none"},
])
def test_unusable_budget_details_leave_the_picture_out(monkeypatch, details):
    from checker.report import Finding

    report, claim = sidedness_report(monkeypatch)
    odd = Finding("warn", "odd budget", details=details, check="error-budget")
    page = render_html(Report(report.title, report.file, report.findings + (odd,)), claim)
    assert 'id="figure-budget"' not in page and "odd budget" in page


def test_comparison_claim_gets_the_difference_picture():
    # claims_examples/comparison_baseline_error_ignored.yaml (invented): both estimates with their
    # binomial errors, sqrt(0.913 x 0.087 / 1200) = 0.00814 and sqrt(0.89 x 0.11 / 1200) = 0.00903,
    # and the difference 0.023 with the errors in quadrature, 0.0122
    from checker.checks import run_checks
    from checker.claim import read_claim
    from checker.render.html import render_html

    path = Path(__file__).resolve().parents[2] / "claims_examples" / "comparison_baseline_error_ignored.yaml"
    claim = read_claim(path)
    page = render_html(run_checks(claim), claim)
    assert 'data-figure="comparison"' in page and 'id="section-comparison"' in page
    for shown in ("0.00814", "0.00903", "0.0122", "0.0081"):
        assert f">{shown}<" in page
