"""`heapkit.locked`: 8 threads × 10^4 mixed operations, then every entry accounted for."""

from __future__ import annotations

import contextlib
import random
import threading
from typing import Any

import pytest

import heapkit
import heapkit.testing
from tests.kinds import NAMES, make, monotone


@pytest.mark.parametrize("name", NAMES)
def test_eight_threads_lose_nothing(name: str) -> None:
    q: Any = heapkit.locked(make(name))
    popped: list[list[tuple[Any, Any]]] = [[] for _ in range(8)]
    pushed: list[list[tuple[Any, Any]]] = [[] for _ in range(8)]
    removed: list[list[tuple[Any, Any]]] = [[] for _ in range(8)]
    ops = 10_000 if name in ("binary", "pairing", "lazy") else 3_000

    failures: list[BaseException] = []

    def work(t: int) -> None:
        try:
            run(t)
        except BaseException as exc:  # a dying thread must fail the test
            failures.append(exc)

    def run(t: int) -> None:
        rng = random.Random(t)
        mine: list[Any] = []
        for i in range(ops):
            r = rng.random()
            if r < 0.5 or not mine:
                with q.lock:  # the radix kind needs keys at or above its last popped key
                    floor = q.inner.last if monotone(name) else 0
                    k = floor + rng.randrange(10**6)
                    mine.append(q.push(k, (t, i)))
                pushed[t].append((k, (t, i)))
            elif r < 0.7:
                h = mine.pop(rng.randrange(len(mine)))
                # another thread may have popped it first
                with contextlib.suppress(heapkit.InvalidHandleError):
                    removed[t].append(q.remove(h))
            elif r < 0.85:
                h = mine[rng.randrange(len(mine))]
                try:
                    q.decrease_key(h, h.key)
                except heapkit.InvalidHandleError:
                    mine.remove(h)
            else:
                with contextlib.suppress(heapkit.EmptyHeapError):
                    popped[t].append(q.pop())

    threads = [threading.Thread(target=work, args=(t,)) for t in range(8)]
    for th in threads:
        th.start()
    for th in threads:
        th.join()
    assert not failures, failures
    heapkit.check(heapkit.threads.unwrap(q))
    rest = [q.pop() for _ in range(len(q))]
    out = sorted(v for part in popped + removed for _, v in part) + [v for _, v in rest]
    assert sorted(out) == sorted(v for part in pushed for _, v in part)
    assert len(set(out)) == len(out)


# --- one lock per heap, and check under it (issue 12, "locked()") ----------------------


def test_every_wrapper_of_one_heap_holds_the_same_lock() -> None:
    h = heapkit.BinaryHeap()
    a, b = heapkit.locked(h), heapkit.locked(h)
    assert a.lock is b.lock
    assert heapkit.blocking(h).lock is a.lock
    assert heapkit.asynchronous(h).lock is a.lock
    assert heapkit.locked(a).lock is a.lock and heapkit.locked(a).inner is h
    assert heapkit.locked(heapkit.BinaryHeap()).lock is not a.lock


def test_two_wrappers_of_one_binary_heap_under_eight_threads() -> None:
    h = heapkit.BinaryHeap()
    wrappers = [heapkit.locked(h), heapkit.locked(h)]
    out: list[list[Any]] = [[] for _ in range(8)]
    failures: list[BaseException] = []

    def work(t: int) -> None:
        try:
            q = wrappers[t % 2]
            rng = random.Random(t)
            for i in range(3_000):
                if rng.random() < 0.6:
                    q.push(rng.randrange(1000), (t, i))
                else:
                    with contextlib.suppress(heapkit.EmptyHeapError):
                        out[t].append(q.pop()[1])
        except BaseException as exc:
            failures.append(exc)

    threads = [threading.Thread(target=work, args=(t,), daemon=True) for t in range(8)]
    for th in threads:
        th.start()
    for th in threads:
        th.join(60)
    assert not any(th.is_alive() for th in threads), "deadlock"
    assert not failures, failures
    heapkit.check(h)
    popped = [v for part in out for v in part]
    assert len(set(popped)) == len(popped)  # nothing popped twice


class Watched(heapkit.testing.ReferenceHeap):  # type: ignore[misc]
    """The reference model, noting whether the wrapper's lock is held when it is read."""

    lock: Any = None
    unlocked_reads = 0

    def _note(self) -> None:
        if not self.lock._is_owned():
            Watched.unlocked_reads += 1

    def __len__(self) -> int:
        self._note()
        return int(super().__len__())

    def __iter__(self) -> Any:
        self._note()
        return super().__iter__()

    def peek(self) -> Any:
        self._note()
        return super().peek()


def test_check_of_a_wrapper_reads_the_inner_heap_under_its_lock() -> None:
    inner = Watched()
    q = heapkit.locked(inner)
    inner.lock = q.lock
    q.push(2, "b")
    q.push(1, "a")
    Watched.unlocked_reads = 0
    heapkit.check(q)
    assert Watched.unlocked_reads == 0


@pytest.mark.parametrize("wrapper", ["locked", "blocking", "asynchronous"])
def test_check_of_a_wrapper_runs_the_kinds_own_rules(wrapper: str) -> None:
    wrap = getattr(heapkit, wrapper)
    h = heapkit.PairingHeap([(1, "root")])
    mid = h.push(5, "mid")
    low = h.push(6, "low")
    h.pop()  # the pairing links 5 over 6: root 5, child 6
    h.push(0, "top")
    q = wrap(h)
    assert heapkit.check(q).kind == "pairing"
    low._key = low._k = 4  # below its parent 5, above the minimum 0: only the kind's rule sees it
    assert mid.alive
    with pytest.raises(heapkit.InvariantError, match="heap-order"):
        heapkit.check(q)


