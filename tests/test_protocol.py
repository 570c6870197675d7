"""Protocol details every kind shares: errors, ownership across melds, iteration,
copy and pickle, stable order.  Parametrised over every kind in `heapkit.KINDS`."""

from __future__ import annotations

import copy
import pickle
import sys
from typing import Any

import pytest

import heapkit
from tests.kinds import NAMES, VARIANTS, make

NAN = float("nan")


def _entries(heap: Any) -> list[tuple[Any, Any]]:
    return sorted((h.key, h.value) for h in heap)


@pytest.mark.parametrize("name", NAMES)
def test_empty_heap_errors_name_the_operation(name: str) -> None:
    heap = make(name)
    with pytest.raises(heapkit.EmptyHeapError, match="pop"):
        heap.pop()
    with pytest.raises(IndexError, match="peek"):
        heap.peek()
    assert len(heap) == 0 and not heap


@pytest.mark.parametrize("name", NAMES)
def test_nan_is_refused_everywhere_and_changes_nothing(name: str) -> None:
    heap = make(name, pairs=[(3, "c"), (5, "e")])
    h = heap.push(4, "d")
    before = _entries(heap)
    for call in (
        lambda: heap.push(NAN, "x"),
        lambda: heap.decrease_key(h, NAN),
        lambda: heap.change_key(h, NAN),
        lambda: heap.extend([(1, "a"), (NAN, "x"), (2, "b")]),
    ):
        with pytest.raises(heapkit.KeyOrderError):
            call()
        assert _entries(heap) == before
        heapkit.check(heap)


@pytest.mark.parametrize("name", NAMES)
def test_decrease_key_upward_is_refused(name: str) -> None:
    heap = make(name, pairs=[(3, "c")])
    h = heap.push(4, "d")
    with pytest.raises(heapkit.KeyOrderError, match="decrease_key"):
        heap.decrease_key(h, 9)
    assert h.key == 4 and _entries(heap) == [(3, "c"), (4, "d")]


@pytest.mark.parametrize("name", NAMES)
def test_dead_foreign_and_non_handles(name: str) -> None:
    a, b = make(name), make(name)
    ha = a.push(5, "a")
    hb = b.push(6, "b")
    assert a.pop() == (5, "a")
    for op in ("decrease_key", "change_key"):
        with pytest.raises(heapkit.InvalidHandleError, match="dead"):
            getattr(a, op)(ha, 1)
        with pytest.raises(heapkit.InvalidHandleError, match="another heap"):
            getattr(a, op)(hb, 1)
        with pytest.raises(TypeError):
            getattr(a, op)(42, 1)
    with pytest.raises(heapkit.InvalidHandleError):
        a.remove(ha)
    with pytest.raises(heapkit.InvalidHandleError):
        a.remove(hb)
    assert not ha.alive and hb.alive and hb in b and hb not in a and 42 not in a
    assert _entries(b) == [(6, "b")]


@pytest.mark.parametrize("name", NAMES)
def test_meld_refusals(name: str) -> None:
    a = make(name, pairs=[(1, "a")])
    with pytest.raises(ValueError, match="itself"):
        a.meld(a)
    with pytest.raises(TypeError):
        a.meld(make(name, stable=True))
    other = "pairing" if name != "pairing" else "binary"
    with pytest.raises(TypeError):
        a.meld(heapkit.new(other))
    with pytest.raises(TypeError):
        a.meld([(2, "b")])
    assert _entries(a) == [(1, "a")]


def test_dary_meld_needs_the_same_arity() -> None:
    with pytest.raises(TypeError, match="arity"):
        heapkit.DaryHeap(arity=3).meld(heapkit.DaryHeap(arity=4))
    heapkit.BinaryHeap().meld(heapkit.DaryHeap(arity=2))  # same structure: allowed


@pytest.mark.parametrize("name", NAMES)
def test_handles_follow_a_chain_of_melds(name: str) -> None:
    heaps = [make(name) for _ in range(6)]
    handles = [h.push(10 + i, i) for i, h in enumerate(heaps)]
    # meld in both directions, pairwise, down to one heap
    heaps[0].meld(heaps[1])
    heaps[3].meld(heaps[2])
    heaps[4].meld(heaps[5])
    heaps[3].meld(heaps[0])
    heaps[4].meld(heaps[3])
    top = heaps[4]
    assert len(top) == 6 and all(len(h) == 0 for h in heaps[:4] + heaps[5:])
    for i, h in enumerate(handles):
        assert h in top and h.alive
        assert all(h not in other for other in heaps if other is not top)
        top.decrease_key(h, i)
    assert [top.pop() for _ in range(6)] == [(i, i) for i in range(6)]
    # the emptied heaps stay usable
    heaps[0].push(1, "again")
    assert heaps[0].pop() == (1, "again")


