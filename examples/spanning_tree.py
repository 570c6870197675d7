"""Prim's minimum spanning tree with decrease_key: cabling an invented campus.

Buildings of the Fernwick research park are points in the plane; a cable between two
buildings costs their distance.  `prim` grows the cheapest tree from building 0.
"""

from __future__ import annotations

import math
import random
from typing import Any

import heapkit


def campus(n: int, seed: int = 5) -> list[tuple[float, float]]:
    rng = random.Random(seed)
    return [(rng.uniform(0, 1000), rng.uniform(0, 1000)) for _ in range(n)]


def prim(points: list[tuple[float, float]], kind: str = heapkit.DEFAULT) -> tuple[float, list[tuple[int, int]]]:
    """Total cable length and the tree's edges (complete graph, O(n^2) edge scans)."""
    n = len(points)
    q: Any = heapkit.new(kind)
    handles = [q.push(math.inf, i) for i in range(n)]
    q.decrease_key(handles[0], 0.0)
    parent = [-1] * n
    in_tree = [False] * n
    total = 0.0
    edges: list[tuple[int, int]] = []
    while q:
        cost, u = q.pop()
        in_tree[u] = True
        total += cost
        if parent[u] >= 0:
            edges.append((parent[u], u))
        ux, uy = points[u]
        for v in range(n):
            if not in_tree[v]:
                d = math.hypot(ux - points[v][0], uy - points[v][1])
                if d < handles[v].key:
                    q.decrease_key(handles[v], d)
                    parent[v] = u
    return total, edges


def main() -> None:
    total, edges = prim(campus(120))
    print(f"Fernwick park: {len(edges)} cables, {total:.1f} m in all")


if __name__ == "__main__":
    main()
