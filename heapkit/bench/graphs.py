"""Seeded random graphs for the Dijkstra workloads (invented data, never check values).

A graph is an adjacency list: ``adj[u]`` is a list of ``(v, weight)`` pairs.  Both
the heapkit runs and the ``heapq`` baseline read the same lists, so the only
difference between them is the queue.
"""

from __future__ import annotations

import random

__all__ = ["Adjacency", "grid_graph", "sparse_graph"]

#: Weights are ``int | float``, not ``float``: compiled (mypyc) code converts an int
#: annotated ``float`` to a float, and radix needs int keys.
Weight = int | float
Adjacency = list[list[tuple[int, Weight]]]


def _weight(rng: random.Random, integer: bool) -> Weight:
    # Integer weights in 1..100 (monotone kinds such as radix need int keys).
    return rng.randint(1, 100) if integer else rng.random()


def sparse_graph(n: int, m: int, seed: int, *, integer: bool = False) -> Adjacency:
    """A directed graph on ``n`` vertices with ``m`` random arcs (self-loops allowed).

    Vertex 0 reaches most of the graph once ``m`` is a few times ``n``.

    >>> adj = sparse_graph(5, 12, seed=1)
    >>> len(adj), sum(len(a) for a in adj)
    (5, 12)
    """
    rng = random.Random(seed)
    adj: Adjacency = [[] for _ in range(n)]
    rand = rng.randrange
    for _ in range(m):
        adj[rand(n)].append((rand(n), _weight(rng, integer)))
    return adj


def grid_graph(rows: int, cols: int, seed: int, *, integer: bool = False) -> Adjacency:
    """A ``rows`` x ``cols`` grid, each cell linked both ways to its four neighbours.

    Each direction of each link gets its own random weight.

    >>> adj = grid_graph(3, 4, seed=1)
    >>> len(adj), sum(len(a) for a in adj)  # 2 * (3*3 + 2*4) arcs
    (12, 34)
    """
    rng = random.Random(seed)
    adj: Adjacency = [[] for _ in range(rows * cols)]
    for r in range(rows):
        for c in range(cols):
            u = r * cols + c
            if c + 1 < cols:
                adj[u].append((u + 1, _weight(rng, integer)))
                adj[u + 1].append((u, _weight(rng, integer)))
            if r + 1 < rows:
                adj[u].append((u + cols, _weight(rng, integer)))
                adj[u + cols].append((u, _weight(rng, integer)))
    return adj
