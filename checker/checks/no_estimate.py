"""The skip a check reports when the claim prints no estimate (the kinds of
claim that may leave it out: counting experiments, claims that print only
their significances, comparisons that print only their difference)."""

from __future__ import annotations

from ..claim.model import Claim
from ..report import Finding


def kind_words(claim: Claim) -> str:
    if claim.metric == "counts":
        return "a counting experiment"
    if claim.comparison is not None and claim.comparison.difference is not None:
        return "a comparison that prints only its difference"
    return "a claim that prints only its significances"


def no_estimate(claim: Claim, needed_for: str) -> Finding:
    """A skip naming what the missing estimate was needed for."""
    return Finding("skip", f"No estimate is printed ({kind_words(claim)}), so {needed_for} cannot be "
                   "recomputed.", details={"missing": ["estimate"]},
                   statement="no_estimate")
