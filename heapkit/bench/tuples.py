"""The first baseline: the plain tuple idiom, what users write and time.

A Python user who needs Dijkstra or an event queue without heapkit pushes
``(key, item)`` tuples onto a list with the C ``heapq`` functions.  A lower key
for an item already queued is pushed again as a duplicate; on pop, a stale
duplicate is skipped (``if d > dist[u]: continue``).  There is no entry finder,
no counter and no removal: it is the cheapest honest queue in CPython, and the
one heapkit is timed against first (:mod:`heapkit.bench.idiom`, the docs'
entry-invalidation recipe with ``[priority, count, task]`` entries, is the second).

The idiom cannot re-prioritise an entry *up* or cancel it without a finder, so it
runs only the workloads that need neither: Dijkstra (decrease-key becomes a
duplicate push), push-then-pop sorting and the hold model.  Each function mirrors
one runner in :mod:`heapkit.bench.workloads` and returns the same result.
Ties: ``(key, item)`` compares the item on equal keys; every item here is an int.
"""

from __future__ import annotations

from heapq import heappop, heappush
from typing import Any

from heapkit.bench.graphs import Adjacency

__all__ = ["dijkstra", "hold", "sort"]


def dijkstra(adj: Adjacency, src: int, zero: float = 0.0) -> list[float]:
    """Shortest distances from ``src``: duplicates pushed, stale ones skipped on pop.

    >>> dijkstra([[(1, 2.0), (2, 5.0)], [(2, 1.0)], []], 0)
    [0.0, 2.0, 3.0]
    """
    dist = [float("inf")] * len(adj)
    dist[src] = zero
    pq: list[tuple[Any, int]] = [(zero, src)]
    while pq:
        d, u = heappop(pq)
        if d > dist[u]:
            continue
        for v, w in adj[u]:
            nd = d + w
            if nd < dist[v]:
                dist[v] = nd
                heappush(pq, (nd, v))
    return dist


def sort(pairs: list[tuple[Any, int]]) -> list[tuple[Any, int]]:
    """Push every ``(key, task)`` tuple, then pop them all.

    >>> sort([(3, 0), (1, 1), (2, 2)])
    [(1, 1), (2, 2), (3, 0)]
    """
    pq: list[tuple[Any, int]] = []
    for pair in pairs:
        heappush(pq, pair)
    return [heappop(pq) for _ in range(len(pairs))]


def hold(keys: list[float], incs: list[float]) -> list[float]:
    """The hold model on ``(time, task)`` tuples: pop the earliest, push it back later.

    >>> hold([1.0, 2.0], [5.0, 0.5, 1.0])
    [1.0, 2.0, 2.5]
    """
    pq: list[tuple[float, int]] = []
    for task, key in enumerate(keys):
        heappush(pq, (key, task))
    out: list[float] = []
    append = out.append
    for inc in incs:
        t, task = heappop(pq)
        append(t)
        heappush(pq, (t + inc, task))
    return out
