"""The benchmark workloads: seeded data, the heapkit runner and the ``heapq`` baseline.

Each :class:`Workload` makes its data once (``make(scale)``; scale 1 is the full
size), then runs it through a heap from ``factory()`` (``run``) and through the
``heapq`` baselines: the plain tuple idiom of :mod:`heapkit.bench.tuples`
(``tuples``, where it can do the job) and the docs' entry-invalidation idiom of
:mod:`heapkit.bench.idiom` (``baseline``).  ``same`` says whether two results
agree (distances, pop orders).  All data are invented.

Capabilities.  A kind whose class sets ``MONOTONE = True`` takes only
non-negative integer keys that are never below the last key popped (a radix
heap); it runs only the workloads marked ``monotone_ok``.  Every other kind runs
every workload.
"""

from __future__ import annotations

import math
import random
from collections.abc import Callable
from dataclasses import dataclass
from heapq import heappop, heappush
from typing import Any

from heapkit.bench import idiom, tuples
from heapkit.bench.graphs import Adjacency, grid_graph, sparse_graph

__all__ = ["WORKLOADS", "ShelfKey", "Workload", "admits", "dijkstra", "hold", "meld", "scheduler", "sort"]

Factory = Callable[[], Any]


def admits(cls: type, monotone_ok: bool) -> bool:
    """May kind ``cls`` run a workload (``monotone_ok``: its keys suit a radix heap)?

    >>> from heapkit import BinaryHeap
    >>> admits(BinaryHeap, False)
    True
    """
    return monotone_ok or not getattr(cls, "MONOTONE", False)


@dataclass(frozen=True)
class Workload:
    """One benchmark row: how to make its data, run it, and check the result."""

    name: str
    what: str
    make: Callable[[float], Any]
    run: Callable[[Factory, Any], Any]
    baseline: Callable[[Any], Any]
    same: Callable[[Any, Any], bool]
    monotone_ok: bool = False
    decrease_key: bool = False
    #: The plain tuple idiom's run (:mod:`heapkit.bench.tuples`), where it can do the job.
    tuples: Callable[[Any], Any] | None = None

    def admits(self, cls: type) -> bool:
        """True if kind ``cls`` can run this workload (see the module docstring)."""
        return admits(cls, self.monotone_ok)


# --- runners on heapkit heaps --------------------------------------------------------


def dijkstra(factory: Factory, adj: Adjacency, src: int, zero: float) -> list[float]:
    """Shortest distances from ``src`` with handles: push once, then decrease_key.

    >>> from heapkit import PairingHeap
    >>> dijkstra(PairingHeap, [[(1, 2.0), (2, 5.0)], [(2, 1.0)], []], 0, 0.0)
    [0.0, 2.0, 3.0]
    """
    heap = factory()
    push = heap.push
    pop = heap.pop
    decrease_key = heap.decrease_key
    dist = [math.inf] * len(adj)
    handles: list[Any] = [None] * len(adj)
    dist[src] = zero
    handles[src] = push(zero, src)
    while heap:
        d, u = pop()
        for v, w in adj[u]:
            nd = d + w
            if nd < dist[v]:
                dist[v] = nd
                h = handles[v]
                if h is None:
                    handles[v] = push(nd, v)
                else:
                    decrease_key(h, nd)
    return dist


def sort(factory: Factory, pairs: list[tuple[Any, int]]) -> list[tuple[Any, int]]:
    """Push every ``(key, task)``, then pop them all.

    >>> from heapkit import BinaryHeap
    >>> sort(BinaryHeap, [(3, 0), (1, 1), (2, 2)])
    [(1, 1), (2, 2), (3, 0)]
    """
    heap = factory()
    push = heap.push
    pop = heap.pop
    for key, task in pairs:
        push(key, task)
    return [pop() for _ in range(len(pairs))]


