"""A job dispatcher for the invented Brackenford parcel depots.

Jobs carry a priority (smaller runs first).  Every tick the dispatcher runs the most
urgent job; waiting jobs *age*: each tick a waiting job's priority drops by one
(decrease_key), so nothing starves.  Customers cancel jobs (remove); at noon the east
depot closes and its queue is melded into the west depot's (meld).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import heapkit


@dataclass(frozen=True)
class Event:
    """At ``tick``: ``add`` a job (name, priority, depot), ``cancel`` one, or ``merge`` depots."""

    tick: int
    what: str
    job: str = ""
    priority: int = 0
    depot: str = "west"


def dispatch(events: list[Event], ticks: int, kind: str = heapkit.DEFAULT) -> list[tuple[int, str]]:
    """Run the depots for ``ticks`` ticks; return (tick, job) in the order jobs ran (west depot)."""
    depots: dict[str, Any] = {"west": heapkit.new(kind, stable=True), "east": heapkit.new(kind, stable=True)}
    handles: dict[str, Any] = {}
    ran: list[tuple[int, str]] = []
    by_tick: dict[int, list[Event]] = {}
    for e in events:
        by_tick.setdefault(e.tick, []).append(e)
    for t in range(ticks):
        for e in by_tick.get(t, []):
            if e.what == "add":
                handles[e.job] = depots[e.depot].push(e.priority, e.job)
            elif e.what == "cancel" and handles.get(e.job) is not None and handles[e.job].alive:
                q = depots["west"] if handles[e.job] in depots["west"] else depots["east"]
                q.remove(handles[e.job])
            elif e.what == "merge":
                depots["west"].meld(depots["east"])
        west = depots["west"]
        if west:
            ran.append((t, west.pop()[1]))
        for q in depots.values():
            for h in list(q):
                q.decrease_key(h, h.key - 1)  # aging
    return ran


def brute_force(events: list[Event], ticks: int) -> list[tuple[int, str]]:
    """The same rules with plain lists: scan for the smallest (priority, arrival)."""
    queues: dict[str, list[list[Any]]] = {"west": [], "east": []}
    arrival = 0
    ran: list[tuple[int, str]] = []
    for t in range(ticks):
        for e in [e for e in events if e.tick == t]:
            if e.what == "add":
                queues[e.depot].append([e.priority, arrival, e.job])
                arrival += 1
            elif e.what == "cancel":
                for q in queues.values():
                    q[:] = [j for j in q if j[2] != e.job]
            elif e.what == "merge":
                queues["west"].extend(queues["east"])
                queues["east"] = []
        west = queues["west"]
        if west:
            best = min(west, key=lambda j: (j[0], j[1]))
            west.remove(best)
            ran.append((t, best[2]))
        for q in queues.values():
            for j in q:
                j[0] -= 1
    return ran


def demo_events() -> list[Event]:
    return [
        Event(0, "add", "fridge to Mill Lane", 5),
        Event(0, "add", "letters to Quay Row", 9),
        Event(1, "add", "piano to Orchard Rise", 2, "east"),
        Event(1, "add", "medicine to Well Street", 0),
        Event(2, "cancel", "letters to Quay Row"),
        Event(2, "add", "books to Tannery Yard", 7, "east"),
        Event(3, "merge", ""),
        Event(3, "add", "bicycle to Ferry Steps", 4),
    ]


def main() -> None:
    for tick, job in dispatch(demo_events(), 8):
        print(f"tick {tick}: {job}")


if __name__ == "__main__":
    main()
