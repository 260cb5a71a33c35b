"""The report's pictures, each a function of plain numbers returning SVG text
ready to inline in an HTML page.

They draw; they never compute a statistic.  The numbers come from the claim as
printed and from the findings' ``details``.  A Gaussian drawn from a printed
threshold and error is drawing, not re-deriving.

matplotlib is imported inside each function (it costs about 0.4 s), with an
Agg canvas attached to a bare Figure so that no pyplot state is touched and a
notebook's backend is left alone.  Output is byte-reproducible: the SVG id salt
is fixed per figure (which also keeps ids unique across figures on one page),
the date is left out, and text stays text (``svg.fonttype: none``) so that no
glyph definitions repeat between figures and numbers remain searchable.
"""

from __future__ import annotations

import math
import re
from contextlib import contextmanager
from html import escape
from typing import Iterator, Mapping, Sequence

from .. import wording
from ..visible import visible

# Our palette: dark ink on warm paper, one deep blue accent and one ochre; every
# series also differs by marker, line style or hatching so greyscale prints read.
INK = "#1f2430"
MUTED = "#5b6270"
FAINT = "#c9ccd3"
PAPER = "#fffdf8"
ACCENT = "#1d4f91"
OCHRE = "#b86b00"
BRICK = "#a3242b"

WIDTH_IN = 8.0  # figures are drawn 8 inches wide and scaled by the page

_RC = {
    "svg.fonttype": "none",
    "font.family": "DejaVu Sans",
    "font.size": 11.0,
    "axes.titlesize": 12.0,
    "axes.labelsize": 11.0,
    "axes.edgecolor": MUTED,
    "axes.labelcolor": INK,
    "axes.linewidth": 0.9,
    "axes.spines.top": False,
    "axes.spines.right": False,
    "xtick.color": MUTED,
    "ytick.color": MUTED,
    "xtick.labelcolor": INK,
    "ytick.labelcolor": INK,
    "text.color": INK,
    "legend.frameon": False,
    "legend.fontsize": 10.0,
    "hatch.color": MUTED,
    "hatch.linewidth": 0.8,
    "figure.facecolor": PAPER,
    "axes.facecolor": PAPER,
    "savefig.facecolor": PAPER,
    "path.simplify": False,
}


def _plain(text: object) -> str:
    """A user-supplied label on one line with its control characters shown as
    escapes (checker.visible; a lone surrogate cannot even be drawn), and
    matplotlib's math parsing switched off wherever one is drawn, so "$" stays
    a dollar sign."""
    return " ".join(visible(text).split())


_fmt = wording.num


def _finite(*values) -> bool:
    """True when every value is a finite real number (None is not)."""
    return all(isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)
               for v in values)


@contextmanager
def _drawing(name: str, height_in: float) -> Iterator:
    """A bare matplotlib Figure under our rc settings (restored afterwards)."""
    import matplotlib
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    with matplotlib.rc_context({**_RC, "svg.hashsalt": f"claimcheck-{name}"}):
        fig = Figure(figsize=(WIDTH_IN, height_in), layout="constrained")
        FigureCanvasAgg(fig)
        yield fig


def _save(fig, name: str, title: str) -> str:
    """The figure as inline SVG text (call inside its ``_drawing`` block)."""
    import io

    buffer = io.StringIO()
    fig.savefig(buffer, format="svg", metadata={"Date": None, "Creator": "claimcheck"})
    return _inline(buffer.getvalue(), name, title)


def _inline(svg: str, name: str, title: str) -> str:
    """matplotlib's SVG file made into an element for an HTML page: no XML
    prolog, no metadata block, ids prefixed with the figure's name, scalable
    (width and height left to the page's CSS, the viewBox kept), labelled for
    screen readers."""
    start = svg.index("<svg")
    svg = svg[start:]
    svg = re.sub(r"<metadata>.*?</metadata>\s*", "", svg, count=1, flags=re.S)
    # matplotlib numbers its groups per figure (figure_1, line2d_25, ...), so
    # two figures on one page would share ids: give every id the figure's name.
    svg = re.sub(r'(\sid="|url\(#|href="#)', lambda m: f"{m.group(1)}{name}-", svg)
    head_end = svg.index(">")
    head = svg[:head_end]
    head = re.sub(r'\s(width|height)="[^"]*"', "", head)
    head += f' class="cc-plot" role="img" aria-labelledby="{name}-title" data-figure="{name}"'
    body = svg[head_end:]
    body = body.replace(">", f'><title id="{name}-title">{escape(title)}</title>', 1)
    return head + body.rstrip() + "\n"


