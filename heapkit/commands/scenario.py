"""The demo's invented scenario: the parcel depots of Brackenford, a fictional town.

Morning: vans are routed over a synthetic street grid with Dijkstra (integer
minutes, so even the radix kind can take it).  Day: jobs arrive at two depots with
deadlines; as deadlines near, jobs are re-prioritised (decrease_key), some are
cancelled (remove); at noon the east depot closes and its queue is melded into the
west depot's; the west depot then works through everything.  The run is recorded
as a trace, so every kind can replay exactly the same operations.
"""

from __future__ import annotations

import os
import random
from dataclasses import dataclass

import heapkit
from heapkit import trace


@dataclass
class Story:
    """What happened while the scenario was recorded."""

    junctions: int = 0
    relaxed: int = 0
    jobs: int = 0
    reprioritised: int = 0
    cancelled: int = 0
    delivered: int = 0


def record_scenario(path: str | os.PathLike[str], *, size: int = 45, jobs: int = 4000, seed: int = 2) -> Story:
    """Write the scenario's trace to ``path`` and return its story."""
    rng = random.Random(seed)
    story = Story()
    routes: trace.Recorder[int, tuple[int, int]] = trace.record(heapkit.new("pairing"), path)
    # Morning: Dijkstra from the depot at junction (0, 0) on a size x size grid.
    minutes = {}
    for x in range(size):
        for y in range(size):
            for nb in ((x + 1, y), (x, y + 1)):
                if nb[0] < size and nb[1] < size:
                    minutes[((x, y), nb)] = minutes[(nb, (x, y))] = rng.randint(1, 9)
    nbrs: dict[tuple[int, int], list[tuple[int, int]]] = {}
    for a, b in minutes:
        nbrs.setdefault(a, []).append(b)
    dist = {(0, 0): 0}
    handle = {(0, 0): routes.push(0, (0, 0))}
    done = set()
    while routes:
        d, u = routes.pop()
        done.add(u)
        for v in nbrs[u]:
            nd = d + minutes[(u, v)]
            if v in done:
                continue
            if v not in dist:
                dist[v] = nd
                handle[v] = routes.push(nd, v)
            elif nd < dist[v]:
                dist[v] = nd
                routes.decrease_key(handle[v], nd)
                story.relaxed += 1
    story.junctions = len(done)
    # Day: jobs at two depots; keys are (deadline minute, job number).
    west: trace.Recorder[tuple[int, int], str] = routes.sibling(heapkit.new("pairing"))
    east: trace.Recorder[tuple[int, int], str] = routes.sibling(heapkit.new("pairing"))
    open_jobs = []
    for j in range(jobs):
        depot = west if rng.random() < 0.6 else east
        open_jobs.append((depot, depot.push((rng.randint(60, 900), j), f"parcel {j}")))
        story.jobs += 1
        if j % 7 == 3:
            depot_of, h = open_jobs[rng.randrange(len(open_jobs))]
            if h.alive:
                depot_of.decrease_key(h, (max(0, h.key[0] - rng.randint(5, 120)), h.key[1]))
                story.reprioritised += 1
        if j % 23 == 11:
            depot_of, h = open_jobs.pop(rng.randrange(len(open_jobs)))
            if h.alive:
                depot_of.remove(h)
                story.cancelled += 1
        if j % 5 == 0 and west:
            west.pop()
            story.delivered += 1
    west.meld(east)  # noon: the east depot closes
    while west:
        west.pop()
        story.delivered += 1
    routes.close()
    return story


def tell(story: Story) -> str:
    return (
        f"Brackenford, an invented town: vans routed over {story.junctions} junctions "
        f"(Dijkstra, {story.relaxed} decrease_keys);\n"
        f"{story.jobs} parcel jobs at two depots, {story.reprioritised} re-prioritised as deadlines "
        f"neared, {story.cancelled} cancelled,\nthe east depot melded into the west at noon, "
        f"{story.delivered} delivered."
    )