def test_check_during_concurrent_use_reports_no_false_failure() -> None:
    q = heapkit.locked(heapkit.PairingHeap())
    stop = threading.Event()
    failures: list[BaseException] = []

    def churn(t: int) -> None:
        rng = random.Random(t)
        try:
            while not stop.is_set():
                if rng.random() < 0.5 or len(q) < 50:  # about 50-150 entries: each check stays short
                    if len(q) < 150:
                        q.push(rng.randrange(100), t)
                else:
                    with contextlib.suppress(heapkit.EmptyHeapError):
                        q.pop()
        except BaseException as exc:
            failures.append(exc)

    threads = [threading.Thread(target=churn, args=(t,), daemon=True) for t in range(3)]
    for th in threads:
        th.start()
    try:
        for _ in range(300):
            heapkit.check(q)  # before the fix: "iteration gives N handles, len is M", RuntimeError
    finally:
        stop.set()
        for th in threads:
            th.join(30)
    assert not failures, failures


# --- blocking under load (issue 16) ---------------------------------------------------


def _stress(name: str, ops: int) -> None:
    """8 threads, ``ops`` operations each, on one heap: pushes, re-prioritising, cancelling
    through handles, waiting pops (blocking) and plain pops (a second wrapper, locked),
    while the main thread runs ``check``.  Afterwards every pushed value is accounted
    for exactly once (model: Python's multiset of values, common practice)."""
    heap = make(name)
    q: Any = heapkit.blocking(heap)
    other: Any = heapkit.locked(heap)
    pushed: list[list[Any]] = [[] for _ in range(8)]
    taken: list[list[Any]] = [[] for _ in range(8)]
    failures: list[BaseException] = []

    def run(t: int) -> None:
        rng = random.Random(t)
        mine: list[Any] = []
        for i in range(ops):
            r = rng.random()
            if r < 0.45 or not mine:
                mine.append(q.push(rng.randrange(10**6), (t, i)))
                pushed[t].append((t, i))
                if len(mine) > 64:
                    del mine[:32]
            elif r < 0.6:
                h = mine[rng.randrange(len(mine))]
                try:
                    if rng.random() < 0.5:
                        q.change_key(h, rng.randrange(10**6))
                    else:
                        q.decrease_key(h, h.key - 1)  # h.key may be stale: then the heap refuses or it is dead
                except (heapkit.InvalidHandleError, heapkit.KeyOrderError):
                    pass
            elif r < 0.7:
                h = mine.pop(rng.randrange(len(mine)))
                with contextlib.suppress(heapkit.InvalidHandleError):  # popped by another thread
                    taken[t].append(q.remove(h)[1])
            elif r < 0.9:
                with contextlib.suppress(heapkit.EmptyHeapError):
                    taken[t].append(q.pop(timeout=0.05)[1])
            else:
                with contextlib.suppress(heapkit.EmptyHeapError):
                    taken[t].append(other.pop()[1])

    def work(t: int) -> None:
        try:
            run(t)
        except BaseException as exc:  # a dying thread must fail the test
            failures.append(exc)

    threads = [threading.Thread(target=work, args=(t,), daemon=True) for t in range(8)]
    for th in threads:
        th.start()
    checks = 0
    while any(th.is_alive() for th in threads) and checks < 50:
        heapkit.check(q)  # under the lock, once: no false failure while the others run
        checks += 1
        threads[0].join(0.2)
    for th in threads:
        th.join(300)
    assert not any(th.is_alive() for th in threads), "deadlock"
    assert not failures, failures
    heapkit.check(q)
    rest = []
    while q:
        rest.append(q.pop_now()[1])
    out = [v for part in taken for v in part] + rest
    assert len(set(out)) == len(out)  # nothing taken twice
    assert sorted(out) == sorted(v for part in pushed for v in part)  # nothing lost


def test_blocking_eight_threads_hundred_thousand_ops_each() -> None:
    _stress(heapkit.DEFAULT, 100_000)


@pytest.mark.parametrize("name", [n for n in NAMES if not monotone(n)])
def test_blocking_eight_threads_every_kind(name: str) -> None:
    _stress(name, 3_000)


def test_the_lock_registry_keeps_no_heap_alive() -> None:
    import gc
    import weakref

    from heapkit.concurrent import guard

    h = heapkit.PairingHeap([(1, "a")])
    q = heapkit.blocking(h)
    ref = weakref.ref(h)
    assert id(h) in guard._GUARDS
    key = id(h)
    del h, q
    gc.collect()
    assert ref() is None
    assert key not in guard._GUARDS or guard._GUARDS[key][0]() is not None


def test_a_queue_without_weak_references_is_refused() -> None:
    class Slotted(heapkit.testing.ReferenceHeap):  # type: ignore[misc]
        __slots__ = ()

    class Tight:
        __slots__ = ("inner",)

    with pytest.raises(TypeError, match="__weakref__"):
        heapkit.locked(Tight())  # type: ignore[arg-type]
    assert heapkit.locked(Slotted()).lock is not None  # a subclass keeps its base's __weakref__