_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


def _power_of_ten(exponent: int) -> str:
    return "1" if exponent == 0 else f"10{str(exponent).translate(_SUPERSCRIPT)}"


def _value_axis(ax, label: str) -> None:
    """Few ticks on the x axis, and very small or large values written as plain
    numbers with the common power of ten in the axis label ("(×10⁻³)"), instead
    of long decimals that collide.  Formatted here rather than with
    matplotlib's math text, which is slow to lay out and not needed."""
    from matplotlib.ticker import FuncFormatter, MaxNLocator

    ax.xaxis.set_major_locator(MaxNLocator(nbins=6))
    lo, hi = ax.get_xlim()
    top = max(abs(lo), abs(hi))
    exponent = math.floor(math.log10(top)) if top > 0 else 0
    if -2 <= exponent <= 3:
        ax.xaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:g}"))
        ax.set_xlabel(label)
        return
    scale = 10.0 ** exponent
    ax.xaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{round(v / scale, 6):g}"))
    ax.set_xlabel(f"{label} (×{_power_of_ten(exponent)})")


def _log_axis(axis) -> None:
    """Decade ticks labelled 1, 10⁻¹, 10⁻², ... without math text."""
    from matplotlib.ticker import FuncFormatter, LogLocator, NullFormatter

    axis.set_major_locator(LogLocator(base=10.0))
    axis.set_major_formatter(FuncFormatter(
        lambda v, _: _power_of_ten(round(math.log10(v))) if v > 0 else ""))
    axis.set_minor_formatter(NullFormatter())


def _no_math(*texts) -> None:
    for group in texts:
        for t in group:
            t.set_parse_math(False)


# --- significance ---------------------------------------------------------------

