"""Hostile text through the real command line: control characters, lone surrogates
and bidirectional overrides in every string a user supplies, terminals that are not
UTF-8, spreadsheet formulas in a batch table, and the batch page's security policy.

Whatever a title, label, name, field name, circuit id or file name holds, no raw
control character (ESC, BEL, CR, other C0 and C1 but newline and tab; the
bidirectional overrides) reaches the terminal, the JSON, the Markdown, the HTML or the
CSV; NUL never reaches a report; JSON keeps the exact string.  The claims are invented.
"""

from __future__ import annotations

import csv
import io
import json
import os
import shutil

import pytest

from limited import ROOT, assert_answered, assert_no_raw_controls, claimcheck, claimcheck_many

EXAMPLES = ROOT / "claims_examples"
# Each a string a hostile title (or label, or id) may hold.
HOSTILE = ["\x1b[31mred\x1b[0m", "\x1b]0;pwned\x07", "bell\x07", "back\rover", "\x9b31m C1 CSI",
           "\u202eevil\u202c", "nul\x00byte", "\ud800 lone", "\udcff\udcfe", "tab\tok", "del\x7f", "\x1bP dcs \x1b\\"]
YAML_ESCAPED = {"\x1b": "\\e", "\x07": "\\a", "\r": "\\r", "\x9b": "\\x9b", "\u202e": "\\u202e",
                "\u202c": "\\u202c", "\x00": "\\0", "\ud800": "\\ud800", "\udcff": "\\udcff", "\udcfe": "\\udcfe",
                "\t": "\\t", "\x7f": "\\x7f", "\\": "\\\\", '"': '\\"'}


def yaml_string(text: str) -> str:
    """A double-quoted YAML scalar holding exactly ``text``."""
    return '"' + "".join(YAML_ESCAPED.get(c, c) for c in text) + '"'


def claim(title: str, label: str, name: str) -> str:
    return (f"title: {yaml_string(title)}\nsource: {yaml_string(label)}\nmetric: linear-xeb\nqubits: 20\n"
            "estimate: 2.2e-3\nstat_error: 0.3e-3\nsamples: 2000000\nthreshold: 0\n"
            "significance: {sigma: 9.9}\n"  # flagged, so the notes quote the claim
            f"parts:\n  - {{label: {yaml_string(label)}, estimate: 2.3e-3, stat_error: 0.4e-3}}\n"
            f"  - {{label: {yaml_string(name)}, estimate: 2.1e-3, stat_error: 0.4e-3}}\n"
            "combination: {method: inverse-variance, estimate: 2.2e-3}\n"
            f"error_budget:\n  - {{name: {yaml_string(name)}, count: 100, error: 0.001}}\n")


def test_hostile_strings_never_reach_any_output_raw(tmp_path):
    cases, files = [], []
    n = len(HOSTILE)
    for i, title in enumerate(HOSTILE):  # each string as a title, a label and a name
        path = tmp_path / f"c{i}.yaml"
        path.write_text(claim(title, HOSTILE[(i + 3) % n], HOSTILE[(i + 5) % n]), encoding="utf-8",
                        errors="surrogatepass")
        md, html = tmp_path / f"n{i}.md", tmp_path / f"r{i}.html"
        cases += [["check", path, "--markdown", md, "--html", html], ["check", path, "--json"]]
        files.append((title, md, html))
    outcomes = claimcheck_many(cases)
    for (title, md, html), text, as_json in zip(files, outcomes[::2], outcomes[1::2]):
        for outcome in (text, as_json):
            assert_answered(outcome)
            assert_no_raw_controls(outcome.stdout, outcome.argv)
        for report in (md, html):
            assert_no_raw_controls(report.read_bytes(), report)
        # JSON keeps the exact title, escapes and all.
        assert json.loads(as_json.stdout)["title"] == title


