"""claimcheck draft on the three kinds of claim of issue 14 (a counting experiment, beating a
baseline, a mean over a few runs): an invented sentence for each example claim in claims_examples/
is drafted, the draft holds the example's fields with their printed digits, and the drafted claim
checked gives the same findings as the example file (the same status and the same reproduced_by,
so the slip each example plants is caught by name from the paper's words too).

The sentences are invented here, in the words of each example's own invented scenario; the
expected findings are not written down but taken from claimcheck check of the example file.
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest

from checker.checks import run_checks
from checker.claim import claim_from_document
from checker.claim.load import load_document, parse_text
from checker.draft import draft_text, make_loadable

sys.path.insert(0, str(Path(__file__).resolve().parent))
from test_corpus import flat  # noqa: E402

ROOT = Path(__file__).resolve().parents[2]

# (example file, invented sentence, the check whose findings must agree)
CASES = [
    ("significances_only_local_global.yaml",
     "The invented combined search finds its largest excess at a local significance of 3.9 sigma, and a "
     "global significance of 2.3 sigma after the look-elsewhere effect (one-sided).", "look-elsewhere"),
    ("counts_background_error_ignored.yaml",
     "The invented Marram Neutron Counter records 47 events observed over an expected background of "
     "30.2 ± 3.1: 2.9 sigma (one-sided).", "significance"),
    ("counts_background_error_ignored.yaml",
     "The invented Marram Neutron Counter records 47 events observed over an expected background of "
     "30.2 (uncertainty 3.1): 2.9 sigma (one-sided).", "significance"),
    ("counts_naive_s_over_root_b.yaml",
     "The invented Kestrel Underground Array observes 47 events over an expected background of 30.2, "
     "a 3.06σ excess (one-sided).", "significance"),
    ("counts_exact_poisson_clean.yaml",
     "In the invented Sedge Low-Background Lab 12 events were observed with 4.1 expected from background, "
     "a signal yield of 7.9 events at 3.05σ (p = 1.1 × 10^-3, one-sided).", "significance"),
    ("comparison_baseline_error_ignored.yaml",
     "The invented Wrenfield detector reaches an accuracy of 0.913 against the previous best's 0.890, "
     "on independent test sets of 1,200 images each: a difference of 0.023 ± 0.0081, 2.8σ "
     "(one-sided).", "comparison"),
    ("comparison_paired_clean.yaml",
     "On the same 1,200 utterances the invented Halloway recogniser reaches an accuracy of 0.913 and the "
     "baseline recogniser 0.890; 58 utterances were right only for ours and 30 only for the baseline, "
     "a difference of 0.0233 (z = 2.98, p = 0.0014, one-sided).", "comparison"),
    ("comparison_paired_no_discordant.yaml",
     "The invented Pellham system reaches an accuracy of 0.913 against the previous best's 0.890 on the "
     "same 1,200 sentences, significant at 2.9 sigma (one-sided).", "comparison"),
    ("comparison_unpaired_on_same_items.yaml",
     "The invented Ostrander ranker reaches an accuracy of 0.913 against the previous best's 0.890 on the "
     "same 1,200 queries, with 58 queries only ours got right and 30 only the baseline got right; the "
     "difference is significant at 1.9σ (one-sided).", "comparison"),
    ("mean_five_seeds_normal_tail.yaml",
     "The invented Brackwater agent reaches a mean return of 71.3 ± 1.2 (standard deviation over 5 seeds), "
     "above 70.0 at p = 0.008 (one-sided).", "significance"),
    ("mean_sd_printed_as_error.yaml",
     "The invented Fernhill benchmark's mean compile time over 8 runs is 12.61 ± 0.42 s, with a standard "
     "deviation of 0.42 s across the runs.", "error-floor"),
]

# Fields of an example that its sentence does not print (the example's title and source, and the
# defaults an example writes out).
NOT_PRINTED = {"title", "source", "baseline.label"}


def _draft(sentence: str):
    draft, text = make_loadable(draft_text(sentence, "invented.txt"))
    doc = parse_text(text, "invented.yaml", "yaml")
    return draft, text, doc


def _findings(claim, check: str) -> list:
    return sorted((f.status, repr(f.reproduced_by)) for f in run_checks(claim).findings if f.check == check)


@pytest.mark.parametrize("name,sentence,check", CASES, ids=[c[0] for c in CASES])
def test_drafted_kind_holds_the_example_fields(name, sentence, check):
    example = load_document(ROOT / "claims_examples" / name)
    want = {k: v for k, v in flat(example).items() if k not in NOT_PRINTED}
    draft, text, doc = _draft(sentence)
    got = flat(doc)
    for key, value in want.items():
        if key == "comparison.paired" and value == "false" and key not in got:
            continue  # left to the default, with a guess line
        assert got.get(key) == value, (key, text)


@pytest.mark.parametrize("name,sentence,check", CASES, ids=[c[0] for c in CASES])
def test_drafted_kind_gives_the_example_findings(name, sentence, check):
    example = claim_from_document(load_document(ROOT / "claims_examples" / name))
    _, text, doc = _draft(sentence)
    drafted = claim_from_document(doc)
    want = _findings(example, check)
    assert want and want == _findings(drafted, check), text


# A difference printed with its sigma and no estimate (nor baseline): the sigma is the difference's,
# comparison.sigma, whether printed in the difference's sentence or in one of its own. Invented
# sentences; the hand-written claim is what a person would write from them.
DIFFERENCE_ONLY = """title: invented Larkspur parser against the previous best
metric: mean
comparison:
  difference: 0.023
  difference_error: 0.0081
  sigma: 2.8
{more}  sided: one
"""


@pytest.mark.parametrize("sentence, more", [
    ("The invented Larkspur parser beats the previous best by a difference of 0.023 ± 0.0081, significant "
     "at 2.8σ (one-sided).", ""),
    ("The invented Larkspur parser improves on the previous best by 0.023 ± 0.0081. This is significant at "
     "2.8σ (p = 0.0026, one-sided).", "  p_value: 0.0026\n"),
])
def test_a_difference_only_comparison_keeps_its_sigma(sentence, more):
    _, text, doc = _draft(sentence)
    got = flat(doc)
    assert got["comparison.sigma"] == "2.8" and "significance.sigma" not in got, text
    assert not any(key.startswith("significance.") for key in got), text
    hand_doc = parse_text(DIFFERENCE_ONLY.format(more=more), "hand.yaml", "yaml")
    assert {k: v for k, v in got.items() if k != "title"} == {k: v for k, v in flat(hand_doc).items() if k != "title"}
    drafted, hand = claim_from_document(doc), claim_from_document(hand_doc)

    def findings(claim):
        return [(f.check, f.status, f.statement, f.message, repr(f.reproduced_by)) for f in run_checks(claim).findings]

    assert findings(drafted) == findings(hand)
