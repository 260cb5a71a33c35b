"""The quick decimal logarithm (stats/precision.py: 20 digits first, 60 when
the double is in doubt) gives the very doubles of the 60-digit logarithm:
random printed numbers over the whole exponent range, numbers next to 1 (ln
near 0) and powers of ten."""

import random
from decimal import Decimal

import pytest
from hypothesis import given
from hypothesis import strategies as st

from checker.stats.precision import decimal_log, decimal_log_plain


def _same(d):
    assert repr(decimal_log(d)) == repr(decimal_log_plain(d)), d


@pytest.mark.parametrize("text", ["1", "1.0000000000000000001", "0.99999999999999999999", "10", "1e-999999",
                                  "9.99999e999998", "2.718281828459045235360287", "0", "2.24e-3", "91.2",
                                  "1e300", "1e-300", "0.5", "3e6", "1.00000000000000011102230246251565"])
def test_listed(text):
    _same(Decimal(text))


def test_random_printed_numbers():
    rng = random.Random(7)
    for _ in range(5000):
        digits = rng.randint(1, 25)
        mantissa = rng.randint(1, 10 ** digits - 1)
        _same(Decimal(f"{mantissa}e{rng.randint(-400, 400)}"))
        _same(Decimal(1) + Decimal(f"{rng.choice([-1, 1]) * rng.randint(1, 10 ** 6)}e-{rng.randint(6, 40)}"))


@given(st.decimals(min_value=Decimal("1e-2000"), max_value=Decimal("1e2000"), allow_nan=False,
                   allow_infinity=False, places=None))
def test_any_decimal(d):
    _same(d)
