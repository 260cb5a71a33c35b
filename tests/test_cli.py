"""The command line through run(argv, stdout, stderr): exit status, the JSON
contract, and one line on stderr for every unusable input."""

from __future__ import annotations

import io
import math
import json
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from jsonschema import Draft202012Validator

from checker.checks import REGISTRY
from checker.cli import run

ROOT = Path(__file__).resolve().parent.parent
CLEAN = """\
title: Invented proportion claim
metric: proportion
estimate: 0.912
stat_error: 0.009
samples: 1000
threshold: 0.5
significance: {sigma: 45.8}
"""
FLAWED = CLEAN.replace("stat_error: 0.009", "stat_error: 0.002").replace("sigma: 45.8", "sigma: 206")


def cli(*argv):
    out, err = io.StringIO(), io.StringIO()
    status = run([str(a) for a in argv], out, err)
    return status, out.getvalue(), err.getvalue()


def refuse_constant(token):
    raise AssertionError(f"JSON holds {token}")


def strict_json(text):
    return json.loads(text, parse_constant=refuse_constant)


def test_exit_status_zero_one(write_claim):
    status, out, err = cli("check", write_claim(CLEAN))
    assert (status, err) == (0, "") and "verdict: consistent" in out
    status, out, err = cli("check", write_claim(FLAWED))
    assert (status, err) == (1, "") and "verdict: inconsistent" in out


def test_nothing_checkable_is_incomplete_and_exit_zero(write_claim):
    status, out, _ = cli("check", write_claim("title: t\nmetric: mean\nestimate: 1\n"), "--only",
                         "error-floor,look-elsewhere")
    assert status == 0 and "verdict: incomplete" in out


FINDING_KEYS = {"check", "status", "message", "reported", "recomputed", "reproduced_by", "details",
                "field", "statement", "printed", "recomputed_range", "tolerance", "title", "question",
                "log10_reported", "log10_recomputed"}


@pytest.mark.parametrize("text", [CLEAN, FLAWED])
def test_json_follows_the_contract(write_claim, text):
    path = write_claim(text)
    status, out, err = cli("check", path, "--json")
    assert err == ""
    report = strict_json(out)
    # DESIGN.md, "Output contract", and the counts of each status (issue 16).
    assert set(report) == {"title", "file", "verdict", "counts", "findings"}
    assert report["file"] == str(path) and report["title"] == "Invented proportion claim"
    assert report["verdict"] == ("consistent" if status == 0 else "inconsistent")
    assert report["findings"]
    for f in report["findings"]:
        assert set(f) == FINDING_KEYS
        assert f["check"] in REGISTRY and f["status"] in {"pass", "warn", "fail", "skip"}
        assert isinstance(f["message"], str) and "\n" not in f["message"]
        for key in ("reported", "recomputed"):
            assert f[key] is None or isinstance(f[key], (int, float))
        assert f["reproduced_by"] is None or isinstance(f["reproduced_by"], dict)
        assert isinstance(f["details"], dict)


def test_json_never_holds_nan_or_infinity(write_claim):
    # A printed bound makes the global sigma "at least ...": an infinite upper end inside.
    text = "title: t\nmetric: mean\nestimate: 1\ntrials: 10\nsignificance: {p_value: '< 1e-6', global_sigma: 4.5}\n"
    status, out, _ = cli("check", write_claim(text), "--json")
    report = strict_json(out)
    (le,) = [f for f in report["findings"] if f["check"] == "look-elsewhere"]
    assert le["details"]["global_sigma_high"] is None
    text = "title: t\nmetric: mean\nestimate: 1\nsignificance: {p_value: 3.7e-350, sigma: 40}\nthreshold: 0\n"
    strict_json(cli("check", write_claim(text), "--json")[1])


def test_only_selects_checks(write_claim):
    status, out, _ = cli("check", write_claim(FLAWED), "--json", "--only", "bounds,significance")
    assert {f["check"] for f in strict_json(out)["findings"]} == {"bounds", "significance"}
    status, out, _ = cli("check", write_claim(FLAWED), "--only", "bounds")
    assert status == 0  # the planted flaws are not bounds findings


def test_verdict_only(write_claim):
    status, out, _ = cli("check", write_claim(FLAWED), "--verdict-only")
    assert status == 1 and out.count("\n") == 1
    assert out == "inconsistent (error-floor); 1 flagged, 0 noted, 2 agree\n"


def test_schema_prints_a_valid_2020_12_schema():
    status, out, err = cli("schema")
    assert (status, err) == (0, "")
    schema = json.loads(out)
    Draft202012Validator.check_schema(schema)
    assert schema == json.loads((ROOT / "schemas" / "claim.schema.json").read_text())