def significance_svg(estimate: float, threshold: float, width: float, *,
                     stat_error: float | None = None, syst_error: float | None = None,
                     printed_sigma: float | None = None,
                     recomputed_sigma: tuple[float, float] | None = None, mirror: bool = False,
                     width_label: str = "stat_error", estimate_text: str | None = None,
                     error_text: str | None = None, threshold_text: str | None = None,
                     syst_text: str | None = None) -> str:
    """The null sampling distribution at the threshold, the estimate with its
    error bar, and the printed and recomputed sigma marked.

    Parameters
    ----------
    estimate, threshold : float
        As printed.
    width : float
        The width the null is drawn with (the printed error the claim's stated
        convention divides by); the sigma marks sit at threshold + sigma x width.
    stat_error : float, optional
        The estimate's error bar (default: ``width``).
    syst_error : float, optional
        Drawn as a second, lighter bar under the estimate.
    printed_sigma : float, optional
    recomputed_sigma : (low, high), optional
        The recomputed range from the significance finding.
    mirror : bool
        Place the sigma marks below the threshold (a two-sided sigma, which is
        a distance, for an estimate below the threshold).  Labels keep the
        values as given.
    width_label : str
        Which printed error ``width`` is, for the axis label.
    estimate_text, error_text, threshold_text, syst_text : str, optional
        The numbers as printed, for the labels (default: three significant figures).
    """
    import numpy as np

    if not _finite(estimate, threshold, width) or width <= 0:
        raise ValueError("the significance picture needs a finite estimate and threshold and a positive error")
    bar = stat_error if _finite(stat_error) and stat_error > 0 else width
    syst = syst_error if _finite(syst_error) and syst_error > 0 else None
    side = -1.0 if mirror else 1.0
    printed = printed_sigma if _finite(printed_sigma) else None
    recomputed = tuple(sorted(recomputed_sigma)) if recomputed_sigma is not None and _finite(*recomputed_sigma) else None
    marks = [0.0, (estimate - threshold) / width]  # positions on the picture's sigma axis
    marks += [side * printed] if printed is not None else []
    marks += [side * r for r in recomputed] if recomputed is not None else []
    reach = max(bar, syst or 0.0)
    lo = min(threshold - 4.0 * width, estimate - 2.5 * reach, threshold + (min(marks) - 1.0) * width)
    hi = max(threshold + 4.0 * width, estimate + 2.5 * reach, threshold + (max(marks) + 1.0) * width)
    with _drawing("significance", 4.1) as fig:
        ax = fig.add_subplot()
        x = np.linspace(lo, hi, 600)
        z = (x - threshold) / width
        density = np.exp(-0.5 * z * z)  # peak height 1: the shape is what matters here
        ax.fill_between(x, density, color=FAINT, alpha=0.7, linewidth=0)
        ax.plot(x, density, color=MUTED, linewidth=1.6, label="null distribution at the threshold")
        ax.axvline(threshold, color=MUTED, linewidth=1.0)
        ax.annotate(f"threshold {_plain(threshold_text or _fmt(threshold))}", (threshold, 1.03),
                    ha="center", va="bottom", fontsize=10, color=INK, annotation_clip=False,
                    parse_math=False)
        top, band_top = 1.16, 0.86 / 1.16
        if recomputed is not None:
            a, b = sorted(threshold + side * r * width for r in recomputed)
            span = max(b - a, (hi - lo) / 400)  # a range that rounds to one value still shows
            ax.axvspan(a, a + span, ymax=band_top, facecolor="none", edgecolor=ACCENT, hatch="////",
                       linewidth=1.0, label=f"recomputed {_fmt(recomputed[0])} to {_fmt(recomputed[1])} σ")
        if printed is not None:
            ax.axvline(threshold + side * printed * width, ymax=band_top, color=OCHRE, linewidth=2.2,
                       linestyle=(0, (2.5, 1.5)), label=f"printed {_fmt(printed)} σ")
        ax.errorbar([estimate], [0.55], xerr=[[bar], [bar]], fmt="o", color=INK, markersize=8,
                    capsize=5, linewidth=2.0,
                    label=f"estimate {_plain(estimate_text or _fmt(estimate))} ± "
                          f"{_plain(error_text or _fmt(bar))}")
        if syst is not None:
            ax.errorbar([estimate], [0.42], xerr=[[syst], [syst]], fmt="none", color=MUTED,
                        capsize=4, linewidth=1.4, linestyle="--", label=f"± syst {_plain(syst_text or _fmt(syst))}")
        ax.set_xlim(lo, hi)
        ax.set_ylim(0, top)
        ax.set_yticks([])
        ax.spines["left"].set_visible(False)
        _value_axis(ax, "value of the estimate")
        sec = ax.secondary_xaxis("top", functions=(lambda v: (v - threshold) / width,
                                                   lambda s: threshold + s * width))
        sec.set_xlabel(f"distance from the threshold, in units of {width_label} (σ)", color=MUTED)
        sec.tick_params(colors=MUTED)
        legend = fig.legend(loc="outside lower center", ncol=2, handlelength=2.6)
        _no_math(legend.get_texts())
        return _save(fig, "significance", "The null distribution at the threshold, the estimate, "
                     "and the printed and recomputed significance")


# --- forest plot -------------------------------------------------------------------

