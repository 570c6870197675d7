"""k-way merge of sorted streams: the invented sensor logs of the Saltmarsh weather
stations, each already in time order, merged into one timeline."""

from __future__ import annotations

import random
from collections.abc import Iterable, Iterator
from typing import Any

import heapkit


def merge(streams: Iterable[Iterable[Any]], kind: str = heapkit.DEFAULT) -> Iterator[Any]:
    """Yield the items of sorted streams in order; equal items in stream order (stable heap)."""
    q: Any = heapkit.new(kind, stable=True)
    its = [iter(s) for s in streams]
    for it in its:
        for first in it:
            q.push(first, it)
            break
    while q:
        item, it = q.pop()
        yield item
        for nxt in it:
            q.push(nxt, it)
            break


def station_logs(stations: int, readings: int, seed: int = 8) -> list[list[float]]:
    rng = random.Random(seed)
    return [sorted(round(rng.uniform(0, 86400), 1) for _ in range(readings)) for _ in range(stations)]


def main() -> None:
    logs = station_logs(12, 500)
    timeline = list(merge(logs))
    print(
        f"Saltmarsh: {len(timeline)} readings from {len(logs)} stations, "
        f"first at {timeline[0]} s, last at {timeline[-1]} s"
    )


if __name__ == "__main__":
    main()
