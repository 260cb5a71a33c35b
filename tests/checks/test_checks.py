"""The check registry and the runner: ids as DESIGN.md fixes them, the runner
adds the id, and no claim that loads can make a check raise."""

from __future__ import annotations


from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from checker.checks import REGISTRY, run_checks
from checker.claim import read_claim
from checker.errors import ClaimcheckError
from checker.report import STATUSES

# DESIGN.md, "Checks (fixed ids)".
DESIGN_IDS = {"bounds", "error-floor", "significance", "combination", "heterogeneity", "extrapolation",
              "look-elsewhere", "error-budget", "interval", "granularity", "comparison"}
# Checks added beyond DESIGN.md's table, each documented in the README's check table.
ADDED_IDS = {"rates"}


def test_registry_ids_are_design_ids():
    assert {"bounds", "error-floor", "significance", "look-elsewhere"} <= set(REGISTRY) <= DESIGN_IDS | ADDED_IDS


def test_the_runner_fills_in_the_check_id_and_honours_only(check_claim):
    text = ("title: Invented\nmetric: proportion\nestimate: 0.912\nstat_error: 0.009\nsamples: 1000\n"
            "threshold: 0.5\nsignificance: {sigma: 45.8}\n")
    report = check_claim(text)
    assert {f.check for f in report.findings} == set(REGISTRY)
    only = check_claim(text, only=["bounds", "significance"])
    assert {f.check for f in only.findings} == {"bounds", "significance"}
    assert [f.check for f in only.findings][0] == "bounds"  # in the order asked for


NUMBER_TEXTS = st.one_of(
    st.sampled_from(["0", "1", "0.5", "2.24e-3", "1e-400", "3.7e-350", "91.2%", "'< 0.001'", "2.5e7", "40",
                     "200", "-3", "1.02", "0.0", "1000000", "-1.5", "0.99999", "1e300", "-0.0"]),
    st.floats(min_value=-1e6, max_value=1e6, allow_nan=False).map(lambda x: f"{x:.3g}"),
    st.integers(1, 10**7).map(str))
COUNT_TEXTS = st.one_of(st.sampled_from(["1", "2", "10", "100", "2.5e7", "3e6", "1000000"]),
                        st.integers(1, 10**9).map(str))


@st.composite
def claims(draw):
    metric = draw(st.sampled_from(["linear-xeb", "log-xeb", "heavy-output", "proportion", "mean"]))
    lines = ["title: Invented random claim", f"metric: {metric}", f"estimate: {draw(NUMBER_TEXTS)}"]
    for field, values in (("stat_error", NUMBER_TEXTS), ("syst_error", NUMBER_TEXTS), ("samples", COUNT_TEXTS),
                          ("circuits", COUNT_TEXTS), ("qubits", st.sampled_from(["1", "2", "4", "30", "61", "1000"])),
                          ("sd", NUMBER_TEXTS), ("threshold", NUMBER_TEXTS), ("trials", COUNT_TEXTS),
                          ("tolerance", st.sampled_from(["0", "0.02", "0.5"]))):
        if draw(st.booleans()):
            lines.append(f"{field}: {draw(values)}")
    sig = []
    for field, values in (("sigma", NUMBER_TEXTS), ("p_value", NUMBER_TEXTS),
                          ("sided", st.sampled_from(["one", "two"])),
                          ("systematics", st.sampled_from(["none", "quadrature", "marginalized"])),
                          ("error_at", st.sampled_from(["estimate", "threshold"])),
                          ("required_sigma", NUMBER_TEXTS), ("global_sigma", NUMBER_TEXTS),
                          ("upcrossings", NUMBER_TEXTS), ("upcrossing_sigma", NUMBER_TEXTS)):
        if draw(st.booleans()):
            sig.append(f"{field}: {draw(values)}")
    if sig:
        lines.append("significance: {" + ", ".join(sig) + "}")
    if draw(st.booleans()):
        lines.append(f"interval: {{low: {draw(NUMBER_TEXTS)}, high: {draw(NUMBER_TEXTS)}}}")
    if draw(st.booleans()):
        lines.append(f"parts: [{{label: a, estimate: {draw(NUMBER_TEXTS)}, stat_error: {draw(NUMBER_TEXTS)}, "
                     f"samples: {draw(COUNT_TEXTS)}}}]")
    if draw(st.booleans()):
        lines.append(f"extrapolation: {{factor: {draw(NUMBER_TEXTS)}}}")
    return "\n".join(lines) + "\n"


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow,
                                                                   HealthCheck.function_scoped_fixture])
@given(text=claims())
def test_no_claim_that_loads_makes_a_check_raise(write_claim, text):
    try:
        claim = read_claim(write_claim(text))
    except ClaimcheckError:
        return
    report = run_checks(claim)
    assert report.verdict in ("consistent", "inconsistent", "incomplete")
    for f in report.findings:
        assert f.status in STATUSES and f.message and "\n" not in f.message
        for value in (f.reported, f.recomputed):
            assert value is None or isinstance(value, (int, float))