def scheduler(factory: Factory, ops: list[tuple[int, int, Any]], ntasks: int) -> list[tuple[Any, int]]:
    """Run the dispatcher's operations: 0 push, 1 pop, 2 decrease-key, 3 remove.

    >>> from heapkit import PairingHeap
    >>> scheduler(PairingHeap, [(0, 0, 5), (0, 1, 7), (2, 1, 3), (3, 0, None), (1, 0, None)], 2)
    [(5, 0), (3, 1)]
    """
    heap = factory()
    push = heap.push
    pop = heap.pop
    decrease_key = heap.decrease_key
    remove = heap.remove
    handles: list[Any] = [None] * ntasks
    out: list[tuple[Any, int]] = []
    append = out.append
    for op, task, key in ops:
        if op == 0:
            handles[task] = push(key, task)
        elif op == 1:
            if heap:
                append(pop())
        elif op == 2:
            decrease_key(handles[task], key)
        else:
            append(remove(handles[task]))
    return out


def meld(factory: Factory, groups: list[list[tuple[Any, int]]], npop: int) -> list[tuple[Any, int]]:
    """Build one small heap per group, meld them pairwise into one, pop ``npop``.

    >>> from heapkit import PairingHeap
    >>> meld(PairingHeap, [[(4, 0), (2, 1)], [(3, 2)], [(1, 3)]], 3)
    [(1, 3), (2, 1), (3, 2)]
    """
    heaps = []
    for group in groups:
        heap = factory()
        push = heap.push
        for key, task in group:
            push(key, task)
        heaps.append(heap)
    while len(heaps) > 1:
        nxt = []
        for i in range(0, len(heaps) - 1, 2):
            a = heaps[i]
            a.meld(heaps[i + 1])
            nxt.append(a)
        if len(heaps) % 2:
            nxt.append(heaps[-1])
        heaps = nxt
    heap = heaps[0]
    pop = heap.pop
    return [pop() for _ in range(min(npop, len(heap)))]


def hold(factory: Factory, keys: list[float], incs: list[float]) -> list[float]:
    """The hold model: for each increment pop the earliest event, push it back later.

    >>> from heapkit import BinaryHeap
    >>> hold(BinaryHeap, [1.0, 2.0], [5.0, 0.5, 1.0])
    [1.0, 2.0, 2.5]
    """
    heap = factory()
    push = heap.push
    pop = heap.pop
    for task, key in enumerate(keys):
        push(key, task)
    out: list[float] = []
    append = out.append
    for inc in incs:
        t, task = pop()
        append(t)
        push(t + inc, task)
    return out


# --- data ----------------------------------------------------------------------------


def _scaled(full: int, scale: float, least: int) -> int:
    return max(least, int(full * scale))


def _same_pops(a: list[tuple[Any, int]], b: list[tuple[Any, int]]) -> bool:
    """Equal keys in the same order, and the same entries (ties may pop in any order)."""
    return [k for k, _ in a] == [k for k, _ in b] and sorted(a) == sorted(b)


def _equal(a: Any, b: Any) -> bool:
    return bool(a == b)


def _sort_data(shape: str) -> Callable[[float], list[tuple[int, int]]]:
    def make(scale: float) -> list[tuple[int, int]]:
        n = _scaled(100_000, scale, 100)
        rng = random.Random(11)
        if shape == "equal":
            keys = [rng.randrange(16) for _ in range(n)]
        else:
            keys = [rng.randrange(10**9) for _ in range(n)]
            if shape != "random":
                keys.sort(reverse=shape == "reversed")
        return [(k, i) for i, k in enumerate(keys)]

    return make


