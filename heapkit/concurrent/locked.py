"""``locked(heap)``: a thread-safe wrapper of the same protocol.

A bare heap is not thread-safe: two threads that push at once can corrupt it.
The wrapper takes the heap's one lock around every operation (O(1) extra per
call); every wrapper of the same heap (``locked``, ``blocking``,
``asynchronous``) holds that same lock.  Iterating returns a snapshot of the
handles taken under the lock.
"""

from __future__ import annotations

from typing import Any, TypeVar

from heapkit.concurrent.guard import Wrapper
from heapkit.protocol import Heap

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

    def pop(self) -> tuple[K, V]:
        """Remove and return a smallest entry (``EmptyHeapError`` if none; never waits).

        >>> from heapkit import BinaryHeap
        >>> locked(BinaryHeap([(2, 'b'), (1, 'a')])).pop()
        (1, 'a')
        """
        return self.pop_now()


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
