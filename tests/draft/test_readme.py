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


def test_readme_kinds_table_is_current():
    """Each invented sentence of the README's table for the three kinds of issue 14 drafts to the
    fields the table lists, and to no other field (the title aside)."""
    import sys

    from checker.claim.load import parse_text

    sys.path.insert(0, str(Path(__file__).resolve().parent))
    from test_corpus import flat

    section = README.read_text(encoding="utf-8").split(
        "### Drafting a counting experiment, a comparison with a baseline, a mean over a few runs", 1)[1]
    rows = re.findall(r"^\| (?!Invented sentence|---)(.+?) \| (.+?) \|$", section.split("\n### ", 1)[0], re.M)
    assert len(rows) == 3
    for sentence, listed in rows:
        want = dict(item.split(": ", 1) for item in re.findall(r"`([^`]+)`", listed))
        _, text = make_loadable(draft_text(sentence, "readme.txt"))
        got = flat(parse_text(text, "readme.yaml", "yaml"))
        got.pop("title")
        assert got == want, sentence
