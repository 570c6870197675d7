"""The build switch (issue 14): ``heapkit.COMPILED``, the kinds command, the stale-build guard.

The compiled CI run (.ci/compiled) sets ``HEAPKIT_EXPECT_COMPILED=1`` and runs this
whole suite against ``HEAPKIT_COMPILE=1 pip install .``; the pure run leaves it unset.
"""

from __future__ import annotations

import contextlib
import importlib
import importlib.machinery
import importlib.util
import io
import os
import sys
from pathlib import Path

import pytest

import heapkit
from heapkit import _compiled
from heapkit.__main__ import main

EXPECT_COMPILED = os.environ.get("HEAPKIT_EXPECT_COMPILED") == "1"
SUFFIX = importlib.machinery.EXTENSION_SUFFIXES[0]
CHECKOUT = Path(heapkit.__file__).resolve().parent.parent


def test_compiled_flag_says_which_build_runs() -> None:
    assert isinstance(heapkit.COMPILED, bool)
    assert heapkit.COMPILED is EXPECT_COMPILED
    # Independent of _compiled's own test: where the listed modules were loaded from
    # (CPython's extension suffixes: importlib.machinery.EXTENSION_SUFFIXES).
    loaded = [importlib.import_module(m).__file__ or "" for m in _compiled.MODULES]
    assert bool(loaded) and all(f.endswith(SUFFIX) for f in loaded) is EXPECT_COMPILED


def test_kinds_command_prints_the_build() -> None:
    out = io.StringIO()
    with contextlib.redirect_stdout(out):
        assert main(["kinds"]) == 0
    assert out.getvalue().splitlines()[-1] == f"compiled: {EXPECT_COMPILED}"


def _tree(tmp_path: Path) -> Path:
    """A fake checkout: pyproject.toml beside heapkit/, with heapkit/bench/graphs.py."""
    (tmp_path / "pyproject.toml").write_text("")
    pkg = tmp_path / "heapkit"
    (pkg / "bench").mkdir(parents=True)
    (pkg / "bench" / "graphs.py").write_text("")
    return pkg


def test_stale_extension_is_found_and_refused(tmp_path: Path) -> None:
    pkg = _tree(tmp_path)
    so = pkg / "bench" / f"graphs{SUFFIX}"
    so.write_bytes(b"")
    src_time = (pkg / "bench" / "graphs.py").stat().st_mtime
    os.utime(so, (src_time + 10, src_time + 10))  # built after the edit: fine
    assert _compiled.stale_extensions(str(pkg)) == []
    _compiled._guard_source_tree(str(pkg))
    os.utime(so, (src_time - 10, src_time - 10))  # the source was edited after the build
    assert _compiled.stale_extensions(str(pkg)) == [str(so)]
    with pytest.raises(_compiled.StaleBuildError, match=r"_build/clean\.py"):
        _compiled._guard_source_tree(str(pkg))


def test_extension_of_an_unlisted_module_is_stale(tmp_path: Path) -> None:
    pkg = _tree(tmp_path)
    orphan = pkg / f"protocol{SUFFIX}"  # compiled once, then dropped from MODULES
    orphan.write_bytes(b"")
    assert _compiled.stale_extensions(str(pkg)) == [str(orphan)]


def test_guard_ignores_an_installed_package(tmp_path: Path) -> None:
    pkg = _tree(tmp_path)
    (tmp_path / "pyproject.toml").unlink()  # site-packages: no pyproject.toml beside heapkit/
    so = pkg / "bench" / f"graphs{SUFFIX}"
    so.write_bytes(b"")
    os.utime(so, (0, 0))
    _compiled._guard_source_tree(str(pkg))


@pytest.mark.skipif(not (CHECKOUT / "pyproject.toml").exists(), reason="runs on an installed copy")
def test_checkout_has_no_stale_extension() -> None:
    assert _compiled.stale_extensions(str(CHECKOUT / "heapkit")) == []


@pytest.mark.skipif(not (CHECKOUT / "_build").is_dir(), reason="runs on an installed copy")
def test_mypy_is_a_build_requirement_only_when_compiling(monkeypatch: pytest.MonkeyPatch) -> None:
    spec = importlib.util.spec_from_file_location("_heapkit_backend", CHECKOUT / "_build" / "backend.py")
    assert spec is not None and spec.loader is not None
    backend = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(backend)
    monkeypatch.delenv("HEAPKIT_COMPILE", raising=False)
    assert backend.get_requires_for_build_editable() == []
    assert backend.get_requires_for_build_wheel() == []
    monkeypatch.setenv("HEAPKIT_COMPILE", "1")
    assert any(r.startswith("mypy") for r in backend.get_requires_for_build_wheel())
    sys.modules.pop("_heapkit_backend", None)


def test_integer_graph_weights_stay_int_on_both_builds() -> None:
    # graphs.py promises "integer weights in 1..100" (radix needs int keys); mypyc turns an
    # int annotated ``float`` into a float, so this fails on a compiled build typed ``float``.
    from heapkit.bench.graphs import grid_graph, sparse_graph

    for adj in (sparse_graph(50, 200, seed=3, integer=True), grid_graph(4, 5, seed=3, integer=True)):
        weights = [w for arcs in adj for _, w in arcs]
        assert weights and all(type(w) is int and 1 <= w <= 100 for w in weights)
    assert all(type(w) is float for arcs in sparse_graph(50, 200, seed=3) for _, w in arcs)
