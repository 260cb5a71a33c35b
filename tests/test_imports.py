"""The import rules (DESIGN.md, "Dependencies point one way"; issue 10): read
from the source, so a lazy import inside a function counts too.

* nothing under checker/report.py, checks/, stats/ or claim/ imports render/
  or commands/;
* stats/ imports nothing of ours;
* no module imports a private name (one starting with ``_``) of another module.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parent.parent / "checker"


def _modules(*parts: str) -> list[Path]:
    out = []
    for part in parts:
        path = PACKAGE / part
        out += sorted(path.rglob("*.py")) if path.is_dir() else [path]
    return out


def _name(path: Path) -> str:
    rel = path.relative_to(PACKAGE.parent).with_suffix("")
    parts = list(rel.parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def imports(path: Path) -> list[tuple[str, tuple[str, ...], int]]:
    """(absolute module, names imported from it, line) for every import in a file."""
    tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
    package = _name(path).split(".")
    if path.name != "__init__.py":
        package = package[:-1]
    found = []
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            found += [(alias.name, (), node.lineno) for alias in node.names]
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package[:len(package) - node.level + 1]
                module = ".".join(base + ([node.module] if node.module else []))
            else:
                module = node.module or ""
            found.append((module, tuple(a.name for a in node.names), node.lineno))
    return found


LOWER = _modules("report.py", "checks", "stats", "claim")


@pytest.mark.parametrize("path", LOWER, ids=lambda p: str(p.relative_to(PACKAGE)))
def test_lower_layers_never_import_renderers_or_commands(path):
    bad = []
    for module, names, line in imports(path):
        targets = [module] + [f"{module}.{n}" for n in names]
        if any(t == f"checker.{top}" or t.startswith(f"checker.{top}.") for t in targets
               for top in ("render", "commands")):
            bad.append(f"{path.name}:{line} imports {module} {names}")
    assert not bad, bad


@pytest.mark.parametrize("path", _modules("stats"), ids=lambda p: str(p.relative_to(PACKAGE)))
def test_stats_import_nothing_of_ours(path):
    ours = [f"{path.name}:{line} {module}" for module, _, line in imports(path)
            if module.startswith("checker") and not module.startswith("checker.stats")]
    assert not ours


def test_no_private_names_cross_modules():
    bad = []
    for path in _modules("."):
        for module, names, line in imports(path):
            if module.startswith("checker"):
                bad += [f"{path.relative_to(PACKAGE)}:{line} {module}.{n}" for n in names
                        if n.startswith("_") and n != "__version__"]
    assert not bad, bad


def test_the_reader_resolves_relative_imports():
    found = imports(PACKAGE / "checks" / "significance.py")
    assert any(module == "checker.stats.tails" for module, _, _ in found)
    assert any(module == "checker.checks.spec" for module, _, _ in found)


# --- start-up: help and schema import none of the numerical stack (issue 13) ---

LIGHT_COMMANDS = (["--help"], ["schema"], [])
HEAVY_MODULES = ("numpy", "scipy", "pandas", "yaml", "jsonschema", "checker.checks", "checker.claim",
                 "checker.stats", "checker.report")


@pytest.mark.parametrize("argv", LIGHT_COMMANDS)
def test_help_and_schema_import_no_numerical_module(argv):
    import subprocess
    import sys

    probe = ("import io, sys; from checker.cli import run; out = io.StringIO(); "
             f"status = run({argv!r}, out, io.StringIO()); "
             f"print(status, len(out.getvalue()) > 100, [m for m in {HEAVY_MODULES!r} if m in sys.modules])")
    done = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, check=True,
                          cwd=PACKAGE.parent)
    assert done.stdout.split(None, 2) == ["0", "True", "[]\n"], done.stdout + done.stderr


def test_schema_command_prints_the_validators_schema():
    import io

    from checker.claim.validate import SCHEMA_PATH
    from checker.cli import run
    from checker.commands.schema import SCHEMA_FILE

    assert SCHEMA_FILE == SCHEMA_PATH
    out = io.StringIO()
    assert run(["schema"], out, io.StringIO()) == 0
    assert out.getvalue() == SCHEMA_PATH.read_text(encoding="utf-8")


def test_lazy_names_of_the_package():
    import checker
    from checker.report import Finding, Report

    assert checker.Report is Report and checker.Finding is Finding
    with pytest.raises(AttributeError):
        checker.no_such_name  # noqa: B018
