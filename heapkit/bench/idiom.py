"""The baseline: the ``heapq`` entry-invalidation idiom of the Python docs' heapq page.

Each queue is a list of entries ``[priority, count, task]`` kept in heap order by
``heapq``, an ``entry_finder`` dict from task to its entry, and a ``REMOVED``
marker: removing a task marks its entry, re-prioritising marks the old entry
and pushes a new one, popping skips marked entries.  The count breaks ties so
that tasks are never compared.

The docs wrap this in ``add_task``/``remove_task``/``pop_task``; here their
bodies are written inline with local aliases, the fastest honest form of the
idiom (the docs' function-call form took 1.05x (grid) to 1.27x (sparse graph)
the inline form's time on Dijkstra, measured, and would flatter heapkit).
Every function mirrors one runner in :mod:`heapkit.bench.workloads` and returns
the same result, so the two can be checked equal.
"""

from __future__ import annotations

import itertools
from heapq import heapify, heappop, heappush
from typing import Any

from heapkit.bench.graphs import Adjacency

__all__ = ["REMOVED", "dijkstra", "hold", "meld", "scheduler", "sort"]

#: Placeholder for a removed task (the docs use a string too).
REMOVED = "<removed-task>"


def dijkstra(adj: Adjacency, src: int, zero: float = 0.0) -> list[float]:
    """Shortest distances from ``src``; a lower tentative distance re-prioritises.

    >>> dijkstra([[(1, 2.0), (2, 5.0)], [(2, 1.0)], []], 0)
    [0.0, 2.0, 3.0]
    """
    inf = float("inf")
    dist = [inf] * len(adj)
    counter = itertools.count()
    pq: list[list[Any]] = []
    entry_finder: dict[int, list[Any]] = {}
    dist[src] = zero
    entry = [zero, next(counter), src]
    entry_finder[src] = entry
    heappush(pq, entry)
    while pq:
        d, _, u = heappop(pq)
        if u is REMOVED:
            continue
        del entry_finder[u]
        for v, w in adj[u]:
            nd = d + w
            if nd < dist[v]:
                dist[v] = nd
                old = entry_finder.pop(v, None)
                if old is not None:
                    old[-1] = REMOVED
                entry = [nd, next(counter), v]
                entry_finder[v] = entry
                heappush(pq, entry)
    return dist


def sort(pairs: list[tuple[Any, int]]) -> list[tuple[Any, int]]:
    """Push every ``(key, task)``, then pop them all.

    >>> sort([(3, 0), (1, 1), (2, 2)])
    [(1, 1), (2, 2), (3, 0)]
    """
    counter = itertools.count()
    pq: list[list[Any]] = []
    entry_finder: dict[int, list[Any]] = {}
    for key, task in pairs:
        entry = [key, next(counter), task]
        entry_finder[task] = entry
        heappush(pq, entry)
    out: list[tuple[Any, int]] = []
    append = out.append
    while pq:
        key, _, task = heappop(pq)
        if task is not REMOVED:
            del entry_finder[task]
            append((key, task))
    return out


def scheduler(ops: list[tuple[int, int, Any]], ntasks: int) -> list[tuple[Any, int]]:
    """Run the dispatcher's operations: 0 push, 1 pop, 2 decrease-key, 3 remove.

    Returns what pop and remove gave back, in order.

    >>> scheduler([(0, 0, 5), (0, 1, 7), (2, 1, 3), (3, 0, None), (1, 0, None)], 2)
    [(5, 0), (3, 1)]
    """
    counter = itertools.count()
    pq: list[list[Any]] = []
    entry_finder: dict[int, list[Any]] = {}
    out: list[tuple[Any, int]] = []
    append = out.append
    for op, task, key in ops:
        if op == 0:
            entry = [key, next(counter), task]
            entry_finder[task] = entry
            heappush(pq, entry)
        elif op == 1:
            while pq:
                k, _, t = heappop(pq)
                if t is not REMOVED:
                    del entry_finder[t]
                    append((k, t))
                    break
        elif op == 2:
            old = entry_finder.pop(task)
            old[-1] = REMOVED
            entry = [key, next(counter), task]
            entry_finder[task] = entry
            heappush(pq, entry)
        else:
            old = entry_finder.pop(task)
            old[-1] = REMOVED
            append((old[0], task))
    return out


def meld(groups: list[list[tuple[Any, int]]], npop: int) -> list[tuple[Any, int]]:
    """Build one small queue per group, meld them pairwise into one, pop ``npop``.

    Two queues meld as ``heapify(a + b)`` with their finders merged: O(len(a) +
    len(b)), and the result is again a queue that takes pushes and re-prioritising.
    (``heapq.merge`` only yields a sorted stream, which cannot be pushed to.)

    >>> meld([[(4, 0), (2, 1)], [(3, 2)], [(1, 3)]], 3)
    [(1, 3), (2, 1), (3, 2)]
    """
    counter = itertools.count()
    queues: list[tuple[list[list[Any]], dict[int, list[Any]]]] = []
    for group in groups:
        pq: list[list[Any]] = []
        entry_finder: dict[int, list[Any]] = {}
        for key, task in group:
            entry = [key, next(counter), task]
            entry_finder[task] = entry
            heappush(pq, entry)
        queues.append((pq, entry_finder))
    while len(queues) > 1:
        nxt = []
        for i in range(0, len(queues) - 1, 2):
            (a, fa), (b, fb) = queues[i], queues[i + 1]
            both = a + b
            heapify(both)
            fa.update(fb)
            nxt.append((both, fa))
        if len(queues) % 2:
            nxt.append(queues[-1])
        queues = nxt
    pq, entry_finder = queues[0]
    out: list[tuple[Any, int]] = []
    while pq and len(out) < npop:
        key, _, task = heappop(pq)
        if task is not REMOVED:
            del entry_finder[task]
            out.append((key, task))
    return out


def hold(keys: list[float], incs: list[float]) -> list[float]:
    """The hold model: queue ``keys``; then for each increment pop the earliest
    event and push it back that much later.  Returns the popped times.

    >>> hold([1.0, 2.0], [5.0, 0.5, 1.0])
    [1.0, 2.0, 2.5]
    """
    counter = itertools.count()
    pq: list[list[Any]] = []
    entry_finder: dict[int, list[Any]] = {}
    for task, key in enumerate(keys):
        entry = [key, next(counter), task]
        entry_finder[task] = entry
        heappush(pq, entry)
    out: list[float] = []
    append = out.append
    for inc in incs:
        while True:
            t, _, task = heappop(pq)
            if task is not REMOVED:
                break
        del entry_finder[task]
        append(t)
        entry = [t + inc, next(counter), task]
        entry_finder[task] = entry
        heappush(pq, entry)
    return out
