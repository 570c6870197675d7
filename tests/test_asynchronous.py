"""`heapkit.asynchronous`: many waiters, cancellation while waiting (nothing lost),
timeouts through `asyncio.timeout`, close, and wakes from another thread.

Every test runs under `asyncio.wait_for(..., BOUND)`, so a waiter that is never
woken fails the test instead of hanging the run.
"""

from __future__ import annotations

import asyncio
import random
import threading
from collections.abc import Awaitable, Callable
from typing import Any

import pytest

import heapkit

BOUND = 60.0  # real seconds: only a lost wake comes near it


def run(main: Callable[[], Awaitable[Any]]) -> Any:
    async def bounded() -> Any:
        return await asyncio.wait_for(main(), BOUND)

    return asyncio.run(bounded())


async def settle(q: Any, waiting: int) -> None:
    """Let the loop run until ``waiting`` pops are parked (the count is the wrapper's own)."""
    while len(q._waiters) != waiting:
        await asyncio.sleep(0)


def test_many_waiters_each_get_one_entry() -> None:
    async def main() -> None:
        q = heapkit.asynchronous(heapkit.PairingHeap())
        tasks = [asyncio.create_task(q.pop()) for _ in range(100)]
        await settle(q, 100)
        for i in range(100):
            q.push(random.Random(i).randrange(1000), i)
        got = await asyncio.gather(*tasks)
        # Model: every pushed value once (Python's sorted, common practice).
        assert sorted(v for _, v in got) == list(range(100))
        assert len(q) == 0 and q._waiters == [] and q._guard.watchers == []

    run(main)


def test_cancelled_waiters_lose_nothing() -> None:
    async def main() -> None:
        q = heapkit.asynchronous(heapkit.BinaryHeap())
        tasks = [asyncio.create_task(q.pop()) for _ in range(40)]
        await settle(q, 40)
        for t in tasks[::2]:
            t.cancel()
        await settle(q, 20)
        for i in range(30):
            q.push(i, i)
        done = await asyncio.gather(*tasks, return_exceptions=True)
        got = [d[1] for d in done if isinstance(d, tuple)]
        assert sum(isinstance(d, asyncio.CancelledError) for d in done) == 20
        assert sorted(got + [q.pop_now()[1] for _ in range(len(q))]) == list(range(30))

    run(main)


def test_a_waiter_cancelled_after_its_wake_takes_nothing() -> None:
    async def main() -> None:
        q = heapkit.asynchronous(heapkit.PairingHeap())
        t = asyncio.create_task(q.pop())
        await settle(q, 1)
        q.push(1, "kept")  # resolves the waiter's future ...
        t.cancel()  # ... but it is cancelled before it runs again
        with pytest.raises(asyncio.CancelledError):
            await t
        assert q.pop_now() == (1, "kept")

    run(main)


def test_timeout_leaves_the_queue_as_it_was() -> None:
    async def main() -> None:
        q = heapkit.asynchronous(heapkit.LazyHeap())
        with pytest.raises(TimeoutError):
            async with asyncio.timeout(0.01):
                await q.pop()
        assert q._waiters == [] and q._guard.watchers == []
        q.push(2, "b")
        async with asyncio.timeout(BOUND):
            assert await q.pop() == (2, "b")

    run(main)


def test_random_timeouts_and_cancels_lose_nothing() -> None:
    async def main() -> None:
        q = heapkit.asynchronous(heapkit.PairingHeap())
        rng = random.Random(7)
        got: list[int] = []

        async def consumer() -> None:
            while True:
                try:
                    async with asyncio.timeout(rng.choice([0, 0.0005, 0.002])):
                        got.append((await q.pop())[1])
                except TimeoutError:
                    pass

        consumers = [asyncio.create_task(consumer()) for _ in range(10)]
        handles = []
        for i in range(2000):
            handles.append(q.push(rng.randrange(100), i))
            if rng.random() < 0.2:
                h = handles[rng.randrange(len(handles))]
                if h.alive:
                    q.change_key(h, rng.randrange(100))
            if i % 7 == 0:
                await asyncio.sleep(0)
        while q:
            await asyncio.sleep(0)
        for c in consumers:
            c.cancel()
        await asyncio.gather(*consumers, return_exceptions=True)
        assert len(set(got)) == len(got)
        assert sorted(got + [v for _, v in (q.pop_now() for _ in range(len(q)))]) == list(range(2000))

    run(main)


def test_close_wakes_waiters_after_the_queue_drains() -> None:
    async def main() -> None:
        q = heapkit.asynchronous(heapkit.PairingHeap([(1, "last")]))
        assert await q.pop() == (1, "last")
        tasks = [asyncio.create_task(q.pop()) for _ in range(5)]
        await settle(q, 5)
        q.close()
        done = await asyncio.gather(*tasks, return_exceptions=True)
        assert all(isinstance(d, heapkit.ClosedError) for d in done)
        with pytest.raises(heapkit.ClosedError):
            q.push(2, "late")
        with pytest.raises(heapkit.ClosedError):
            await q.pop()

    run(main)


def test_a_push_from_another_thread_wakes_the_loop() -> None:
    async def main() -> None:
        heap = heapkit.PairingHeap()
        q = heapkit.asynchronous(heap)
        t = asyncio.create_task(q.pop())
        await settle(q, 1)
        th = threading.Thread(target=lambda: heapkit.locked(heap).push(3, "from a thread"), daemon=True)
        th.start()
        assert await t == (3, "from a thread")
        th.join(BOUND)

    run(main)


def test_handles_work_through_the_wrapper_and_check_sees_the_kind() -> None:
    async def main() -> None:
        q = heapkit.asynchronous(heapkit.FibonacciHeap())
        a = q.push(5, "a")
        b = q.push(6, "b")
        other = heapkit.asynchronous(heapkit.FibonacciHeap([(0, "z")]))
        q.meld(other)
        q.decrease_key(b, 1)
        assert q.remove(a) == (5, "a")
        assert heapkit.check(q).kind == "fibonacci"
        assert [await q.pop(), await q.pop()] == [(0, "z"), (1, "b")]

    run(main)
