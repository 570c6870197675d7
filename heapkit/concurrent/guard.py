"""One lock per heap, shared by every wrapper of that heap, and what the wrappers share.

``guard_of(heap)`` returns the heap's :class:`Guard`, made on first use and kept
while the heap lives (a weak reference: the registry never keeps a heap alive).
So ``locked(h)``, ``blocking(h)`` and ``asynchronous(h)`` of one heap all hold the
same re-entrant lock, and a push through any of them wakes a pop waiting in any other.

The guard also counts who waits: threads in a pop (``poppers``; ``timers`` of
them wait for a due time), threads in a push waiting for room (``pushers``), and
the asyncio wrappers with waiters (``watchers``).  After a change, a wrapper calls
``grew``, ``rekeyed`` or ``shrank``, which notify only when someone waits.

Lock order: ``meld`` of two guarded heaps takes both locks in the order of
``id(guard)``, so two threads melding in opposite directions cannot deadlock.
A key whose ``<`` takes a lock of the caller's can deadlock against a thread that
holds that lock and waits for this heap's; keys should not take locks.
"""

from __future__ import annotations

import contextlib
import threading
import weakref
from collections.abc import Callable, Iterable, Iterator
from typing import Any, Generic, TypeVar

from heapkit.errors import ClosedError
from heapkit.protocol import Handle, Heap

__all__ = ["Guard", "Wrapper", "closed_error", "guard_of"]

K = TypeVar("K")
V = TypeVar("V")


class Guard:
    """The lock of one heap, its two conditions and the counts of who waits on them."""

    __slots__ = ("closed", "lock", "poppers", "pushers", "ready", "room", "timers", "watchers")

    def __init__(self) -> None:
        self.lock = threading.RLock()
        self.ready = threading.Condition(self.lock)  # an entry may be there for a popper
        self.room = threading.Condition(self.lock)  # a pusher may find room
        self.poppers = 0
        self.timers = 0
        self.pushers = 0
        self.watchers: list[Callable[[], None]] = []
        self.closed = False

    # The three calls below: the lock is held, and the heap changed just now.
    def grew(self, k: int) -> None:
        """``k`` entries came in: wake ``k`` poppers (all if one waits for a due time).  O(waiters).

        >>> g = Guard()
        >>> with g.lock: g.grew(1)       # nobody waits: nothing to do
        """
        if self.poppers:
            if self.timers:
                self.ready.notify_all()
            else:
                self.ready.notify(k)
        if self.watchers:
            for w in tuple(self.watchers):
                w()

    def rekeyed(self) -> None:
        """A key changed: a popper waiting for a due time must look again.  O(waiters).

        >>> g = Guard()
        >>> with g.lock: g.rekeyed()
        """
        if self.timers:
            self.ready.notify_all()
        for w in tuple(self.watchers):
            w()

    def shrank(self) -> None:
        """Entries went out: wake the pushers waiting for room.  O(waiters).

        >>> g = Guard()
        >>> with g.lock: g.shrank()
        """
        if self.pushers:
            self.room.notify_all()

    def close(self) -> None:
        """Mark the heap's queue closed and wake everyone who waits.  O(waiters).

        >>> g = Guard()
        >>> with g.lock: g.close()
        >>> g.closed
        True
        """
        self.closed = True
        self.ready.notify_all()
        self.room.notify_all()
        for w in tuple(self.watchers):
            w()


_GUARDS: dict[int, tuple[weakref.ref[Any], Guard]] = {}
_REGISTRY = threading.RLock()  # re-entrant: a weakref callback may run while it is held


def _forget(key: int, ref: weakref.ref[Any]) -> None:
    with _REGISTRY:
        entry = _GUARDS.get(key)
        if entry is not None and entry[0] is ref:
            del _GUARDS[key]


