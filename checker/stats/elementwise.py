"""Python's ``max(0.0, x)``, ``min(max(x, 0.0), 1.0)`` and ``x ** 2`` for a
float, and the same choices elementwise for a numpy array, so that one formula
written with them serves one value and 100,000 circuits alike.

Why not ``np.maximum``/``np.clip``/``np.square``: they pick a different
operand than Python's ``max``/``min`` for NaN and -0.0 (``max(0.0, nan)`` is
0.0, ``np.maximum(0.0, nan)`` is nan), and ``np.square`` is ``x * x`` where
Python's ``x ** 2`` calls the C library's ``pow``, which need not round the
same.  The array forms below choose exactly what the scalar forms choose, so
an array result equals the loop over its elements bit for bit
(tests/stats/test_elementwise.py).  A float (or any 0-dimensional value) takes
the plain Python expression unchanged; numpy is imported only for an array.
"""

from __future__ import annotations


def is_array(x) -> bool:
    """True for an array of one or more dimensions (numpy's), False for a plain number."""
    return getattr(x, "ndim", 0) != 0


def at_least_zero(x):
    """``max(0.0, x)``: x when x > 0.0, else 0.0 (so NaN and -0.0 give 0.0)."""
    if not is_array(x):
        return max(0.0, x)
    import numpy as np

    return np.where(x > 0.0, x, 0.0)


def clip_unit(x):
    """``min(max(x, 0.0), 1.0)``: max keeps x unless 0.0 > x, min keeps that unless 1.0 < it
    (so NaN and -0.0 stay)."""
    if not is_array(x):
        return min(max(x, 0.0), 1.0)
    import numpy as np

    y = np.where(x < 0.0, 0.0, x)
    return np.where(y > 1.0, 1.0, y)


def python_square(x):
    """``x ** 2`` with Python's float power (the C library's pow), elementwise for an array."""
    if not is_array(x):
        return x ** 2
    import numpy as np

    return np.array([v ** 2 for v in x.ravel().tolist()], dtype=float).reshape(x.shape)
