"""The source layout issue 14 asks for (item 2): one package per kind with the same
rooms, companions instead of mixins, no import circle between checked mode and
the history.  Facts about heapkit's own files, checked by reading them (``ast``,
``importlib``): the design note (docs/compiled-build.md, sections 2 and 3) is the source.
"""

from __future__ import annotations

import ast
import copy
import importlib
import inspect
import pickle
from pathlib import Path
from typing import Any, Generic

import pytest

import heapkit
from heapkit._compiled import MODULES
from heapkit._face import HeapFace
from heapkit.kinds import KINDS

KINDS_DIR = Path(heapkit.__file__).parent / "kinds"
CONTRACTS_DIR = Path(heapkit.__file__).parent / "contracts"

#: The hooks checked mode, the checker, ``to_dot`` and the auditor look up on a heap.
SPI_HOOKS = (
    "_survey",
    "_touched",
    "_survey_local",
    "_dot_edges",
    "_layout_problem",
    "_phi",
    "_cost_probe",
    "_cost",
    "_bound",
)


def _package(kind: str) -> str:
    return kind.replace("-", "_")


@pytest.mark.parametrize("kind", sorted(KINDS))
def test_every_kind_is_a_package_with_its_rooms(kind: str) -> None:
    pkg = _package(kind)
    cls = KINDS[kind]
    assert (KINDS_DIR / pkg / "__init__.py").is_file()
    assert cls.__module__ == f"heapkit.kinds.{pkg}.heap"
    # the package imports the class: ``from heapkit.kinds.<kind> import <Class>``
    assert getattr(importlib.import_module(f"heapkit.kinds.{pkg}"), cls.__name__) is cls
    # binary is the d-ary heap at arity 2: its rules and costs are the d-ary heap's
    rooms = ("heap",) if kind == "binary" else ("heap", "core", "rules", "cost")
    for room in rooms:
        assert (KINDS_DIR / pkg / f"{room}.py").is_file(), f"{pkg}/{room}.py"
    if kind != "binary":  # core.py is the hot path, compiled in the compiled build (issue 14)
        assert f"heapkit.kinds.{pkg}.core" in MODULES


def test_no_flat_kind_modules_are_left() -> None:
    flat = sorted(p.name for p in KINDS_DIR.glob("*.py") if p.name != "__init__.py")
    assert all(name.startswith("_shared_") for name in flat), flat


def test_every_kind_module_stays_under_500_lines() -> None:
    # style.md: modules under 500 lines
    long = {
        str(p.relative_to(KINDS_DIR)): n
        for p in KINDS_DIR.rglob("*.py")
        if (n := len(p.read_text().splitlines())) >= 500
    }
    assert long == {}


@pytest.mark.parametrize("kind", sorted(KINDS))
def test_kind_classes_take_no_mixins(kind: str) -> None:
    # mypyc refuses multiple inheritance of native classes (docs/compiled-build.md §3):
    # one base besides Generic, for the heap class and for its handle class.  HeapFace is
    # admitted as well: it is typing only (no slots, no members at run time) and gives the
    # public class the K, V signatures HeapBase cannot have (docs/compiled-build.md §0)
    cls = KINDS[kind]
    for c in (cls, cls._NODE):
        if not c.__module__.startswith("heapkit.kinds."):
            continue  # the shared handle base of _core (lazy's handles point at entries)
        bases = [b for b in c.__bases__ if b is not Generic and b is not HeapFace]
        assert len(bases) == 1, (c, c.__bases__)


@pytest.mark.parametrize("kind", sorted(KINDS))
def test_spi_hooks_are_methods_of_the_kind_not_aliases(kind: str) -> None:
    # docs/compiled-build.md §3 rule 5: no class-body aliasing of module functions
    for c in KINDS[kind].__mro__:
        if not c.__module__.startswith("heapkit.kinds."):
            continue
        for name in SPI_HOOKS:
            attr = c.__dict__.get(name)
            if attr is None:
                continue
            fn = attr.__func__ if isinstance(attr, (classmethod, staticmethod)) else attr
            assert inspect.isfunction(fn), (c, name)
            assert fn.__qualname__ == f"{c.__name__}.{name}", (c, name, fn.__qualname__)


def _imports(path: Path) -> set[str]:
    found: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text())):
        if isinstance(node, ast.ImportFrom) and node.module:
            found.add(node.module)
        elif isinstance(node, ast.Import):
            found.update(a.name for a in node.names)
    return found


def test_history_never_imports_checked_mode() -> None:
    # issue 14: the import circle between contracts/mode.py and contracts/history.py
    assert "heapkit.contracts.history" in _imports(CONTRACTS_DIR / "mode.py")
    history = _imports(CONTRACTS_DIR / "history.py")
    assert "heapkit.contracts.mode" not in history
    assert "heapkit.contracts.replaying" not in history


def test_history_error_replays_without_the_history_importing_the_mode() -> None:
    class Sloppy(heapkit.BinaryHeap[int, str]):  # decrease_key forgets to sift up
        __slots__ = ()

        def decrease_key(self, handle: Any, key: int) -> None:
            handle._key = handle._k = key

    h = heapkit.checked(Sloppy([(1, "a"), (2, "b")]))
    x = h.push(3, "c")
    with pytest.raises(heapkit.HistoryError) as err:
        h.decrease_key(x, 0)
    with pytest.raises(heapkit.HistoryError):
        err.value.replay()
    # the record replays clean on a correct kind: keys pop in order (sorted is the reference)
    again = err.value.replay("binary")
    assert [again.pop()[0] for _ in range(len(again))] == sorted([1, 2, 0])


@pytest.mark.parametrize("kind", sorted(KINDS))
def test_copies_and_pickles_name_the_moved_classes(kind: str) -> None:
    h = heapkit.new(kind, [(3, "c"), (1, "a"), (2, "b")])
    data = pickle.dumps(h)
    assert f"heapkit.kinds.{_package(kind)}".encode() in data
    for c in (pickle.loads(data), copy.copy(h), copy.deepcopy(h)):
        assert type(c) is type(h)
        assert [c.pop() for _ in range(len(c))] == sorted([(3, "c"), (1, "a"), (2, "b")])  # sorted: the reference