def one_error_line(status, out, err, starts=None):
    assert status == 2 and out == ""
    assert err.endswith("\n") and err.count("\n") == 1, err
    assert "Traceback" not in err
    if starts is not None:
        assert err.startswith(starts), err
    return err.rstrip("\n")


@pytest.mark.parametrize("text, words", [
    ("title: t\nmetric: mean\nestimate: 1\nsamples: -5\n", "samples (line 4): samples must be a whole number"),
    ("title: t\nmetric: mean\nestimate: 1\nsamples: 2.5\n", "samples (line 4)"),
    ("title: t\nmetric: mean\n", "estimate (line 1): estimate is missing"),
    ("title: t\nmetric: mean\nestimate: [1\n", "is not valid YAML"),
    ("title: t\nmetric: mean\nestimate: 017\n", "octal"),
    ("title: t\nmetric: mean\nestimate: 1\nestimate: 2\n", "twice"),
    ("title: t\nmetric: mean\nestimate: 1\nstat_eror: 2\n", "did you mean 'stat_error'"),
    ("title: t\nmetric: mean\nestimate: !!python/object:os.system 1\n", "tag"),
    ("", "is empty"),
    ("- just\n- a list\n", "a list"),
    (b"\xff\xfe\x00binary", "binary"),
    (b"title: caf\xe9\n", "not UTF-8"),
])
def test_bad_input_is_one_line_and_exit_two(write_claim, text, words):
    path = write_claim(text)
    line = one_error_line(*cli("check", path, "--json"), starts=str(path))
    assert line[len(str(path))] in (":", " ")  # "FILE: field (line N): ..." or "FILE (line N): ..."
    assert words in line


def test_missing_file_and_directory(tmp_path):
    missing = tmp_path / "nowhere.yaml"
    assert one_error_line(*cli("check", missing)) == (f"{missing}: no such file; give the path of a YAML or "
                                                      "JSON claim file")
    (tmp_path / "folder.yaml").mkdir()
    assert "is a directory" in one_error_line(*cli("check", tmp_path / "folder.yaml"))
    assert "is a directory" in one_error_line(*cli("check", tmp_path))


@pytest.mark.parametrize("argv, words", [
    (["check", "x.yaml", "--only", "nope"], "unknown check id nope"),
    (["check", "x.yaml", "--only", ","], "unknown check id (none)"),
    (["check"], "the following arguments are required: file"),
    (["frobnicate"], "invalid choice"),
    (["check", "x.yaml", "--no-such-option"], "unrecognized arguments"),
])
def test_usage_errors_are_one_line_and_exit_two(argv, words):
    line = one_error_line(*cli(*argv), starts="claimcheck: ")
    assert words in line


def test_help_and_no_command():
    status, out, err = cli()
    assert status == 0 and "check" in out and err == ""
    status, out, _ = cli("--help")
    assert status == 0 and "usage: claimcheck" in out
    status, out, _ = cli("check", "--help")
    assert status == 0 and "--json" in out


def test_a_report_over_the_input_is_refused_and_the_input_untouched(write_claim):
    path = write_claim(CLEAN)
    before = path.read_bytes()
    line = one_error_line(*cli("check", path, "--markdown", path))
    assert "is one of the input files" in line
    assert path.read_bytes() == before


@settings(max_examples=100, deadline=None, suppress_health_check=[HealthCheck.too_slow,
                                                                   HealthCheck.function_scoped_fixture])
@given(extra=st.lists(st.sampled_from([
    "samples: 0", "samples: 3e6", "stat_error: 0.002", "stat_error: -1", "threshold: 0.5", "threshold: 2",
    "significance: {sigma: 4.2}", "significance: {p_value: '< 0.001'}", "significance: {p_value: 1e-400}",
    "significance: {sided: two, sigma: 1e300}", "trials: 12", "qubits: 1", "syst_error: 0.01",
    "significance: {systematics: marginalized, sigma: 40}", "parts: [{estimate: 2}]", "estimate2: 1",
    "interval: {low: 0.9, high: 0.8}", "tolerance: 0", "sd: 0.3", "circuits: 200", "metric2: x",
    "significance: {upcrossings: 2, upcrossing_sigma: 0.5, global_sigma: 3}", "extrapolation: {factor: 0.9}",
    "samples: yes", ": broken", "- list", "  indented: 1",
]), unique=True, max_size=8),
    metric=st.sampled_from(["linear-xeb", "log-xeb", "heavy-output", "proportion", "mean"]),
    json_out=st.booleans())
