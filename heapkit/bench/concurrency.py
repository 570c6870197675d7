"""The ``concurrency`` section: ``heapkit.blocking`` against the stdlib's ``queue.PriorityQueue``.

A producer-consumer run: ``producers`` threads push ``n`` random keys in all,
``consumers`` threads pop them (each a fixed share, so no sentinel is needed),
all in this process.  Each repetition runs the stdlib queue and the heapkit
queue one after the other (which goes first alternates), timing both CPU time
(``time.process_time``: every thread of the process) and wall time
(``time.perf_counter``).  The figures are the medians of the per-repetition
ratios heapkit / stdlib (below 1: heapkit is faster).  All data are invented.
"""

from __future__ import annotations

import gc
import queue
import random
import statistics
import threading
import time
from collections.abc import Callable, Mapping
from typing import Any

import heapkit

__all__ = ["producer_consumer"]

Progress = Callable[[str], None]


def _quiet(_: str) -> None:
    pass


def _stdlib_run(keys: list[int], producers: int, consumers: int) -> list[int]:
    q: queue.PriorityQueue[tuple[int, int]] = queue.PriorityQueue()
    got: list[list[int]] = [[] for _ in range(consumers)]

    def produce(part: list[int]) -> None:
        put = q.put
        for i, k in enumerate(part):
            put((k, i))  # the usual (priority, tie-breaker) entry

    def consume(j: int, count: int) -> None:
        get = q.get
        out = got[j]
        for _ in range(count):
            out.append(get()[0])

    _threads(keys, producers, consumers, produce, consume)
    return sorted(k for part in got for k in part)


def _heapkit_run(kind: type, keys: list[int], producers: int, consumers: int) -> list[int]:
    q: Any = heapkit.blocking(kind())
    got: list[list[int]] = [[] for _ in range(consumers)]

    def produce(part: list[int]) -> None:
        push = q.push
        for i, k in enumerate(part):
            push(k, i)

    def consume(j: int, count: int) -> None:
        pop = q.pop
        out = got[j]
        for _ in range(count):
            out.append(pop()[0])

    _threads(keys, producers, consumers, produce, consume)
    return sorted(k for part in got for k in part)


def _threads(
    keys: list[int],
    producers: int,
    consumers: int,
    produce: Callable[[list[int]], None],
    consume: Callable[[int, int], None],
) -> None:
    n = len(keys)
    shares = [n // consumers + (j < n % consumers) for j in range(consumers)]
    threads = [threading.Thread(target=produce, args=(keys[p::producers],)) for p in range(producers)]
    threads += [threading.Thread(target=consume, args=(j, shares[j])) for j in range(consumers)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()


def _timed(fn: Callable[[], list[int]]) -> tuple[float, float, list[int]]:
    gc.collect()
    gc.disable()
    try:
        c0, w0 = time.process_time(), time.perf_counter()
        out = fn()
        return time.process_time() - c0, time.perf_counter() - w0, out
    finally:
        gc.enable()


def producer_consumer(
    n: int,
    kinds: Mapping[str, type],
    repeat: int,
    *,
    producers: int = 2,
    consumers: int = 2,
    seed: int = 3,
    progress: Progress = _quiet,
) -> dict[str, Any]:
    """Ratios heapkit.blocking / queue.PriorityQueue, CPU and wall; O(repeat * n log n).

    Returns ``{"n", "producers", "consumers", "stdlib_cpu_s", "stdlib_wall_s",
    "kinds": {kind: {"cpu_ratio", "wall_ratio", "cpu_s", "wall_s", "ok"}}}`` (medians).

    >>> r = producer_consumer(200, {"lazy": heapkit.LazyHeap}, 1)
    >>> r["kinds"]["lazy"]["ok"]
    True
    """
    keys = _keys(n, seed)
    want = sorted(keys)
    base_cpu: list[float] = []
    base_wall: list[float] = []
    rows: dict[str, Any] = {}
    for name in kinds:
        cpu_r: list[float] = []
        wall_r: list[float] = []
        cpu_s: list[float] = []
        wall_s: list[float] = []
        ok = True
        for rep in range(repeat):
            progress(f"concurrency: {name} {rep + 1}/{repeat}")

            def base() -> list[int]:
                return _stdlib_run(keys, producers, consumers)

            def mine(kind: type = kinds[name]) -> list[int]:
                return _heapkit_run(kind, keys, producers, consumers)

            if rep % 2 == 0:
                bc, bw, bout = _timed(base)
                kc, kw, kout = _timed(mine)
            else:
                kc, kw, kout = _timed(mine)
                bc, bw, bout = _timed(base)
            ok = ok and kout == want and bout == want
            base_cpu.append(bc)
            base_wall.append(bw)
            cpu_s.append(kc)
            wall_s.append(kw)
            cpu_r.append(kc / bc if bc > 0 else float("inf"))
            wall_r.append(kw / bw if bw > 0 else float("inf"))
        rows[name] = {
            "cpu_ratio": statistics.median(cpu_r),
            "wall_ratio": statistics.median(wall_r),
            "cpu_s": statistics.median(cpu_s),
            "wall_s": statistics.median(wall_s),
            "ok": ok,
        }
    return {
        "n": n,
        "producers": producers,
        "consumers": consumers,
        "stdlib_cpu_s": statistics.median(base_cpu) if base_cpu else None,
        "stdlib_wall_s": statistics.median(base_wall) if base_wall else None,
        "kinds": rows,
    }


def _keys(n: int, seed: int) -> list[int]:
    rng = random.Random(seed)
    return [rng.randrange(10**6) for _ in range(n)]


def render(report: Mapping[str, Any]) -> list[str]:
    """The section as text lines.

    >>> render({"n": 10, "producers": 2, "consumers": 2, "stdlib_cpu_s": 1.0, "stdlib_wall_s": 1.0,
    ...         "kinds": {"lazy": {"cpu_ratio": 0.5, "wall_ratio": 0.6, "ok": True}}})[-1]
    '  lazy                0.50       0.60'
    """
    out = [
        "",
        f"concurrency: blocking(kind) / queue.PriorityQueue, n = {report['n']} entries, "
        f"{report['producers']} producer and {report['consumers']} consumer threads "
        f"(stdlib: {report['stdlib_cpu_s']:.3f} s CPU, {report['stdlib_wall_s']:.3f} s wall)",
        "  kind".ljust(16) + "CPU ratio".rjust(10) + "wall ratio".rjust(11),
    ]
    for k, row in report["kinds"].items():
        if not row["ok"]:
            out.append(f"  {k}".ljust(16) + "WRONG".rjust(9))
            continue
        out.append(f"  {k}".ljust(16) + f"{row['cpu_ratio']:.2f}".rjust(10) + f"{row['wall_ratio']:.2f}".rjust(11))
    return out
