"""Tests of checker/render/figures.py: each picture is well-formed inline SVG,
byte-reproducible, labelled, with ids that do not collide across figures, and
draws user strings as literal text.  The raw-data helpers are tested with
made-up arrays."""

from __future__ import annotations

import re
import subprocess
import sys
import xml.etree.ElementTree as ET

import numpy as np
import pytest

from checker.render import figures

SVG_NS = "{http://www.w3.org/2000/svg}"


def _parse(svg: str) -> ET.Element:
    return ET.fromstring(svg)


def _texts(svg: str) -> list[str]:
    return ["".join(t.itertext()) for t in _parse(svg).iter(f"{SVG_NS}text")]


def _ids(svg: str) -> set[str]:
    return set(re.findall(r'\sid="([^"]+)"', svg))


def _sig():
    return figures.significance_svg(2.24e-3, 1.0e-3, 0.21e-3, syst_error=0.1e-3, printed_sigma=5.9,
                                    recomputed_sigma=(5.74, 6.07), estimate_text="2.24e-3",
                                    error_text="0.21e-3", threshold_text="1.0e-3")


def _forest(label="family A"):
    return figures.forest_svg(
        [(label, 2.61e-3, 0.32e-3), ("family B", 1.25e-3, 0.33e-3), ("no error", 1.9e-3, None)],
        [("inverse-variance", 1.89e-3, 0.16e-3, False), ("random effects", 1.88e-3, 0.32e-3, True)],
        (1.89e-3, 0.16e-3))


def _budget(name="readout"):
    return figures.budget_svg([("two-qubit gates", 0.0307), (name, 0.601)], 0.0185, 0.004, 1.9e-3,
                              0.0183, measured_text="1.9e-3")


# Made-up arrays: 20 bins of x = D p, an exponential-looking histogram and two curves.
EDGES = np.linspace(0.0, 8.0, 21)
CENTRES = (EDGES[:-1] + EDGES[1:]) / 2
OBSERVED = 1000 * np.exp(-CENTRES) * (1 + 0.05 * np.sin(7 * CENTRES))
CURVES = {"mixture at fitted F": 1000 * (0.1 * CENTRES + 0.9) * np.exp(-CENTRES),
          "mixture at F = 0": 1000 * np.exp(-CENTRES)}


def _raw():
    return figures.raw_histogram_svg(EDGES, OBSERVED, CURVES)


def _boot():
    edges = np.linspace(1.5e-3, 2.9e-3, 31)
    counts = 400 * np.exp(-0.5 * ((edges[:-1] - 2.2e-3) / 2e-4) ** 2)
    return figures.bootstrap_svg(edges, counts, 1.82e-3, 2.61e-3)


def _cmp(label="previous best"):
    return figures.comparison_svg(("estimate", 0.913, 0.0081), (label, 0.890, 0.0090), (0.023, 0.0122),
                                  (0.023, 0.0081), "recomputed (unpaired)")


BUILDERS = {"significance": _sig, "forest": _forest, "budget": _budget,
            "raw-histogram": _raw, "bootstrap": _boot, "comparison": _cmp}


@pytest.fixture(scope="module")
def drawn():
    return {name: build() for name, build in BUILDERS.items()}


@pytest.mark.parametrize("name", sorted(BUILDERS))
def test_inline_svg_shape(drawn, name):
    svg = drawn[name]
    assert svg.startswith("<svg ") and svg.rstrip().endswith("</svg>")
    root = _parse(svg)
    head = svg[: svg.index(">")]
    assert "viewBox=" in head and " width=" not in head and " height=" not in head
    assert root.get("data-figure") == name and root.get("role") == "img"
    assert root.find(f"{SVG_NS}title").get("id") == f"{name}-title"
    assert "<?xml" not in svg and "<!DOCTYPE" not in svg and "<metadata" not in svg
    assert "<script" not in svg.lower() and "xlink:href=\"http" not in svg


@pytest.mark.parametrize("name", sorted(BUILDERS))
def test_byte_reproducible(drawn, name):
    assert BUILDERS[name]() == drawn[name]


def test_ids_do_not_collide_across_figures(drawn):
    seen: dict[str, str] = {}
    for name, svg in drawn.items():
        for ident in _ids(svg):
            assert ident not in seen, f"id {ident} in both {seen.get(ident)} and {name}"
            seen[ident] = name


def test_significance_marks_and_labels(drawn):
    texts = " | ".join(_texts(drawn["significance"]))
    for needle in ("threshold 1.0e-3", "printed 5.9 σ", "recomputed 5.74 to 6.07 σ",
                   "estimate 2.24e-3 ± 0.21e-3", "± syst 0.0001"):
        assert needle in texts


