"""A team's own queue: the `heapq` entry-invalidation idiom from the Python docs,
wrapped in a class with its own method names.  `test_own_queue.py` checks it with
heapkit's testing kit.

    q = TicketQueue()
    t = q.add(5.0, "restock shelf 12")
    q.bump(t, 1.0)                      # decrease-key
    q.cancel(t)                         # delete
"""

from __future__ import annotations

import heapq
import itertools
from typing import Any

_GONE = object()


class Ticket:
    """What `add` returns: the live list entry ``[key, order, serial, value]``."""

    __slots__ = ("entry",)

    def __init__(self, entry: list[Any]) -> None:
        self.entry = entry

    @property
    def key(self) -> Any:
        return self.entry[0]

    @property
    def alive(self) -> bool:
        return self.entry[3] is not _GONE


class TicketQueue:
    """Smallest key first; ties in arrival order.  Entries are ``[key, order, serial,
    value]``: a unique serial keeps the comparison away from the values."""

    def __init__(self) -> None:
        self._heap: list[list[Any]] = []
        self._order = itertools.count()
        self._serial = itertools.count()
        self._size = 0

    def add(self, key: Any, value: Any) -> Ticket:
        entry = [key, next(self._order), next(self._serial), value]
        heapq.heappush(self._heap, entry)
        self._size += 1
        return Ticket(entry)

    def cancel(self, ticket: Ticket) -> tuple[Any, Any]:
        entry = ticket.entry
        if entry[3] is _GONE:
            raise ValueError("cancel: that ticket is no longer queued")
        key, value = entry[0], entry[3]
        entry[3] = _GONE
        self._size -= 1
        return key, value

    def bump(self, ticket: Ticket, key: Any) -> None:
        """Re-prioritise: retire the old entry, queue a fresh one (same arrival order)."""
        old = ticket.entry
        if old[3] is _GONE:
            raise ValueError("bump: that ticket is no longer queued")
        fresh = [key, old[1], next(self._serial), old[3]]
        old[3] = _GONE
        heapq.heappush(self._heap, fresh)
        ticket.entry = fresh

    def _drop_gone(self) -> None:
        while self._heap and self._heap[0][3] is _GONE:
            heapq.heappop(self._heap)

    def next_up(self) -> tuple[Any, Any]:
        self._drop_gone()
        if not self._heap:
            raise IndexError("next_up: nothing queued")
        return self._heap[0][0], self._heap[0][3]

    def take(self) -> tuple[Any, Any]:
        self._drop_gone()
        if not self._heap:
            raise IndexError("take: nothing queued")
        entry = heapq.heappop(self._heap)
        key, value = entry[0], entry[3]
        entry[3] = _GONE
        self._size -= 1
        return key, value

    def __len__(self) -> int:
        return self._size
