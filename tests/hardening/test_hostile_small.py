"""The smaller classes of the second hostile round, through the real command line:
negative numbers after options, brackets in comments and quoted text, library
warnings on stderr, and counts beyond the double's digits in plan's output.
The claims are invented.
"""

from __future__ import annotations

import json
import re

from limited import ROOT, assert_answered, claimcheck, claimcheck_many

EXAMPLES = ROOT / "claims_examples"
PLAN = ["plan", "--metric", "linear-xeb", "--fidelity", "2e-3", "--sigma", "3"]


def test_negative_numbers_after_options_parse(tmp_path):
    cases = [PLAN + ["--threshold", value] for value in ("-1e-3", "-.5e-3", "-0.001", "-1E-3", "-1")]
    cases.append(["plan", "--metric", "mean", "--fidelity", "-0.2", "--threshold", "-1.5e0", "--sigma", "3",
                  "--sd", "2"])
    series = tmp_path / "s.csv"
    series.write_text("time,estimate,error\n" + "".join(f"{t - 5},{0.5 + 0.001 * t:.4f},0.01\n" for t in range(10)))
    cases.append(["drift", series, "--window", "-4e0", "-1e-1"])
    # A value that merely starts with "-" and a letter is not a number: argparse's message.
    cases.append(PLAN + ["--threshold", "-x"])
    outcomes = claimcheck_many(cases)
    for outcome in outcomes[:-2]:
        assert_answered(outcome)
        assert "threshold -" in outcome.out, outcome.out[:300]
    assert_answered(outcomes[-2])
    assert outcomes[-1].status == 2 and "--threshold" in outcomes[-1].err and outcomes[-1].err.count("\n") == 1


def test_brackets_in_comments_and_quoted_text_are_not_nesting(tmp_path):
    base = (EXAMPLES / "lattice_xeb_clean.yaml").read_text()
    variants = {
        "comment": base + "# " + "[" * 100 + "\n",
        "quoted title": base.replace("title: ", "title: '" + "[" * 60 + "' # ", 1),
        "double quoted": base.replace("title: ", 'title: "' + "{{{{" * 20 + '" # ', 1),
        "apostrophe then brackets": base.replace("title: ", "title: don't [" + "[" * 40 + " # ", 1),
    }
    cases = []
    for i, text in enumerate(variants.values()):
        path = tmp_path / f"c{i}.yaml"
        path.write_text(text)
        cases.append(["check", path, "--verdict-only"])
    for name, outcome in zip(variants, claimcheck_many(cases)):
        assert outcome.status in (0, 1), (name, outcome.err)
    # Real nesting beyond 32 levels is still refused, in a tenth of a second or so.
    deep = tmp_path / "deep.yaml"
    deep.write_text("title: t\nmetric: mean\nestimate: 1\nx: " + "[" * 500_000 + "\n")
    outcome = claimcheck_many([["check", deep]])[0]
    assert outcome.status == 2 and "nested too deeply" in outcome.err and outcome.seconds < 3, outcome


def test_library_warnings_stay_off_stderr(tmp_path):
    # Degenerate inputs that made matplotlib (an empty log axis) or numpy warn: the
    # findings say what matters; stderr stays empty.
    budget = tmp_path / "budget.yaml"
    budget.write_text("title: all lost (invented)\nmetric: linear-xeb\nestimate: 1e-300\nstat_error: 1e-301\n"
                      "error_budget:\n  - {name: gates, count: 1000000, error: 0.5}\n")
    tiny = tmp_path / "tiny.yaml"
    tiny.write_text("title: tiny (invented)\nmetric: mean\nestimate: 1e-300\nsd: 1e-300\nsamples: 3\n"
                    "threshold: 0\nsignificance: {sigma: 3}\nparts:\n  - {estimate: 1e-300, stat_error: 1e-310}\n"
                    "  - {estimate: 2e-300, stat_error: 1e-310}\ncombination: {method: random-effects}\n")
    flat = tmp_path / "flat.csv"
    flat.write_text("time,estimate,error\n" + "".join(f"{t},0.5,0.01\n" for t in (1, 1, 1, 2)))
    cases = [["check", budget, "--html", tmp_path / "b.html"], ["check", tiny, "--html", tmp_path / "t.html"],
             ["drift", flat]]
    for outcome in claimcheck_many(cases):
        assert outcome.status in (0, 1, 2), outcome.err
        if outcome.status != 2:
            assert outcome.stderr == b"", outcome.err


def test_plan_writes_huge_counts_without_float_noise():
    outcome = claimcheck("plan", *PLAN[1:], "--threshold", "1e-3", "--samples", "1e300")
    assert_answered(outcome)
    assert not re.search(r"[0-9,]{40,}", outcome.out), outcome.out
    assert "1e300 samples" in outcome.out
    as_json = claimcheck_many([PLAN + ["--threshold", "1e-3", "--samples", "1e300", "--json"]])[0]
    assert json.loads(as_json.stdout)["at"]["samples"] == 1e300


def test_a_failure_of_claimcheck_itself_is_never_exit_1(monkeypatch, capsys):
    # A traceback used to exit 1, the status for "something was flagged"; a script reading
    # $? -le 1 as a normal result read a crash as one.  Now: one line and exit 3.
    import pytest

    import checker.cli

    for error in (RuntimeError("on purpose\x1b[31m, in a test"), MemoryError()):
        def broken(argv, *args, error=error):
            raise error
        monkeypatch.setattr(checker.cli, "run", broken)
        monkeypatch.setattr("sys.argv", ["claimcheck", "check", "x.yaml"])
        with pytest.raises(SystemExit) as exit_:
            checker.cli.main()
        assert exit_.value.code == checker.cli.INTERNAL_ERROR == 3
        err = capsys.readouterr().err
        assert err.count("\n") == 1 and "Traceback" not in err and "\x1b" not in err, err
