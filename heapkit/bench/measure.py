"""Measuring: timed runs side by side with the baseline, comparison counts, memory,
growth, and the cost of the contract modes.

Times are CPU time of this process (``time.process_time``), so other programs on
a shared machine disturb them less, with the garbage collector paused during
each run as ``timeit`` does.  Each repetition runs the baselines and the kind one
after the other, the order reversed every other repetition (tuple idiom, docs
idiom, kind; then kind, docs idiom, tuple idiom); the figures reported are the
**median of the per-repetition ratios** kind / tuple idiom and kind / docs idiom.
"""

from __future__ import annotations

import contextlib
import functools
import gc
import heapq
import itertools
import math
import random
import statistics
import time
import tracemalloc
from collections.abc import Callable, Iterator, Mapping
from dataclasses import dataclass, field
from typing import Any, ClassVar

import heapkit
from heapkit.bench import idiom
from heapkit.bench.workloads import WORKLOADS, Workload, sort

__all__ = [
    "Counted",
    "Row",
    "bytes_per_entry",
    "comparisons",
    "dijkstra_comparisons",
    "growth",
    "log2_factorial",
    "modes",
    "time_workload",
]

Progress = Callable[[str], None]


def _quiet(_: str) -> None:
    pass


def timed(fn: Callable[[], Any]) -> tuple[float, Any]:
    """Run ``fn`` once with the collector paused; return (CPU seconds, its result)."""
    gc.collect()
    was = gc.isenabled()
    gc.disable()
    try:
        t0 = time.process_time()
        out = fn()
        return time.process_time() - t0, out
    finally:
        if was:
            gc.enable()


@dataclass
class Row:
    """One kind on one workload: its times, the baselines', and the ratios.

    ``base_*``: the docs' entry-invalidation idiom; ``tuple_*``: the plain tuple
    idiom (empty where the workload has none).
    """

    kind: str
    kind_s: list[float] = field(default_factory=list)
    base_s: list[float] = field(default_factory=list)
    ratios: list[float] = field(default_factory=list)
    tuple_s: list[float] = field(default_factory=list)
    tuple_ratios: list[float] = field(default_factory=list)
    ok: bool = True

    @property
    def ratio(self) -> float:
        """Median of the per-repetition ratios kind / docs idiom."""
        return statistics.median(self.ratios) if self.ratios else math.nan

    @property
    def tuple_ratio(self) -> float | None:
        """Median of the per-repetition ratios kind / tuple idiom (None: no tuple idiom)."""
        return statistics.median(self.tuple_ratios) if self.tuple_ratios else None


def _ratio(t: float, base: float) -> float:
    return t / base if base > 0 else math.inf


def time_workload(
    w: Workload,
    data: Any,
    kinds: Mapping[str, type],
    repeat: int,
    progress: Progress = _quiet,
) -> dict[str, Row]:
    """Time every admitted kind against the baselines, ``repeat`` times, alternating.

    Kinds are timed in rounds, one run of each per round, the order of the kinds
    reversed every other round (as ``replay`` does): timed one kind after another,
    the kind timed first came out up to 7% faster than in second place (measured,
    compiled binary on the grid: 0.95 first against 1.03 second, means of 4 runs of
    7), and the table's first kind is always ``binary``.  Each kind's baselines run beside
    it, their order reversed every other round too.  The first run of each kind
    (and of the tuple idiom) is also checked against the docs idiom's result.
    """
    rows = {name: Row(name) for name, cls in kinds.items() if w.admits(cls)}
    tup = w.tuples
    for rep in range(repeat):
        for name in rows if rep % 2 == 0 else reversed(rows):
            cls, row = kinds[name], rows[name]
            progress(f"{w.name}: round {rep + 1}/{repeat}: {name}")
            runs: list[tuple[str, Callable[[], Any]]] = [
                ("docs", functools.partial(w.baseline, data)),
                ("kind", functools.partial(w.run, cls, data)),
            ]
            if tup is not None:
                runs.insert(0, ("tuple", functools.partial(tup, data)))
            if rep % 2:
                runs.reverse()
            t: dict[str, float] = {}
            got: dict[str, Any] = {}
            for label, fn in runs:
                t[label], got[label] = timed(fn)
            if rep == 0:
                row.ok = w.same(got["kind"], got["docs"])
                if tup is not None and not w.same(got["tuple"], got["docs"]):
                    raise ValueError(f"{w.name}: the tuple idiom's result differs from the docs idiom's")
            row.base_s.append(t["docs"])
            row.kind_s.append(t["kind"])
            row.ratios.append(_ratio(t["kind"], t["docs"]))
            if tup is not None:
                row.tuple_s.append(t["tuple"])
                row.tuple_ratios.append(_ratio(t["kind"], t["tuple"]))
    return rows