def test_the_surrogate_reproduction_through_the_console_script(tmp_path):
    path = tmp_path / "c.yaml"
    path.write_text('title: "\\ud800"\nmetric: linear-xeb\nestimate: 1e-3\n', encoding="utf-8")
    outcome = claimcheck("check", path)
    assert_answered(outcome)
    assert b"\\ud800" in outcome.stdout


def test_control_characters_in_field_names_and_file_names_of_error_lines(tmp_path):
    cases = []
    for i, bad in enumerate(HOSTILE):
        if "\x00" in bad or "\ud800" <= bad[0] <= "\udfff":
            continue  # not in a file name or a YAML key here
        # An unknown field whose name holds the characters: refused, and the line shows them escaped.
        path = tmp_path / f"field{i}.yaml"
        path.write_text(f"title: t\nmetric: mean\nestimate: 1\n{yaml_string('x' + bad)}: 1\n", encoding="utf-8")
        cases.append(["check", path])
        # A file whose name holds them.
        named = tmp_path / f"name{i}{bad.replace('/', '')}.yaml"
        named.write_text("title: t\nmetric: mean\nestimate: [1]\n", encoding="utf-8")
        cases.append(["check", named])
    for outcome in claimcheck_many(cases):
        assert outcome.status == 2 and outcome.err.count("\n") == 1, (outcome.argv, outcome.err)
        assert_no_raw_controls(outcome.stderr, outcome.argv)


def test_hostile_circuit_ids_in_raw_reports(tmp_path):
    data = tmp_path / "data.csv"
    rows = ["circuit,probability"] + [f'"{HOSTILE[i % 6]}{i % 3}",{(i % 7 + 1) / 2**12:.6e}' for i in range(600)]
    data.write_text("\n".join(rows) + "\n", encoding="utf-8")
    html, md = tmp_path / "r.html", tmp_path / "r.md"
    outcomes = claimcheck_many([
        ["raw", data, "--metric", "linear-xeb", "--qubits", "12", "--bootstrap", "50", "--html", html,
         "--markdown", md],
        ["raw", data, "--metric", "linear-xeb", "--qubits", "12", "--bootstrap", "0", "--json"]])
    for outcome in outcomes:
        assert_answered(outcome)
        assert_no_raw_controls(outcome.stdout, outcome.argv)
    for report in (html, md):
        assert_no_raw_controls(report.read_bytes(), report)
    ids = {c["circuit"] for c in json.loads(outcomes[1].stdout)["circuits"]}
    assert "\x1b[31mred\x1b[0m0" in ids  # JSON keeps the ids exactly


def test_a_batch_folder_with_hostile_titles_and_undecodable_names(tmp_path):
    folder = tmp_path / "claims"
    folder.mkdir()
    for i, bad in enumerate(HOSTILE):
        (folder / f"c{i}.yaml").write_text(claim(bad, bad, "n"), encoding="utf-8", errors="surrogatepass")
    shutil.copy(EXAMPLES / "lattice_xeb_clean.yaml", folder / os.fsdecode(b"\xff\xfe-latin.yaml"))
    outs = [tmp_path / f"summary.{s}" for s in ("csv", "json", "html")]
    outcomes = claimcheck_many([["batch", folder, "--out", out] for out in outs])
    for outcome, out in zip(outcomes, outs):
        assert outcome.status in (0, 1), (outcome.status, outcome.err[-2000:])
        assert "Traceback" not in outcome.err
        assert_no_raw_controls(outcome.stdout + outcome.stderr, outcome.argv)
        assert_no_raw_controls(out.read_bytes(), out)
    claims = json.loads(outs[1].read_text(encoding="utf-8"))["claims"]
    assert len(claims) == len(HOSTILE) + 1


# --- terminals that are not UTF-8 --------------------------------------------------------

EXAMPLE_CLAIMS = sorted(EXAMPLES.glob("*.yaml")) + sorted(EXAMPLES.glob("*.json"))


