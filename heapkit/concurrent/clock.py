"""Clocks for the blocking queue: what time it is, and how a thread waits for a while.

A :class:`Clock` answers ``now()`` and does ``wait(condition, timeout)`` (called with
the condition's lock held; it returns when the condition is notified, when
``timeout`` seconds of that clock have passed, or spuriously: callers look again).
``SYSTEM`` is ``time.monotonic`` with ``Condition.wait``.  :class:`ManualClock` is for
tests: its time moves only when ``advance`` is called, so a test of the wait/wake
logic needs no sleeps and cannot be flaky on a loaded machine.
"""

from __future__ import annotations

import threading
import time
from typing import Protocol

__all__ = ["SYSTEM", "Clock", "ManualClock", "SystemClock"]


class Clock(Protocol):
    """``now()`` in seconds (any origin) and ``wait(condition, timeout)``."""

    def now(self) -> float: ...

    def wait(self, condition: threading.Condition, timeout: float | None) -> None: ...


class SystemClock:
    """``time.monotonic`` and ``Condition.wait``.  O(1).

    >>> SYSTEM.now() <= SYSTEM.now()
    True
    """

    __slots__ = ()

    def now(self) -> float:
        """Seconds since an arbitrary origin, never going back.  O(1).

        >>> isinstance(SYSTEM.now(), float)
        True
        """
        return time.monotonic()

    def wait(self, condition: threading.Condition, timeout: float | None) -> None:
        """Wait on ``condition`` (its lock held) for at most ``timeout`` seconds.  O(1).

        >>> c = threading.Condition()
        >>> with c: SYSTEM.wait(c, 0)
        """
        condition.wait(timeout)


SYSTEM = SystemClock()


class ManualClock:
    """A clock that moves only when told: ``advance(seconds)``.  O(1) per call.

    ``wait`` ignores its timeout (no real time passes on this clock); the waiter
    wakes when the condition is notified or when ``advance`` runs.  ``sleepers``
    counts the threads inside ``wait`` now, ``timeouts`` lists the timeout of
    every ``wait`` begun (so ``len(timeouts)`` counts them); ``wait_for_waits(n)``
    lets a test know that the ``n``-th wait has begun before it moves the clock
    or changes the heap (the waiter is then surely asleep on its condition).

    >>> c = ManualClock(10.0); c.advance(2.5); c.now()
    12.5
    """

    def __init__(self, start: float = 0.0) -> None:
        self._now = start
        self._state = threading.Condition(threading.Lock())
        self._conditions: list[threading.Condition] = []
        self.sleepers = 0
        self.timeouts: list[float | None] = []

    def now(self) -> float:
        """The clock's time.  O(1).

        >>> ManualClock(3.0).now()
        3.0
        """
        return self._now

    def wait(self, condition: threading.Condition, timeout: float | None) -> None:
        """Wait on ``condition`` until notified or until ``advance`` runs.  O(1).

        >>> c = threading.Condition(); clock = ManualClock()
        >>> with c: clock.wait(c, 0)      # no time to wait: returns at once
        >>> clock.timeouts
        []
        """
        if timeout is not None and timeout <= 0:
            return
        with self._state:
            if not any(c is condition for c in self._conditions):
                self._conditions.append(condition)
            self.sleepers += 1
            self.timeouts.append(timeout)
            self._state.notify_all()
        try:
            condition.wait()
        finally:
            with self._state:
                self.sleepers -= 1
                self._state.notify_all()

    def advance(self, seconds: float) -> None:
        """Move the clock forward and wake every waiter so it looks again.  O(conditions).

        >>> c = ManualClock(); c.advance(1); c.now()
        1.0
        """
        if not seconds >= 0:
            raise ValueError(f"advance: seconds must be >= 0, got {seconds!r}")
        with self._state:
            self._now += seconds
            conditions = list(self._conditions)
        for c in conditions:
            with c:
                c.notify_all()

    def wait_for_waits(self, n: int, timeout: float = 30.0) -> bool:
        """Block (real time, at most ``timeout`` s) until ``n`` waits have begun; True if so.  O(1).

        >>> ManualClock().wait_for_waits(0)
        True
        """
        with self._state:
            return self._state.wait_for(lambda: len(self.timeouts) >= n, timeout)