def test_any_claim_through_the_command_line(write_claim, extra, metric, json_out):
    text = f"title: Invented\nmetric: {metric}\nestimate: 0.9\n" + "".join(line + "\n" for line in extra)
    argv = ["check", write_claim(text)] + (["--json"] if json_out else [])
    status, out, err = cli(*argv)
    assert status in (0, 1, 2)
    if status == 2:
        one_error_line(status, out, err)
    else:
        assert err == ""
        if json_out:
            assert strict_json(out)["verdict"] == ("inconsistent" if status == 1 else strict_json(out)["verdict"])


def test_version_and_python_dash_m():
    import subprocess
    import sys

    import checker

    status, out, err = cli("--version")
    assert (status, out, err) == (0, f"claimcheck {checker.__version__}\n", "")
    done = subprocess.run([sys.executable, "-m", "checker", "--version"], capture_output=True, text=True,
                          timeout=60, cwd=ROOT)
    assert (done.returncode, done.stdout) == (0, f"claimcheck {checker.__version__}\n")


def test_check_takes_several_files_and_standard_input(write_claim, monkeypatch):
    clean, flawed = write_claim(CLEAN), write_claim(FLAWED)
    status, out, err = cli("check", clean, flawed, "--verdict-only")
    assert (status, err) == (1, "")
    first, second = out.splitlines()
    assert first.startswith(f"{clean}: consistent; ") and second.startswith(f"{flawed}: inconsistent (")
    status, out, _ = cli("check", clean, flawed, "--json")
    assert [r["verdict"] for r in strict_json(out)] == ["consistent", "inconsistent"]
    # The worst status: an unusable file (2) beats a flag (1); the others are still checked.
    status, out, err = cli("check", flawed, write_claim("title: t\n"), clean, "--verdict-only")
    assert status == 2 and len(out.splitlines()) == 2 and err.count("\n") == 1
    # With --json the unusable file keeps its place in the array, with the same one line.
    bad = write_claim("title: t\n")
    status, out, err = cli("check", flawed, bad, clean, "--json")
    entries = strict_json(out)
    assert status == 2 and [e["verdict"] for e in entries] == ["inconsistent", "unusable", "consistent"]
    assert entries[1] == {"file": str(bad), "status": "unusable", "verdict": "unusable",
                          "error": err.strip()}
    assert err.count("\n") == 1 and err.startswith(f"{bad}: ") and "metric" in err
    assert "status" not in entries[0] and "status" not in entries[2]
    # Every file unusable: still an array, and the worst status.
    status, out, err = cli("check", bad, str(bad) + ".missing.yaml", "--json")
    assert status == 2 and [e["status"] for e in strict_json(out)] == ["unusable", "unusable"]
    assert err.count("\n") == 2
    # "-" reads one claim from standard input, YAML or JSON.
    for text in (CLEAN, json.dumps({"title": "t", "metric": "mean", "estimate": 1})):
        monkeypatch.setattr("sys.stdin", io.TextIOWrapper(io.BytesIO(text.encode())))
        status, out, err = cli("check", "-")
        assert (status, err) == (0, "") and "from <stdin>" in out
    line = one_error_line(*cli("check", clean, flawed, "--html", "out.html"), starts="--html: ")
    assert "use claimcheck batch" in line


EXCESS = """\
title: Invented excess over background (invented numbers)
metric: mean
estimate: 638.0
stat_error: 52.1
syst_error: 122.2
threshold: 0
significance: {sigma: 4.8%s}
"""


def test_an_unstated_convention_that_reproduces_the_print_is_a_note(write_claim):
    # 638.0 / sqrt(52.1^2 + 122.2^2) = 4.80 (common practice: errors in quadrature).
    status, out, _ = cli("check", write_claim(EXCESS % ""), "--json")
    (sig,) = [f for f in strict_json(out)["findings"] if f["check"] == "significance"]
    assert status == 0 and sig["status"] == "warn"
    assert sig["reproduced_by"] == {"systematics": "quadrature"}
    assert "states no treatment of the systematic error" in sig["message"]
    # Stated, the convention that does not reproduce the print stays a flag.
    status, out, _ = cli("check", write_claim(EXCESS % ", systematics: none"), "--json")
    (sig,) = [f for f in strict_json(out)["findings"] if f["check"] == "significance"]
    assert status == 1 and sig["status"] == "fail"