@pytest.mark.parametrize("encoding", ["ascii", "latin-1"])
def test_every_example_on_a_terminal_that_is_not_utf8(tmp_path, encoding):
    cases = [["check", path, *extra] for path in EXAMPLE_CLAIMS for extra in ([], ["--json"], ["--verdict-only"])]
    cases += [["batch", EXAMPLES / "survey_table.csv"],
              ["raw", EXAMPLES / "simulated_raw_lattice.csv", "--claim", EXAMPLES / "simulated_raw_lattice.yaml",
               "--bootstrap", "100", "--fit-sample", "500"],
              ["plan", "--metric", "linear-xeb", "--fidelity", "2e-3", "--threshold", "1e-3", "--sigma", "3"]]
    for outcome in claimcheck_many(cases, encoding=encoding):
        assert outcome.status in (0, 1, 2) and "Traceback" not in outcome.err, (outcome.argv, outcome.err[-2000:])
        outcome.stdout.decode(encoding)  # written in the terminal's own encoding
        if encoding == "ascii":
            assert "±".encode("latin-1") not in outcome.stdout


def test_ascii_spellings_through_the_console_script():
    # Four shipped examples print the plus-minus sign; on an ASCII terminal it is spelt "+-".
    plain = claimcheck_many([["check", path] for path in EXAMPLE_CLAIMS])
    printing = [o.argv[1] for o in plain if "±" in o.out]
    assert printing, "no example prints a plus-minus sign any more; pick another symbol to test"
    for path in printing[:2]:
        outcome = claimcheck("check", path, env={"PYTHONIOENCODING": "ascii"})
        assert outcome.status in (0, 1) and outcome.stderr == b"", outcome.err
        assert b"+-" in outcome.stdout
        outcome.stdout.decode("ascii")


# --- spreadsheet formulas and the batch page's policy ------------------------------------

FORMULAS = ["=1+1", "=HYPERLINK(\"http://example.invalid\")", "+SUM(A1)", "-2+3", "@SUM(A1)", "\tx", "\rx"]


def test_batch_csv_neutralises_formulas_and_keeps_numbers(tmp_path):
    table = tmp_path / "survey.csv"
    rows = io.StringIO()
    writer = csv.writer(rows, lineterminator="\n", quoting=csv.QUOTE_ALL)
    writer.writerow(["title", "metric", "estimate", "stat_error", "samples", "threshold", "significance.sigma",
                     "source"])
    for i, formula in enumerate(FORMULAS):
        writer.writerow([formula, "linear-xeb", "2.1e-3", "0.15e-3", "500000", "0", "-1.5", formula])
    table.write_text(rows.getvalue(), encoding="utf-8")
    out = tmp_path / "summary.csv"
    outcome = claimcheck("batch", table, "--out", out)
    assert outcome.status in (0, 1), outcome.err
    read = list(csv.DictReader(io.StringIO(out.read_text(encoding="utf-8"))))
    assert len(read) == len(FORMULAS)
    for row in read:
        for column in ("title", "claim_source"):
            assert not row[column].startswith(("=", "+", "-", "@", "\t", "\r")), (column, row[column])
        assert row["sigma_printed"] == "-1.5"  # a printed number stays a number
        float(row["sigma_recomputed"])
    assert [row["title"] for row in read][:5] == ["'" + f for f in FORMULAS[:5]]


def test_batch_html_carries_the_same_security_policy_as_the_reports(tmp_path):
    from checker.render.page import CSP

    out, report = tmp_path / "summary.html", tmp_path / "report.html"
    outcomes = claimcheck_many([["batch", EXAMPLES / "survey_table.csv", "--out", out],
                                ["check", EXAMPLES / "lattice_xeb_clean.yaml", "--html", report]])
    assert all(o.status in (0, 1, 2) and "Traceback" not in o.err for o in outcomes)
    meta = f'<meta http-equiv="Content-Security-Policy" content="{CSP}">'
    assert meta in out.read_text(encoding="utf-8")
    assert meta in report.read_text(encoding="utf-8")
