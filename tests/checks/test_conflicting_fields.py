"""Fields that contradict each other, through the real command line (issue 16, input side).

Every circuit is sampled at least once (common practice: a sample is one run of one circuit),
so fewer samples than circuits cannot be a total; a treatment of the systematic error needs a
systematic error; integer_data describes a mean's responses and no other metric.
"""

from __future__ import annotations

import io
import json

from checker.cli import run


def cli(*argv):
    out, err = io.StringIO(), io.StringIO()
    status = run([str(a) for a in argv], out, err)
    return status, out.getvalue(), err.getvalue()


def findings(out, check):
    return [f for f in json.loads(out)["findings"] if f["check"] == check]


XEB = """\
title: Invented lattice, fewer samples than circuits (invented numbers)
metric: linear-xeb
qubits: 20
estimate: 2.0e-3
stat_error: 0.2e-3
samples: 1000
circuits: 2000
"""


def test_fewer_samples_than_circuits_is_flagged_and_not_used(write_claim):
    status, out, _ = cli("check", write_claim(XEB), "--json")
    (flag,) = [f for f in findings(out, "bounds") if f["status"] == "fail"]
    assert status == 1 and flag["field"] == "samples" and flag["statement"] == "samples_below_circuits"
    # 1000 x 2000 = 2e6 samples if 1000 is the count per circuit (arithmetic).
    assert "1000 samples but 2000 circuits" in flag["message"] and "(2e6 in all)" in flag["message"]
    assert flag["details"]["samples_if_per_circuit"] == 2.0e6
    (floor,) = findings(out, "error-floor")
    assert floor["status"] == "skip" and "physical-range check flags them" in floor["message"]
    # The same counts the right way round raise no such flag.
    fixed = XEB.replace("samples: 1000", "samples: 2000000")
    status, out, _ = cli("check", write_claim(fixed), "--json", "--only", "bounds")
    assert [f["status"] for f in findings(out, "bounds")] == ["pass"]


def test_a_part_with_fewer_samples_than_circuits(write_claim):
    text = ("title: t\nmetric: linear-xeb\nestimate: 2.0e-3\n"
            "parts:\n  - {label: a, estimate: 2.0e-3, stat_error: 0.5e-3, samples: 10, circuits: 50}\n")
    status, out, _ = cli("check", write_claim(text), "--json", "--only", "bounds")
    (flag,) = findings(out, "bounds")
    assert status == 1 and flag["details"]["part"] == "a" and flag["message"].startswith("Part a gives 10 samples")


QUADRATURE = """\
title: Invented device, a stated treatment of a systematic error it does not print
metric: linear-xeb
qubits: 20
estimate: 2.0e-3
stat_error: 0.5e-3
threshold: 0
significance: {sigma: 4.0, systematics: quadrature}
"""


def test_a_treatment_of_the_systematic_error_with_none_printed_is_a_note(write_claim):
    status, out, _ = cli("check", write_claim(QUADRATURE), "--json", "--only", "significance")
    found = findings(out, "significance")
    (note,) = [f for f in found if f["statement"] == "systematics_unprinted"]
    assert status == 0 and note["status"] == "warn" and note["field"] == "significance.systematics"
    assert "prints no syst_error" in note["message"]
    # 2.0e-3 / 0.5e-3 = 4.0 (arithmetic): the print agrees, and the message names what was used.
    (sigma,) = [f for f in found if f["statement"] == "sigma_vs_inputs"]
    assert sigma["status"] == "pass" and "statistical error only" in sigma["message"]
    assert not any("added in quadrature" in f["message"] for f in found)
    # With a systematic error printed there is nothing to note.
    status, out, _ = cli("check", write_claim(QUADRATURE + "syst_error: 0.1e-3\n"), "--json", "--only", "significance")
    assert not [f for f in findings(out, "significance") if f["statement"] == "systematics_unprinted"]


def test_integer_data_on_a_proportion_is_refused(write_claim):
    text = "title: t\nmetric: proportion\nestimate: 0.75\nsamples: 200\ninteger_data: true\n"
    path = write_claim(text)
    status, out, err = cli("check", path)
    assert status == 2 and out == "" and err.count("\n") == 1
    assert err.startswith(f"{path}: integer_data (line 5): integer_data belongs to metric mean")
    assert "leave integer_data out, or write metric: mean" in err
    # false says nothing wrong, and a mean may say true.
    assert cli("check", write_claim(text.replace("true", "false")))[0] == 0
    assert cli("check", write_claim(text.replace("proportion", "mean") + "sd: 0.4\n"))[0] in (0, 1)


def test_a_percentage_without_its_sign_gets_one_question_not_a_granularity_line(write_claim):
    status, out, _ = cli("check", write_claim("title: t\nmetric: proportion\nestimate: 91.3\nsamples: 200\n"),
                         "--json")
    (bound,) = findings(out, "bounds")
    assert status == 1 and bound["message"].endswith("a proportion is at most 1: did you mean 91.3%?")
    (grain,) = findings(out, "granularity")
    assert grain["status"] == "skip" and "nearest" not in grain["message"]
