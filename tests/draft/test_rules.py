"""Every rule of checker/draft/rules.py fires on its own example sentence."""

from __future__ import annotations

import pytest

from checker.draft import draft_text, rules


def test_rule_names_are_unique():
    names = [r.name for r in rules.ALL]
    assert len(names) == len(set(names))


@pytest.mark.parametrize("rule", rules.ALL, ids=[r.name for r in rules.ALL])
def test_each_rule_fires_on_its_example(rule):
    draft = draft_text(rule.example, "example", require_estimate=False)
    assert rule.name in draft.trace, (rule.example, draft.trace)


@pytest.mark.parametrize("kind, example", [
    ("measurement", "The best run, 0.913 ± 0.008."),
    ("sigma", "The excess is 4.2σ."),
    ("interval", "It lies in the 95% CI [0.895, 0.926]."),
])
def test_defaults(kind, example):
    draft = draft_text(example, "example", require_estimate=False)
    assert f"default-{kind}" in draft.trace
