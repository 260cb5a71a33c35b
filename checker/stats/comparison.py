"""Comparing a result with a baseline: the difference, its error, z and p.

Unpaired (independent measurements): d = a - b, se = sqrt(se_a^2 + se_b^2).
For proportions without printed errors, se^2 = p (1 - p) / n for each.

Paired proportions (both scored on the same N items), with the discordant
counts n10 (items only ours got right) and n01 (only the baseline's):

- difference d = (n10 - n01) / N and its Wald error
  se = sqrt((n10 + n01) - (n10 - n01)^2 / N) / N  (Agresti 2002, section 10.1);
- McNemar's z = (n10 - n01) / sqrt(n10 + n01), chi-square z^2 on 1 degree of
  freedom, or with the continuity correction (|n10 - n01| - 1)^2 / (n10 + n01);
- the exact test: n10 ~ Binomial(n10 + n01, 1/2) under the null.

Without the discordant counts a paired claim fixes only n10 - n01 = N d; the
discordant total n10 + n01 can run from |n10 - n01| (no item where both
differ) up to the most the two accuracies allow, which bounds McNemar's z.

References
----------
Q. McNemar, "Note on the sampling error of the difference between correlated
proportions or percentages", Psychometrika 12, 153 (1947).
A. Agresti, "Categorical Data Analysis", 2nd ed., Wiley (2002), section 10.1
(the paired difference, its standard error and McNemar's statistic; from memory).
A. L. Edwards, "Note on the correction for continuity in testing the
significance of the difference between correlated proportions",
Psychometrika 13, 185 (1948).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .log_special import log_betainc
from .tails import LOG2, log_p_from_sigma, sigma_from_log_p

PAIRED_TESTS = ("z", "chi-square", "chi-square-corrected", "exact")


@dataclass(frozen=True)
class Difference:
    """A difference with its standard error and significance."""

    difference: float
    error: float
    sigma: float     # signed z for the tests with a sign; |z| for chi-square forms
    log_p: float     # natural log of p at the requested sidedness
    sided: str
    test: str

    @property
    def p_value(self) -> float:
        return math.exp(self.log_p) if self.log_p > -745 else 0.0


def proportion_error(p: float, n: float) -> float:
    """sqrt(p (1 - p) / n): the binomial standard error of a proportion."""
    p = min(max(p, 0.0), 1.0)
    return math.sqrt(p * (1.0 - p) / n)


def unpaired(a: float, se_a: float, b: float, se_b: float, sided: str = "one") -> Difference:
    """a - b with the two errors in quadrature."""
    d = a - b
    se = math.hypot(se_a, se_b)
    z = d / se
    return Difference(d, se, z, log_p_from_sigma(z, sided), sided, "z")


def paired_difference(n10: float, n01: float, n: float) -> tuple[float, float]:
    """(d, se) of a paired difference of proportions from its discordant counts
    (Agresti 2002, section 10.1; from memory)."""
    d = (n10 - n01) / n
    var = max((n10 + n01) - (n10 - n01) ** 2 / n, 0.0)
    return d, math.sqrt(var) / n


def exact_log_p(n10: float, n01: float, sided: str = "one") -> float:
    """log p of the exact McNemar test: P(X >= n10) for X ~ Binomial(n10 + n01, 1/2)
    (one-sided), or twice the smaller tail (two-sided, capped at 1)."""
    k, m = int(round(n10)), int(round(n10 + n01))
    if m == 0:
        return 0.0

    def upper(j):  # log P(X >= j)
        return 0.0 if j <= 0 else log_betainc(j, m - j + 1, 0.5)

    if sided == "one":
        return upper(k)
    smaller = min(upper(k), upper(m - k))
    return min(0.0, LOG2 + smaller)


def mcnemar(n10: float, n01: float, n: float, test: str = "z", sided: str = "one") -> Difference:
    """The paired comparison by one of :data:`PAIRED_TESTS`.

    ``z`` is (n10 - n01) / sqrt(n10 + n01); ``chi-square`` its square (reported
    through |z|, its p two-sided by nature, halved for one-sided when the sign
    agrees); ``chi-square-corrected`` with Edwards' continuity correction;
    ``exact`` the binomial test on the discordant pairs.
    """
    d, se = paired_difference(n10, n01, n)
    total = n10 + n01
    diff = n10 - n01
    if total <= 0:
        return Difference(d, se, 0.0, 0.0 if sided == "two" else math.log(0.5), sided, test)
    if test == "z":
        z = diff / math.sqrt(total)
        return Difference(d, se, z, log_p_from_sigma(z, sided), sided, test)
    if test in ("chi-square", "chi-square-corrected"):
        shrink = 1.0 if test == "chi-square-corrected" else 0.0
        root = max(abs(diff) - shrink, 0.0) / math.sqrt(total)
        z = math.copysign(root, diff)
        return Difference(d, se, z, log_p_from_sigma(z, sided), sided, test)
    if test == "exact":
        log_p = exact_log_p(n10, n01, sided)
        z = sigma_from_log_p(log_p, sided)
        return Difference(d, se, z, log_p, sided, test)
    raise ValueError(f"test must be one of {', '.join(PAIRED_TESTS)}, got {test!r}")


@dataclass(frozen=True)
class DiscordantRange:
    """What a paired claim without discordant counts can still say."""

    net: int                # n10 - n01
    fewest: int             # smallest possible n10 + n01
    most: int               # largest possible n10 + n01
    sigma_low: float        # McNemar z at the most discordant pairs
    sigma_high: float       # McNemar z at the fewest


def discordant_range(correct_ours: int, correct_baseline: int, n: int) -> DiscordantRange:
    """The range of McNemar's z over every split of the items consistent with
    the two correct counts on the same ``n`` items.

    n10 - n01 = k_a - k_b is fixed; n10 can run from max(k_a - k_b, 0) to
    min(k_a, n - k_b), and n10 + n01 = 2 n10 - (k_a - k_b).
    """
    net = correct_ours - correct_baseline
    lowest_n10 = max(net, 0)
    highest_n10 = min(correct_ours, n - correct_baseline)
    fewest = 2 * lowest_n10 - net
    most = 2 * highest_n10 - net
    if fewest <= 0:  # equal accuracies: z is 0 whatever the split
        return DiscordantRange(net, fewest, most, 0.0, 0.0)
    z_few = net / math.sqrt(fewest)
    z_most = net / math.sqrt(most)
    return DiscordantRange(net, fewest, most, min(z_few, z_most), max(z_few, z_most))
