"""Staging checks for a ticket dispatcher: the help desk of Quillmoor, an invented mill town.

Tickets come in at two desks, the mill floor and the company store.  A ticket's key is
``(severity, minute opened, ticket number)``: smaller runs first.  Tickets get escalated
(``decrease_key``), withdrawn (``remove``), each desk serves its most urgent ticket now
and then, and at 18:00 the store desk closes and hands its open tickets to the mill
desk (``meld``).

What to switch on in staging (production runs the same code with all of it off):

1. The whole process, no code change: start the staging service with
   ``HEAPKIT_DEBUG=check:100,audit`` in its environment (read once, when heapkit is
   imported).  Every heap it makes then comes checked (every 100th operation) and audited
   for its whole life; each heap's ledger is reported when the heap goes away, to the
   function given to ``heapkit.audit.configure(report=...)`` (default: the summary is
   logged on the ``heapkit.audit`` logger; ``report=heapkit.audit.Collector(at_exit=True)``
   gives one summary per kind instead of one per heap).  What is on is said once on the
   ``heapkit`` logger; ``heapkit.set_debug("check:100,audit")`` does the same from code.
   See :func:`env_staging_shift`.
2. One queue, in code: ``heapkit.checked(q, every=10)`` verifies what every 10th
   operation touched (a broken rule raises ``InvariantError`` with the last operations);
   ``with heapkit.audit(q, keep="totals") as ledger:`` keeps flat memory on long runs, then
   ``ledger.summary()``, ``ledger.assert_bounds()`` and ``ledger.worst(3)`` (the single
   costliest operations, which amortized bounds hide).  See :func:`staging_shift`.
3. Keep the evidence: ``heapkit.trace.record(q, path)`` writes each operation as a line of
   JSON, so a bad day can be replayed on every kind later::

       python -m heapkit replay quillmoor.jsonl --check --audit

Run ``python examples/staging_checks.py`` for (2) and (3), or
``HEAPKIT_DEBUG=check:100,audit python examples/staging_checks.py --env`` for (1).
"""

from __future__ import annotations

import gc
import json
import os
import random
import sys
import tempfile
from typing import Any

import heapkit
from heapkit import trace
from heapkit.ledger import Ledger

Key = tuple[int, int, int]  # (severity, minute opened, ticket number)
Event = tuple[Any, ...]

CLOSING = 18 * 60  # the store desk hands over at 18:00


def shift(tickets: int = 600, seed: int = 7) -> list[Event]:
    """An invented day at the desks, minute by minute, as a list of events.

    ``("open", desk, number, severity, minute)``, ``("escalate", number)``,
    ``("withdraw", number)``, ``("serve", desk)``, ``("hand_over",)``.
    """
    rng = random.Random(seed)
    events: list[Event] = []
    handed = False
    for no in range(tickets):
        minute = 6 * 60 + no * 14 * 60 // tickets  # 06:00 to 20:00
        if not handed and minute >= CLOSING:
            events.append(("hand_over",))
            handed = True
        desk = "mill" if handed or rng.random() < 0.55 else "store"
        events.append(("open", desk, no, rng.randint(1, 5), minute))
        if no % 4 == 1:
            events.append(("escalate", rng.randrange(no + 1)))
        if no % 11 == 5:
            events.append(("withdraw", rng.randrange(no + 1)))
        if no % 3 == 0:
            events.append(("serve", "mill"))
        if no % 5 == 0 and not handed:
            events.append(("serve", "store"))
    events.extend([("serve", "mill")] * tickets)  # the evening: the mill desk clears its list
    return events


def serve(events: list[Event], desks: dict[str, Any]) -> list[Key]:
    """Run the events on the two desks' queues; return the keys in the order tickets were served."""
    desks = dict(desks)
    handles: dict[int, Any] = {}
    served: list[Key] = []
    for ev in events:
        what = ev[0]
        if what == "open":
            _, desk, no, severity, minute = ev
            handles[no] = desks[desk].push((severity, minute, no), f"ticket {no}")
        elif what in ("escalate", "withdraw"):
            h = handles.get(ev[1])
            if h is None or not h.alive:
                continue
            desk = "mill" if h in desks["mill"] else "store"
            severity, minute, no = h.key
            if what == "withdraw":
                desks[desk].remove(h)
            elif severity > 0:
                desks[desk].decrease_key(h, (severity - 1, minute, no))
        elif what == "serve":
            if desks[ev[1]]:
                served.append(desks[ev[1]].pop()[0])
        else:  # hand_over: the store's open tickets move to the mill desk
            desks["mill"].meld(desks["store"])
            desks["store"] = desks["mill"]
    return served


def staging_shift(
    events: list[Event], kind: str = heapkit.DEFAULT, *, every: int = 10, trace_path: str | None = None
) -> tuple[list[Key], Ledger]:
    """The day in checked mode under the audit (and recorded, if ``trace_path``).

    Returns the served keys and the mill desk's ledger; raises ``InvariantError`` if a
    rule breaks and ``BoundExceededError`` if an operation exceeds its kind's bound.
    """
    # Checked mode first, then the audit: the audit counts only the operations' own
    # comparisons, so the order of the two does not change its figures.
    mill = heapkit.checked(heapkit.new(kind), every=every)
    store = heapkit.checked(heapkit.new(kind), every=every)
    with heapkit.audit(mill, keep="totals") as ledger, heapkit.audit(store, keep="totals") as store_ledger:
        desks: dict[str, Any] = {"mill": mill, "store": store}
        recorder = None
        if trace_path is not None:
            recorder = trace.record(mill, trace_path)
            desks = {"mill": recorder, "store": recorder.sibling(store)}
        try:
            served = serve(events, desks)
        finally:
            if recorder is not None:
                recorder.close()
    store_ledger.assert_bounds()
    ledger.assert_bounds()
    return served, ledger


def env_staging_shift(events: list[Event]) -> tuple[list[Key], list[Ledger]]:
    """The day on plain ``heapkit.new()`` queues: ``HEAPKIT_DEBUG`` decides what is checked.

    Returns the served keys and the ledgers reported when the queues went away
    (none when ``HEAPKIT_DEBUG`` has no ``audit``).
    """
    reports: list[Ledger] = []
    heapkit.audit.configure(report=reports.append, keep="totals")  # e.g. send to your monitoring
    try:
        served = serve(events, {"mill": heapkit.new(), "store": heapkit.new()})
        gc.collect()  # the queues are gone: their reports arrive
    finally:
        heapkit.audit.configure(report=None)
    return served, reports


def main(argv: list[str]) -> None:
    events = shift()
    if "--env" in argv:
        served, reports = env_staging_shift(events)
        print(
            json.dumps(
                {
                    "served": served,
                    "ledgers": len(reports),
                    "over_bound": sum(led.violation_count for led in reports),
                    "HEAPKIT_DEBUG": os.environ.get("HEAPKIT_DEBUG", ""),
                }
            )
        )
        return
    path = os.path.join(tempfile.mkdtemp(), "quillmoor.jsonl")
    served, ledger = staging_shift(events, trace_path=path)
    print(f"Quillmoor help desk: {len(served)} tickets served, every check passed.\n")
    print(ledger.summary())
    print("\nthe three costliest single operations:")
    for r in ledger.worst(3):
        print(f"  #{r.step} {r.op} at n={r.n}: {r.actual} {ledger.unit}")
    print(f"\ntrace kept at {path}; compare the kinds on it with\n  python -m heapkit replay {path} --check --audit")


if __name__ == "__main__":
    main(sys.argv[1:])
