"""Ordering objects of stable heaps: push order that survives meld, copy and pickle.

Push order numbers come from one count per process, shared by every stable heap
so that order survives meld.  A heap loaded from a pickle keeps its entries'
numbers (made by the process that pushed them) and moves the count past them
(:func:`seq_after`), so an entry pushed after loading comes after every loaded
entry of equal key.  Entries of heaps pickled by different processes and then
melded order among themselves by those numbers: consistently, not by wall clock.
"""

from __future__ import annotations

import itertools
import threading
from typing import Any

#: Push order within the process, shared by every stable heap so that order
#: survives meld.  ``next()`` on a count is atomic under the GIL.
_SEQ = itertools.count()
_SEQ_LOCK = threading.Lock()

#: Wrapper types that carry an ``inner`` ordering object (the auditor adds its own).
WRAPPERS: set[type] = set()


class Stable:
    """Ordering object of a stable heap: ``(key, push order)`` compared with one ``<``.

    If ``a`` was pushed first, ``a`` comes first unless ``b.key < a.key``;
    otherwise ``b`` comes first unless ``a.key < b.key``.  Never equal to
    anything, so a tuple holding it compares no further.
    """

    __slots__ = ("key", "seq")

    def __init__(self, key: Any, seq: int) -> None:
        self.key = key
        self.seq = seq

    def __lt__(self, other: Stable) -> bool:
        if self.seq < other.seq:
            return not other.key < self.key
        return bool(self.key < other.key)

    def __eq__(self, other: object) -> bool:
        return False

    __hash__ = None  # type: ignore[assignment]

    def __repr__(self) -> str:
        return f"{self.key!r}#{self.seq}"


def stable_wrap(key: Any, old: Any) -> Stable:
    """Make the :class:`Stable` ordering object of ``key`` (keeping ``old``'s push order)."""
    seq = None if old is None else seq_of(old)
    return Stable(key, next(_SEQ) if seq is None else seq)


def seq_after(top: int) -> None:
    """Make every later push order number exceed ``top`` (entries loaded from a pickle
    keep theirs, which may come from another process's count)."""
    global _SEQ
    with _SEQ_LOCK:
        if next(_SEQ) <= top:
            _SEQ = itertools.count(top + 1)


def seq_of(o: Any) -> int | None:
    """The push order inside an ordering object, or None where it has none."""
    while True:
        t = type(o)
        if t is Stable:
            return int(o.seq)
        if t not in WRAPPERS:
            return None
        o = o.inner
