"""The shared core keeps the rules mypyc needs (docs/compiled-build.md), and what they move
(weak references on the public classes, typing on ``HeapFace``) works on every kind."""

from __future__ import annotations

import ast
import copy
import gc
import importlib
import pickle
import weakref
from pathlib import Path
from typing import Any, Generic

import pytest

import heapkit
from heapkit import _core, audit, checked
from heapkit._compiled import MODULES
from heapkit._face import HeapFace
from heapkit.concurrent.guard import guard_of
from tests.kinds import NAMES, make

#: Modules written for mypyc: the list it compiles plus the core the kinds share.
READY = sorted(set(MODULES) | {"heapkit._core"})


def _source(module: str) -> ast.Module:
    base = Path(heapkit.__file__).parent.parent
    path = base.joinpath(*module.split(".")).with_suffix(".py")
    if not path.exists():  # an installed compiled wheel may ship without its sources
        pytest.skip(f"no source for {module} beside the installed package")
    return ast.parse(path.read_text(encoding="utf-8"))


def _names(node: ast.expr) -> str:
    return ast.unparse(node)


@pytest.mark.parametrize("module", READY)
def test_compiled_modules_keep_the_mypyc_rules(module: str) -> None:
    """Rules of docs/compiled-build.md §3 (each one a crash or a silent fault when broken):
    no Generic base, no __weakref__ slot, no TYPE_CHECKING/else, no object.__new__."""
    tree = _source(module)
    # object.__new__ is allowed behind the pure-build switch only (never run when compiled).
    switched = any(
        isinstance(n, ast.AnnAssign | ast.Assign) and "_PURE" in ast.unparse(n).split("=")[0] for n in tree.body
    )
    problems: list[str] = []
    for node in ast.walk(tree):
        if isinstance(node, ast.ClassDef):
            bases = [_names(b) for b in node.bases]
            if any(b == "Generic" or b.startswith(("Generic[", "HeapBase[", "HandleBase[")) for b in bases):
                problems.append(f"class {node.name} has a generic base {bases}")
            for stmt in node.body:
                slots = isinstance(stmt, ast.Assign) and any(
                    isinstance(t, ast.Name) and t.id == "__slots__" for t in stmt.targets
                )
                if slots and "__weakref__" in ast.literal_eval(stmt.value):
                    problems.append(f"class {node.name} lists __weakref__ in __slots__")
        if isinstance(node, ast.If) and "TYPE_CHECKING" in _names(node.test) and node.orelse:
            problems.append(f"line {node.lineno}: if TYPE_CHECKING with an else")
        if isinstance(node, ast.Attribute) and _names(node) == "object.__new__" and not switched:
            problems.append(f"line {node.lineno}: object.__new__")
    assert problems == []


def test_core_classes_allow_interpreted_subclasses() -> None:
    """Every class of _core that kinds subclass carries mypyc's allow_interpreted_subclasses
    (without it a compiled base refuses, or later crashes on, a Python subclass)."""
    tree = _source("heapkit._core")
    flagged = {
        node.name
        for node in ast.walk(tree)
        if isinstance(node, ast.ClassDef)
        and any("allow_interpreted_subclasses=True" in _names(d) for d in node.decorator_list)
    }
    assert {"HeapBase", "HandleBase", "LeafHandle"} <= flagged


def test_heapbase_is_not_generic_and_has_no_weakref_slot() -> None:
    # a compiled Generic class never clears its weak references (docs/compiled-build.md §5)
    for cls in (_core.HeapBase, _core.HandleBase, _core.LeafHandle):
        assert Generic not in cls.__mro__, cls
    assert _core.HeapBase.__weakrefoffset__ == 0  # no weak-reference slot (both builds)


@pytest.mark.parametrize("name", NAMES)
def test_public_classes_carry_the_weakref_slot_and_the_typed_face(name: str) -> None:
    cls = heapkit.KINDS[name]
    owner = next(c for c in cls.__mro__ if "__weakref__" in c.__dict__.get("__slots__", ()))
    assert issubclass(owner, _core.HeapBase) and owner is not _core.HeapBase
    assert cls.__weakrefoffset__ != 0
    mro = cls.__mro__
    assert mro.index(HeapFace) < mro.index(_core.HeapBase)  # mypy reads HeapFace's signatures


def _finalized(h: Any) -> list[str]:
    fired: list[str] = []
    weakref.finalize(h, fired.append, "gone")
    return fired


@pytest.mark.parametrize("name", NAMES)
@pytest.mark.parametrize("mode", ["plain", "checked", "audit"])
def test_weak_references_and_finalize_work_in_every_mode(name: str, mode: str) -> None:
    """weakref.finalize fires (the audit's pending reports rely on it) and the concurrency
    lock registry finds one lock per heap, in every mode (a class switch keeps the slot)."""
    h = make(name, pairs=[(3, "c"), (1, "a"), (2, "b")])
    session = None
    if mode == "checked":
        checked(h)
    elif mode == "audit":
        session = audit(h)
        session.__enter__()
    ref = weakref.ref(h)
    assert ref() is h
    assert guard_of(h) is guard_of(h)
    fired = _finalized(h)
    assert h.pop() == (1, "a")  # heapq order (common practice: smallest key first)
    if session is not None:
        session.__exit__(None, None, None)
    del h, session
    gc.collect()
    assert ref() is None
    assert fired == ["gone"]


