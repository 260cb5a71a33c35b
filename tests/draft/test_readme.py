"""The README's drafting example is what claimcheck draft prints for its paragraph."""

from __future__ import annotations

import re
from pathlib import Path

from checker.draft import draft_text, make_loadable
from checker.draft.writer import HEADER

README = Path(__file__).resolve().parents[2] / "README.md"


def test_readme_draft_example_is_current():
    section = README.read_text(encoding="utf-8").split("## Drafting a claim from the paper's words", 1)[1]
    paragraph = re.search(r"```text\n(.*?)```", section, re.S).group(1)
    shown = re.search(r"```yaml\n(.*?)```", section, re.S).group(1)
    _, text = make_loadable(draft_text(paragraph, "abstract.txt"))
    assert text.splitlines()[len(HEADER):] == shown.splitlines()