def test_the_systematic_added_linearly_is_a_recognised_convention(write_claim):
    # 638.0 / (52.1 + 122.2) = 3.660 (arithmetic); in quadrature the same inputs give 4.80.
    text = EXCESS.replace("sigma: 4.8%s", "sigma: 3.66%s")
    status, out, _ = cli("check", write_claim(text % ", systematics: quadrature"), "--json")
    (sig,) = [f for f in strict_json(out)["findings"] if f["check"] == "significance"]
    assert status == 1 and sig["reproduced_by"] == {"systematics": "linear"}
    assert "added linearly" in sig["message"]
    status, out, _ = cli("check", write_claim(text % ", systematics: linear"), "--json", "--only", "significance")
    assert status == 0 and [f["status"] for f in strict_json(out)["findings"]] == ["pass"]


def test_a_printed_p_of_zero_is_flagged_by_bounds_and_not_compared(write_claim):
    text = ("title: Invented claim\nmetric: mean\nestimate: 0.55\nstat_error: 0.01\nthreshold: 0.5\n"
            "significance: {sigma: 5.0, p_value: 0.000}\n")
    status, out, _ = cli("check", write_claim(text), "--json")
    found = strict_json(out)["findings"]
    (zero,) = [f for f in found if f["check"] == "bounds"]
    assert status == 0 and zero["status"] == "warn" and "p < 0.001" in zero["message"]
    sig = [f for f in found if f["check"] == "significance"]
    assert not any("matching the printed p" in f["message"] for f in sig)
    assert [f["status"] for f in sig if f["field"] == "significance.p_value"] == ["skip"]


def test_checks_skip_an_input_that_bounds_flags(write_claim):
    status, out, _ = cli("check", write_claim(CLEAN.replace("stat_error: 0.009", "stat_error: -0.009")), "--json")
    found = strict_json(out)["findings"]
    assert status == 1 and [f["check"] for f in found if f["status"] == "fail"] == ["bounds"]
    for check in ("error-floor", "significance"):
        (f,) = [f for f in found if f["check"] == check]
        assert f["status"] == "skip" and "stat_error -0.009 is not used" in f["message"]
    assert not any("n/a" in f["message"] for f in found)


NOTHING_PRINTED = """\
title: Invented claim that prints no significance
metric: linear-xeb
qubits: 30
estimate: 2.24e-3
stat_error: 0.21e-3
threshold: 0
"""


def test_a_value_with_nothing_printed_to_compare_is_for_information(write_claim, tmp_path):
    # Issue 16: the significance recomputed where none is printed (2.24e-3 / 0.21e-3 = 10.7 sigma,
    # arithmetic) is information, not agreement: JSON status and counts, text, notes, batch.
    path = write_claim(NOTHING_PRINTED)
    status, out, _ = cli("check", path, "--json")
    report = strict_json(out)
    (sig,) = [f for f in report["findings"] if f["check"] == "significance"]
    assert status == 0 and sig["status"] == "info" and sig["reported"] is None
    assert 10.4 < sig["recomputed"] < 11.0
    # bounds alone agrees; error-floor says how many samples the printed error implies (no samples given)
    assert report["counts"]["info"] == 2 and report["counts"]["pass"] == 1
    status, out, _ = cli("check", path, "--markdown", tmp_path / "n.md", "--html", tmp_path / "n.html")
    assert " info significance" in out and "1 agree, 2 for information" in out
    notes = (tmp_path / "n.md").read_text()
    agrees, informed = notes.split("## What agrees")[1].split("## For information")
    assert "No significance is printed" not in agrees and "No significance is printed" in informed
    assert ">For information</h2>" in (tmp_path / "n.html").read_text()
    table = tmp_path / "t.csv"
    table.write_text("title,metric,qubits,estimate,stat_error,threshold\n"
                     "Invented,linear-xeb,30,2.24e-3,0.21e-3,0\n")
    status, out, _ = cli("batch", table, "--out", tmp_path / "t.json")
    (row,) = strict_json((tmp_path / "t.json").read_text())["claims"]
    assert status == 0 and (row["agree"], row["for_information"]) == (1, 2)
    assert "wrote 1 row to" in out


DEEP = """\
title: Invented claim with a p below the double range
metric: linear-xeb
qubits: 30
estimate: 2.24e-3
stat_error: 0.05e-3
threshold: 0
significance: {{sigma: {sigma}, p_value: {p}}}
"""


