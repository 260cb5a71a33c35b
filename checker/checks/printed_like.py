"""Writing a recomputed number the way the value it is compared with was
printed (see :func:`checker.wording.like`, where the rule lives)."""

from __future__ import annotations

from ..claim.model import Reported
from ..wording import MAX_DECIMALS, significant_figures  # noqa: F401  (the tests read them here)
from .. import wording


def like(x: float | None, printed: Reported | None, figures: int | None = None) -> str:
    """``x`` in the notation of ``printed``, with one significant figure more
    (or ``figures`` of them)."""
    return wording.like(x, printed.text if printed is not None else None, figures)
