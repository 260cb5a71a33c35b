"""Drafting a claim file from the paper's own words (``claimcheck draft``)."""
