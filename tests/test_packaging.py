"""Packaging and import: the metadata a well-kept package carries, and a light ``import heapkit``.

The sdist itself is tested by ``.ci/run`` (built, unpacked in a temporary
directory, installed and run with the README's test command).
"""

from __future__ import annotations

import os
import subprocess
import sys
import tomllib
from pathlib import Path

import heapkit

ROOT = Path(__file__).resolve().parent.parent


def _python(code: str, **env: str) -> str:
    run = subprocess.run(
        [sys.executable, "-c", code],
        cwd=ROOT,
        capture_output=True,
        text=True,
        timeout=120,
        env={k: v for k, v in os.environ.items() if k != "HEAPKIT_DEBUG"} | env,
    )
    assert run.returncode == 0, run.stderr
    return run.stdout.strip()


def test_import_heapkit_leaves_the_machinery_unloaded() -> None:
    loaded = _python(
        "import sys; import heapkit; heapkit.new('pairing', [(1, 'a')]).pop(); print(' '.join(sorted(sys.modules)))"
    ).split()
    for heavy in (
        "heapkit.audit",
        "heapkit.contracts",
        "heapkit.threads",
        "heapkit.trace",
        "heapkit.ledger",
        "logging",
        "dataclasses",
        "inspect",
        "ast",
    ):
        assert heavy not in loaded, heavy


def test_every_public_name_resolves_with_a_docstring() -> None:
    for name in heapkit.__all__:
        value = getattr(heapkit, name)
        assert value is not None, name
        if callable(value) and name != "KindName":  # KindName is a Literal alias
            assert (value.__doc__ or "").strip(), f"heapkit.{name} has no docstring"
    assert set(heapkit.__all__) <= set(dir(heapkit))
    from heapkit import Locked, audit, check, checked, locked, to_dot, unchecked  # noqa: F401


def test_audit_stays_the_auditor_when_its_module_loads_first() -> None:
    out = _python(
        "from heapkit.audit import attach; import heapkit, types; "
        "print(isinstance(heapkit.audit, types.ModuleType), callable(heapkit.audit))"
    )
    assert out == "False True"


def test_heapkit_debug_still_acts_at_import() -> None:
    out = _python("import heapkit; print(type(heapkit.new('binary')).__dict__.get('_layer'))", HEAPKIT_DEBUG="check")
    assert out == "checked"


def test_unknown_attribute_is_an_attribute_error() -> None:
    out = _python("import heapkit\ntry:\n    heapkit.nope\nexcept AttributeError as e:\n    print(e)")
    assert out == "module 'heapkit' has no attribute 'nope'"


def test_metadata() -> None:
    project = tomllib.loads((ROOT / "pyproject.toml").read_text())["project"]
    assert project["license"] == "MIT"  # SPDX expression (PEP 639), not the deprecated table form
    assert "MIT License" in (ROOT / "LICENSE").read_text() and "heapkit authors" in (ROOT / "LICENSE").read_text()
    assert "test" not in project["optional-dependencies"]  # dev tools live in requirements-dev.txt
    assert not any(d.startswith("typing") for d in project["dependencies"])  # never imported
    assert len(project["classifiers"]) >= 8 and "Typing :: Typed" in project["classifiers"]
    assert (ROOT / "requirements-dev.txt").is_file()
    manifest = (ROOT / "MANIFEST.in").read_text()
    assert "graft tests" in manifest and "graft examples" in manifest and "CHANGELOG.md" in manifest