def guard_of(heap: Any, op: str = "locked") -> Guard:
    """The one :class:`Guard` of ``heap`` (made on first use).  O(1).

    Raises ``TypeError`` for an object that cannot be weakly referenced (a class
    with ``__slots__`` but no ``__weakref__``): its lock could not be found again.

    >>> from heapkit import PairingHeap
    >>> h = PairingHeap()
    >>> guard_of(h) is guard_of(h)
    True
    """
    key = id(heap)
    with _REGISTRY:
        entry = _GUARDS.get(key)
        if entry is not None and entry[0]() is heap:
            return entry[1]
        try:
            ref = weakref.ref(heap, lambda r: _forget(key, r))
        except TypeError:
            raise TypeError(
                f"{op}: {type(heap).__name__} objects cannot be weakly referenced, so every wrapper "
                f"of {heap!r} could not share one lock; add '__weakref__' to its __slots__"
            ) from None
        guard = Guard()
        _GUARDS[key] = (ref, guard)
        return guard


def closed_error(op: str) -> ClosedError:
    return ClosedError(f"{op}: the queue is closed")


def pairs_list(pairs: Iterable[tuple[K, V]]) -> list[tuple[K, V]]:
    """The pairs as a list, read before any lock is taken (a generator may be slow)."""
    return pairs if isinstance(pairs, list) else list(pairs)


