"""Random boxes of printed parts, shared by the combination-range tests."""

from __future__ import annotations

import numpy as np

from checker.stats.combination_ranges import PartsBox
from checker.stats.precision import parse_printed


def printed(value: float, digits: int):
    return parse_printed(f"{value:.{digits - 1}e}")


def random_box(rng, printed_samples: bool = False) -> PartsBox:
    k = int(rng.integers(2, 9))
    scale = 10.0 ** rng.uniform(-4, 0)
    errors = scale * rng.uniform(0.3, 2.0, k)
    values = scale * rng.uniform(1, 20) + rng.normal(0, 1, k) * errors * rng.uniform(0.3, 3)
    xs = [printed(v, int(rng.integers(1, 4))) for v in values]
    ss = [printed(e, int(rng.integers(1, 4))) for e in errors]
    n = rng.integers(1000, 100000, k).astype(float)
    ns = [printed(v, 2) for v in n] if printed_samples else [parse_printed(str(int(v)), exact=True) for v in n]
    col = lambda reps, attr: np.array([getattr(r, attr) for r in reps])  # noqa: E731
    return PartsBox(col(xs, "value"), col(xs, "low"), col(xs, "high"), col(ss, "value"), col(ss, "low"),
                    col(ss, "high"), col(ns, "value"), col(ns, "low"), col(ns, "high"))
