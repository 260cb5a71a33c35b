"""The sentence rules: which words send a printed number to which claim field.

Every rule of ``claimcheck draft`` is in this file, as data.  A number is
read by :mod:`.notation`; then the words around it pick its field:

1. ``RIGHT`` rules look at the words just after the number (``12 circuits``,
   ``30-qubit``, ``the 5σ threshold``).  They bind tightest.
2. ``LEFT`` rules look at the words just before it, back to the previous
   number of the sentence (``above the threshold of``, ``the previous
   best's``).  A strong rule beats a weak one; among rules of one strength the
   nearest match wins, then the earlier rule in the list.
3. ``SENTENCE`` rules look anywhere earlier in the sentence (``Combined with
   inverse-variance weights, the twelve circuits give ...``).
4. Otherwise a value printed with an error is the estimate, a significance in
   sigma is the significance, and any other number is left out of the draft
   and listed at its end.

``TEXT`` rules read the whole text once (the metric, one- or two-sided, how
the systematic entered, the weighting); the first match decides.
``COLUMNS`` name the fields of a table's columns.

Each rule carries one example sentence, and a test drafts every example and
checks that the rule fired.  Patterns are matched case-insensitively against
the normalised text (see :mod:`.normalize`): ``±``, ``×``, ``σ``, ``≈``, ``^``,
``-`` as minus.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

VALUE, MEASUREMENT, SIGMA, INTERVAL, PAIR, RATIO = (
    "value", "measurement", "sigma", "interval", "pair", "ratio")
NUMBERS = frozenset({VALUE, MEASUREMENT})

# Strengths: a right-hand unit binds tightest, then a strong word before the
# number, then a word earlier in the sentence, then a weak word before it.
REFERENCE, UNIT, STRONG, SENTENCE_WIDE, WEAK = 5, 3, 2, 1.5, 1


@dataclass(frozen=True)
class Rule:
    """One rule: words near a number that give it a role.

    Attributes
    ----------
    name : str
        Unique id (named in tests and in a draft's trace).
    role : str
        What the number becomes (see ``ROLES`` in :mod:`.assemble`).
    kinds : frozenset
        The notation kinds it applies to.
    side : str
        ``left``, ``right``, ``sentence`` or ``text``.
    pattern : str
        Regular expression; ``left`` patterns are searched in the words before
        the number and must end within ``reach`` characters of it; ``right``
        patterns must match from the first character after it.
    strength : float
    example : str
        A sentence in which the rule fires (each is tested).
    reach : int
        For ``left`` rules: how far before the number the match may end.
    whole : bool
        Only a whole number of at least 1 takes this role (counts).
    """

    name: str
    role: str
    kinds: frozenset
    side: str
    pattern: str
    strength: float
    example: str
    reach: int = 40
    whole: bool = False

    @property
    def regex(self) -> re.Pattern:
        return _compiled(self.pattern, self.side)


_CACHE: dict = {}


def _compiled(pattern: str, side: str) -> re.Pattern:
    key = (pattern, side)
    if key not in _CACHE:
        _CACHE[key] = re.compile(("^(?:" + pattern + ")") if side == "right" else pattern, re.I)
    return _CACHE[key]


def _kinds(*names: str) -> frozenset:
    return frozenset(names)


# Words that may stand between a count and its noun ("400 random graphs"),
# but not function words ("12 of the samples").
_GAP = (r"(?!(?:of|the|a|an|and|or|in|on|at|for|with|per|each|from|to|by|than|as|is|are|was|"
        r"were|that|which|only)\b)[a-z][a-z-]*")


def _noun(nouns: str) -> str:
    """A count noun right after the number: ``12 circuits``, ``400 random
    graphs``, ``30-qubit`` (a hyphen binds the noun directly)."""
    return rf"\s*-\s*(?:{nouns})\b|\s+(?:{_GAP}\s+){{0,2}}(?:{nouns})\b"


SAMPLE_NOUNS = (r"samples?|shots?|bit-?strings?|measurements?|repetitions?|runs?|seeds?|test\s+items|"
                r"items|questions|problems|examples|images|clips|utterances|episodes|prompts|tasks|"
                r"sequences|realizations|realisations|draws|evaluations|graphs|rounds|cases|"
                r"test\s+cases|sentences|documents|patients|subjects|participants|games|matches|ratings|responses|"
                r"answers|trials\s+of\s+the\s+task")
CIRCUIT_NOUNS = r"circuits?|circuit\s+instances"
INSTANCE_NOUNS = r"instances|problem\s+instances|graph\s+instances"
TRIAL_NOUNS = (r"configurations?|settings?|variants|attempts|hyper-?parameter\s+(?:settings|sets|configurations)|"
               r"parameter\s+sets|scan\s+points|search\s+points|models\s+tried|candidate\s+models|"
               r"looks|bins")
_PER_PART = rf"(?:{SAMPLE_NOUNS}|{CIRCUIT_NOUNS})\s+(?:each|apiece|per\s+(?:circuit|instance|part|family|patch|configuration|setting|seed|run))"

# Words for an item one method got right ("58 utterances were right only for ours").
_RIGHT_WORDS = r"(?:right|correct|correctly\s+answered|answered|solved|passed)"

RIGHT = (
    Rule("count-per-part", "per_part", NUMBERS, "right", _noun(_PER_PART), REFERENCE,
         "Each of the 12 circuits ran 2.0 × 10^6 samples each, giving 0.0018 ± 0.0002.", whole=True),
    Rule("discordant-ours", "discordant_ours", NUMBERS, "right",
         rf"\s+(?:{_GAP}\s+){{0,2}}(?:(?:that|which|where|were|was|are|is)\s+)?(?:{_RIGHT_WORDS}\s+)?only\s+"
         r"(?:(?:for|by|with|to)\s+)?(?:ours|our\b|we\b|the\s+new|the\s+proposed|our\s+\w+)",
         UNIT, "There are 58 items only ours got right and 30 only the baseline got right.", whole=True),
    Rule("discordant-theirs", "discordant_theirs", NUMBERS, "right",
         rf"\s+(?:{_GAP}\s+){{0,2}}(?:(?:that|which|where|were|was|are|is)\s+)?(?:{_RIGHT_WORDS}\s+)?only\s+"
         r"(?:(?:for|by|with|to)\s+)?(?:the\s+)?(?:baseline|previous|old|reference|theirs|they\b)",
         UNIT, "There are 58 items only ours got right and 30 only the baseline got right.", whole=True),
    Rule("discordant-only-by", "discordant", NUMBERS, "right",
         rf"\s+(?:{_GAP}\s+){{0,3}}?only\s+(?:by|with|for)\b", UNIT,
         "There are 58 questions solved only by Kittiwake and 30 only by Fulmar.", whole=True),
    Rule("count-qubits", "qubits", NUMBERS, "right", _noun(r"qubits?"), UNIT,
         "The 30-qubit lattice gives 0.0018 ± 0.0002.", whole=True),
    Rule("count-circuits", "circuits", NUMBERS, "right", _noun(CIRCUIT_NOUNS), UNIT,
         "Over 12 random circuits we find 0.0018 ± 0.0002.", whole=True),
    Rule("count-instances", "instances", NUMBERS, "right", _noun(INSTANCE_NOUNS), UNIT,
         "The mean ratio over 400 instances is 0.874 ± 0.0026.", whole=True),
    Rule("count-samples", "samples", NUMBERS, "right", _noun(SAMPLE_NOUNS), UNIT,
         "From 2.5 × 10^7 samples we find 0.0018 ± 0.0002.", whole=True),
    Rule("count-trials", "trials", NUMBERS, "right", _noun(TRIAL_NOUNS), UNIT,
         "The best of 24 coupler settings reaches 0.0029 ± 0.0009.", whole=True),
    Rule("background-after", "background", NUMBERS, "right",
         r"\s+(?:(?:events?|counts?)\s+)?(?:expected\s+)?background(?:\s+(?:events?|counts?))?\b",
         UNIT, "The invented search expects 30.2 ± 3.1 background events and observes 47."),
    Rule("background-expected", "background", NUMBERS, "right",
         r"\s+(?:(?:events?|counts?)\s+)?(?:(?:are|were|is|was)\s+)?expected\b",
         UNIT, "We observe 47 events where 30.2 ± 3.1 are expected, a 2.9σ excess."),
    Rule("count-events", "observed", NUMBERS, "right",
         _noun(r"events?|counts?(?!\s+of)|candidate\s+events|candidates"), UNIT,
         "We observe 47 events over an expected background of 30.2 ± 3.1.", whole=True),
    Rule("count-upcrossings", "upcrossings", NUMBERS, "right", _noun(r"up-?crossings?"), UNIT,
         "The scan shows 2 upcrossings at the 0.5σ level.", whole=True),
    Rule("ratio-correct", "estimate_ratio", _kinds(RATIO), "right",
         rf"\s+(?:{_GAP}\s+){{0,2}}(?:correct|right|passed|solved|successes|successful|succeeded|{SAMPLE_NOUNS})",
         UNIT, "The model answers 1096/1200 test items correctly."),
    Rule("sigma-required-after", "required_sigma", _kinds(SIGMA), "right",
         r"\s*(?:discovery\s+|evidence\s+|significance\s+|pass(?:ing)?\s+|detection\s+)?"
         r"(?:threshold|criterion|requirement|level|standard|bar|mark|cut|goal|target|rule)\b",
         UNIT, "The excess of 0.0018 ± 0.0002 clears the 5σ discovery threshold."),
    Rule("sigma-global-after", "global_sigma", _kinds(SIGMA), "right", r"\s*\(?\s*global(?:ly)?\b",
         UNIT, "The best setting shows 3.2σ local and 2.1σ global significance."),
    Rule("sigma-global-later", "global_sigma", _kinds(SIGMA), "right",
         r"\s*(?:[a-z]+\s+){0,3}?(?:after|once|with)\s+(?:the\s+|a\s+)?(?:look[- ]elsewhere|trials[- ]factor|"
         r"correction\s+for\s+the\s+\w+)",
         UNIT, "The best setting shows 3.2σ, or 2.1σ after the look-elsewhere correction."),
    Rule("sigma-local-after", "sigma", _kinds(SIGMA), "right", r"\s*\(?\s*local(?:ly)?\b",
         UNIT, "The best setting shows 3.2σ local and 2.1σ global significance."),
    Rule("difference-points", "difference_points", _kinds(VALUE), "right",
         r"\s*(?:points?|pts?\.?)(?!\w)", UNIT,
         "The invented Plover model reaches 91.3% against the previous best's 89.0%, +2.3 points."),
    Rule("threshold-after", "threshold", NUMBERS, "right",
         r"\s*(?:threshold|bound|limit|cut-?off|target|criterion)\b",
         UNIT, "The accuracy of 0.913 ± 0.008 beats the 0.85 target."),
    Rule("baseline-after", "baseline", NUMBERS, "right",
         r"\s*(?:,\s*)?(?:for|of|by|from)\s+(?:the\s+)?(?:baseline|previous(?:\s+best)?|prior|reference|old|"
         r"earlier|competing|existing)\b|\s*\(\s*(?:the\s+)?(?:baseline|previous\s+best)\s*\)",
         UNIT, "We reach 91.3% against 89.0% for the baseline."),
)

LEFT = (
    Rule("reference", "reference", _kinds(VALUE), "left",
         r"(?<![\w])(?:fig(?:ure)?s?|tab(?:le)?s?|eqs?|eqn|equations?|sec(?:tion)?s?|refs?|references?|"
         r"appendix|chapter|step|lemma|theorem|algorithm|line|lines|page|pages|pp|version|arxiv)\.?\s*[(:]?\s*$"
         r"|\[\s*(?:\d+\s*[,–-]\s*)*$", REFERENCE,
         "As Fig. 3 shows, the fidelity is 0.0018 ± 0.0002.", reach=0),
    Rule("times-operand", "operand", _kinds(VALUE), "left", r"×\s*$", REFERENCE + 1,
         "A PDF copy prints 2.5 × 107 samples and a fidelity of 0.0185 ± 0.0020.", reach=0),
    Rule("each-sampled", "per_part", NUMBERS, "left",
         r"\beach\b[^.;]{0,60}?\b(?:was|is|were|are)\s+(?:sampled|measured|run|repeated|evaluated)\s*$",
         REFERENCE, "Each circuit was sampled 2.0 × 10^6 times; the fidelity is 0.0018 ± 0.0002.", reach=0,
         whole=True),
    Rule("p-value", "p_value", _kinds(VALUE), "left",
         r"(?<![\w.])p(?:[- ]?values?)?\s*(?:of|is|was)?\s*(?:=|<|>|≤|≈)?\s*$", REFERENCE,
         "The excess is significant (p = 1.4 × 10^-15).", reach=0),
    Rule("p-global", "global_p", _kinds(VALUE), "left",
         r"\bglobal\s+p(?:[- ]?values?)?\s*(?:of|is|was)?\s*(?:=|<|>|≤|≈)?\s*$", REFERENCE + 1,
         "The local p = 0.0007 becomes a global p = 0.016 after the scan.", reach=0),
    Rule("z-score", "sigma", _kinds(VALUE), "left",
         r"(?<![\w.])(?:z(?:[- ]?(?:score|value|statistic))?|significance)\s*(?:of|is|was)?\s*(?:=|≈)?\s*$",
         REFERENCE, "The difference has a z-score of 2.9.", reach=0),
    Rule("sample-size", "samples", NUMBERS, "left", r"(?<![\w.])n\s*=\s*$", STRONG,
         "The mean score is 71.3 ± 1.2 (n = 5).", reach=0, whole=True),
    Rule("best-of", "trials", NUMBERS, "left", r"\bbest\s+of\s*(?:the\s+)?$", STRONG,
         "The best of 24 reaches 0.0029 ± 0.0009.", reach=0, whole=True),
    Rule("same-items", "shared_samples", NUMBERS, "left", r"\bsame\s*$", UNIT + 1,
         "We reach 91.3% against the previous best's 89.0% on the same 1,200 test items.",
         reach=0, whole=True),
    Rule("background-symbol", "background", NUMBERS, "left",
         r"(?<![\w.])(?:b|n_?b|b_?exp|n_?bkg|bkg|n_?bg)\s*=\s*$", REFERENCE,
         "The invented counter sees n_obs = 47 with b = 30.2 ± 3.1, Z = 2.9.", reach=0),
    Rule("signal-yield", "estimate", NUMBERS, "left",
         r"\b(?:signal(?:\s+yield)?|excess|yield)\s*(?:of|is|was|=|:)?\s*$", UNIT + 0.5,
         "Over a background of 30.2 ± 3.1 the invented counter sees a signal yield of 16.8 ± 7.4.", reach=0),
    Rule("observed", "observed", NUMBERS, "left", r"\b(?:observ(?:e|es|ed|ing)|n_?obs\s*=)\s*$", STRONG,
         "Over an expected background of 30.2 ± 3.1 we observe 47.", reach=0, whole=True),
    Rule("sigma-required-before", "required_sigma", _kinds(SIGMA), "left",
         r"\b(?:requir\w*|at\s+least|minimum|needed|need|target(?:ed)?|criterion\s+of|goal\s+of|standard\s+of)\b",
         STRONG, "The result needs at least 3σ; it reaches 0.0018 ± 0.0002.", reach=15),
    Rule("sigma-global", "global_sigma", _kinds(SIGMA), "left",
         r"\b(?:global(?:ly)?|look[- ]elsewhere|trials[- ]factor|after\s+correct\w*|corrected)\b",
         STRONG, "After the look-elsewhere correction the significance is 2.1σ."),
    Rule("sigma-local", "sigma", _kinds(SIGMA), "left", r"\blocal(?:ly)?\b", STRONG,
         "The local significance is 3.2σ.", reach=25),
    Rule("sigma-upcrossing", "upcrossing_sigma", _kinds(SIGMA), "left", r"\bup-?crossings?\b", UNIT + 1,
         "The scan shows 2 upcrossings at the 0.5σ level."),
    Rule("interval-words", "interval", _kinds(PAIR), "left",
         r"\b(?:CI|C\.I\.|confidence|credible|interval)\b", STRONG,
         "The accuracy is 0.912, with a confidence interval of [0.895, 0.926]."),
    Rule("threshold-ratio", "threshold", _kinds(RATIO), "left",
         r"\b(?:above|exceed\w*|surpass\w*|beyond|greater\s+than|threshold|bound|limit|criterion|null)\b",
         STRONG, "The heavy-output probability 0.742 ± 0.031 is above 2/3."),
    Rule("background", "background", NUMBERS, "left",
         r"\bbackground\b|\bexpected\s*(?:number\s+of\s+|background\s+)?(?:events\s+)?(?:of\s+)?$",
         STRONG, "We observe 47 events over an expected background of 30.2 ± 3.1."),
    Rule("difference", "difference", NUMBERS, "left",
         r"(?:\b(?:difference|improvement|gain|margin|lead|advantage|increase|delta)\b|Δ)[^.\d]{0,40}?"
         r"(?:\bof|\bis|\bwas|=|:|\bby)\s*$"
         r"|\b(?:improv\w*|outperform\w*|beat\w*|ahead|better|exceed\w*)\b[^.]{0,60}?\bby\s*$",
         STRONG + 0.5, "The improvement over the baseline is 0.023 ± 0.012.", reach=0),
    Rule("baseline", "baseline", NUMBERS, "left",
         r"\bbaselines?(?:'s)?\b|\b(?:previous|prior|earlier)\s+(?:best|method|model|work|record|result)s?(?:'s?)?\b"
         r"|\bbest\s+previous\b|\bpreviously\s+(?:reported|published)\b|\bstate[- ]of[- ]the[- ]art\b"
         r"|\b(?:compared|relative)\s+(?:with|to)\b|\bagainst\b|\bversus\b|\bvs\.?(?!\w)|\bup\s+from\b",
         STRONG, "Our method reaches 91.3% against the previous best's 89.0%."),
    Rule("syst-error", "syst_error", _kinds(VALUE), "left",
         r"\bsyst(?:ematic|\.)?\s+(?:error|uncertainty|shift|offset)s?\s*(?:of|is|was|=|:)?\s*(?:±\s*)?$",
         STRONG, "The fidelity is 0.0018 with a systematic uncertainty of 0.0001.", reach=0),
    Rule("stat-error", "stat_error", _kinds(VALUE), "left",
         r"\b(?:stat(?:istical|\.)?\s+)?(?:standard\s+)?(?:error|uncertainty)(?:\s+bars?)?(?:\s+of\s+the\s+mean)?"
         r"\s*(?:of|is|was|=|:)?\s*(?:±\s*)?$|(?:^|\s)±\s*$",
         STRONG, "The fidelity is 0.0018 with a statistical error of 0.0002.", reach=0),
    Rule("sd", "sd", NUMBERS, "left",
         r"\b(?:standard\s+deviation|s\.d\.|sd|std\.?(?:\s+dev\.?)?|spread|scatter)\b[^.\d,;)]{0,25}$",
         STRONG, "The mean ratio is 0.874 with a per-instance standard deviation of 0.052."),
    Rule("factor", "factor", NUMBERS, "left",
         r"\b(?:factor|scaled\s+by|multiplied\s+by|extrapolat\w*|correction)\b", STRONG,
         "The headline is the patch value times a correction factor of 0.93 ± 0.03."),
    Rule("combined", "combination", NUMBERS, "left",
         r"\b(?:combined|combining|combination|weighted\s+(?:mean|average)|pooled|overall)\b", STRONG,
         "The combined value of the twelve circuits is 0.00178 ± 0.00020."),
    Rule("threshold", "threshold", _kinds(VALUE), "left",
         r"\b(?:above|exceed(?:s|ed|ing)?|surpass\w*|beyond|greater\s+than|larger\s+than|higher\s+than|"
         r"more\s+than|threshold|bound|limit|null(?:[- ]hypothesis)?(?:\s+value)?|target|chance(?:\s+level)?|"
         r"random\s+guessing|criterion|cut-?off)\b|\bexcess\s+(?:over|above)\b",
         STRONG, "The fidelity of 0.0018 ± 0.0002 lies above the threshold of 0.001."),
    Rule("estimate-words", "estimate", NUMBERS, "left",
         r"(?:\b(?:of|is|was|are|were|reach(?:es|ed|ing)?|achiev\w*|attain\w*|obtain\w*|measur\w*|gives?|gave|"
         r"yield\w*|found|find|finds|record\w*|report\w*|scor\w*|at|fidelity|accuracy|xeb|probability|rate|"
         r"ratio|score|value|estimate|mean|average|fraction|yield)|[=:])\s*(?:an?\s+|the\s+)?(?:value\s+of\s+)?$",
         WEAK, "Our classifier reaches 91.3%."),
)

SENTENCE = (
    Rule("baseline-subject", "baseline", NUMBERS, "sentence",
         r"^(?:the\s+|our\s+|a\s+)?(?:[\w-]+\s+){0,2}?(?:baselines?|previous\s+best|prior\s+best|state[- ]of[- ]the[- ]art)\b",
         SENTENCE_WIDE, "The strongest baseline, an invented model called Fulmar, reaches 89.0% on the same questions."),
    Rule("discordant", "discordant", _kinds(VALUE, PAIR), "sentence", r"\bdiscordant\b", STRONG,
         "The discordant counts are 58 and 30.", whole=True),
    Rule("combined-sentence", "combination", _kinds(MEASUREMENT), "sentence",
         r"\b(?:combined|combining|combination|weighted\s+(?:mean|average)|pooled)\b", SENTENCE_WIDE,
         "Combined with inverse-variance weights, the twelve circuits give 0.00178 ± 0.00020."),
)

# Whole-text rules: (rule, value).  The first match of each role decides.
TEXT = (
    Rule("metric-log-xeb", "metric", frozenset(), "text",
         r"\blog(?:arithmic)?[- ]?(?:cross[- ]entropy|XEB)\b|\bXEB_?log\b", STRONG,
         "The log cross-entropy benchmark gives 0.0042 ± 0.0009."),
    Rule("metric-linear-xeb", "metric", frozenset(), "text",
         r"\blinear[- ]?(?:cross[- ]entropy|XEB)\b|\bcross[- ]entropy\s+(?:benchmark\w*|fidelity)\b|\bXEB\b|\bF_?\s?XEB\b",
         STRONG, "The linear XEB fidelity is 0.0018 ± 0.0002."),
    Rule("metric-heavy-output", "metric", frozenset(), "text",
         r"\bheavy[- ]output|\bquantum\s+volume\b|\bHOP\b", STRONG,
         "The heavy-output probability is 0.742 ± 0.031."),
    Rule("metric-counts", "metric", frozenset(), "text",
         r"\bbackground\b[^.]{0,80}\bevents?\b|\bevents?\b[^.]{0,80}\bbackground\b|\bsignal\s+(?:events|yield)\b",
         STRONG, "We observe 47 events over an expected background of 30.2 ± 3.1."),
    Rule("metric-proportion", "metric", frozenset(), "text",
         r"\baccura(?:cy|cies)\b|\bsuccess(?:es)?\s+(?:rate|probability|fraction)\b|\bpass\s+rate\b|\bwin\s+rate\b"
         r"|\bfraction\b|\bproportion\b|\bparity\b|\bGHZ\b|\berror\s+rate\b|\bprecision\b|\brecall\b|\bhit\s+rate\b",
         WEAK, "The test accuracy is 91.3% ± 0.8%."),
    Rule("metric-mean", "metric", frozenset(), "text",
         r"\bmean\b|\baverage\b|\bapproximation\s+ratio\b|\bover\s+(?:\d+|[a-z]+)\s+(?:seeds|runs)\b|\bscore\b",
         WEAK, "The mean reward over 5 seeds is 71.3 ± 1.2."),
    Rule("sided-two", "sided", frozenset(), "text", r"\btwo[- ](?:sided|tailed)\b|\bdouble[- ]sided\b",
         STRONG, "The result is 3.6σ, two-sided."),
    Rule("sided-one", "sided", frozenset(), "text", r"\bone[- ](?:sided|tailed)\b|\bsingle[- ]sided\b",
         STRONG, "The result is 3.6σ, one-sided."),
    Rule("systematics-quadrature", "systematics", frozenset(), "text", r"\bquadrature\b", STRONG,
         "The systematic error is added in quadrature to give 11.2σ."),
    Rule("systematics-marginalized", "systematics", frozenset(), "text",
         r"\bmarginali[sz](?:ed|ing)\b|\bCousins[- ]Highland\b|\bhybrid\s+(?:treatment|method|p-?value)\b",
         STRONG, "The p-value of 0.004 is marginalized over the systematic shift."),
    Rule("systematics-none", "systematics", frozenset(), "text",
         r"\bstat(?:istical)?\s+(?:error|uncertainty)\s+(?:alone|only)\b|\bonly\s+the\s+statistical\b"
         r"|\bstat(?:istical)?[- ]only\b|\bsyst\w*\s+(?:error|uncertainty)\s+(?:is\s+|was\s+)?(?:left\s+out|not\s+included|excluded|ignored)\b",
         STRONG, "The significance of 4.2σ uses the statistical error only."),
    Rule("error-at-threshold", "error_at", frozenset(), "text",
         r"\b(?:error|uncertainty)\s+(?:is\s+|was\s+)?(?:evaluated\s+|computed\s+|taken\s+)?(?:at|under)\s+(?:the\s+)?(?:threshold|null)",
         STRONG, "The 4.2σ divides by the standard error evaluated at the threshold."),
    Rule("error-at-estimate", "error_at", frozenset(), "text",
         r"\b(?:error|uncertainty)\s+(?:is\s+|was\s+)?(?:evaluated\s+|computed\s+|taken\s+)?at\s+the\s+(?:estimate|measured\s+value)",
         STRONG, "The 4.2σ divides by the standard error at the estimate."),
    Rule("paired-no", "paired", frozenset(), "text",
         r"\bunpaired\b|\bindependent\s+(?:test\s+)?(?:samples|sets|test\s+sets)\b|\bdifferent\s+test\s+sets\b",
         STRONG, "The two models were scored on independent test sets of 1,200 items."),
    Rule("paired-yes", "paired", frozenset(), "text",
         rf"\bpaired\b|\bsame\s+(?:[\d,]+\s+)?(?:test\s+)?(?:{SAMPLE_NOUNS}|instances|set|test\s+set)\b",
         STRONG, "Both were measured on the same 1,200 test items."),
    Rule("method-inverse-variance", "method", frozenset(), "text",
         r"\binverse[- ]variance\b|\bweighted\s+by\s+(?:the\s+)?(?:inverse\s+)?(?:of\s+)?(?:their\s+)?variances?\b"
         r"|\bweighted\s+by\s+(?:the\s+|their\s+)?(?:inverse\s+)?(?:squared\s+)?(?:errors|uncertainties)\b",
         STRONG, "The 12 circuits are combined with inverse-variance weights."),
    Rule("method-random-effects", "method", frozenset(), "text",
         r"\brandom[- ]effects?\b|\bDerSimonian\b|\bPaule[- ]Mandel\b", STRONG,
         "The 6 patches are combined in a random-effects model."),
    Rule("method-samples", "method", frozenset(), "text",
         r"\bweighted\s+by\s+(?:the\s+|their\s+)?(?:numbers?\s+of\s+)?(?:samples|shots|counts)\b|\b(?:sample|shot)[- ]weighted\b",
         STRONG, "The 12 circuits are weighted by their number of samples."),
    Rule("method-equal", "method", frozenset(), "text",
         r"\bequal(?:ly)?[- ]weight(?:s|ed)?\b|\bequal\s+weights\b|\bunweighted\b|\b(?:plain|simple|arithmetic)\s+(?:mean|average)\b",
         STRONG, "The 6 patches are combined with equal weights."),
    Rule("error-to-stat", "error_to", frozenset(), "text",
         r"\bfactor'?s?\s+(?:own\s+)?(?:error|uncertainty)\b[^.]{0,50}\bstatistical\b", STRONG,
         "The factor of 0.93 ± 0.03 scales the value; the factor's error is added to the statistical error."),
    Rule("error-to-syst", "error_to", frozenset(), "text",
         r"\bfactor'?s?\s+(?:own\s+)?(?:error|uncertainty)\b[^.]{0,50}\bsystematic\b", STRONG,
         "The factor of 0.93 ± 0.03 scales the value; the factor's error is counted as systematic."),
    Rule("threshold-zero", "threshold_zero", frozenset(), "text",
         r"\b(?:above|exceeds?|exceeding|greater\s+than|different\s+from|from)\s+zero\b"
         r"|\bnull\s+hypothesis\s+of\s+(?:zero|no)\b|\bzero[- ]fidelity\s+(?:null|hypothesis)\b",
         STRONG, "The fidelity of 0.0018 ± 0.0002 is far above zero."),
    Rule("integer-data", "integer_data", frozenset(), "text",
         r"\bwhole[- ]number\s+(?:scores|responses|ratings)\b|\binteger\s+(?:scores|responses|ratings)\b|\bLikert\b",
         STRONG, "Ratings are whole-number scores; the mean is 3.48 ± 0.09."),
    Rule("error-budget", "budget", frozenset(), "text", r"\berror\s+budget\b|\bbudget\b", STRONG,
         "The error budget lists 150 two-qubit gates with error 0.005 and 20 readouts with error 0.012."),
)

# An error-budget item inside a sentence that speaks of a budget:
# "150 two-qubit gates with error 0.005 ± 0.001".
BUDGET_ITEM = re.compile(
    r"(?<![\w.-])(?P<count>\d{1,3}(?:,\d{3})+|\d+)\s+(?P<name>[a-z][a-z0-9-]*(?:\s+[a-z][a-z0-9-]*){0,3}?)\s+"
    r"(?:with|at|of)\s+(?:an?\s+)?(?:(?:average|mean)\s+)?(?:(?:error(?:\s+rate)?|infidelity)\s+(?:of\s+)?)?"
    r"(?:each\s+)?(?P<error>\d*\.?\d+(?:[eE][-+]?\d+)?%?)(?:\s*±\s*(?P<sd>\d*\.?\d+(?:[eE][-+]?\d+)?%?))?", re.I)

# The words of a baseline cue that name it (baseline.label).
BASELINE_LABEL = re.compile(
    r"\b(?:previous|prior|earlier)\s+(?:best|method|model|work|record|result)|\bbest\s+previous\b"
    r"|\bstate[- ]of[- ]the[- ]art\b|\bbaseline", re.I)

# Which metric words name which metric; specific metrics win over the
# generic proportion and mean, which go by the first word in the text.
SPECIFIC_METRICS = ("metric-log-xeb", "metric-linear-xeb", "metric-heavy-output", "metric-counts")
METRIC_OF_RULE = {"metric-log-xeb": "log-xeb", "metric-linear-xeb": "linear-xeb",
                  "metric-heavy-output": "heavy-output", "metric-counts": "counts",
                  "metric-proportion": "proportion", "metric-mean": "mean"}
# A metric named by the word "fidelity" alone (a guess: fidelity is also a
# GHZ or state fidelity).
FIDELITY_WORD = re.compile(r"\bfidelit(?:y|ies)\b", re.I)

# A background read from words that do not say "background" ("30.2 are expected", "b = 30.2"):
# it makes the claim a counting experiment only beside an observed count.
WEAK_BACKGROUND = frozenset({"background-expected", "background-symbol"})

# A baseline named in a sentence ("+2.3 points" is a difference only beside one).
BASELINE_CUE = re.compile(
    r"\b(?:baselines?|previous|prior|state[- ]of[- ]the[- ]art|against|versus|vs\.?|compared|over)\b", re.I)

# Words right after a value with one unlabelled error, or anywhere in its
# sentence, that say the error is the spread of the runs (sd) or the error of
# their mean (sem): "71.3 ± 1.2 (standard deviation over 5 seeds)", "mean ± SD".
_SD_WORDS = r"(?:standard\s+deviations?|s\.\s?d\.?|sd|std\.?(?:\s*dev\.?)?|spread)"
_SEM_WORDS = r"(?:standard\s+errors?(?:\s+of\s+the\s+mean)?|s\.\s?e\.(?:\s?m\.)?|sem|s\.e\.m\.?|std\.?\s+err(?:or)?)"
SD_AFTER = re.compile(rf"\s*[(\[,]?\s*(?:mean\s*±\s*)?(?:±\s*)?(?:(?:one|1)\s+)?(?:the\s+)?{_SD_WORDS}(?![\w])", re.I)
SEM_AFTER = re.compile(rf"\s*[(\[,]?\s*(?:mean\s*±\s*)?(?:±\s*)?(?:(?:one|1)\s+)?(?:the\s+)?{_SEM_WORDS}(?![\w])", re.I)
SD_SENTENCE = re.compile(
    rf"\bmean\s*±\s*{_SD_WORDS}(?![\w])|±\s*(?:is|are|denotes?|gives?|shows?)\s+(?:the\s+|one\s+)?{_SD_WORDS}(?![\w])"
    rf"|\berrors?(?:\s+bars?)?\s+(?:are|is|denote|show)\s+(?:the\s+|one\s+)?{_SD_WORDS}(?![\w])", re.I)
SEM_SENTENCE = re.compile(
    rf"\bmean\s*±\s*{_SEM_WORDS}(?![\w])|±\s*(?:is|are|denotes?|gives?|shows?)\s+(?:the\s+|one\s+)?{_SEM_WORDS}(?![\w])"
    rf"|\berrors?(?:\s+bars?)?\s+(?:are|is|denote|show)\s+(?:the\s+|one\s+)?{_SEM_WORDS}(?![\w])", re.I)

# Words that put a sigma or p printed in their sentence on the comparison
# with a baseline rather than on the threshold.
COMPARISON_SENTENCE = re.compile(
    r"\b(?:baselines?|previous\s+best|prior\s+best|difference|improvement|compared|versus|vs\.?|"
    r"outperform\w*|beat\w*|paired|McNemar|discordant)\b", re.I)

# Table columns: the first matching rule names a column's field.  A column
# heading "(×10^-3)" or "[%]" scales its cells (see tables.py).
COLUMNS = (
    ("syst_error", r"\bsyst|\bsystematic"),
    ("stat_error", r"^(?:±|\+/-|stat\.?|statistical|errors?|err\.?|uncertainty|unc\.?|s\.?e\.?m?\.?|std\.?\s*err(?:or)?"
                   r"|σ_?stat|σ|δ|standard\s+error)\b|\bstat(?:istical)?\s+(?:error|unc)|\berror\b(?!\s+rate)"),
    ("sd", r"^(?:sd|s\.d\.|std\.?\s*dev\.?|standard\s+deviation|spread)\b"),
    ("samples", r"\bsamples\b|\bshots\b|^n$|^n_\w+|\bitems\b|\bbitstrings\b|\bmeasurements\b|\brepetitions\b"
                r"|\bseeds\b|\bruns\b|\bsize\b|\brounds\b|\bepisodes\b|\bimages\b|\bclips\b|\bgames\b"),
    ("circuits", r"\bcircuits\b|\binstances\b"),
    ("count", r"^(?:count|number|#|n_?gates|gates)\b"),
    ("significance.sigma", r"\bsignificance\b|^z$|^n_?σ$|\bsigmas?\b|\bσ\s*\(?sig"),
    ("significance.p_value", r"^p\b|\bp-?values?\b"),
    ("threshold", r"\bthreshold\b|\bnull\b"),
    ("qubits", r"\bqubits\b|^n_?q$|\bwidth\b"),
    ("trials", r"\btrials\b|\bconfigurations\b"),
    ("estimate", r"fidelit|\bxeb\b|f_?xeb|\bestimate|\bvalue|\baccuracy|\bsuccess|\bheavy|\bhop\b|\bmean\b|\bscore"
                 r"|\brate\b|\bprobability|\bresult|^f$|^h$|\bproportion|\bfraction|\bratio|\byield|\bsignal"
                 r"|\berror\s+rate|\binfidelity"),
)
# A first column of whole numbers is still the parts' labels when its heading says so.
LABEL_HEADING = re.compile(
    r"^(?:circuit|family|config\w*|setting|patch|instance|name|label|model|method|system|device|run|"
    r"seed|id|#|no\.?|part|split|task|dataset|component|row|benchmark|index)s?\b", re.I)
# Headings too generic to be a claim's title.
GENERIC_HEADING = re.compile(
    r"^(?:abstract|results?|introduction|discussion|conclusions?|methods|summary|main\s+results|"
    r"experimental\s+results|evaluation|\d+(?:\.\d+)*)\.?$", re.I)

# The row of a results table that holds the combination of the others.
COMBINED_ROW = re.compile(
    r"^(?:combined|total|all(?:\s+\w+)?|overall|mean|average|weighted(?:\s+mean|\s+average)?|pooled|"
    r"inverse[- ]variance|summary|full|sum)\b", re.I)
# An error-budget table: a count column and an error column but no estimate.
BUDGET_HEADINGS = re.compile(r"\b(?:component|gate|operation|source|error\s+source|name)\b", re.I)

ALL = RIGHT + LEFT + SENTENCE + TEXT

# What a number becomes when no rule speaks for it: a value printed with an
# error is the estimate, a sigma is the significance, an interval is the
# interval.  Any other number is listed at the end of the draft, not placed.
DEFAULTS = {MEASUREMENT: "estimate", SIGMA: "sigma", INTERVAL: "interval"}
