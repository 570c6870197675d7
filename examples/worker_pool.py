"""A render farm for the invented Ashgrove animation studio: worker threads and a
job queue whose waiting jobs are re-prioritised and cancelled.

Artists submit render jobs (priority: smaller renders first).  While the jobs
wait, the director bumps some shots (``change_key``) and artists withdraw others
(``remove``, through the handle ``push`` gave them).  Worker threads take the next
job with ``q.pop()``, which waits while the queue is empty; ``q.close()`` ends the
shift: the workers render what is still queued, then stop.  A bump or a
withdrawal that comes after a worker took the job raises ``InvalidHandleError``:
the job is already rendering.

Run it: ``python examples/worker_pool.py``.
"""

from __future__ import annotations

import random
import threading
from dataclasses import dataclass, field
from typing import Any

import heapkit


@dataclass(frozen=True)
class Job:
    """A shot to render: its priority, the director's new priority (or None), withdrawn?"""

    name: str
    priority: int
    bump: int | None = None
    withdraw: bool = False


@dataclass
class Shift:
    """What happened: each worker's rendered (priority, shot) in order, the priorities the
    director managed to set, and the shots withdrawn before a worker took them."""

    rendered: list[list[tuple[int, str]]]
    final: dict[str, int] = field(default_factory=dict)
    withdrawn: set[str] = field(default_factory=set)


def studio_day(n: int, seed: int = 11) -> list[Job]:
    """``n`` invented shots: about 1 in 4 bumped, 1 in 8 withdrawn."""
    rng = random.Random(seed)
    jobs = []
    for i in range(n):
        r = rng.random()
        jobs.append(
            Job(
                f"shot-{i:03d}",
                rng.randrange(1, 50),
                bump=rng.randrange(0, 50) if r < 0.25 else None,
                withdraw=0.25 <= r < 0.375,
            )
        )
    return jobs


def run_shift(jobs: list[Job], workers: int = 3, *, hold: bool = False, kind: str = heapkit.DEFAULT) -> Shift:
    """Render ``jobs`` on ``workers`` threads.  ``hold=True`` keeps the workers at the door
    until every bump and withdrawal is done (a reproducible order)."""
    q: Any = heapkit.blocking(heapkit.new(kind, stable=True))  # equal priorities: first submitted first
    shift = Shift([[] for _ in range(workers)])
    door = threading.Event()

    def worker(w: int) -> None:
        door.wait()
        while True:
            try:
                shift.rendered[w].append(q.pop())
            except heapkit.ClosedError:  # closed and nothing left: the shift is over
                return

    threads = [threading.Thread(target=worker, args=(w,), daemon=True) for w in range(workers)]
    for t in threads:
        t.start()
    if not hold:
        door.set()
    handles = {}
    for job in jobs:
        handles[job.name] = q.push(job.priority, job.name)
        shift.final[job.name] = job.priority
    for job in jobs:  # while the jobs wait
        try:
            if job.withdraw:
                q.remove(handles[job.name])
                shift.withdrawn.add(job.name)
            elif job.bump is not None:
                q.change_key(handles[job.name], job.bump)
                shift.final[job.name] = job.bump
        except heapkit.InvalidHandleError:
            pass  # a worker took it first: it renders at the priority it had
    door.set()
    q.close()
    for t in threads:
        t.join(60)
        if t.is_alive():
            raise RuntimeError("run_shift: a worker did not finish")
    heapkit.check(q)
    return shift


def sequential(jobs: list[Job]) -> list[tuple[int, str]]:
    """The same day with no threads and no heap: sort the shots that stay by
    (final priority, submission order)."""
    kept = [(j.priority if j.bump is None else j.bump, i, j.name) for i, j in enumerate(jobs) if not j.withdraw]
    return [(p, name) for p, _, name in sorted(kept)]


if __name__ == "__main__":
    day = studio_day(40)
    shift = run_shift(day, workers=3)
    for w, done in enumerate(shift.rendered):
        print(f"worker {w}: " + ", ".join(f"{name}@{p}" for p, name in done))
    print(f"withdrawn in time: {len(shift.withdrawn)}")