class Counted:
    """A key that counts the ``<`` comparisons made on it (and has no other order).

    >>> Counted.count = 0
    >>> Counted(1) < Counted(2), Counted.count
    (True, 1)
    """

    __slots__ = ("v",)
    count: ClassVar[int] = 0

    def __init__(self, v: float) -> None:
        self.v = v

    def __lt__(self, other: Counted) -> bool:
        Counted.count += 1
        return self.v < other.v


def log2_factorial(n: int) -> float:
    """log2(n!), the information-theoretic lower bound on comparisons to sort n keys
    (Knuth, TAOCP vol. 3, sec. 5.3.1), computed as ``math.lgamma(n + 1) / math.log(2)``.

    >>> round(log2_factorial(4), 6) == round(math.log2(24), 6)
    True
    """
    return math.lgamma(n + 1) / math.log(2)


def comparisons(kinds: Mapping[str, type], n: int, seed: int = 1) -> dict[str, int]:
    """Key comparisons for n pushes then n pops of the same random keys, per kind and
    for ``heapq`` itself (bare keys, under the name ``"heapq"``).  Deterministic.

    >>> from heapkit import BinaryHeap
    >>> c = comparisons({"binary": BinaryHeap}, 200)
    >>> c["binary"] > 0 and c["heapq"] > 0
    True
    """
    rng = random.Random(seed)
    raw = [rng.randrange(10**9) for _ in range(n)]
    out: dict[str, int] = {}
    keys = [Counted(v) for v in raw]
    Counted.count = 0
    pq: list[Counted] = []
    for k in keys:
        heapq.heappush(pq, k)
    while pq:
        heapq.heappop(pq)
    out["heapq"] = Counted.count
    for name, cls in kinds.items():
        if getattr(cls, "MONOTONE", False):
            continue  # a radix heap files int keys by their bits; it does not use <
        keys = [Counted(v) for v in raw]
        heap: Any = cls()
        Counted.count = 0
        for i, k in enumerate(keys):
            heap.push(k, i)
        while heap:
            heap.pop()
        out[name] = Counted.count
    return out


def _counted_dijkstra(heap: Any, adj: Any, src: int) -> list[float]:
    """Dijkstra with handles (push once, then decrease_key) on :class:`Counted` keys."""
    dist = [math.inf] * len(adj)
    handles: list[Any] = [None] * len(adj)
    dist[src] = 0.0
    handles[src] = heap.push(Counted(0.0), src)
    while heap:
        k, u = heap.pop()
        for v, w in adj[u]:
            nd = k.v + w
            if nd < dist[v]:
                dist[v] = nd
                h = handles[v]
                if h is None:
                    handles[v] = heap.push(Counted(nd), v)
                else:
                    heap.decrease_key(h, Counted(nd))
    return dist


