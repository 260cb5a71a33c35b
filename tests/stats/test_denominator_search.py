"""checker.stats.denominator_search: naming the N a printed interval used."""

from __future__ import annotations

import numpy as np
import pytest

from checker.stats.denominator_search import effective_sample_size, search_denominator
from checker.stats.precision import parse_printed


def _printed(value: float, digits: int):
    return parse_printed(f"{value * 100:.{digits}f}%")


def test_a_recall_interval_computed_with_all_cases_is_found_among_the_margins():
    # A recall of 35/42 printed with the 95% interval 75.06%-91.60%: by hand (common practice,
    # the Wald formula p +- 1.96 sqrt(p(1-p)/N)) that is the Wald interval with N = 78, not 42.
    low, high = parse_printed("75.06%"), parse_printed("91.60%")
    found = search_denominator((35 / 42, 35 / 42), low.bounds, high.bounds, 0.95, 0.0,
                               margins={"positives": 42, "all cases": 78})
    assert found.fits[0].method == "wald"
    assert (found.fits[0].n_best, found.fits[0].label) == (78, "all cases")


def test_without_margins_the_whole_number_search_finds_the_same_denominator():
    rate, low, high = parse_printed("83.33%"), parse_printed("75.06%"), parse_printed("91.60%")
    found = search_denominator(rate.bounds, low.bounds, high.bounds, 0.95, 0.0)
    assert [(f.method, f.n_low, f.n_high) for f in found.fits][:1] == [("wald", 78, 78)]
    assert not found.sampled


@pytest.mark.parametrize("seed", range(4))
def test_intervals_made_with_a_wrong_denominator_are_named(seed):
    # Generator: a random 2x2 table, a rate with its own denominator, and its interval made by
    # statsmodels' proportion_confint (the reference library) with another margin of the table,
    # printed to two decimals in percent. The search must name the method and that margin among
    # its fits. All 4 seeds x 10 draws must pass.
    from statsmodels.stats.proportion import proportion_confint

    rng = np.random.default_rng(seed)
    names = {"wald": "normal", "wilson": "wilson", "clopper-pearson": "beta", "agresti-coull": "agresti_coull",
             "jeffreys": "jeffreys"}
    for _ in range(10):
        tp, fp, fn, tn = (int(x) for x in rng.integers(5, 400, size=4))
        k, right = tp, tp + fn
        wrong = int(rng.choice([tp + fp, tp + fp + fn + tn, tn + fp]))
        if wrong == right:
            continue
        method = str(rng.choice(list(names)))
        lo, hi = proportion_confint(k / right * wrong, wrong, alpha=0.05, method=names[method])
        p_low, p_high = _printed(max(lo, 0.0), 2), _printed(min(hi, 1.0), 2)
        found = search_denominator((k / right, k / right), p_low.bounds, p_high.bounds, 0.95, 0.0,
                                   margins={"right": right, "wrong": wrong})
        assert any(f.method == method and f.n_low <= wrong <= f.n_high for f in found.fits), (
            tp, fp, fn, tn, method, wrong)


def test_the_search_stays_bounded_and_says_so_at_a_million():
    # A rate printed to one decimal with an interval two decimals wide fits a long run of N:
    # the run is sampled, not walked one by one, and the result says so.
    rate, low, high = parse_printed("50.0%"), parse_printed("49.9%"), parse_printed("50.1%")
    found = search_denominator(rate.bounds, low.bounds, high.bounds, 0.95, 0.0)
    assert found.sampled
    assert found.fits and all(f.n_low > 10**5 for f in found.fits)


def test_no_fit_is_reported_when_none_exists():
    # An interval that does not contain its own rate fits no method with any N.
    rate, low, high = parse_printed("80.0%"), parse_printed("85.0%"), parse_printed("90.0%")
    assert search_denominator(rate.bounds, low.bounds, high.bounds, 0.95, 0.0).fits == ()


def test_effective_sample_size_inverts_the_wald_half_width():
    # Kish (1965), Survey Sampling, Sec. 8.2 (from memory): deff = N / N_eff; the Wald half-width
    # 1.96 sqrt(p(1-p)/N) (common practice) gives N back.
    half = 1.959963984540054 * np.sqrt(0.3 * 0.7 / 250)
    assert effective_sample_size(0.3, half, 0.95) == pytest.approx(250, rel=1e-12)
    assert effective_sample_size(0.3, 0.0, 0.95) == float("inf")


from hypothesis import given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402

_ANY = st.floats(min_value=0.0, max_value=1.0, allow_subnormal=True) | st.sampled_from(
    [0.0, 1.0, 5e-324, 1e-300, 3.93e-265, 1 - 1e-16, 0.5])


@settings(max_examples=300, deadline=None)
@given(rate=_ANY, low=_ANY, high=_ANY, level=st.sampled_from([0.5, 0.95, 1 - 1e-12, 1e-9]),
       slack=st.sampled_from([0.0, 1e-300, 0.01]))
def test_any_printed_numbers_give_a_bounded_answer(rate, low, high, level, slack):
    # Hostile printed intervals (zero width, subnormal, reversed, at 0 and 1) never raise, and every
    # fit found is a whole N in range that the method really gives within the slack.
    from checker.stats.binomial_intervals import proportion_interval

    found = search_denominator((rate, rate), (low, low), (high, high), level, slack, n_max=10**7)
    for fit in found.fits:
        assert 1 <= fit.n_low <= fit.n_best <= fit.n_high <= 10**7
        lo, hi = proportion_interval(rate * fit.n_best, fit.n_best, level, fit.method)
        assert low - slack <= lo <= low + slack and high - slack <= hi <= high + slack
    assert effective_sample_size(rate, abs(high - low) / 2, level) >= 0
