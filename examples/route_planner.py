"""Route planning on an invented street grid: Dijkstra and A* with decrease_key.

The town of Lantern Hollow is a W×H grid of junctions; each street has a travel
time in minutes.  `shortest_times` runs Dijkstra from the depot; `fastest_route`
runs A* with the Manhattan distance times the fastest street as the heuristic.
"""

from __future__ import annotations

import random
from typing import Any

import heapkit

Node = tuple[int, int]
Graph = dict[Node, list[tuple[Node, float]]]


def street_grid(width: int, height: int, seed: int = 11) -> Graph:
    """An invented town: junctions on a grid, streets to the four neighbours."""
    rng = random.Random(seed)
    g: Graph = {(x, y): [] for x in range(width) for y in range(height)}
    for x in range(width):
        for y in range(height):
            for nx, ny in ((x + 1, y), (x, y + 1)):
                if nx < width and ny < height:
                    minutes = round(rng.uniform(1.0, 9.0), 2)
                    g[(x, y)].append(((nx, ny), minutes))
                    g[(nx, ny)].append(((x, y), minutes))
    return g


def shortest_times(g: Graph, source: Node, kind: str = heapkit.DEFAULT) -> dict[Node, float]:
    """Dijkstra: minutes from ``source`` to every junction, one handle per junction."""
    q: Any = heapkit.new(kind)
    dist = {source: 0.0}
    handle = {source: q.push(0.0, source)}
    done: set[Node] = set()
    while q:
        d, u = q.pop()
        done.add(u)
        for v, w in g[u]:
            nd = d + w
            if v in done:
                continue
            if v not in dist:
                dist[v] = nd
                handle[v] = q.push(nd, v)
            elif nd < dist[v]:
                dist[v] = nd
                q.decrease_key(handle[v], nd)
    return dist


def fastest_route(g: Graph, source: Node, target: Node, kind: str = heapkit.DEFAULT) -> tuple[float, list[Node]]:
    """A*: (minutes, junctions) of a fastest route; the heuristic never overestimates."""
    fastest = min(w for edges in g.values() for _, w in edges)

    def h(n: Node) -> float:
        return (abs(n[0] - target[0]) + abs(n[1] - target[1])) * fastest

    q: Any = heapkit.new(kind)
    best = {source: 0.0}
    came: dict[Node, Node] = {}
    handle = {source: q.push(h(source), source)}
    closed: set[Node] = set()
    while q:
        _, u = q.pop()
        if u == target:
            break
        closed.add(u)
        for v, w in g[u]:
            nd = best[u] + w
            if v in closed or (v in best and not nd < best[v]):
                continue
            best[v] = nd
            came[v] = u
            if v in handle and handle[v].alive:
                q.decrease_key(handle[v], nd + h(v))
            else:
                handle[v] = q.push(nd + h(v), v)
    path = [target]
    while path[-1] != source:
        path.append(came[path[-1]])
    return best[target], path[::-1]


def main() -> None:
    town = street_grid(30, 20)
    times = shortest_times(town, (0, 0))
    minutes, route = fastest_route(town, (0, 0), (29, 19))
    print(f"Lantern Hollow: {len(town)} junctions; farthest junction {max(times.values()):.2f} min away")
    print(f"depot -> north-east gate: {minutes:.2f} min over {len(route) - 1} streets")


if __name__ == "__main__":
    main()