def _counted_idiom_dijkstra(adj: Any, src: int) -> list[float]:
    """The docs' heapq idiom of :func:`heapkit.bench.idiom.dijkstra` on :class:`Counted`
    priorities (an entry ``[priority, count, vertex]`` compares its priority with one ``<``
    since two Counted objects are never equal)."""
    dist = [math.inf] * len(adj)
    counter = itertools.count()
    pq: list[list[Any]] = []
    finder: dict[int, list[Any]] = {}
    dist[src] = 0.0
    finder[src] = entry = [Counted(0.0), next(counter), src]
    heapq.heappush(pq, entry)
    while pq:
        k, _, u = heapq.heappop(pq)
        if u is idiom.REMOVED:
            continue
        del finder[u]
        for v, w in adj[u]:
            nd = k.v + w
            if nd < dist[v]:
                dist[v] = nd
                old = finder.pop(v, None)
                if old is not None:
                    old[-1] = idiom.REMOVED
                finder[v] = entry = [Counted(nd), next(counter), v]
                heapq.heappush(pq, entry)
    return dist


def dijkstra_comparisons(kinds: Mapping[str, type], adj: Any, src: int = 0) -> dict[str, int]:
    """Key comparisons of Dijkstra's algorithm from ``src`` per kind (push, pop,
    decrease_key) and for the ``heapq`` idiom (``"heapq"``: a new entry per
    improvement, stale entries skipped), all reaching the same distances.

    >>> from heapkit import BinaryHeap
    >>> c = dijkstra_comparisons({"binary": BinaryHeap}, [[(1, 2.0), (2, 5.0)], [(2, 1.0)], []])
    >>> c["binary"] > 0 and c["heapq"] > 0
    True
    """
    out: dict[str, int] = {}
    Counted.count = 0
    want = _counted_idiom_dijkstra(adj, src)
    out["heapq"] = Counted.count
    for name, cls in kinds.items():
        if getattr(cls, "MONOTONE", False):
            continue  # int keys filed by their bits; no <
        Counted.count = 0
        got = _counted_dijkstra(cls(), adj, src)
        if got != want:
            raise ValueError(f"dijkstra_comparisons: {name} found other distances than heapq")
        out[name] = Counted.count
    return out


def bytes_per_entry(kinds: Mapping[str, type], n: int) -> dict[str, float]:
    """Memory the queue holds per entry after n pushes (handles included), by
    ``tracemalloc``; keys and values are made beforehand so only the queue counts.
    The baseline's figure (``"heapq idiom"``) counts its list, entries and finder.

    >>> from heapkit import PairingHeap
    >>> 0 < bytes_per_entry({"pairing": PairingHeap}, 1000)["pairing"] < 1000
    True
    """
    rng = random.Random(2)
    keys = [rng.randrange(10**9) for _ in range(n)]
    values = list(range(n))
    out: dict[str, float] = {}

    def idiom_fill() -> Any:
        counter = itertools.count()
        pq: list[list[Any]] = []
        finder: dict[int, list[Any]] = {}
        for i in range(n):
            entry = [keys[i], next(counter), values[i]]
            finder[values[i]] = entry
            heapq.heappush(pq, entry)
        return pq, finder

    def kind_fill(cls: type) -> Callable[[], Any]:
        def fill() -> Any:
            heap: Any = cls()
            push = heap.push
            for i in range(n):
                handles[i] = push(keys[i], values[i])
            return heap

        return fill

    handles: list[Any] = [None] * n
    fills: dict[str, Callable[[], Any]] = {"heapq idiom": idiom_fill}
    for name, cls in kinds.items():
        fills[name] = kind_fill(cls)
    for name, fill in fills.items():
        gc.collect()
        tracemalloc.start()
        try:
            before = tracemalloc.get_traced_memory()[0]
            keep = fill()
            after = tracemalloc.get_traced_memory()[0]
        finally:
            tracemalloc.stop()
        out[name] = (after - before) / n
        del keep
        handles[:] = [None] * n
    return out


