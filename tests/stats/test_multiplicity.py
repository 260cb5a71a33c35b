"""Look-elsewhere corrections: Sidak, Bonferroni and Gross-Vitells against the
published values, and tiny p-values kept in log space."""

from __future__ import annotations

import math
from decimal import Decimal

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from checker.stats.multiplicity import log_bonferroni, log_gross_vitells, log_sidak
from checker.stats.tails import log_p_from_sigma, sigma_from_log_p


def same_digits(value: float, printed: str) -> bool:
    """``value`` rounded to the printed number of significant figures equals ``printed``."""
    digits = len(Decimal(printed).as_tuple().digits)
    return Decimal(f"{value:.{digits - 1}e}") == Decimal(printed)


LOCAL_3_SIGMA = log_p_from_sigma(3.0, "one")

# REFERENCES.md, "Look-elsewhere effect": Sidak p_g = 1 - (1 - p)^N (Z. Sidak, J. Am. Stat.
# Assoc. 62, 626 (1967)) and Bonferroni min(1, N p), at local Z = 3 one-sided.
SIDAK = [(10, "0.0134173", "2.2139"), (100, "0.126355", "1.1438")]
BONFERRONI = [(10, "0.013499", "2.2115"), (100, "0.13499", "1.1031")]


@pytest.mark.parametrize("trials, p_global, z_global", SIDAK)
def test_sidak_reference_values(trials, p_global, z_global):
    log_p = log_sidak(LOCAL_3_SIGMA, trials)
    assert same_digits(math.exp(log_p), p_global)
    assert same_digits(sigma_from_log_p(log_p, "one"), z_global)


@pytest.mark.parametrize("trials, p_global, z_global", BONFERRONI)
def test_bonferroni_reference_values(trials, p_global, z_global):
    log_p = log_bonferroni(LOCAL_3_SIGMA, trials)
    assert same_digits(math.exp(log_p), p_global)
    assert same_digits(sigma_from_log_p(log_p, "one"), z_global)


def test_gross_vitells_worked_example():
    # Gross and Vitells, Eur. Phys. J. C 70, 525 (2010), arXiv:1005.1891, as quoted in
    # REFERENCES.md: local Z = 5, 2 upcrossings at c0 = 0.25 (0.5 sigma).
    log_local = log_p_from_sigma(5.0, "one")
    assert same_digits(math.exp(log_local), "2.86652e-7")
    log_global = log_gross_vitells(log_local, 5.0, 2, 0.5)
    assert same_digits(math.exp(log_global), "8.73e-6")
    assert same_digits(sigma_from_log_p(log_global, "one"), "4.295")
    # "a trials factor of about 30"
    assert same_digits(math.exp(log_global - log_local), "3e1")


def test_gross_vitells_with_a_two_sided_local_p():
    # Same source and example: with p_local two-sided the trials factor is 15.7.
    log_local = log_p_from_sigma(5.0, "two")
    factor = math.exp(log_gross_vitells(log_local, 5.0, 2, 0.5) - log_local)
    assert same_digits(factor, "15.7")


def test_gross_vitells_without_upcrossings_is_the_local_p():
    log_local = log_p_from_sigma(4.0)
    assert log_gross_vitells(log_local, 4.0, 0, 0.5) == log_local


def test_global_p_never_exceeds_one():
    assert log_bonferroni(math.log(0.2), 100) == 0.0
    assert log_sidak(math.log(0.2), 100) <= 0.0
    assert log_gross_vitells(math.log(0.3), 0.5, 50, 0.5) == 0.0
    assert log_sidak(0.0, 5) == 0.0


def test_one_trial_changes_nothing():
    for log_p in (math.log(0.3), math.log(1e-9), -1e4):
        assert log_sidak(log_p, 1) == pytest.approx(log_p, rel=1e-12)
        assert log_bonferroni(log_p, 1) == log_p


def test_fewer_than_one_trial_is_refused():
    with pytest.raises(ValueError):
        log_sidak(-3.0, 0.5)


@pytest.mark.parametrize("log_p", [math.log(1e-300), -1e5, -800.0])
def test_tiny_local_p_in_log_space(log_p):
    # Far in the tail Sidak and Bonferroni coincide: log p_g = log N + log p (common practice).
    for trials in (10, 1e6):
        assert log_sidak(log_p, trials) == pytest.approx(math.log(trials) + log_p, rel=1e-13)
        assert log_bonferroni(log_p, trials) == pytest.approx(math.log(trials) + log_p, rel=1e-13)


