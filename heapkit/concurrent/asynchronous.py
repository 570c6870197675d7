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
from typing import TypeVar

from heapkit.concurrent.guard import Wrapper, closed_error
from heapkit.protocol import Heap

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


def asynchronous(heap: Heap[K, V]) -> Asynchronous[K, V]:
    """Wrap ``heap`` for asyncio: ``await q.pop()`` waits for an entry; O(1).  See :class:`Asynchronous`.

    >>> from heapkit import BinaryHeap
    >>> len(asynchronous(BinaryHeap([(1, 'a')])))
    1
    """
    return Asynchronous(heap)