class Wrapper(Generic[K, V]):
    """What every concurrent wrapper shares: the inner heap, its guard, the protocol's
    handle operations under the lock, and ``held()`` (the lock and the inner heap)."""

    __slots__ = ("_guard", "inner")

    def __init__(self, heap: Heap[K, V], op: str) -> None:
        if isinstance(heap, Wrapper):
            heap = heap.inner  # a wrapper of a wrapper shares the heap's one lock
        self.inner: Heap[K, V] = heap
        self._guard = guard_of(heap, op)

    @property
    def lock(self) -> threading.RLock:
        """The heap's one re-entrant lock (the same object for every wrapper of the heap).  O(1).

        >>> from heapkit import BinaryHeap, blocking, locked
        >>> h = BinaryHeap(); locked(h).lock is blocking(h).lock
        True
        """
        return self._guard.lock

    @contextlib.contextmanager
    def held(self) -> Iterator[Heap[K, V]]:
        """Hold the heap's lock and give the inner heap, for compound steps.  O(1).

        ``heapkit.check`` of a wrapper checks the inner heap this way, once.

        >>> from heapkit import BinaryHeap, locked
        >>> q = locked(BinaryHeap([(1, 'a')]))
        >>> with q.held() as heap:
        ...     top = heap.peek(); heap.change_key(top, 5)
        >>> q.pop()
        (5, 'a')
        """
        with self._guard.lock:
            yield self.inner

    def _extend_under_lock(self, pairs: list[tuple[K, V]]) -> list[Handle[K, V]]:
        out = self.inner.extend(pairs)
        if out:
            self._guard.grew(len(out))
        return out

    def push(self, key: K, value: V) -> Handle[K, V]:
        """Insert (never waits); the kind's bound plus one lock.  ``ClosedError`` once closed.

        >>> from heapkit import BinaryHeap, locked
        >>> locked(BinaryHeap()).push(1, 'a').key
        1
        """
        g = self._guard
        with g.lock:
            if g.closed:
                raise closed_error("push")
            h = self.inner.push(key, value)
            if g.poppers or g.watchers:
                g.grew(1)
            return h

    def extend(self, pairs: Iterable[tuple[K, V]]) -> list[Handle[K, V]]:
        """Insert many, all or nothing; the kind's extend plus one lock.  The pairs are read
        before the lock is taken.

        >>> from heapkit import BinaryHeap, locked
        >>> len(locked(BinaryHeap()).extend([(2, 'b'), (1, 'a')]))
        2
        """
        pairs = pairs_list(pairs)
        with self._guard.lock:
            if self._guard.closed:
                raise closed_error("extend")
            return self._extend_under_lock(pairs)

    def pop_now(self) -> tuple[K, V]:
        """Remove and return a smallest entry without waiting; the kind's bound plus one lock.

        ``EmptyHeapError`` if there is none (``ClosedError`` if closed as well).

        >>> from heapkit import BinaryHeap, locked
        >>> locked(BinaryHeap([(1, 'a')])).pop_now()
        (1, 'a')
        """
        g = self._guard
        with g.lock:
            if g.closed and not self.inner:
                raise closed_error("pop_now")
            out = self.inner.pop()
            if g.pushers:
                g.shrank()
            return out

    def close(self) -> None:
        """Refuse later pushes through any wrapper of this heap; waiting pops drain what is
        left, then get ``ClosedError``.  O(waiters).

        >>> from heapkit import BinaryHeap, locked
        >>> q = locked(BinaryHeap([(1, 'a')])); q.close(); q.pop(), q.closed
        ((1, 'a'), True)
        """
        with self._guard.lock:
            self._guard.close()

    @property
    def closed(self) -> bool:
        """True once ``close()`` was called on any wrapper of this heap.  O(1)."""
        return self._guard.closed

    def peek(self) -> Handle[K, V]:
        """The handle of a smallest entry; the kind's bound plus one lock.

        >>> from heapkit import BinaryHeap, locked
        >>> locked(BinaryHeap([(2, 'b'), (1, 'a')])).peek().value
        'a'
        """
        with self._guard.lock:
            return self.inner.peek()

    def decrease_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry a key that is not larger; the kind's bound plus one lock.

        >>> from heapkit import BinaryHeap, locked
        >>> q = locked(BinaryHeap()); h = q.push(5, 'a'); q.decrease_key(h, 1); h.key
        1
        """
        self._rekey(self.inner.decrease_key, handle, key)

    def change_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry any key; the kind's bound plus one lock.

        >>> from heapkit import BinaryHeap, locked
        >>> q = locked(BinaryHeap()); h = q.push(5, 'a'); q.change_key(h, 9); h.key
        9
        """
        self._rekey(self.inner.change_key, handle, key)

    def _rekey(self, op: Callable[[Handle[K, V], K], None], handle: Handle[K, V], key: K) -> None:
        g = self._guard
        with g.lock:
            op(handle, key)
            if g.timers or g.watchers:
                g.rekeyed()

    def remove(self, handle: Handle[K, V]) -> tuple[K, V]:
        """Delete the entry and return it; the kind's bound plus one lock.

        >>> from heapkit import BinaryHeap, locked
        >>> q = locked(BinaryHeap()); h = q.push(5, 'a'); q.remove(h)
        (5, 'a')
        """
        g = self._guard
        with g.lock:
            out = self.inner.remove(handle)
            if g.pushers:
                g.shrank()
            return out

    def _room_for_meld(self, k: int) -> None:
        """Called under both locks before a meld brings in ``k`` entries (closed; capacity)."""
        if self._guard.closed:
            raise closed_error("meld")

    def meld(self, other: Heap[K, V]) -> None:
        """Move every entry of ``other`` (a bare heap or any wrapper) in here; the kind's meld bound.

        Both heaps' locks are taken, in a fixed order (no deadlock between two
        threads melding in opposite directions).

        >>> from heapkit import PairingHeap, locked
        >>> a, b = locked(PairingHeap()), locked(PairingHeap([(1, 'x')]))
        >>> a.meld(b); len(a), len(b)
        (1, 0)
        """
        if isinstance(other, Wrapper):
            src: Any = other.inner
            theirs = other._guard
        else:
            src, theirs = other, guard_of(other, "meld")
        mine = self._guard
        first, second = sorted((mine, theirs), key=id)
        with first.lock, second.lock:
            k = len(src)
            if src is not self.inner:
                self._room_for_meld(k)
            self.inner.meld(src)
            if k:
                mine.grew(k)
                theirs.shrank()

    def clear(self) -> None:
        """Remove everything; O(n) plus one lock.

        >>> from heapkit import BinaryHeap, locked
        >>> q = locked(BinaryHeap([(1, 'a')])); q.clear(); len(q)
        0
        """
        g = self._guard
        with g.lock:
            self.inner.clear()
            g.shrank()

    def __len__(self) -> int:
        with self._guard.lock:
            return len(self.inner)

    def __bool__(self) -> bool:
        with self._guard.lock:
            return bool(self.inner)

    def __iter__(self) -> Iterator[Handle[K, V]]:
        """A snapshot of the live handles, taken under the lock.  O(n)."""
        with self._guard.lock:
            return iter(list(self.inner))

    def __contains__(self, handle: object) -> bool:
        with self._guard.lock:
            return handle in self.inner

    def __repr__(self) -> str:
        with self._guard.lock:
            return f"{type(self).__name__.lower()}({self.inner!r})"