@pytest.mark.parametrize("name", NAMES)
def test_iteration_raises_if_the_heap_changes(name: str) -> None:
    heap = make(name, pairs=[(i, i) for i in range(10)])
    it = iter(heap)
    first = next(it)
    heap.decrease_key(first, first.key)
    with pytest.raises(RuntimeError, match="changed"):
        next(it)
    assert sorted(h.value for h in heap) == list(range(10))


@pytest.mark.parametrize("name", NAMES)
def test_clear_kills_every_handle_and_heap_stays_usable(name: str) -> None:
    heap = make(name, pairs=[(i, i) for i in range(20)])
    handles = list(heap)
    heap.clear()
    assert len(heap) == 0 and not any(h.alive for h in handles)
    with pytest.raises(heapkit.InvalidHandleError):
        heap.remove(handles[0])
    heap.push(3, "x")
    assert heap.pop() == (3, "x")


@pytest.mark.parametrize("name", NAMES)
def test_value_is_writable_key_is_not(name: str) -> None:
    heap = make(name)
    h = heap.push(2, "old")
    h.value = "new"
    with pytest.raises(AttributeError):
        h.key = 1
    assert heap.pop() == (2, "new")


@pytest.mark.parametrize(("name", "stable"), VARIANTS)
def test_copy_gives_new_handles_and_the_same_entries(name: str, stable: bool) -> None:
    heap = make(name, stable, pairs=[(i % 5, i) for i in range(40)])
    for h in list(heap)[::3]:
        heap.decrease_key(h, h.key - 1 if h.key else 0)
    heap.pop()
    dup = copy.copy(heap)
    assert _entries(dup) == _entries(heap)
    assert all(h not in dup for h in heap)
    heapkit.check(dup)
    a = [heap.pop() for _ in range(len(heap))]
    b = [dup.pop() for _ in range(len(dup))]
    if stable:
        assert a == b
    else:
        assert [k for k, _ in a] == [k for k, _ in b]


@pytest.mark.parametrize(("name", "stable"), VARIANTS)
def test_deepcopy_and_pickle_map_handles_to_the_copy(name: str, stable: bool) -> None:
    heap = make(name, stable, pairs=[(i % 7, [i]) for i in range(50)])
    heap.pop()
    h = next(iter(heap))
    for clone, ch in (copy.deepcopy((heap, h)), pickle.loads(pickle.dumps((heap, h)))):
        assert ch in clone and ch.alive and ch.key == h.key and ch.value == h.value
        assert ch.value is not h.value
        heapkit.check(clone)
        clone.remove(ch)
        assert len(clone) == len(heap) - 1
    assert h in heap and len(heap) == 49


@pytest.mark.parametrize("name", NAMES)
def test_stable_order_survives_key_changes_and_meld(name: str) -> None:
    a, b = make(name, True), make(name, True)
    first = a.push(5, "first")
    b.push(3, "second")
    third = a.push(9, "third")
    b.push(3, "fourth")
    a.change_key(first, 3)
    a.decrease_key(third, 3)
    a.meld(b)
    assert [a.pop()[1] for _ in range(4)] == ["first", "second", "third", "fourth"]


@pytest.mark.parametrize("name", NAMES)
def test_repr_is_short(name: str) -> None:
    heap = make(name, pairs=[(i, "v" * 3) for i in range(1000)])
    assert len(repr(heap)) < 200 and type(heap).__name__ in repr(heap)
    top = heap.peek()
    assert "dead" not in repr(top)
    heap.pop()
    assert "dead" in repr(top)


@pytest.mark.parametrize("name", NAMES)
def test_deep_structures_need_no_recursion(name: str) -> None:
    # Decreasing pushes make a pairing heap a single chain of parent/child links.
    n = max(sys.getrecursionlimit() * 20, 30_000)
    heap = make(name)
    for i in range(n, 0, -1):
        heap.push(i, None)
    heapkit.check(heap)
    clone = pickle.loads(pickle.dumps(heap))
    assert len(copy.deepcopy(clone)) == n
    assert sum(1 for _ in heap) == n
    assert heap.pop() == (1, None)
    heap.clear()
