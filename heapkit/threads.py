"""``locked(heap)``: a thread-safe wrapper of the same protocol.

A bare heap is not thread-safe: two threads that push at once can corrupt it.
The wrapper takes one lock around every operation (O(1) extra per call).
Iterating returns a snapshot of the handles taken under the lock.
"""

from __future__ import annotations

import threading
from collections.abc import Iterable, Iterator
from typing import Any, Generic, TypeVar

from heapkit.protocol import Handle, Heap

__all__ = ["Locked", "locked"]

K = TypeVar("K")
V = TypeVar("V")


class Locked(Generic[K, V]):
    """A heap behind one re-entrant lock; ``inner`` is the heap itself.

    >>> from heapkit import PairingHeap
    >>> q = locked(PairingHeap())
    >>> h = q.push(2, 'b'); q.decrease_key(h, 1); q.pop()
    (1, 'b')
    """

    __slots__ = ("inner", "lock")

    def __init__(self, inner: Heap[K, V]) -> None:
        self.inner = inner
        self.lock = threading.RLock()

    def push(self, key: K, value: V) -> Handle[K, V]:
        """Insert; the kind's bound plus one lock."""
        with self.lock:
            return self.inner.push(key, value)

    def extend(self, pairs: Iterable[tuple[K, V]]) -> list[Handle[K, V]]:
        """Insert many, all or nothing; the pairs are read before the lock is taken."""
        pairs = list(pairs)
        with self.lock:
            return self.inner.extend(pairs)

    def peek(self) -> Handle[K, V]:
        """The handle of a smallest entry."""
        with self.lock:
            return self.inner.peek()

    def pop(self) -> tuple[K, V]:
        """Remove and return a smallest entry."""
        with self.lock:
            return self.inner.pop()

    def decrease_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry a key that is not larger."""
        with self.lock:
            self.inner.decrease_key(handle, key)

    def change_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry any key."""
        with self.lock:
            self.inner.change_key(handle, key)

    def remove(self, handle: Handle[K, V]) -> tuple[K, V]:
        """Delete the entry and return it."""
        with self.lock:
            return self.inner.remove(handle)

    def meld(self, other: Heap[K, V]) -> None:
        """Move every entry of ``other`` (a bare heap or another ``Locked``) in here.

        Both locks are taken, in a fixed order, so two threads melding two
        wrappers into each other cannot deadlock.
        """
        if isinstance(other, Locked):
            first, second = sorted((self, other), key=id)
            with first.lock, second.lock:
                self.inner.meld(other.inner)
        else:
            with self.lock:
                self.inner.meld(other)

    def clear(self) -> None:
        """Remove everything."""
        with self.lock:
            self.inner.clear()

    def __len__(self) -> int:
        with self.lock:
            return len(self.inner)

    def __bool__(self) -> bool:
        with self.lock:
            return bool(self.inner)

    def __iter__(self) -> Iterator[Handle[K, V]]:
        with self.lock:
            return iter(list(self.inner))

    def __contains__(self, handle: object) -> bool:
        with self.lock:
            return handle in self.inner

    def __repr__(self) -> str:
        with self.lock:
            return f"locked({self.inner!r})"


def locked(heap: Heap[K, V]) -> Locked[K, V]:
    """Wrap ``heap`` so that every operation holds one lock.  O(1).

    >>> from heapkit import BinaryHeap
    >>> len(locked(BinaryHeap([(1, 'a')])))
    1
    """
    return Locked(heap)


def unwrap(heap: Any) -> Any:
    """The bare heap inside a ``Locked`` (or the object itself)."""
    return heap.inner if isinstance(heap, Locked) else heap
