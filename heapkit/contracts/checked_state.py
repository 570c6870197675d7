"""Checked mode's per-heap state (kept in ``heap._ext["checked"]``) and its sentinel.

:mod:`heapkit.contracts.mode` drives it; this module only holds what a heap remembers
between operations: the counters that decide when a check is due, the history of recent
operations and the labels that name handles in it.
"""

from __future__ import annotations

from collections import deque
from typing import Any

from heapkit.contracts.history import Entry

__all__ = ["NOTHING", "State"]

#: ``touched`` before the operation has said anything.
NOTHING: Any = object()


class State:
    """Checked mode's per-heap state, kept in ``heap._ext["checked"]``."""

    __slots__ = (
        "base",
        "busy",
        "count",
        "due",
        "every",
        "force",
        "full",
        "full_every",
        "history",
        "labels",
        "local",
        "next_label",
        "record",
        "replaced",
        "since_full",
        "size_at_full",
        "subject",
        "touched",
        "ver",
        "ver_before",
    )

    def __init__(self, replaced: type, every: int, history: int, full_every: int | None) -> None:
        self.replaced = replaced
        self.local = callable(getattr(replaced, "_touched", None)) and callable(
            getattr(replaced, "_survey_local", None)
        )
        self.every = every
        self.full_every = full_every
        self.history: deque[Entry] = deque(maxlen=history)
        self.base: tuple[tuple[Any, int], ...] = ()
        self.record: list[Entry] = []
        self.labels: dict[int, tuple[Any, int]] = {}
        self.next_label = 0
        self.count = 0
        self.since_full = 0
        self.size_at_full = 0
        self.due = False
        self.busy: str | None = None
        self.full = False
        self.force = False
        self.touched: Any = NOTHING
        self.subject: Any = None
        self.ver = -1
        self.ver_before = -1

    def snapshot(self, heap: Any) -> None:
        """Start a new record from the heap's entries (after a passing full check).  O(n)."""
        self.size_at_full = heap._n
        label = self.label
        self.base = tuple((x.key, label(x)) for x in heap._handles())
        self.record = []

    def label(self, h: Any) -> int:
        """The small number naming handle ``h`` in the history."""
        got = self.labels.get(id(h))
        if got is not None and got[0] is h:
            return got[1]
        lab = self.next_label
        self.next_label += 1
        self.labels[id(h)] = (h, lab)
        return lab
