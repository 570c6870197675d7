"""Binary heap: the d-ary array heap of :mod:`heapkit.kinds.dary` with ``d = 2``,
its hot paths written for arity 2.

Invariants
----------
* heap order: ``not (a[i].k < a[(i - 1) >> 1].k)`` for every ``0 < i < n``;
* index: ``a[i].i == i``; size: ``len(a) == len(heap)``; ownership as for every kind.

Bounds (worst-case)
-------------------
push, decrease_key: at most ``floor(log2 n)`` comparisons.  pop: bottom-up, about
``log2 n`` comparisons (one per level down, then usually one or two back up),
the same count as CPython's ``heapq`` for the same keys.  Everything else is
:class:`~heapkit.kinds.dary.DaryHeap`'s.  push and decrease_key compare first,
then move; pop moves while it compares (as ``heapq`` does) and, if a comparison
raises, moves every entry back before the exception propagates.

The arity-2 paths are written in the shared core, ``heapkit/kinds/dary/core.py``
(compiled in the compiled build), which takes them whenever the arity is 2; this class
only names the kind and its bounds.

Sources: J. W. J. Williams, "Algorithm 232: Heapsort", CACM 7 (1964); the
bottom-up sift as in Knuth, TAOCP vol. 3, ex. 5.2.3-18, and ``Lib/heapq.py``.
"""

from __future__ import annotations

from typing import ClassVar, TypeVar

from heapkit.kinds.dary.heap import DaryHeap

__all__ = ["BinaryHeap"]

K = TypeVar("K")
V = TypeVar("V")


class BinaryHeap(DaryHeap[K, V]):
    """The binary (arity 2) array heap: ``heapkit.new("binary")``.

    ``push``, ``pop`` and ``decrease_key`` use shifts for the parent and child
    positions and compare two children with one ``<`` (no inner loop); every
    other operation is the d-ary heap's.

    >>> BinaryHeap([(2, 'b'), (1, 'a')]).pop()
    (1, 'a')
    """

    __slots__ = ()
    KIND: ClassVar[str] = "binary"
    BOUNDS: ClassVar[str] = "worst-case: push, decrease_key, pop, remove, change_key O(log n); peek O(1)"
    DEFAULT_ARITY: ClassVar[int] = 2
