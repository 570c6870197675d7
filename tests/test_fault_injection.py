"""Fault injection for the hollow, radix and weak kinds: a key's ``<`` raises after a chosen
number of comparisons, in every operation; afterwards the heap holds the same entries
with the same keys, every live handle is live, and ``heapkit.check`` passes."""

from __future__ import annotations

import random
from collections.abc import Callable
from typing import Any

import pytest

import heapkit
from heapkit.kinds.hollow import HollowHeap
from heapkit.kinds.radix import RadixHeap
from heapkit.kinds.weak import WeakHeap


class Boom(Exception):
    pass


FUSE = [-1]  # comparisons left before `<` raises; -1: never


def _tick() -> None:
    if FUSE[0] == 0:
        raise Boom
    if FUSE[0] > 0:
        FUSE[0] -= 1


class Key(int):
    """A non-negative int (so the radix heap takes it) whose `<` can blow up."""

    def __lt__(self, other: Any) -> bool:
        _tick()
        return int(self) < int(other)


OPS = ["push", "pop", "decrease_key", "change_key_up", "change_key_down", "remove", "meld", "extend"]


def _build(cls: type, stable: bool, seed: int) -> tuple[Any, list[Any]]:
    rng = random.Random(seed)
    heap = cls(stable=stable)
    hs = [heap.push(Key(rng.randint(10, 60)), i) for i in range(40)]
    for _ in range(6):
        heap.pop()
    for h in hs[::4]:
        if h.alive:
            heap.decrease_key(h, Key(max(heap.last if cls is RadixHeap else 0, h.key - 3)))
    return heap, hs


def _run(op: str, heap: Any, hs: list[Any], other: Any) -> Callable[[], Any]:
    live = [h for h in hs if h.alive]
    root = heap.peek()
    base = heap.last if isinstance(heap, RadixHeap) else 0
    return {
        "push": lambda: heap.push(Key(base + 1), "new"),
        "pop": heap.pop,
        "decrease_key": lambda: heap.decrease_key(live[-1], Key(base)),
        "change_key_up": lambda: heap.change_key(root, Key(root.key + 30)),
        "change_key_down": lambda: heap.change_key(live[3], Key(base)),
        "remove": lambda: heap.remove(root),
        "meld": lambda: heap.meld(other),
        "extend": lambda: heap.extend([(Key(base + i), f"x{i}") for i in range(5)]),
    }[op]


def _snapshot(heap: Any) -> list[tuple[int, Any]]:
    return sorted((int(h.key), h.value) for h in heap)


@pytest.mark.parametrize("kind", [HollowHeap, RadixHeap, WeakHeap])
@pytest.mark.parametrize("stable", [False, True])
@pytest.mark.parametrize("op", OPS)
def test_a_raising_comparison_loses_nothing(kind: type, stable: bool, op: str) -> None:
    fuse = 0
    raised = 0
    while True:
        heap, hs = _build(kind, stable, seed=fuse)
        other = kind(stable=stable)
        if isinstance(heap, RadixHeap):
            other._last = heap.last
        while isinstance(heap, RadixHeap) and op == "pop" and (
            heap._buckets[0] or len(next(filter(None, heap._buckets))) < 2
        ):
            heap.pop()  # so that the pop under test redistributes a bucket of 2 or more
        others = [other.push(Key(heap.peek().key + i), f"o{i}") for i in range(6)]
        before = _snapshot(heap)
        before_other = _snapshot(other)
        live = [h for h in hs if h.alive]
        action = _run(op, heap, hs, other)
        FUSE[0] = fuse
        try:
            action()
        except Boom:
            raised += 1
        else:
            FUSE[0] = -1
            break
        finally:
            FUSE[0] = -1
        assert _snapshot(heap) == before
        assert _snapshot(other) == before_other
        assert all(h.alive and h in heap for h in live)
        assert all(h.alive and h in other for h in others)
        heapkit.check(heap)
        heapkit.check(other)
        # and it still works: everything pops in order
        keys = [int(heap.pop()[0]) for _ in range(len(heap))]
        assert keys == sorted(keys)
        fuse += 1
    assert raised == fuse  # every comparison point up to success was tried
    if (kind, op) not in COMPARE_NOTHING:
        assert raised > 0


#: Operations that compare no key: radix files keys by their bits; a weak heap
#: appends pushed and melded entries and settles them at the next pop or peek.
COMPARE_NOTHING = {(RadixHeap, "remove"), (RadixHeap, "meld"),
                   (WeakHeap, "push"), (WeakHeap, "meld"), (WeakHeap, "extend")}
