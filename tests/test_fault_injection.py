"""Fault injection on every kind: a key's ``<`` raises (or returns a result whose
``bool()`` raises) after a chosen number of comparisons, in every operation; afterwards
the heap holds the same entries with the same keys, every live handle is live,
``heapkit.check`` passes, an iteration in progress raises ``RuntimeError`` or is
complete, and the entries pop in ``sorted`` order."""

from __future__ import annotations

import itertools
import random
from collections.abc import Callable
from typing import Any

import pytest

import heapkit
from heapkit.kinds.radix import RadixHeap
from tests.fuses import MODES, Boom, Fuse, assert_unchanged, finish_iteration, start_iteration
from tests.kinds import NAMES


class Key(int):
    """A non-negative int (so the radix heap takes it) whose `<` can blow up."""

    def __lt__(self, other: Any) -> Any:
        return Fuse.result(int(self) < int(other))


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


@pytest.mark.parametrize("mode", MODES)
@pytest.mark.parametrize("name", NAMES)
@pytest.mark.parametrize("stable", [False, True])
@pytest.mark.parametrize("op", OPS)
def test_a_raising_comparison_loses_nothing(name: str, stable: bool, op: str, mode: str) -> None:
    for seed in range(3):  # one shape per seed, then every comparison point of the op in it
        fuse = 0
        while _fault_at(name, stable, op, mode, seed, fuse):
            fuse += 1
        if (name, op) not in COMPARE_NOTHING:
            assert fuse > 0, "the operation compared nothing"


def _fault_at(name: str, stable: bool, op: str, mode: str, seed: int, fuse: int) -> bool:
    """Run ``op`` on a heap built from ``seed`` with the comparison after ``fuse`` failing
    (and every one after it); False if the op completed first.  Checks the aftermath."""
    kind = heapkit.KINDS[name]
    heap, hs = _build(kind, stable, seed)
    other = kind(stable=stable)
    if isinstance(heap, RadixHeap):
        other._last = heap.last
    while (
        isinstance(heap, RadixHeap) and op == "pop" and (heap._buckets[0] or len(next(filter(None, heap._buckets))) < 2)
    ):
        heap.pop()  # so that the pop under test redistributes a bucket of 2 or more
    others = [other.push(Key(heap.peek().key + i), f"o{i}") for i in range(6)]
    before = _snapshot(heap)
    before_other = _snapshot(other)
    live = [h for h in hs if h.alive]
    action = _run(op, heap, hs, other)
    walks = start_iteration(heap)
    Fuse.arm(fuse, mode)
    try:
        action()
    except Boom:
        pass
    else:
        return False
    finally:
        Fuse.disarm()
    finish_iteration(walks, heap)
    assert_unchanged(_snapshot, (heap, before, live), (other, before_other, others))
    # and it still works: everything pops in order.  Source: Python's sorted() (_snapshot).
    keys = [int(heap.pop()[0]) for _ in range(len(heap))]
    assert keys == [k for k, _ in before]
    return True


#: Operations that compare no keys: radix remove and meld (buckets by bit length), lazy
#: remove (the entry goes stale in place), weak push, meld and extend (entries are appended
#: and settled at the next pop or peek).
COMPARE_NOTHING = {
    ("radix", "remove"),
    ("radix", "meld"),
    ("lazy", "remove"),
    ("weak", "push"),
    ("weak", "meld"),
    ("weak", "extend"),
}


@pytest.mark.parametrize("mode", MODES)
@pytest.mark.parametrize("name", NAMES)
def test_an_iteration_across_a_failed_pop_skips_nothing(name: str, mode: str) -> None:
    """Shapes with many key changes (hollow nodes, cut trees, stale entries), then pops,
    some completing, some with a comparison failing while iterations stopped at several
    points are running."""
    kind = heapkit.KINDS[name]
    for seed in range(40):
        rng = random.Random(seed)
        heap = kind()
        hs = [heap.push(Key(rng.randrange(100)), i) for i in range(60)]
        for share, pops in ((0.5, 5), (0.4, 0)):
            for h in hs:
                if h.alive and rng.random() < share:
                    low = heap.last if isinstance(heap, RadixHeap) else 0
                    heap.decrease_key(h, Key(max(low, h.key - rng.randrange(1, 30))))
            for _ in range(pops):
                heap.pop()
        for fuse in range(0, 80, 3):
            before = _snapshot(heap)
            walks = []
            for n in (1, 5, 15, 30):
                w = iter(heap)
                walks.append((w, list(itertools.islice(w, n))))
            Fuse.arm(fuse, mode, once=True)
            try:
                heap.pop()
            except Boom:
                finish_iteration(walks, heap)
                assert _snapshot(heap) == before
                heapkit.check(heap)
            finally:
                Fuse.disarm()
