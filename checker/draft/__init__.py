"""Drafting a claim file from the paper's own words (``claimcheck draft``).

A deterministic reader, no network and no trained model:

- :mod:`.normalize` turns LaTeX, Markdown and PDF-copied Unicode into one plain notation;
- :mod:`.notation` finds every printed number and keeps its digits;
- :mod:`.rules` holds every rule that sends a number to a claim field (one readable table);
- :mod:`.tables` finds LaTeX, Markdown and delimited tables;
- :mod:`.assemble` applies the rules and builds a :class:`Draft`;
- :mod:`.writer` writes the YAML with its comments; :mod:`.loadable` makes sure it loads;
- :mod:`.table_rows` drafts one batch row per table row (``--table``).
"""

from .assemble import draft_text
from .model import Draft, DraftError, Field
from .loadable import make_loadable
from .writer import render_yaml

__all__ = ["Draft", "DraftError", "Field", "draft_text", "make_loadable", "render_yaml"]
