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

Sources: J. W. J. Williams, "Algorithm 232: Heapsort", CACM 7 (1964); the
bottom-up sift as in Knuth, TAOCP vol. 3, ex. 5.2.3-18, and ``Lib/heapq.py``.
"""

from __future__ import annotations

from typing import Any, ClassVar, TypeVar

from heapkit._core import empty_error, nan_error, upward_error
from heapkit.kinds.dary.heap import DaryHeap
from heapkit.kinds.dary.slot import _Slot
from heapkit.protocol import Handle

__all__ = ["BinaryHeap"]

K = TypeVar("K")
V = TypeVar("V")

# The node class's __new__: object's when pure; a compiled HandleBase refuses object.__new__.
_new = _Slot.__new__


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

    def push(self, key: K, value: V) -> Handle[K, V]:
        """Insert an entry and return its handle.  O(log n) worst-case.

        >>> BinaryHeap().push(3, 'c').key
        3
        """
        if self._d != 2:
            return super().push(key, value)
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None else w(key, None)
        x = _new(_Slot)
        x._key = key
        x._k = k
        x.value = value
        x._tok = self._tok
        a = self._a
        j = t = len(a)
        # Compare first (find where x lands), then move.
        while t:
            p = (t - 1) >> 1
            if k < a[p]._k:
                t = p
            else:
                break
        a.append(x)
        while j != t:
            p = (j - 1) >> 1
            q = a[p]
            a[j] = q
            q._i = j
            j = p
        a[t] = x
        x._i = t
        self._n += 1
        self._ver += 1
        return x

    def pop(self) -> tuple[K, V]:
        """Remove and return a smallest ``(key, value)``.  O(log n) worst-case.

        >>> BinaryHeap([(4, 'd'), (1, 'a'), (3, 'c')]).pop()
        (1, 'a')
        """
        if self._d != 2:
            return super().pop()
        a = self._a
        m = len(a) - 1
        if m < 0:
            raise empty_error("pop")
        top = a[0]
        last = a.pop()
        if m:
            k = last._k
            # One pass, as heapq does: the smaller child moves up into the hole
            # down to a leaf, then last climbs back from there.  Moving while
            # comparing beats compare-then-move by 9% at n = 500, 3% at 1e5
            # (measured); a raising comparison is undone below.
            i = 0
            c = 1
            try:
                while c < m:
                    r = c + 1
                    if r < m and a[r]._k < a[c]._k:
                        c = r
                    q = a[c]
                    a[i] = q
                    q._i = i
                    i = c
                    c = c + c + 1
                while i:
                    p = (i - 1) >> 1
                    q = a[p]
                    if k < q._k:
                        a[i] = q
                        q._i = i
                        i = p
                    else:
                        break
            except BaseException:
                # Each entry above the hole came up from its child on the path.
                while i:
                    p = (i - 1) >> 1
                    q = a[p]
                    a[i] = q
                    q._i = i
                    i = p
                a[0] = top
                a.append(last)
                raise
            a[i] = last
            last._i = i
        self._n = m
        self._ver += 1
        top._tok = None
        return top._key, top.value

    def decrease_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry a key that is not larger.  O(log n) worst-case.

        >>> h = BinaryHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        x: Any = handle
        if self._d != 2:
            super().decrease_key(x, key)
            return
        # Preamble inline, not HeapBase._new_order: a call is ~50 ns, 5% of a pairing decrease_key (measured).
        if type(x) is not _Slot or x._tok is not self._tok:
            self._claim(x, "decrease_key")
        if key != key:
            raise nan_error("decrease_key", key)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        if x._k < k:
            raise upward_error(x, key)
        a = self._a
        j = t = x._i
        while t:
            p = (t - 1) >> 1
            if k < a[p]._k:
                t = p
            else:
                break
        x._key = key
        x._k = k
        while j != t:
            p = (j - 1) >> 1
            q = a[p]
            a[j] = q
            q._i = j
            j = p
        a[t] = x
        x._i = t
        self._ver += 1
