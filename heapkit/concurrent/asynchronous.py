"""``asynchronous(heap)``: an asyncio queue with handles; ``await q.pop()`` waits for an entry.

Every operation holds the heap's one lock for its short synchronous step, so
the heap may also be used from threads through another wrapper; a push from
another thread wakes the awaiting pops through ``loop.call_soon_threadsafe``.
Awaiting pops belong to one event loop at a time.

Cancellation-safe: ``pop`` takes an entry only in the synchronous step after its
last ``await``, so a pop cancelled while it waits (``task.cancel()``, or
``asyncio.timeout`` running out) has taken nothing.  ``close()`` wakes every
awaiting pop; pops drain what is left, then raise ``ClosedError``; pushes raise it.
"""

from __future__ import annotations

import asyncio
import contextlib
import threading
from collections.abc import Iterable
from typing import TypeVar

from heapkit.concurrent.guard import Wrapper, closed_error, pairs_list
from heapkit.protocol import Handle, Heap

__all__ = ["Asynchronous", "asynchronous"]

K = TypeVar("K")
V = TypeVar("V")


class Asynchronous(Wrapper[K, V]):
    """An asyncio-friendly heap; see the module docstring.

    >>> import asyncio
    >>> from heapkit import PairingHeap
    >>> q = asynchronous(PairingHeap())
    >>> async def main():
    ...     h = q.push(5, 'reindex'); q.decrease_key(h, 1)
    ...     return await q.pop()
    >>> asyncio.run(main())
    (1, 'reindex')
    """

    __slots__ = ("_loop", "_thread", "_waiters")

    def __init__(self, heap: Heap[K, V]) -> None:
        super().__init__(heap, "asynchronous")
        self._waiters: list[asyncio.Future[None]] = []
        self._loop: asyncio.AbstractEventLoop | None = None
        self._thread = 0

    def push(self, key: K, value: V) -> Handle[K, V]:
        """Insert (never waits) and wake the awaiting pops; the kind's bound plus one lock.

        >>> from heapkit import BinaryHeap
        >>> asynchronous(BinaryHeap()).push(1, 'a').key
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
        """Insert many, all or nothing; the kind's extend plus one lock.

        >>> from heapkit import BinaryHeap
        >>> len(asynchronous(BinaryHeap()).extend([(2, 'b'), (1, 'a')]))
        2
        """
        pairs = pairs_list(pairs)
        with self._guard.lock:
            if self._guard.closed:
                raise closed_error("extend")
            return self._extend_under_lock(pairs)

    def _room_for_meld(self, k: int) -> None:
        if self._guard.closed:
            raise closed_error("meld")

    def pop_now(self) -> tuple[K, V]:
        """Remove and return a smallest entry without waiting; ``EmptyHeapError`` if none.

        >>> from heapkit import BinaryHeap
        >>> asynchronous(BinaryHeap([(1, 'a')])).pop_now()
        (1, 'a')
        """
        g = self._guard
        with g.lock:
            if not self.inner and g.closed:
                raise closed_error("pop_now")
            out = self.inner.pop()
            if g.pushers:
                g.shrank()
            return out

    async def pop(self) -> tuple[K, V]:
        """Remove and return a smallest entry, awaiting one if the queue is empty.

        The kind's pop bound plus one lock.  Bound it with ``asyncio.timeout``;
        ``ClosedError`` once closed and drained.

        >>> import asyncio
        >>> from heapkit import BinaryHeap
        >>> q = asynchronous(BinaryHeap())
        >>> async def late():
        ...     async with asyncio.timeout(0.01):
        ...         return await q.pop()
        >>> asyncio.run(late())
        Traceback (most recent call last):
        ...
        TimeoutError
        """
        g = self._guard
        while True:
            with g.lock:
                if self.inner:
                    return self.pop_now()
                if g.closed:
                    raise closed_error("pop")
                fut = self._enlist()
            try:
                await fut
            finally:
                with g.lock:
                    self._discharge(fut)

    def _enlist(self) -> asyncio.Future[None]:
        """Lock held: a future the next change resolves, on the running loop."""
        loop = asyncio.get_running_loop()
        if self._loop is not loop:
            if self._waiters:
                raise RuntimeError("pop: pops of this queue are awaited on another event loop")
            self._loop = loop
            self._thread = threading.get_ident()
        fut: asyncio.Future[None] = loop.create_future()
        if not self._waiters:
            self._guard.watchers.append(self._wake)
        self._waiters.append(fut)
        return fut

    def _discharge(self, fut: asyncio.Future[None]) -> None:
        """Lock held: forget ``fut``; the last waiter out stops watching the heap."""
        self._waiters.remove(fut)
        if not self._waiters:
            self._guard.watchers.remove(self._wake)

    def _wake(self) -> None:
        """Lock held, after a change: resolve every waiting future (from any thread)."""
        loop = self._loop
        if loop is None:
            return
        if threading.get_ident() == self._thread:
            self._resolve()
        else:
            with contextlib.suppress(RuntimeError):  # a closed loop: nobody is left to wake
                loop.call_soon_threadsafe(self._resolve)

    def _resolve(self) -> None:
        for f in tuple(self._waiters):
            if not f.done():
                f.set_result(None)

    def close(self) -> None:
        """Refuse later pushes; awaiting pops drain what is left, then get ``ClosedError``.  O(waiters).

        >>> from heapkit import BinaryHeap
        >>> q = asynchronous(BinaryHeap()); q.close(); q.closed
        True
        """
        with self._guard.lock:
            self._guard.close()

    @property
    def closed(self) -> bool:
        """True once ``close()`` was called on any wrapper of this heap."""
        return self._guard.closed


def asynchronous(heap: Heap[K, V]) -> Asynchronous[K, V]:
    """Wrap ``heap`` for asyncio: ``await q.pop()`` waits for an entry; O(1).  See :class:`Asynchronous`.

    >>> from heapkit import BinaryHeap
    >>> len(asynchronous(BinaryHeap([(1, 'a')])))
    1
    """
    return Asynchronous(heap)

