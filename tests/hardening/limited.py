"""Running claimcheck's real command line under resource limits.

Every run is a fresh Python process with at most :data:`MEMORY` bytes of
address space and :data:`CPU_SECONDS` of CPU (``resource.setrlimit``), one BLAS
thread, and a wall-clock timeout; a run that breaks a limit fails the test
rather than the machine.

* :func:`claimcheck` runs one command as a user would (``python -m
  checker.cli ARGS``, the console script's own ``main``).
* :func:`claimcheck_many` runs many commands in one such process, each through
  ``checker.cli.run`` with its own byte streams of a chosen encoding and its own
  alarm: the generated suites use it so that hundreds of cases cost seconds.

Imported by the hardening tests (tests/hardening/conftest.py puts this folder
on sys.path).
"""

from __future__ import annotations

import json
import os
import resource
import subprocess
import sys
from dataclasses import dataclass
from pathlib import Path

MEMORY = 1 << 30  # bytes of address space
CPU_SECONDS = 60
CASE_SECONDS = 20  # wall clock for one case inside claimcheck_many
ROOT = Path(__file__).resolve().parents[2]
ENV = {"OPENBLAS_NUM_THREADS": "1", "OMP_NUM_THREADS": "1", "MKL_NUM_THREADS": "1", "PYTHONHASHSEED": "0"}

# Bytes that must never reach a terminal or a report raw: C0 controls but tab and
# newline, DEL, and (in UTF-8) the C1 controls and bidirectional overrides.
RAW_CONTROLS = [bytes([c]) for c in range(32) if c not in (9, 10)] + [b"\x7f"] + \
    [chr(c).encode("utf-8") for c in range(0x80, 0xA0)] + \
    [chr(c).encode("utf-8") for c in (0x202A, 0x202B, 0x202C, 0x202D, 0x202E, 0x2066, 0x2067, 0x2068, 0x2069)]


@dataclass(frozen=True)
class Outcome:
    argv: tuple
    status: object  # an exit status; "traceback" or "hang" from claimcheck_many
    stdout: bytes
    stderr: bytes
    seconds: float = 0.0

    @property
    def err(self) -> str:
        return self.stderr.decode("utf-8", "replace")

    @property
    def out(self) -> str:
        return self.stdout.decode("utf-8", "replace")


def _limits() -> None:
    resource.setrlimit(resource.RLIMIT_AS, (MEMORY, MEMORY))
    resource.setrlimit(resource.RLIMIT_CPU, (CPU_SECONDS, CPU_SECONDS))
    resource.setrlimit(resource.RLIMIT_CORE, (0, 0))


def _env(extra: dict | None = None) -> dict:
    env = {k: v for k, v in os.environ.items() if not k.startswith("PYTHONIOENCODING")}
    env.update(ENV)
    env.update(extra or {})
    return env


def claimcheck(*argv, env: dict | None = None, timeout: float = 60, cwd=None) -> Outcome:
    """One run of the real command line, under the limits."""
    args = [str(a) for a in argv]
    proc = subprocess.run([sys.executable, "-m", "checker.cli", *args], capture_output=True, timeout=timeout,
                          preexec_fn=_limits, env=_env(env), cwd=cwd or ROOT, stdin=subprocess.DEVNULL)
    return Outcome(tuple(args), proc.returncode, proc.stdout, proc.stderr)


_DRIVER = r"""
import io, json, signal, sys, time, traceback
from checker.cli import run

class Hang(Exception):
    pass

def alarm(*_):
    raise Hang()

signal.signal(signal.SIGALRM, alarm)
cases = json.load(sys.stdin)
results = []
for case in cases:
    out_bytes, err_bytes = io.BytesIO(), io.BytesIO()
    out = io.TextIOWrapper(out_bytes, encoding=case["encoding"], errors="strict", write_through=True)
    err = io.TextIOWrapper(err_bytes, encoding=case["encoding"], errors="backslashreplace", write_through=True)
    start = time.monotonic()
    signal.alarm(case["seconds"])
    try:
        status = run(case["argv"], out, err)
    except Hang:
        status = "hang"
    except BaseException:
        status = "traceback"
        err.write(traceback.format_exc())
    finally:
        signal.alarm(0)
    results.append({"status": status, "stdout": out_bytes.getvalue().decode("latin-1"),
                    "stderr": err_bytes.getvalue().decode("latin-1"), "seconds": time.monotonic() - start})
sys.stdout.write(json.dumps(results))
"""


def claimcheck_many(cases, encoding: str = "utf-8", seconds: int = CASE_SECONDS, timeout: float = 300) -> list:
    """Many runs of ``checker.cli.run`` (each a list of arguments) in one limited
    process; stdout of each is written in ``encoding`` (strictly)."""
    payload = json.dumps([{"argv": [str(a) for a in argv], "encoding": encoding, "seconds": seconds}
                          for argv in cases])
    proc = subprocess.run([sys.executable, "-c", _DRIVER], input=payload.encode(), capture_output=True,
                          timeout=timeout, preexec_fn=_limits, env=_env(), cwd=ROOT)
    assert proc.returncode == 0, proc.stderr.decode("utf-8", "replace")[-3000:]
    return [Outcome(tuple(str(a) for a in argv), r["status"], r["stdout"].encode("latin-1"),
                    r["stderr"].encode("latin-1"), r["seconds"]) for argv, r in zip(cases, json.loads(proc.stdout))]


def assert_refused(outcome: Outcome, name, *words, outputs=()) -> None:
    """Exit 2, nothing on stdout, one stderr line starting with ``name`` and
    holding ``words``, no traceback, and none of ``outputs`` written."""
    err = outcome.err
    assert outcome.status == 2, (outcome.argv, outcome.status, err[-2000:], outcome.out[:300])
    assert outcome.stdout == b"", (outcome.argv, outcome.out[:300])
    assert err.count("\n") == 1 and err.endswith("\n"), (outcome.argv, err[-2000:])
    assert err.startswith(str(name)), (outcome.argv, err)
    assert "Traceback" not in err
    for word in words:
        assert str(word) in err, (word, err)
    for path in outputs:
        assert not Path(path).exists(), (outcome.argv, path)


def assert_answered(outcome: Outcome) -> None:
    """A normal result: exit 0 or 1, no traceback and nothing on stderr."""
    assert outcome.status in (0, 1), (outcome.argv, outcome.status, outcome.err[-3000:])
    assert outcome.stderr == b"", (outcome.argv, outcome.err[-2000:])


def assert_no_raw_controls(data: bytes, what="") -> None:
    for bad in RAW_CONTROLS:
        assert bad not in data, (what, bad, data[:500])