class ShelfKey:
    """A key whose ``<`` does real work, as user keys often do: a shelf label
    compared case-insensitively field by field (casefold, split on ``/``, compare
    the lists of strings) on every comparison, about 1 us each.  No ``__eq__``:
    equality is identity (labels are distinct), so a tuple or list entry holding
    the key pays for its ``<`` only.

    >>> ShelfKey("North/Aisle-07") < ShelfKey("north/aisle-10")
    True
    """

    __slots__ = ("label",)

    def __init__(self, label: str) -> None:
        self.label = label

    def fields(self) -> list[str]:
        """The label's fields, case-folded: what ``<`` compares.  O(len(label)).

        >>> ShelfKey("North/Bin-3").fields()
        ['north', 'bin-3']
        """
        return self.label.casefold().split("/")

    def __lt__(self, other: ShelfKey) -> bool:
        return self.label.casefold().split("/") < other.label.casefold().split("/")

    def __repr__(self) -> str:
        return f"ShelfKey({self.label!r})"


def _costly_data(scale: float) -> list[tuple[ShelfKey, int]]:
    """Distinct shelf labels of an invented warehouse (mixed case), in random order."""
    n = _scaled(50_000, scale, 100)
    rng = random.Random(19)
    sites = ("North-Depot", "south-depot", "EAST-DEPOT")
    seen: dict[tuple[str, ...], str] = {}
    while len(seen) < n:
        label = (
            f"{rng.choice(sites)}/{rng.choice(('Aisle', 'aisle'))}-{rng.randrange(40):02d}/"
            f"bin-{rng.randrange(400):03d}/Lot-{rng.randrange(10**6):06d}"
        )
        seen.setdefault(tuple(label.casefold().split("/")), label)
    labels = [seen[f] for f in sorted(seen)]
    rng.shuffle(labels)
    return [(ShelfKey(t), i) for i, t in enumerate(labels)]


# Proportions of the dispatcher mix (invented, see scheduler_data's docstring).
MIX = {"push": 0.40, "pop": 0.30, "decrease_key": 0.20, "remove": 0.10}


def scheduler_data(scale: float, seed: int = 5) -> tuple[list[tuple[int, int, Any]], int]:
    """A dispatcher's operations after an initial queue of jobs, with the proportions
    of ``MIX``: each job is submitted once and leaves once, dispatched (3 in 4) or
    cancelled (1 in 4), so pushes match pops plus removes and the queue keeps its
    size; half the jobs get one priority boost (escalation) before they leave.
    Keys are deadlines, distinct, never below the last one dispatched.

    >>> ops, n = scheduler_data(0.001)
    >>> n == sum(1 for op in ops if op[0] == 0)
    True
    """
    rng = random.Random(seed)
    start = _scaled(50_000, scale, 50)
    used: set[float] = set()
    key: dict[int, float] = {}
    live: list[int] = []
    pos: dict[int, int] = {}
    pq: list[tuple[float, int]] = []
    ops: list[tuple[int, int, Any]] = []
    now = 0.0

    def fresh(lo: float, hi: float) -> float:
        k = lo + (hi - lo) * rng.random()
        while k in used or k <= lo:
            k = lo + (hi - lo) * rng.random()
        used.add(k)
        return k

    def enter(t: int, k: float) -> None:
        key[t] = k
        heappush(pq, (k, t))

    def leave(t: int) -> None:
        i = pos.pop(t)
        last = live.pop()
        if last != t:
            live[i] = last
            pos[last] = i
        del key[t]

    for t in range(start):
        pos[t] = len(live)
        live.append(t)
        k = fresh(0.0, 1.0)
        enter(t, k)
        ops.append((0, t, k))
    ntasks = start
    cut_pop = MIX["push"] + MIX["pop"]
    cut_dec = cut_pop + MIX["decrease_key"]
    for _ in range(4 * start):
        r = rng.random()
        if r < MIX["push"] or not live:
            t = ntasks
            ntasks += 1
            pos[t] = len(live)
            live.append(t)
            k = fresh(now, now + 1.0)
            enter(t, k)
            ops.append((0, t, k))
        elif r < cut_pop:
            while True:
                k, t = heappop(pq)
                if key.get(t) == k:
                    break
            now = k
            leave(t)
            ops.append((1, 0, None))
        elif r < cut_dec:
            t = live[rng.randrange(len(live))]
            k = fresh(now, key[t])
            enter(t, k)
            ops.append((2, t, k))
        else:
            t = live[rng.randrange(len(live))]
            leave(t)
            ops.append((3, t, None))
    return ops, ntasks


