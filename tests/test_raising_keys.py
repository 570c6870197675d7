"""The failure rule, on every kind (written for the speed-tuned hot paths, whose
links and moves are inlined): if a key's ``<`` raises at any point, or returns a
result whose ``bool()`` raises, the heap afterwards holds the same entries, every
live handle is still live, ``heapkit.check`` passes, and an iteration in progress
either raises ``RuntimeError`` or still yields every entry.

Each operation is tried with the k-th comparison failing, for every k until the
operation completes without reaching it."""

from __future__ import annotations

import random
from collections.abc import Callable
from typing import Any

import pytest

import heapkit
from tests.fuses import MODES, Boom, Fuse, finish_iteration, start_iteration
from tests.kinds import VARIANTS


class Fragile:
    """An int key whose ``<`` fails (as the fuse says) once its comparisons are used up."""

    __slots__ = ("v",)

    def __init__(self, v: int) -> None:
        self.v = v

    def __lt__(self, other: Fragile) -> Any:
        return Fuse.result(self.v < other.v)

    def __repr__(self) -> str:
        return f"F{self.v}"


def _build(kind: str, stable: bool, seed: int) -> tuple[Any, list[Any]]:
    rng = random.Random(seed)
    heap = heapkit.KINDS[kind](stable=stable)
    handles = [heap.push(Fragile(rng.randrange(40)), i) for i in range(50)]
    for _ in range(12):  # give the structure some shape
        heap.pop()
    return heap, [h for h in handles if h.alive]


def _ops(rng: random.Random) -> dict[str, Callable[[Any, list[Any]], Any]]:
    def meld(heap: Any, hs: list[Any]) -> Any:
        other = heap._spawn()
        for i in range(7):
            other.push(Fragile(rng.randrange(40)), 100 + i)
        return heap.meld(other)

    return {
        "push": lambda heap, hs: heap.push(Fragile(rng.randrange(40)), -1),
        "pop": lambda heap, hs: heap.pop(),
        "decrease_key": lambda heap, hs: heap.decrease_key(hs[5], Fragile(hs[5].key.v - 20)),
        "change_key up": lambda heap, hs: heap.change_key(hs[7], Fragile(hs[7].key.v + 30)),
        "change_key down": lambda heap, hs: heap.change_key(hs[9], Fragile(hs[9].key.v - 30)),
        "remove": lambda heap, hs: heap.remove(hs[11]),
        "meld": meld,
        "extend": lambda heap, hs: heap.extend([(Fragile(v), 200 + v) for v in range(9, 0, -1)]),
    }


@pytest.mark.parametrize("mode", MODES)
@pytest.mark.parametrize(
    ("kind", "stable"), [v for v in VARIANTS if not getattr(heapkit.KINDS[v[0]], "MONOTONE", False)]
)
def test_a_raising_comparison_changes_nothing(kind: str, stable: bool, mode: str) -> None:
    for seed in range(3):
        for name in _ops(random.Random(0)):
            budget = 0
            while True:
                heap, hs = _build(kind, stable, seed)
                before = sorted((h.key.v, h.value) for h in heap)
                live = [h for h in heap]
                op = _ops(random.Random(seed))[name]
                walks = start_iteration(heap)
                Fuse.arm(budget, mode)
                try:
                    op(heap, hs)
                except Boom:
                    Fuse.disarm()
                    heapkit.check(heap)
                    # Source: Python's sorted() of the entries kept before the call.
                    assert sorted((h.key.v, h.value) for h in heap) == before, (name, budget)
                    assert all(h.alive and h in heap for h in live), (name, budget)
                    finish_iteration(walks, heap)
                else:
                    Fuse.disarm()
                    heapkit.check(heap)
                    break
                finally:
                    Fuse.disarm()
                popped = [heap.pop()[0].v for _ in range(len(heap))]
                # Source: Python's sorted() on the popped keys.
                assert popped == sorted(popped)
                budget += 1