def forest_svg(parts: Sequence[tuple[str, float, float | None]],
               combined: Sequence[tuple[str, float, float | None, bool]],
               printed: tuple[float, float | None] | None = None) -> str:
    """Each part with its error bar, each combination method's result, and the
    printed combination.

    Parameters
    ----------
    parts : sequence of (label, estimate, stat_error or None)
    combined : sequence of (method label, estimate, stat_error or None, is the stated method)
    printed : (estimate, stat_error or None), optional
    """
    rows = len(parts) + len(combined) + (1 if printed else 0)
    if not parts:
        raise ValueError("forest_svg needs at least one part")
    with _drawing("forest", 1.35 + 0.36 * rows) as fig:
        ax = fig.add_subplot()
        y = rows + 0.5
        ticks, labels, styles = [], [], []
        for label, est, err in parts:
            y -= 1
            ax.errorbar([est], [y], xerr=None if err is None else [[err], [err]], fmt="o", color=INK,
                        markersize=6, capsize=3, linewidth=1.5)
            ticks.append(y), labels.append(_plain(label)), styles.append("normal")
        if combined or printed:
            ax.axhline(y - 0.5, color=FAINT, linewidth=1.0)
        for label, est, err, stated in combined:
            y -= 1
            ax.errorbar([est], [y], xerr=None if err is None else [[err], [err]], fmt="D",
                        markersize=7, capsize=3, linewidth=1.5, color=ACCENT,
                        markerfacecolor=ACCENT if stated else PAPER, markeredgewidth=1.5)
            ticks.append(y), labels.append(_plain(label) + ("  (stated)" if stated else ""))
            styles.append("bold" if stated else "normal")
        if printed:
            est, err = printed
            y -= 1
            ax.axvline(est, color=OCHRE, linewidth=1.4, linestyle=(0, (5, 3)), zorder=0)
            ax.errorbar([est], [y], xerr=None if err is None else [[err], [err]], fmt="s", markersize=8,
                        capsize=4, linewidth=2.0, color=OCHRE)
            ticks.append(y), labels.append("as printed"), styles.append("bold")
        ax.set_yticks(ticks, labels)
        for t, weight in zip(ax.get_yticklabels(), styles):
            t.set_fontweight(weight)
        _no_math(ax.get_yticklabels())
        ax.tick_params(axis="y", length=0)
        ax.spines["left"].set_visible(False)
        ax.set_ylim(0, rows + 0.2)
        _value_axis(ax, "estimate ± one standard error")
        ax.grid(axis="x", color=FAINT, linewidth=0.6)
        ax.set_axisbelow(True)
        return _save(fig, "forest", "Forest plot: the parts, each combination method and the printed combination")


# --- comparison with a baseline -------------------------------------------------------

def comparison_svg(estimate: tuple[str, float, float | None], baseline: tuple[str, float, float | None],
                   difference: tuple[float, float | None], printed: tuple[float, float | None] | None = None,
                   difference_label: str = "recomputed") -> str:
    """Both estimates with their error bars (left) and their difference with its error
    and the printed one, beside a line at zero (right).

    Parameters
    ----------
    estimate, baseline : (label, value, standard error or None)
    difference : (estimate - baseline, its standard error or None), as the check found them
    printed : (printed difference, printed error or None), optional
    difference_label : the recomputed difference's row label (which error it carries)
    """
    values = [estimate[1], baseline[1], difference[0]] + ([printed[0]] if printed else [])
    if not _finite(*values):
        raise ValueError("comparison_svg needs finite estimates and difference")
    with _drawing("comparison", 2.5) as fig:
        left, right = fig.subplots(1, 2, gridspec_kw={"width_ratios": [1.15, 1.0]})
        for y, (label, value, err), colour, marker in ((2, estimate, INK, "o"), (1, baseline, MUTED, "s")):
            left.errorbar([value], [y], xerr=None if err is None else [[err], [err]], fmt=marker, color=colour,
                          markersize=7, capsize=4, linewidth=1.6)
        left.set_yticks([2, 1], [_plain(estimate[0]), _plain(baseline[0])])
        left.set_ylim(0.4, 2.6)
        _value_axis(left, "value ± one standard error")
        rows = [(1.0 if printed else 1.5, _plain(difference_label), difference, ACCENT, "D")]
        if printed:
            rows.append((2.0, "as printed", printed, OCHRE, "s"))
        for y, _, (value, err), colour, marker in rows:
            right.errorbar([value], [y], xerr=None if err is None else [[err], [err]], fmt=marker, color=colour,
                           markersize=7, capsize=4, linewidth=1.6)
        right.axvline(0.0, color=BRICK, linewidth=1.2, linestyle=(0, (4, 3)))
        right.set_yticks([y for y, *_ in rows], [label for _, label, *_ in rows])
        right.set_ylim(0.4, 2.6)
        # zero and every bar in view, with a margin
        lo = min([0.0] + [v - (e or 0.0) for _, _, (v, e), *_ in rows])
        hi = max([0.0] + [v + (e or 0.0) for _, _, (v, e), *_ in rows])
        pad = 0.12 * (hi - lo) if hi > lo else 1.0
        right.set_xlim(lo - pad, hi + pad)
        _value_axis(right, "difference ± one standard error")
        for ax in (left, right):
            _no_math(ax.get_yticklabels())
            ax.tick_params(axis="y", length=0)
            ax.spines["left"].set_visible(False)
            ax.grid(axis="x", color=FAINT, linewidth=0.6)
            ax.set_axisbelow(True)
        return _save(fig, "comparison", "The estimate and the baseline with their errors, and their "
                     "difference with its error beside zero")