@pytest.mark.parametrize("sigma, p", [("44.8", "1e-400"), ("37.0", "1e-300")])
def test_log10_p_beside_every_p(write_claim, tmp_path, sigma, p):
    # Issue 16: p = 1e-400 keeps its size in JSON, reports and the batch table; 1e-300 round-trips.
    from scipy.stats import norm

    path = write_claim(DEEP.format(sigma=sigma, p=p))
    status, out, _ = cli("check", path, "--json", "--markdown", tmp_path / "n.md", "--html", tmp_path / "n.html")
    found = strict_json(out)["findings"]  # strict: no NaN or Infinity
    exponent = float(p.split("e")[1])
    (vs_inputs,) = [f for f in found if f["statement"] == "p_vs_inputs"]
    assert vs_inputs["printed"]["log10_value"] == exponent and vs_inputs["log10_reported"] == exponent
    low, high = vs_inputs["log10_recomputed"]["low"], vs_inputs["log10_recomputed"]["high"]
    # The recomputed z spans 2.235e-3/0.055e-3 to 2.245e-3/0.045e-3 ("0.05e-3" stands for
    # 0.045e-3 to 0.055e-3); its one-sided p from scipy.stats.norm.logsf (reference library).
    assert low == pytest.approx(norm.logsf(2.245 / 0.045) / math.log(10), rel=1e-6)
    assert high == pytest.approx(norm.logsf(2.235 / 0.055) / math.log(10), rel=1e-6)
    (vs_sigma,) = [f for f in found if f["statement"] == "sigma_vs_p"]
    assert vs_sigma["log10_recomputed"]["low"] == pytest.approx(
        norm.logsf(float(sigma) + 0.05) / math.log(10), rel=1e-6)
    sigma_only = [f for f in found if f["statement"] == "sigma_vs_inputs"]
    assert sigma_only[0]["log10_reported"] is None  # a sigma is not a p
    notes = (tmp_path / "n.md").read_text()
    assert "imply: `0`" not in notes and "<code>0</code>" not in (tmp_path / "n.html").read_text()
    table = tmp_path / "t.csv"
    table.write_text("title,metric,qubits,estimate,stat_error,threshold,significance.sigma,significance.p_value\n"
                     f"Invented,linear-xeb,30,2.24e-3,0.05e-3,0,{sigma},{p}\n")
    cli("batch", table, "--out", tmp_path / "t.json")
    (row,) = strict_json((tmp_path / "t.json").read_text())["claims"]
    assert row["log10_p_printed"] == exponent
    # At the printed central values z = 2.24e-3 / 0.05e-3 = 44.8 (arithmetic).
    assert row["log10_p_recomputed"] == pytest.approx(norm.logsf(44.8) / math.log(10), rel=1e-9)
    assert row["log10_p_holm"] == row["log10_p_bh"] == row["log10_p_recomputed"]  # a family of one
    cli("batch", table, "--out", tmp_path / "t.html")
    assert '<td class="num">1.34e-438</td>' in (tmp_path / "t.html").read_text()
    cli("batch", table, "--out", tmp_path / "t.csv.out.csv")
    header, values = (tmp_path / "t.csv.out.csv").read_text().splitlines()
    cells = dict(zip(header.split(","), values.split(",")))
    assert float(cells["log10_p_printed"]) == exponent


def test_batch_holds_a_claim_stating_trials_to_its_global_significance(tmp_path):
    # Issue 16: local 3.5 sigma (p = 2.33e-4, scipy.stats.norm.sf) over 20 trials is, by Sidak,
    # p = 1 - (1 - 2.33e-4)^20 = 4.64e-3, 2.60 sigma (Sidak 1967; arithmetic): short of 3.
    from scipy.stats import norm

    table = tmp_path / "t.csv"
    table.write_text("title,metric,estimate,stat_error,threshold,significance.required_sigma,trials\n"
                     "Invented best of 20,mean,0.535,0.010,0.5,3,20\n"
                     "Invented single,mean,0.535,0.010,0.5,3,\n")
    status, out, _ = cli("batch", table, "--out", tmp_path / "t.json")
    data = strict_json((tmp_path / "t.json").read_text())
    scan, single = data["claims"]
    p_global = 1 - (1 - norm.sf(3.5)) ** 20
    assert scan["look_elsewhere"] == "sidak" and scan["p_global"] == pytest.approx(p_global, rel=1e-9)
    assert scan["sigma_global"] == pytest.approx(norm.isf(p_global), rel=1e-9)
    assert scan["clears_required"] is False and single["clears_required"] is True
    assert single["look_elsewhere"] == "" and single["sigma_global"] is None
    assert data["summary"]["clear_required_sigma"]["recomputed"] == 1
    assert "global) significance for 1 claim that states trials (Sidak), the local one for the other 1" in out
