"""Every finding names the printed number it is about (issue 10): its ``field``
exists in the claim it came from (or is None for a finding about the whole
claim, whose statement says so), its statement is one its check declares, and
every flag or note has a question for the authors.  Over every example claim
and over generated claims that reach every check."""

from __future__ import annotations

import datetime
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from checker.checks import run_checks
from checker.claim import read_claim
from checker.errors import ClaimcheckError

from described import problems

EXAMPLES = Path(__file__).resolve().parents[2] / "claims_examples"
EXAMPLE_FILES = sorted(p for p in EXAMPLES.iterdir() if p.suffix in (".yaml", ".yml", ".json"))


@pytest.mark.parametrize("path", EXAMPLE_FILES, ids=lambda p: p.name)
def test_every_example_finding_describes_itself(path):
    claim = read_claim(path)
    report = run_checks(claim)
    found = [p for f in report.findings for p in problems(f, claim)]
    assert not found, "\n".join(found)


NUMBER = st.one_of(
    st.sampled_from(["0", "1", "0.5", "2.24e-3", "0.21e-3", "1e-400", "91.2%", "'< 0.001'", "2.5e7", "1.02",
                     "-3", "0.99999", "4.2", "5.9", "3.6e-9", "0.0"]),
    st.floats(min_value=-2.0, max_value=10.0, allow_nan=False).map(lambda x: f"{x:.3g}"))
SMALL = st.one_of(st.floats(min_value=1e-5, max_value=0.2, allow_nan=False).map(lambda x: f"{x:.2g}"),
                  st.sampled_from(["-0.001", "0", "1.5"]))
COUNT = st.one_of(st.sampled_from(["1", "10", "500", "1000", "3e6", "2.5e7"]), st.integers(1, 10**7).map(str))


@st.composite
def claims(draw):
    metric = draw(st.sampled_from(["linear-xeb", "log-xeb", "heavy-output", "proportion", "mean"]))
    lines = ["title: Invented generated claim", f"metric: {metric}", f"estimate: {draw(NUMBER)}"]
    for key, values in (("stat_error", SMALL), ("syst_error", SMALL), ("samples", COUNT), ("circuits", COUNT),
                        ("qubits", st.sampled_from(["4", "20", "53"])), ("sd", SMALL), ("threshold", NUMBER),
                        ("trials", COUNT), ("integer_data", st.sampled_from(["true", "false"])),
                        ("items", st.sampled_from(["1", "3"]))):
        if draw(st.booleans()):
            lines.append(f"{key}: {draw(values)}")
    sig = [f"{key}: {draw(values)}" for key, values in (
        ("sigma", NUMBER), ("p_value", NUMBER), ("sided", st.sampled_from(["one", "two"])),
        ("systematics", st.sampled_from(["none", "quadrature", "marginalized"])),
        ("error_at", st.sampled_from(["estimate", "threshold"])), ("required_sigma", NUMBER),
        ("global_sigma", NUMBER), ("upcrossings", COUNT), ("upcrossing_sigma", NUMBER)) if draw(st.booleans())]
    if sig:
        lines.append("significance: {" + ", ".join(sig) + "}")
    if draw(st.booleans()):
        lines.append(f"interval: {{low: {draw(NUMBER)}, high: {draw(NUMBER)}, level: 0.95}}")
    parts = draw(st.integers(0, 4))
    if parts:
        lines.append("parts:")
        for i in range(parts):
            lines.append(f"  - {{label: p{i}, estimate: {draw(NUMBER)}, stat_error: {draw(SMALL)}, "
                         f"samples: {draw(COUNT)}}}")
    if draw(st.booleans()):
        method = draw(st.sampled_from(["equal", "samples", "inverse-variance", "random-effects"]))
        body = [f"method: {method}"] + [f"{k}: {draw(v)}" for k, v in (("estimate", NUMBER), ("stat_error", SMALL))
                                        if draw(st.booleans())]
        lines.append("combination: {" + ", ".join(body) + "}")
    if draw(st.booleans()):
        body = [f"factor: {draw(NUMBER)}"] + ([f"factor_error: {draw(SMALL)}"] if draw(st.booleans()) else [])
        body += [f"error_to: {draw(st.sampled_from(['syst', 'stat']))}"] if draw(st.booleans()) else []
        lines.append("extrapolation: {" + ", ".join(body) + "}")
    if draw(st.booleans()):
        lines.append(f"error_budget: [{{name: gates, count: {draw(COUNT)}, error: {draw(SMALL)}, "
                     f"error_sd: {draw(SMALL)}}}, {{name: readout, count: 20, error: 0.01}}]")
    return "\n".join(lines) + "\n"


# 300 derandomized draws (tests/conftest.py): every check's statements, flags among them.
@settings(max_examples=300, deadline=datetime.timedelta(seconds=20),
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture])
@given(text=claims())
def test_every_generated_finding_describes_itself(tmp_path, text):
    path = tmp_path / "claim.yaml"
    path.write_text(text, encoding="utf-8")
    try:
        claim = read_claim(path)
    except ClaimcheckError:
        return
    report = run_checks(claim)
    found = [p for f in report.findings for p in problems(f, claim)]
    assert not found, text + "\n" + "\n".join(found)


def _blocks(text: str, start: str, count: int) -> list[str]:
    """The text of each numbered point, 1..count: from its marker to the next."""
    out = []
    for n in range(1, count + 1):
        head = text.index(start.format(n=n))
        ends = [text.find(start.format(n=n + 1), head)]
        out.append(text[head:ends[0] if ends[0] != -1 else len(text)])
    return out


