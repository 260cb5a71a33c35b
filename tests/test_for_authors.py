"""What an author wires into a manuscript's repository: the pre-commit hook
(.pre-commit-hooks.yaml) and the README's CI recipe, each run through the real
command line, and the package metadata that `make demo` installs."""

from __future__ import annotations

import glob
import io
import re
import shlex
import tomllib
from pathlib import Path

import yaml

from checker.cli import run

ROOT = Path(__file__).resolve().parent.parent
CLEAN = ("title: Invented proportion claim\nmetric: proportion\nestimate: 0.912\nstat_error: 0.009\n"
         "samples: 1000\nthreshold: 0.5\nsignificance: {sigma: 45.8}\n")
# A printed error of 0.002 is below the 0.009 that 1,000 samples allow (error-floor flags it).
FLAWED = CLEAN.replace("stat_error: 0.009", "stat_error: 0.002")


def status_of(argv) -> int:
    return run(list(argv), io.StringIO(), io.StringIO())


def manuscript(tmp_path, **files) -> Path:
    folder = tmp_path / "claims"
    folder.mkdir()
    for name, text in files.items():
        (folder / f"{name}.yaml").write_text(text, encoding="utf-8")
    return folder


def test_the_pre_commit_hook_fails_on_a_flag_and_on_an_unusable_file(tmp_path):
    (hook,) = yaml.safe_load((ROOT / ".pre-commit-hooks.yaml").read_text(encoding="utf-8"))
    assert hook["id"] == "claimcheck" and hook["language"] == "python" and hook["pass_filenames"]
    files = re.compile(hook["files"])
    assert files.search("claims/xeb.yaml") and files.search("paper/claims/rate.json")
    assert not files.search(".github/workflows/claims.yml") and not files.search("claims.yaml")
    command = shlex.split(hook["entry"])
    assert command[:2] == ["claimcheck", "check"]
    folder = manuscript(tmp_path, clean=CLEAN, flawed=FLAWED, broken="title: no metric\n")
    # pre-commit appends the staged files that match `files`.
    assert status_of(command[1:] + [str(folder / "clean.yaml")]) == 0
    assert status_of(command[1:] + [str(folder / "clean.yaml"), str(folder / "flawed.yaml")]) == 1
    assert status_of(command[1:] + [str(folder / "flawed.yaml"), str(folder / "broken.yaml")]) == 2


def test_the_readme_ci_recipe_fails_on_a_flag(tmp_path, monkeypatch):
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    (line,) = re.findall(r"^\s*- run: (claimcheck check .*)$", readme, flags=re.M)
    command = shlex.split(line)
    monkeypatch.chdir(tmp_path)
    manuscript(tmp_path, a=CLEAN, b=CLEAN)

    def ci() -> int:  # the shell expands the glob
        return status_of([expanded for word in command[1:] for expanded in (sorted(glob.glob(word)) or [word])])

    assert ci() == 0
    (tmp_path / "claims" / "c.yaml").write_text(FLAWED, encoding="utf-8")
    assert ci() == 1


def test_the_license_is_an_spdx_string():
    # setuptools deprecates project.license as a table (PEP 639); a plain SPDX string needs 77+.
    project = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    assert project["project"]["license"] == "MIT"
    assert any(re.fullmatch(r"setuptools>=(\d+)", r) and int(r.split(">=")[1]) >= 77
               for r in project["build-system"]["requires"])


def test_the_readme_shell_ci_step_fails_on_a_flag_and_names_each_file(tmp_path):
    import os
    import subprocess
    import sys

    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    (block,) = re.findall(r"```sh\n(# CI step \(any shell\).*?)```", readme, flags=re.S)
    step = "\n".join(line for line in block.splitlines() if "pip install" not in line)
    # The installed claimcheck (this test's own environment) stands in for the pip line.
    env = dict(os.environ, PATH=str(Path(sys.executable).parent) + os.pathsep + os.environ.get("PATH", ""))

    def ci():
        done = subprocess.run(["sh", "-c", step], cwd=tmp_path, env=env, capture_output=True, text=True,
                              timeout=300)
        return done.returncode, done.stdout

    folder = manuscript(tmp_path, a=CLEAN)
    (folder / "deeper").mkdir()
    (folder / "deeper" / "b c.yml").write_text(CLEAN, encoding="utf-8")
    status, out = ci()
    assert status == 0
    assert sorted(line.split(";")[0] for line in out.splitlines()) == [
        "claims/a.yaml: consistent", "claims/deeper/b c.yml: consistent"]
    (folder / "flawed.json").write_text('{"title": "Invented flawed claim", "metric": "proportion", '
                                        '"estimate": 0.912, "stat_error": 0.002, "samples": 1000}',
                                        encoding="utf-8")
    status, out = ci()
    assert status != 0 and "claims/flawed.json: inconsistent (error-floor)" in out
