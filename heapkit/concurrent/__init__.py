"""Concurrent wrappers: one heap, one lock, whichever way it is used.

The modules, one idea each:

* :mod:`~heapkit.concurrent.guard`: the heap's one lock (``guard_of``), shared by
  every wrapper of the heap, and the handle operations every wrapper shares;
* :mod:`~heapkit.concurrent.locked`: ``locked(heap)``, every call under the lock;
* :mod:`~heapkit.concurrent.blocking`: ``blocking(heap, *, capacity, due, clock)``,
  threads whose ``pop`` waits, with delayed release for timer queues;
* :mod:`~heapkit.concurrent.asynchronous`: ``asynchronous(heap)``, ``await q.pop()``;
* :mod:`~heapkit.concurrent.clock`: the system clock and a manual clock for tests.
"""

from __future__ import annotations

from heapkit.concurrent.asynchronous import Asynchronous, asynchronous
from heapkit.concurrent.blocking import Blocking, blocking
from heapkit.concurrent.clock import SYSTEM, Clock, ManualClock, SystemClock
from heapkit.concurrent.guard import Wrapper, guard_of
from heapkit.concurrent.locked import Locked, locked, unwrap

__all__ = [
    "SYSTEM",
    "Asynchronous",
    "Blocking",
    "Clock",
    "Locked",
    "ManualClock",
    "SystemClock",
    "Wrapper",
    "asynchronous",
    "blocking",
    "guard_of",
    "locked",
    "unwrap",
]