# --- error budget --------------------------------------------------------------------

def budget_svg(components: Sequence[tuple[str, float]], predicted: float,
               predicted_sd: float | None = None, measured: float | None = None,
               predicted_exponential: float | None = None, measured_text: str | None = None) -> str:
    """Error-budget bars: what each component leaves surviving, the predicted
    product and the measured value, on a log axis running down from 1.

    On a log axis each bar's length is that component's share of the loss, so
    the predicted bar is as long as the component bars laid end to end.

    Parameters
    ----------
    components : sequence of (name, survival fraction (1 - error) ** count)
    predicted : float
        The product of the survivals, as the error-budget finding gives it.
    predicted_sd : float, optional
    measured : float, optional
        The claim's estimate.
    predicted_exponential : float, optional
        The exp(-sum count x error) approximation, marked on the predicted bar.
    measured_text : str, optional
        The measured value as printed, for its label.
    """
    values = [v for _, v in components] + [predicted] + ([measured] if measured is not None else [])
    if not all(_finite(v) and 0 < v <= 1 for v in values):
        raise ValueError("the error-budget bars need fractions in (0, 1] for their log axis")
    rows = len(components) + 1 + (1 if measured is not None else 0)
    expo = predicted_exponential if _finite(predicted_exponential) and predicted_exponential > 0 else None
    with _drawing("budget", 1.6 + 0.45 * rows) as fig:
        ax = fig.add_subplot()
        floor = min(values) / 4.0
        y = rows
        ticks, labels, weights = [], [], []
        for name, surv in components:
            y -= 1
            ax.barh(y, 1.0 - surv, left=surv, height=0.62, color=FAINT, edgecolor=MUTED, linewidth=0.8)
            ax.annotate(_fmt(surv), (surv, y), xytext=(5, 0), textcoords="offset points", va="center",
                        ha="left", fontsize=10, color=INK, annotation_clip=False)
            ticks.append(y), labels.append(_plain(name)), weights.append("normal")
        y -= 1
        ax.barh(y, 1.0 - predicted, left=predicted, height=0.62, color=ACCENT, edgecolor=ACCENT,
                alpha=0.85)
        if _finite(predicted_sd) and predicted_sd > 0:
            low = max(predicted - predicted_sd, floor)
            ax.errorbar([predicted], [y], xerr=[[predicted - low], [predicted_sd]], fmt="none",
                        color=INK, capsize=4, linewidth=1.5)
        if expo is not None:
            ax.plot([expo], [y + 0.45], marker="v", color=INK, markersize=7, linestyle="none",
                    label=f"exponential approximation {_fmt(expo)}")
        ticks.append(y), labels.append(f"predicted {_fmt(predicted)}"), weights.append("bold")
        if measured is not None:
            y -= 1
            ax.axvspan(predicted / 2.0, predicted * 2.0, color=ACCENT, alpha=0.08, linewidth=0,
                       label="within a factor of 2 of the prediction")
            ax.barh(y, 1.0 - measured, left=measured, height=0.62, facecolor=PAPER, edgecolor=OCHRE,
                    hatch="xx", linewidth=1.6)
            ax.axvline(measured, color=OCHRE, linewidth=1.4, linestyle=(0, (5, 3)))
            ticks.append(y), labels.append(f"measured {_plain(measured_text or _fmt(measured))}")
            weights.append("bold")
        ax.set_xscale("log")
        ax.set_xlim(1.0, floor)  # inverted: bars grow to the right as more is lost
        ax.set_ylim(-0.6, rows - 0.4 + (0.35 if expo is not None else 0.0))
        ax.set_yticks(ticks, labels)
        for t, weight in zip(ax.get_yticklabels(), weights):
            t.set_fontweight(weight)
        _no_math(ax.get_yticklabels())
        ax.tick_params(axis="y", length=0)
        ax.spines["left"].set_visible(False)
        ax.set_xlabel("fraction surviving (log scale; 1 at the left)")
        _log_axis(ax.xaxis)
        ax.grid(axis="x", color=FAINT, linewidth=0.6, which="major")
        ax.set_axisbelow(True)
        if ax.get_legend_handles_labels()[0]:
            fig.legend(loc="outside upper center", ncol=2)
        return _save(fig, "budget", "Error budget: survival by component, predicted and measured values")