def test_significance_refuses_a_zero_width():
    with pytest.raises(ValueError):
        figures.significance_svg(2e-3, 1e-3, 0.0)


def test_forest_rows(drawn):
    texts = _texts(drawn["forest"])
    for label in ("family A", "family B", "no error", "inverse-variance", "random effects  (stated)",
                  "as printed"):
        assert label in texts


def test_user_labels_are_literal_text():
    svg = _forest(label="<script>alert(1)</script> $x^2$ & co")
    assert "<script>" not in svg
    assert "&lt;script&gt;alert(1)&lt;/script&gt; $x^2$ &amp; co" in svg
    assert "<script>alert(1)</script> $x^2$ & co" in _texts(svg)
    budget = _budget(name="$\\alpha$ </text>")
    assert "$\\alpha$ </text>" in _texts(budget)


def test_budget_labels_and_refusals(drawn):
    texts = _texts(drawn["budget"])
    assert "predicted 0.0185" in texts and "measured 1.9e-3" in texts
    assert "0.0307" in texts and "0.601" in texts
    with pytest.raises(ValueError):
        figures.budget_svg([("gates", 0.0)], 0.0)
    with pytest.raises(ValueError):
        figures.budget_svg([("gates", 0.5)], 0.5, measured=1.3)


def test_raw_histogram_draws_every_curve(drawn):
    svg = drawn["raw-histogram"]
    texts = _texts(svg)
    assert {"observed", "mixture at fitted F", "mixture at F = 0"} <= set(texts)
    # Values spanning more than a factor 100 get a log axis, ticks at powers of ten.
    assert {"10¹", "10²"} <= set(texts)
    linear = figures.raw_histogram_svg(EDGES[:3], [10.0, 9.0], {"flat": [10.0, 9.5]})
    assert not any(t.startswith("10") and len(t) == 3 for t in _texts(linear))


def test_raw_histogram_checks_lengths():
    with pytest.raises(ValueError, match="21 edges need 20 values"):
        figures.raw_histogram_svg(EDGES, OBSERVED[:-1], {})
    with pytest.raises(ValueError, match="curve 'short'"):
        figures.raw_histogram_svg(EDGES, OBSERVED, {"short": OBSERVED[:5]})


def test_bootstrap_interval_labelled(drawn):
    texts = _texts(drawn["bootstrap"])
    assert "interval 0.00182 to 0.00261" in texts and "replicates" in texts
    with pytest.raises(ValueError):
        figures.bootstrap_svg([0, 1, 2], [3, 4], 1.5, 0.5)


def test_rc_settings_are_restored():
    import matplotlib

    before = dict(matplotlib.rcParams)
    _sig()
    assert dict(matplotlib.rcParams) == before


def test_renderers_import_no_matplotlib_until_drawing():
    code = ("import sys, checker.render.html, checker.render.markdown, checker.render.figures; "
            "print('matplotlib' in sys.modules, 'pyplot' in ' '.join(sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.split() == ["False", "False"]


def test_mirror_puts_a_two_sided_sigma_on_the_estimates_side():
    # Estimate half a width below the threshold, a printed (two-sided) 6 sigma:
    # the mark and so the sigma axis reach -6 and beyond, not +6.
    below = _texts(figures.significance_svg(0.95, 1.0, 0.1, printed_sigma=6.0, mirror=True))
    above = _texts(figures.significance_svg(0.95, 1.0, 0.1, printed_sigma=6.0))
    assert "−6" in below and "6" not in below
    assert "6" in above and "−6" not in above
    assert "printed 6 σ" in below and "printed 6 σ" in above


def test_comparison_rows_and_zero_line(drawn):
    texts = _texts(drawn["comparison"])
    for label in ("estimate", "previous best", "as printed", "recomputed (unpaired)",
                  "difference ± one standard error"):
        assert label in texts
    # a label with markup characters is drawn as literal text
    assert "<b>$x$</b>" in _texts(_cmp("<b>$x$</b>"))


def test_comparison_takes_a_negative_difference_and_no_error():
    svg = figures.comparison_svg(("estimate", 0.5, None), ("baseline", 0.6, 0.01), (-0.1, None))
    assert "recomputed" in _texts(svg)


def test_comparison_refuses_nan():
    with pytest.raises(ValueError):
        figures.comparison_svg(("estimate", float("nan"), None), ("baseline", 0.6, 0.01), (-0.1, None))
