"""`heapkit.locked`: 8 threads × 10^4 mixed operations, then every entry accounted for."""

from __future__ import annotations

import contextlib
import random
import threading
from typing import Any

import pytest

import heapkit
from tests.kinds import NAMES, make, monotone


@pytest.mark.parametrize("name", NAMES)
def test_eight_threads_lose_nothing(name: str) -> None:
    q: Any = heapkit.locked(make(name))
    popped: list[list[tuple[Any, Any]]] = [[] for _ in range(8)]
    pushed: list[list[tuple[Any, Any]]] = [[] for _ in range(8)]
    removed: list[list[tuple[Any, Any]]] = [[] for _ in range(8)]
    ops = 10_000 if name in ("binary", "pairing", "lazy") else 3_000

    def work(t: int) -> None:
        rng = random.Random(t)
        mine: list[Any] = []
        for i in range(ops):
            r = rng.random()
            if r < 0.5 or not mine:
                k = rng.randrange(10**6, 2 * 10**6) if monotone(name) else rng.randrange(10**6)
                mine.append(q.push(k, (t, i)))
                pushed[t].append((k, (t, i)))
            elif r < 0.7:
                h = mine.pop(rng.randrange(len(mine)))
                # another thread may have popped it first
                with contextlib.suppress(heapkit.InvalidHandleError):
                    removed[t].append(q.remove(h))
            elif r < 0.85:
                h = mine[rng.randrange(len(mine))]
                try:
                    q.decrease_key(h, h.key)
                except heapkit.InvalidHandleError:
                    mine.remove(h)
            else:
                with contextlib.suppress(heapkit.EmptyHeapError):
                    popped[t].append(q.pop())

    threads = [threading.Thread(target=work, args=(t,)) for t in range(8)]
    for th in threads:
        th.start()
    for th in threads:
        th.join()
    heapkit.check(heapkit.threads.unwrap(q))
    rest = [q.pop() for _ in range(len(q))]
    out = sorted(v for part in popped + removed for _, v in part) + [v for _, v in rest]
    assert sorted(out) == sorted(v for part in pushed for _, v in part)
    assert len(set(out)) == len(out)
