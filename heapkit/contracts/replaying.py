"""``replay``: run an operation history on a fresh heap in checked mode.

It sits apart from :mod:`heapkit.contracts.history` (the record and its error)
so that the history never imports checked mode: ``mode`` imports ``history``,
and this module imports both.
"""

from __future__ import annotations

from typing import Any

from heapkit.contracts.history import Entry, Target, run
from heapkit.contracts.mode import checked

__all__ = ["replay"]


def replay(history: list[Entry], target: Target, *, start: tuple[tuple[Any, int], ...] = (), every: int = 1) -> Any:
    """Run ``history`` on a fresh heap from ``target``, checked; return the heap.

    ``target``: a name in ``heapkit.KINDS``, a heap class or a factory;
    ``start``: ``(key, label)`` entries to push before the history.  The
    heap is checked in full after every ``every``-th operation, so the first
    broken rule raises :class:`InvariantError` (with its own history).
    O(length of history * n).

    >>> hist = [("push", 3, 0), ("push", 1, 1), ("decrease_key", 0, 3, 0), ("pop", 0, 0)]
    >>> h = replay(hist, "binary")
    >>> [(x.key, x.value) for x in h]
    [(1, 1)]
    """
    return run(history, target, checked, start=start, every=every)