@pytest.mark.parametrize("path", EXAMPLE_FILES, ids=lambda p: p.name)
def test_markdown_and_html_name_the_findings_field(path):
    """Each point of the notes names the field of every finding it raises: a point
    of its own names its finding's field, and a point for one slip that explains
    several findings (render.notes.raised_points) names each member's field."""
    from html import escape

    from checker.render.html import render_html
    from checker.render.markdown import render_markdown
    from checker.render.notes import raised_points

    claim = read_claim(path)
    report = run_checks(claim)
    raised = raised_points(report, claim)
    md_points = _blocks(render_markdown(report, claim), "\n{n}. **", len(raised))
    html_points = _blocks(render_html(report, claim), 'id="point-{n}"', len(raised))
    for point, md, page in zip(raised, md_points, html_points):
        members = getattr(point, "members", (point,))
        fields = [m.printed_field for m in members if m.printed_field is not None]
        if not fields:
            assert "(field `" not in md and 'class="cc-field"' not in page, point.message
        for field in fields:
            assert f"(field `{field}`)" in md, (field, md)
            assert f'<span class="cc-field">({escape(field)})</span>' in page, field


# --- the raw-data checks (RAW_REGISTRY), on the invented example's simulated data ---------------

RAW_DATA = EXAMPLES / "simulated_raw_lattice.csv"
RAW_CLAIM = (EXAMPLES / "simulated_raw_lattice.yaml").read_text(encoding="utf-8")
# Variants of the invented example's claim that reach every raw-data statement: flags on the
# estimate, the error and the counts, an extrapolated headline, fields left out.
RAW_VARIANTS = {
    "as committed": RAW_CLAIM,
    "estimate off": RAW_CLAIM.replace("estimate: 0.606", "estimate: 0.75"),
    "estimate a little off": RAW_CLAIM.replace("estimate: 0.606", "estimate: 0.650"),
    "error too small": RAW_CLAIM.replace("stat_error: 0.023", "stat_error: 0.005"),
    "error too large": RAW_CLAIM.replace("stat_error: 0.023", "stat_error: 0.2"),
    "counts off": RAW_CLAIM.replace("samples: 4000", "samples: 5000").replace("circuits: 8", "circuits: 10"),
    "no counts, no error": RAW_CLAIM.replace("samples: 4000\n", "").replace("circuits: 8\n", "")
                                    .replace("stat_error: 0.023\n", ""),
    "extrapolated": RAW_CLAIM + "combination: {method: inverse-variance, estimate: 0.606, stat_error: 0.023}\n"
                                "extrapolation: {factor: 1.000, factor_error: 0.100}\n",
    "extrapolated, nothing combined": RAW_CLAIM + "extrapolation: {factor: 1.02, factor_error: 0.01}\n",
    # Only significances printed (a local and a global sigma): the one claim with no estimate.
    "no estimate": RAW_CLAIM.replace("estimate: 0.606\n", "").replace("required_sigma: 3", "global_sigma: 4.0"),
}


@pytest.fixture(scope="module")
def raw_result():
    from checker.raw.analysis import analyse

    return analyse(str(RAW_DATA), "linear-xeb", 12, bootstrap=200, fit_sample=2000)


def raw_problems(claim, result) -> list[str]:
    """problems() for every finding of the raw-data registry; a claim check rerun on the
    data's numbers is held against the claim it ran on (the one with the raw numbers)."""
    from checker.checks import run_raw_checks
    from checker.checks.raw_rerun import claim_with_raw_numbers

    substituted = claim_with_raw_numbers(claim, result)
    found = []
    for f in run_raw_checks(claim, result):
        found += problems(f, substituted if f.details.get("numbers") == "raw" else claim)
    return found


@pytest.mark.parametrize("name", list(RAW_VARIANTS))
def test_every_raw_data_finding_describes_itself(tmp_path, raw_result, name):
    path = tmp_path / "claim.yaml"
    path.write_text(RAW_VARIANTS[name], encoding="utf-8")
    claim = read_claim(path)
    found = raw_problems(claim, raw_result)
    assert not found, "\n".join(found)


def test_the_raw_variants_reach_every_raw_statement(tmp_path, raw_result):
    from checker.checks import RAW_SPECS, run_raw_checks

    reached = set()
    for name, text in RAW_VARIANTS.items():
        path = tmp_path / f"{len(reached)}.yaml"
        path.write_text(text, encoding="utf-8")
        reached |= {(f.check, f.statement) for f in run_raw_checks(read_claim(path), raw_result)}
    # Not reached from this file: statements for data that give no estimate or error, a
    # file with no circuit column, a run with no goodness-of-fit test, circuits that scatter
    # more than their samples explain (tests/raw/test_compare.py makes those).
    unreachable = {("raw-estimate", "no_raw_estimate"), ("raw-error", "no_data_error"),
                   ("raw-error", "circuit_scatter"),
                   ("raw-samples", "not_counted"), ("raw-circuits", "not_counted"), ("raw-model", "not_run"),
                   ("raw-rerun", "no_raw_estimate")}
    declared = {(s.id, sid) for s in RAW_SPECS for sid in s.statements}
    assert declared - unreachable <= reached, sorted(declared - unreachable - reached)


@settings(max_examples=100, deadline=datetime.timedelta(seconds=20),
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture])
@given(text=claims())
def test_every_generated_raw_data_finding_describes_itself(tmp_path, raw_result, text):
    path = tmp_path / "claim.yaml"
    path.write_text(text, encoding="utf-8")
    try:
        claim = read_claim(path)
    except ClaimcheckError:
        return
    found = raw_problems(claim, raw_result)
    assert not found, text + "\n" + "\n".join(found)