# Also the regression test of WeakHeap's copies: it had no ``_layout_problem``, so the
# base refused its own ``_export`` layout and every copy and pickle raised ValueError.
@pytest.mark.parametrize("name", NAMES)
def test_copies_and_pickles_are_instances_of_the_public_class(name: str) -> None:
    h = make(name, pairs=[(5, "e"), (2, "b"), (7, "g")])
    for other in (copy.copy(h), copy.deepcopy(h), pickle.loads(pickle.dumps(h))):
        assert type(other) is type(h)
        assert weakref.ref(other)() is other
    assert sorted(x.key for x in copy.copy(h)) == sorted([5, 2, 7])  # sorted(): outside check


#: The compiled cores: kind, module, core class, node classes (sealed: never subclassed).
CORES = [
    ("pairing", "heapkit.kinds.pairing.core", "_PairingCore", ("_Node",)),
    ("rank-pairing", "heapkit.kinds.rank_pairing.core", "_RankPairingCore", ()),
    ("rank-pairing", "heapkit.kinds.rank_pairing.cuts", None, ("_Node",)),
    ("hollow", "heapkit.kinds.hollow.core", "_HollowCore", ()),
    ("hollow", "heapkit.kinds.hollow.dag", None, ("Node", "_Entry")),
    ("fibonacci", "heapkit.kinds.fibonacci.core", "_FibonacciCore", ()),
    ("fibonacci", "heapkit.kinds.fibonacci.rings", None, ("_Node",)),
    ("binomial", "heapkit.kinds.binomial.core", "_BinomialCore", ()),
    ("binomial", "heapkit.kinds.binomial.forest", None, ("_Node",)),
    ("dary", "heapkit.kinds.dary.core", "_DaryCore", ()),
    ("binary", "heapkit.kinds.dary.core", "_DaryCore", ()),  # binary is the d-ary heap at arity 2
    ("dary", "heapkit.kinds.dary.slot", None, ("_Slot",)),
    ("weak", "heapkit.kinds.weak.core", "_WeakCore", ()),
    ("lazy", "heapkit.kinds.lazy.core", "_LazyCore", ()),
    ("lazy", "heapkit.kinds.lazy.entries", None, ("_Handle",)),
    ("radix", "heapkit.kinds.radix.core", "_RadixCore", ("_Item",)),
]


@pytest.mark.parametrize(("name", "module", "core", "nodes"), CORES)
def test_compiled_cores_are_never_the_class_of_a_heap(
    name: str, module: str, core: str | None, nodes: tuple[str, ...]
) -> None:
    """Modes switch ``__class__``; on an instance of the compiled core itself compiled callers
    would keep the core's methods (docs/compiled-build.md §4), so every constructor path
    makes the public class."""
    assert module in MODULES
    mod = importlib.import_module(module)
    cls = heapkit.KINDS[name]
    h: Any = cls([(3, "c"), (1, "a")])
    made = [h, copy.copy(h), copy.deepcopy(h), pickle.loads(pickle.dumps(h)), heapkit.new(name)]
    assert all(type(other) is cls for other in made)
    made.append(h._spawn())  # the family's class (binary spawns a DaryHeap: they meld together)
    assert type(made[-1]) is h._family()
    made.append(checked(cls([(2, "b")])))  # a mode layer: an interpreted subclass of cls
    for other in made:
        assert isinstance(other, h._family())
        if core is not None:
            assert type(other) is not getattr(mod, core) and isinstance(other, getattr(mod, core))
    for node in nodes:
        assert getattr(mod, node).__subclasses__() == []  # sealed: compiled with no flag for subclasses
        assert Generic not in getattr(mod, node).__mro__  # docs/compiled-build.md §3 rule 1


def test_every_kind_has_a_compiled_core() -> None:
    """Issue 14: every kind compiles (an interpreted kind on the compiled core runs slower)."""
    assert {name for name, *_ in CORES} == set(heapkit.KINDS)


@pytest.mark.parametrize("module", READY)
def test_pure_switches_match_the_build(module: str) -> None:
    """A room's ``_PURE`` (handles made with a bare ``__new__`` and slot stores) is true only
    where the module runs as source: a compiled node class refuses ``object.__new__``."""
    from heapkit._compiled import _is_extension

    mod = importlib.import_module(module)
    if not hasattr(mod, "_PURE"):
        pytest.skip(f"{module} has no _PURE switch")
    assert mod._PURE is not _is_extension(mod.__spec__)


@pytest.mark.parametrize("arity", [2, 3, 4])
def test_array_paths_match_heapq_at_every_arity(arity: int) -> None:
    """The compiled array core has a path per arity (2, 4, other): at every arity push,
    decrease_key and pop agree with heapq's order (the outside check)."""
    import heapq

    h = heapkit.DaryHeap(arity=arity)
    keys = [(i * 7919) % 101 for i in range(200)]
    handles = [h.push(k, i) for i, k in enumerate(keys)]
    for i in range(0, 200, 3):
        keys[i] -= 50
        h.decrease_key(handles[i], keys[i])
    heapq.heapify(keys)
    assert [h.pop()[0] for _ in range(len(h))] == [heapq.heappop(keys) for _ in range(200)]  # source: heapq
