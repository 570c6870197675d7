"""``locked(heap)``: a thread-safe wrapper of the same protocol.

A bare heap is not thread-safe: two threads that push at once can corrupt it.
The wrapper takes the heap's one lock around every operation (O(1) extra per
call); every wrapper of the same heap (``locked``, ``blocking``,
``asynchronous``) holds that same lock.  Iterating returns a snapshot of the
handles taken under the lock.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any, TypeVar

from heapkit.concurrent.guard import Wrapper, pairs_list
from heapkit.protocol import Handle, Heap

__all__ = ["Locked", "locked", "unwrap"]

K = TypeVar("K")
V = TypeVar("V")


class Locked(Wrapper[K, V]):
    """A heap behind its one re-entrant lock; ``inner`` is the heap itself.

    >>> from heapkit import PairingHeap
    >>> q = locked(PairingHeap())
    >>> h = q.push(2, 'b'); q.decrease_key(h, 1); q.pop()
    (1, 'b')
    """

    __slots__ = ()

    def __init__(self, inner: Heap[K, V]) -> None:
        super().__init__(inner, "locked")

    def push(self, key: K, value: V) -> Handle[K, V]:
        """Insert; the kind's bound plus one lock.

        >>> from heapkit import BinaryHeap
        >>> locked(BinaryHeap()).push(1, 'a').key
        1
        """
        g = self._guard
        with g.lock:
            h = self.inner.push(key, value)
            if g.poppers or g.watchers:
                g.grew(1)
            return h

    def extend(self, pairs: Iterable[tuple[K, V]]) -> list[Handle[K, V]]:
        """Insert many, all or nothing; the pairs are read before the lock is taken.

        >>> from heapkit import BinaryHeap
        >>> len(locked(BinaryHeap()).extend([(2, 'b'), (1, 'a')]))
        2
        """
        pairs = pairs_list(pairs)
        with self._guard.lock:
            return self._extend_under_lock(pairs)

    def pop(self) -> tuple[K, V]:
        """Remove and return a smallest entry (``EmptyHeapError`` if none; never waits).

        >>> from heapkit import BinaryHeap
        >>> locked(BinaryHeap([(2, 'b'), (1, 'a')])).pop()
        (1, 'a')
        """
        g = self._guard
        with g.lock:
            out = self.inner.pop()
            if g.pushers:
                g.shrank()
            return out


def locked(heap: Heap[K, V]) -> Locked[K, V]:
    """Wrap ``heap`` so that every operation holds the heap's one lock.  O(1).

    Two calls on the same heap give wrappers that share that lock.

    >>> from heapkit import BinaryHeap
    >>> h = BinaryHeap([(1, 'a')])
    >>> len(locked(h)), locked(h).lock is locked(h).lock
    (1, True)
    """
    return Locked(heap)


def unwrap(heap: Any) -> Any:
    """The bare heap inside any concurrent wrapper (or the object itself).  O(1).

    >>> from heapkit import BinaryHeap
    >>> h = BinaryHeap(); unwrap(locked(h)) is h
    True
    """
    return heap.inner if isinstance(heap, Wrapper) else heap