def test_gross_vitells_at_200_sigma():
    # p_local + N exp(-(c - c0)/2) with both terms near exp(-20000), far below the smallest double;
    # the sum is formed in log space: log(a + b) = log b + log1p(a / b).
    z, log_local = 200.0, log_p_from_sigma(200.0)
    log_term = math.log(3) - (z * z - 1.0) / 2
    expected = log_term + math.log1p(math.exp(log_local - log_term))
    assert log_gross_vitells(log_local, z, 3, 1.0) == pytest.approx(expected, rel=1e-13)
    assert math.exp(expected) == 0.0


@settings(max_examples=200, deadline=None)
@given(p=st.floats(min_value=1e-12, max_value=0.999), trials=st.integers(1, 10**6))
def test_sidak_against_the_plain_formula_and_the_bonferroni_bound(p, trials):
    log_p = math.log(p)
    sidak = log_sidak(log_p, trials)
    # Sidak's formula written directly, in a form stable for small p (common practice).
    direct = math.log(-math.expm1(trials * math.log1p(-p)))
    assert sidak == pytest.approx(direct, rel=1e-9, abs=1e-12)
    assert log_p - 1e-12 <= sidak <= log_bonferroni(log_p, trials) + 1e-12


def test_sidak_near_one_keeps_its_digits():
    # p = 0.2, N = 1000: 1 - p_g = 0.8^1000 = 1.23e-97, so log p_g = -1.23e-97 (not 0, whose
    # one-sided sigma is -infinity).  log1p is the textbook remedy (common practice).
    q = 1000 * math.log(0.8)
    assert log_sidak(math.log(0.2), 1000) == pytest.approx(-math.exp(q), rel=1e-12)
    assert math.isfinite(sigma_from_log_p(log_sidak(math.log(0.2), 1000), "one"))


def test_sidak_when_the_local_p_rounds_to_one():
    # log p = -1e-20 is p = 1 - 1e-20, which a double rounds to 1; one trial must give it back.
    assert log_sidak(-1e-20, 1) == pytest.approx(-1e-20, rel=1e-9)
    # Ten trials: 1 - (1e-20)^10 = 1 - 1e-200, whose log is -1e-200.
    assert log_sidak(-1e-20, 10) == pytest.approx(-1e-200, rel=1e-9)


# --- the trials a local and a global p imply (Sidak inverted; issue 14) ---------------------
from decimal import localcontext  # noqa: E402

from checker.stats.multiplicity import sidak_trials  # noqa: E402


def trials_by_decimal(p_local: str, p_global: str) -> Decimal:
    """N = ln(1 - p_global) / ln(1 - p_local) in 420-digit decimal arithmetic (Python's decimal
    module, natural log to the context precision), independent of the double-precision log1p."""
    with localcontext() as ctx:
        ctx.prec = 420
        one = Decimal(1)
        return (one - Decimal(p_global)).ln() / (one - Decimal(p_local)).ln()


@pytest.mark.parametrize("p_local, p_global", [
    ("4.8096e-5", "1.0724e-2"),        # local 3.9, global 2.3 sigma (one-sided, two experiments)
    ("1.3499e-3", "1.3422e-2"),        # local 3 sigma, about 10 trials
    ("1e-300", "1e-297"),               # both deep: N ~ p_global / p_local = 1000
    ("1e-300", "0.5"),                  # a 37-sigma local p with nothing left globally
    ("0.2", "0.9"),                     # large p: log1p would not be needed, expm1 is
])
def test_sidak_trials_against_decimal_arithmetic(p_local, p_global):
    got = sidak_trials(math.log(float(p_local)), math.log(float(p_global)))
    ref = float(trials_by_decimal(p_local, p_global))
    assert got == pytest.approx(ref, rel=1e-12)


def test_sidak_trials_beyond_the_double_range():
    # log p_local = -1000 (p = e^-1000 underflows a double): N = p_global / p_local = e^10
    # when p_global = e^-990 (from -log(1 - p) = p + p^2/2 + ..., the correction ~ e^-1000)
    assert sidak_trials(-1000.0, -990.0) == pytest.approx(math.exp(10.0), rel=1e-12)
    # ... and N = ln 2 / e^-1000 = ln 2 x e^1000 when p_global = 1/2: beyond the double range
    assert sidak_trials(-1000.0, math.log(0.5)) == math.inf


@settings(max_examples=60)
@given(st.floats(-700, -1e-3), st.floats(1, 1e6))
def test_sidak_trials_inverts_log_sidak(log_p, trials):
    log_g = log_sidak(log_p, trials)
    if log_g > -1e-15:  # the global p rounds to 1: any larger N gives it too
        return
    assert sidak_trials(log_p, log_g) == pytest.approx(trials, rel=1e-8)


def test_sidak_trials_below_one_when_the_global_is_the_more_significant():
    assert sidak_trials(math.log(1e-2), math.log(1e-4)) < 1