def _meld_data(scale: float) -> tuple[list[list[tuple[float, int]]], int]:
    n = _scaled(1 << 17, scale, 64)
    rng = random.Random(13)
    keys = rng.sample(range(10 * n), n)
    groups = [[(float(keys[i]), i) for i in range(j, min(n, j + 4))] for j in range(0, n, 4)]
    return groups, n // 4


def _hold_data(scale: float) -> tuple[list[float], list[float]]:
    n = _scaled(100_000, scale, 100)
    rng = random.Random(17)
    return [rng.random() for _ in range(n)], [rng.expovariate(1.0) for _ in range(3 * n)]


def _sparse(integer: bool) -> Callable[[float], tuple[Adjacency, int, float]]:
    def make(scale: float) -> tuple[Adjacency, int, float]:
        n = _scaled(100_000, scale, 50)
        adj = sparse_graph(n, 5 * n, seed=3, integer=integer)
        return adj, 0, (0 if integer else 0.0)

    return make


def _grid(scale: float) -> tuple[Adjacency, int, float]:
    side = max(8, int(400 * math.sqrt(scale)))
    return grid_graph(side, side, seed=7), 0, 0.0


def _dijkstra_row(name: str, what: str, make: Callable[[float], Any], monotone_ok: bool) -> Workload:
    return Workload(
        name,
        what,
        make,
        run=lambda f, d: dijkstra(f, *d),
        baseline=lambda d: idiom.dijkstra(*d),
        same=_equal,
        monotone_ok=monotone_ok,
        decrease_key=True,
        tuples=lambda d: tuples.dijkstra(*d),
    )


def _sort_row(shape: str) -> Workload:
    return Workload(
        f"sort-{shape}",
        f"n pushes then n pops, {shape} int keys (n = 1e5)",
        _sort_data(shape),
        run=sort,
        baseline=idiom.sort,
        same=_same_pops,
        monotone_ok=True,
        tuples=tuples.sort,
    )


#: Every workload, by name, in the order the table shows them.
WORKLOADS: dict[str, Workload] = {
    w.name: w
    for w in [
        _dijkstra_row(
            "dijkstra-sparse", "Dijkstra, random graph n = 1e5, m = 5e5, float weights", _sparse(False), False
        ),
        _dijkstra_row("dijkstra-grid", "Dijkstra, 400 x 400 grid, float weights", _grid, False),
        _dijkstra_row(
            "dijkstra-int", "Dijkstra, random graph n = 1e5, m = 5e5, int weights 1..100", _sparse(True), True
        ),
        *(_sort_row(s) for s in ("random", "sorted", "reversed", "equal")),
        Workload(
            "sort-costly",
            "n pushes then n pops, keys whose < folds and splits labels (n = 5e4)",
            _costly_data,
            run=sort,
            baseline=idiom.sort,
            same=_same_pops,
            tuples=tuples.sort,
        ),
        Workload(
            "scheduler",
            "dispatcher: 40% push, 30% pop, 20% decrease_key, 10% remove (5e4 + 2e5 ops)",
            scheduler_data,
            run=lambda f, d: scheduler(f, *d),
            baseline=lambda d: idiom.scheduler(*d),
            same=_equal,
            decrease_key=True,
        ),
        Workload(
            "meld",
            "32768 heaps of 4 melded pairwise into one, then n/4 pops",
            _meld_data,
            run=lambda f, d: meld(f, *d),
            baseline=lambda d: idiom.meld(*d),
            same=_equal,
        ),
        Workload(
            "hold",
            "discrete-event hold model: 1e5 events, 3e5 pop + push-later",
            _hold_data,
            run=lambda f, d: hold(f, *d),
            baseline=lambda d: idiom.hold(*d),
            same=_equal,
            tuples=lambda d: tuples.hold(*d),
        ),
    ]
}