def growth(kinds: Mapping[str, type], sizes: list[int], progress: Progress = _quiet) -> dict[str, list[float]]:
    """Nanoseconds per operation for n pushes then n pops of random keys, at each
    size (the best of a few runs; one run above 10^5), for the idiom and each kind.

    >>> from heapkit import BinaryHeap
    >>> g = growth({"binary": BinaryHeap}, [100, 200])
    >>> len(g["binary"]), len(g["heapq idiom"])
    (2, 2)
    """
    make = WORKLOADS["sort-random"].make
    out: dict[str, list[float]] = {"heapq idiom": []}
    for name in kinds:
        out[name] = []
    for n in sizes:
        pairs = make(n / 100_000)
        reps = 3 if n <= 100_000 else 1
        progress(f"growth: n = {n}")
        for name in out:
            cls = kinds.get(name)

            def once(c: type | None = cls, p: list[tuple[int, int]] = pairs) -> Any:
                return idiom.sort(p) if c is None else sort(c, p)

            best = min(timed(once)[0] for _ in range(reps))
            out[name].append(best / (2 * n) * 1e9)
    return out


def _feature(name: str) -> Any:
    """A public heapkit function that may not exist in every version (checked, audit)."""
    return vars(heapkit)[name]


@contextlib.contextmanager
def _mode(mode: str, name: str, cls: type) -> Iterator[Callable[[], Any]]:
    """A factory of heaps of kind ``name`` (class ``cls``) in ``mode``:
    plain, new, cycled, checked, audited."""
    if mode == "plain":
        yield cls
    elif mode == "new":
        yield lambda: heapkit.new(name)
    elif mode == "cycled":
        checked, unchecked = _feature("checked"), _feature("unchecked")
        yield lambda: unchecked(checked(cls()))
    elif mode == "checked":
        checked = _feature("checked")
        yield lambda: checked(cls())
    else:
        audit = _feature("audit")
        with contextlib.ExitStack() as stack:

            def make() -> Any:
                heap = cls()
                stack.enter_context(audit(heap))
                return heap

            yield make


#: The contract modes compared with a plain heap, and what each means.
MODES = {
    "new": "heapkit.new(kind) with HEAPKIT_DEBUG unset (contracts off)",
    "cycled": "checked(...) then unchecked(...) (contracts switched off again)",
    "checked": "heapkit.checked(heap): its rules checked after every operation",
    "audited": "inside heapkit.audit(heap)",
}


def modes(
    kinds: Mapping[str, type],
    w: Workload,
    data: Any,
    small: Any,
    repeat: int,
    progress: Progress = _quiet,
) -> dict[str, dict[str, float | str]]:
    """Median ratio, per kind and mode, of ``w`` in that mode to ``w`` on a plain heap.

    The cheap modes run on ``data``; checked and audited modes, which may cost
    O(n) per operation, on ``small``.  A mode whose feature is missing
    (``heapkit.checked``, ``heapkit.audit``) is reported as ``"n/a"``, one that
    fails as ``"failed"``.
    """
    out: dict[str, dict[str, float | str]] = {}
    for name, cls in kinds.items():
        if not w.admits(cls):
            continue
        row: dict[str, float | str] = out.setdefault(name, {})
        for mode in MODES:
            need = {"cycled": "checked", "checked": "checked", "audited": "audit"}.get(mode)
            if need is not None and not hasattr(heapkit, need):
                row[mode] = "n/a"
                continue
            progress(f"contracts: {name} {mode}")
            d = small if mode in ("checked", "audited") else data
            ratios = []
            try:
                for rep in range(repeat):

                    def run(f: Callable[[], Any], d: Any = d) -> Callable[[], Any]:
                        return lambda: w.run(f, d)

                    with _mode(mode, name, cls) as factory:
                        if rep % 2:
                            tm, got = timed(run(factory))
                            tp, plain = timed(run(cls))
                        else:
                            tp, plain = timed(run(cls))
                            tm, got = timed(run(factory))
                    if not w.same(got, plain):
                        raise ValueError("result differs from the plain heap's")
                    ratios.append(tm / tp if tp > 0 else math.inf)
            except Exception:  # a mode that fails is reported in the table, not fatal
                row[mode] = "failed"
                continue
            row[mode] = statistics.median(ratios)
    return out
