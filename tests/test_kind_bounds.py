"""The hollow and radix kinds' audit SPI: on random workloads, actual cost plus
c times the potential change never exceeds the documented bound (their module
docstrings derive the constants).  For meld the potential before is both heaps'."""

from __future__ import annotations

import random
from typing import Any

import pytest

from heapkit.kinds.hollow import HollowHeap
from heapkit.kinds.radix import RadixHeap


@pytest.mark.parametrize("cls", [HollowHeap, RadixHeap])
@pytest.mark.parametrize("seed", range(2))
def test_amortized_cost_stays_within_bound(cls: Any, seed: int) -> None:
    rng = random.Random(seed)
    mono = cls is RadixHeap
    heap, other = cls(), cls()
    live: list[Any] = []
    pending: list[Any] = []
    ops = 0
    for step in range(6000):
        base = heap.last if mono else 0
        if mono and other.last != base:  # radix heaps meld only at the same last popped key
            other = cls()
            other._last = base
            pending = [other.push(base + rng.randint(0, 900), -i) for i in range(5)]
        r = rng.random()
        n = len(heap)
        op = (
            "push"
            if r < 0.3 or not live
            else (
                "decrease_key"
                if r < 0.6
                else "change_key"
                if r < 0.7
                else "remove"
                if r < 0.8
                else "meld"
                if r < 0.82
                else "pop"
            )
        )
        arg: Any = rng.choice(live) if op in ("decrease_key", "change_key", "remove") else None
        if op == "meld":
            arg, n = other, n + len(other)
        probe = heap._cost_probe(op, arg)
        phi = heap._phi() + (other._phi() if op == "meld" else 0.0)
        if op == "push":
            arg = heap.push(base + rng.randint(0, 1000), step)
            live.append(arg)
        elif op == "decrease_key":
            heap.decrease_key(arg, max(base, arg.key - rng.randint(0, 500)))
        elif op == "change_key":
            heap.change_key(arg, base + rng.randint(0, 1000))
        elif op == "remove":
            heap.remove(arg)
        elif op == "meld":
            heap.meld(other)
            live += pending
            pending = []
        else:
            heap.pop()
        amortized = heap._cost(op, probe, arg) + cls.PHI_C * (heap._phi() - phi)
        assert amortized <= heap._bound(op, n) + 1e-9, (op, n, amortized, heap._bound(op, n))
        ops += 1
        if op == "meld":
            other = cls()
            if mono:
                other._last = heap.last
            pending = [other.push((heap.last if mono else 0) + rng.randint(0, 900), -i) for i in range(5)]
        live = [h for h in live if h.alive]
    assert ops == 6000