# --- raw data ----------------------------------------------------------------------------

def _check_bins(edges, values, what):
    if len(edges) != len(values) + 1:
        raise ValueError(f"{what}: {len(edges)} edges need {len(edges) - 1} values, got {len(values)}")


_LINESTYLES = ("-", (0, (6, 3)), (0, (1.5, 2)), (0, (6, 2, 1.5, 2)))


def raw_histogram_svg(edges: Sequence[float], observed: Sequence[float],
                      curves: Mapping[str, Sequence[float]]) -> str:
    """The histogram of x = D p against model curves (for example the
    Porter-Thomas mixture at the fitted fidelity and at F = 0).

    Parameters
    ----------
    edges : sequence of n + 1 bin edges
    observed : sequence of n values per bin (counts or densities)
    curves : mapping label -> n values per bin in the same units as ``observed``,
        drawn as lines through the bin centres.
    """
    import numpy as np

    edges = np.asarray(edges, dtype=float)
    observed = np.asarray(observed, dtype=float)
    _check_bins(edges, observed, "raw_histogram_svg")
    centres = (edges[:-1] + edges[1:]) / 2
    with _drawing("raw-histogram", 4.2) as fig:
        ax = fig.add_subplot()
        ax.stairs(observed, edges, fill=True, color=FAINT, alpha=0.9, label="observed")
        ax.stairs(observed, edges, color=MUTED, linewidth=0.8)
        colours = (ACCENT, OCHRE, INK, BRICK)
        markers = ("o", "s", "^", "D")
        for i, (label, values) in enumerate(curves.items()):
            values = np.asarray(values, dtype=float)
            if len(values) != len(centres):
                raise ValueError(f"raw_histogram_svg: curve {label!r} has {len(values)} values for "
                                 f"{len(centres)} bins")
            ax.plot(centres, values, color=colours[i % 4], linestyle=_LINESTYLES[i % 4], linewidth=2.0,
                    marker=markers[i % 4], markersize=4, markevery=max(1, len(centres) // 12),
                    label=_plain(label))
        positive = np.concatenate([observed] + [np.asarray(v, float) for v in curves.values()])
        positive = positive[positive > 0]
        if positive.size and positive.max() / positive.min() > 100:
            ax.set_yscale("log")
            _log_axis(ax.yaxis)
        ax.set_xlim(edges[0], edges[-1])
        ax.set_xlabel("x = D p (ideal probability of the observed outcome, times the dimension)")
        ax.set_ylabel("per bin")
        legend = ax.legend(loc="upper right")
        _no_math(legend.get_texts())
        return _save(fig, "raw-histogram", "Histogram of x = D p with the model densities")


def bootstrap_svg(edges: Sequence[float], counts: Sequence[float], low: float, high: float) -> str:
    """The bootstrap distribution of the estimate with its interval shaded.

    Parameters
    ----------
    edges : sequence of n + 1 bin edges
    counts : sequence of n replicate counts
    low, high : float
        The interval's ends.
    """
    import numpy as np

    edges = np.asarray(edges, dtype=float)
    counts = np.asarray(counts, dtype=float)
    _check_bins(edges, counts, "bootstrap_svg")
    if not _finite(low, high) or low > high:
        raise ValueError("bootstrap_svg needs finite low <= high")
    with _drawing("bootstrap", 3.6) as fig:
        ax = fig.add_subplot()
        ax.axvspan(low, high, color=ACCENT, alpha=0.10, linewidth=0,
                   label=f"interval {_fmt(low)} to {_fmt(high)}")
        ax.stairs(counts, edges, fill=True, color=FAINT, alpha=0.9, label="replicates")
        ax.stairs(counts, edges, color=MUTED, linewidth=0.8)
        for end, style in ((low, (0, (5, 3))), (high, (0, (5, 3)))):
            ax.axvline(end, color=ACCENT, linewidth=1.8, linestyle=style)
        ax.set_xlim(min(edges[0], low), max(edges[-1], high))
        _value_axis(ax, "estimate in each bootstrap replicate")
        ax.set_ylabel("replicates per bin")
        ax.legend(loc="upper right")
        return _save(fig, "bootstrap", "Bootstrap distribution of the estimate with its interval")
