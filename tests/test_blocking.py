"""`heapkit.blocking`: wait/wake logic on a manual clock (no sleeps), capacity, close,
delayed release against a sequential model, and the handle operations.

Every thread here is a daemon joined with a timeout, so a deadlock fails the test
instead of hanging the run.
"""

from __future__ import annotations

import threading
from collections.abc import Callable
from typing import Any

import pytest
from hypothesis import strategies as st
from hypothesis.stateful import RuleBasedStateMachine, invariant, precondition, rule

import heapkit
from heapkit.concurrent import ManualClock

JOIN = 30.0  # real seconds: only a deadlock comes near it


class Runner:
    """Run ``fn`` in a daemon thread; ``result()`` joins (bounded) and returns or re-raises."""

    def __init__(self, fn: Callable[[], Any]) -> None:
        self.out: Any = None
        self.exc: BaseException | None = None

        def body() -> None:
            try:
                self.out = fn()
            except BaseException as e:  # handed to the test thread
                self.exc = e

        self.thread = threading.Thread(target=body, daemon=True)
        self.thread.start()

    def result(self) -> Any:
        self.thread.join(JOIN)
        assert not self.thread.is_alive(), "deadlock: the thread is still waiting"
        if self.exc is not None:
            raise self.exc
        return self.out

    @property
    def running(self) -> bool:
        return self.thread.is_alive()


def test_pop_waits_for_a_push() -> None:
    clock = ManualClock()
    q = heapkit.blocking(heapkit.PairingHeap(), clock=clock)
    r = Runner(q.pop)
    assert clock.wait_for_waits(1)
    assert clock.timeouts == [None]  # no timeout, no due time: wait for a change only
    q.push(3, "c")
    assert r.result() == (3, "c")
    assert len(q) == 0


def test_pop_timeout_runs_on_the_clock() -> None:
    clock = ManualClock(50.0)
    q = heapkit.blocking(heapkit.BinaryHeap(), clock=clock)
    r = Runner(lambda: q.pop(timeout=5))
    assert clock.wait_for_waits(1)
    assert clock.timeouts == [5]
    clock.advance(4)  # 1 s left: it looks again and waits the rest
    assert clock.wait_for_waits(2)
    assert clock.timeouts[1] == pytest.approx(1)
    assert r.running
    clock.advance(1)
    with pytest.raises(heapkit.EmptyHeapError, match="timeout=5"):
        r.result()


def test_a_push_reaches_a_popper_with_a_timeout() -> None:
    clock = ManualClock()
    q = heapkit.blocking(heapkit.LazyHeap(), clock=clock)
    r = Runner(lambda: q.pop(timeout=10))
    assert clock.wait_for_waits(1)
    q.push(1, "a")
    assert r.result() == (1, "a")


def test_each_push_wakes_one_of_several_poppers() -> None:
    clock = ManualClock()
    q = heapkit.blocking(heapkit.PairingHeap(), clock=clock)
    runners = [Runner(q.pop) for _ in range(4)]
    assert clock.wait_for_waits(4)
    for i in range(4):
        q.push(i, f"job{i}")
    got = sorted(r.result() for r in runners)
    assert got == [(i, f"job{i}") for i in range(4)]  # each entry popped once


def test_meld_wakes_a_waiting_popper() -> None:
    clock = ManualClock()
    q = heapkit.blocking(heapkit.PairingHeap(), clock=clock)
    other = heapkit.locked(heapkit.PairingHeap([(7, "moved")]))
    r = Runner(q.pop)
    assert clock.wait_for_waits(1)
    q.meld(other)
    assert r.result() == (7, "moved")
    assert len(other) == 0


def test_a_push_through_locked_wakes_a_blocking_pop() -> None:
    clock = ManualClock()
    heap = heapkit.PairingHeap()
    q = heapkit.blocking(heap, clock=clock)
    r = Runner(q.pop)
    assert clock.wait_for_waits(1)
    heapkit.locked(heap).push(2, "via locked")
    assert r.result() == (2, "via locked")


# --- delayed release --------------------------------------------------------------------


def test_due_pop_waits_for_the_minimums_time_and_wakes_early() -> None:
    clock = ManualClock(100.0)
    q = heapkit.blocking(heapkit.PairingHeap(), due=True, clock=clock)
    late = q.push(110.0, "late")
    r = Runner(q.pop)
    assert clock.wait_for_waits(1)
    assert clock.timeouts == [10.0]
    q.push(104.0, "sooner")  # a sooner entry: it wakes and waits less
    assert clock.wait_for_waits(2)
    assert clock.timeouts[1] == 4.0
    q.decrease_key(late, 102.0)  # the minimum re-prioritised: wakes again
    assert clock.wait_for_waits(3)
    assert clock.timeouts[2] == 2.0
    clock.advance(1.5)
    assert clock.wait_for_waits(4)
    assert clock.timeouts[3] == 0.5
    assert r.running
    clock.advance(0.5)
    assert r.result() == (102.0, "late")
    assert len(q) == 1
    with pytest.raises(heapkit.EmptyHeapError, match="due"):
        q.pop_now()


def test_due_removing_the_minimum_lets_the_popper_wait_for_the_next() -> None:
    clock = ManualClock()
    q = heapkit.blocking(heapkit.FibonacciHeap(), due=True, clock=clock)
    first = q.push(3.0, "first")
    q.push(8.0, "second")
    r = Runner(q.pop)
    assert clock.wait_for_waits(1)
    assert clock.timeouts == [3.0]
    q.remove(first)  # cancelled: no wake is needed; at 3.0 it finds the next one
    clock.advance(3)
    assert clock.wait_for_waits(2)
    assert clock.timeouts[1] == 5.0
    clock.advance(5)
    assert r.result() == (8.0, "second")


def test_due_with_a_function_of_the_key() -> None:
    clock = ManualClock()
    q = heapkit.blocking(heapkit.BinaryHeap(), due=lambda k: k[0], clock=clock)
    q.push((2.0, 0), "backup")
    q.push((1.0, 5), "report")
    with pytest.raises(heapkit.EmptyHeapError):
        q.pop_now()
    clock.advance(1)
    assert q.pop_now() == ((1.0, 5), "report")


class DueModel(RuleBasedStateMachine):
    """A due-time queue on a manual clock against a sequential model: a dict of live
    entries, whose smallest key is popped once the clock has reached it (common practice)."""

    def __init__(self) -> None:
        super().__init__()
        self.clock = ManualClock()
        self.q: Any = heapkit.blocking(heapkit.PairingHeap(stable=True), due=True, clock=self.clock)
        self.model: dict[int, tuple[int, int]] = {}  # value -> (key, push order)
        self.handles: dict[int, Any] = {}
        self.n = 0

    @rule(key=st.integers(0, 30))
    def push(self, key: int) -> None:
        self.handles[self.n] = self.q.push(key, self.n)
        self.model[self.n] = (key, self.n)
        self.n += 1

    @precondition(lambda self: bool(self.model))
    @rule(data=st.data(), key=st.integers(0, 30))
    def change_key(self, data: st.DataObject, key: int) -> None:
        v = data.draw(st.sampled_from(sorted(self.model)))
        self.q.change_key(self.handles[v], key)
        self.model[v] = (key, self.model[v][1])

    @precondition(lambda self: bool(self.model))
    @rule(data=st.data())
    def cancel(self, data: st.DataObject) -> None:
        v = data.draw(st.sampled_from(sorted(self.model)))
        assert self.q.remove(self.handles.pop(v)) == (self.model.pop(v)[0], v)

    @rule(dt=st.integers(0, 10))
    def advance(self, dt: int) -> None:
        self.clock.advance(dt)

    @rule()
    def pop_now(self) -> None:
        due = [(k, seq, v) for v, (k, seq) in self.model.items() if k <= self.clock.now()]
        if not due:
            with pytest.raises(heapkit.EmptyHeapError):
                self.q.pop_now()
            return
        k, _, v = min(due)
        assert self.q.pop_now() == (k, v)
        del self.model[v]
        del self.handles[v]

    @invariant()
    def same_entries(self) -> None:
        assert len(self.q) == len(self.model)
        heapkit.check(self.q)


TestDueModel = DueModel.TestCase


# --- capacity and close ---------------------------------------------------------------


def test_push_waits_for_room_and_times_out_on_the_clock() -> None:
    clock = ManualClock()
    q = heapkit.blocking(heapkit.PairingHeap(), capacity=2, clock=clock)
    q.push(1, "a")
    q.push(2, "b")
    r = Runner(lambda: q.push(0, "c"))
    assert clock.wait_for_waits(1)
    assert q.pop() == (1, "a")  # room: the pusher goes in
    assert r.result().key == 0
    t = Runner(lambda: q.push(5, "d", timeout=3))
    assert clock.wait_for_waits(2)
    clock.advance(3)
    with pytest.raises(heapkit.FullHeapError, match="capacity 2"):
        t.result()
    assert sorted(h.value for h in q) == ["b", "c"]  # the failed push left it as it was
    with pytest.raises(heapkit.FullHeapError):
        q.extend([(1, "x")] * 3)
    with pytest.raises(heapkit.FullHeapError, match="meld never waits"):
        q.meld(heapkit.PairingHeap([(1, "y")]))
    assert len(q) == 2


def test_close_wakes_everyone_and_drains_first() -> None:
    clock = ManualClock()
    q = heapkit.blocking(heapkit.PairingHeap(), capacity=1, clock=clock)
    q.push(1, "last")
    pusher = Runner(lambda: q.push(2, "refused"))
    assert clock.wait_for_waits(1)
    q.close()
    with pytest.raises(heapkit.ClosedError, match="push"):
        pusher.result()
    assert q.pop() == (1, "last")  # what was in still comes out
    poppers = [Runner(q.pop) for _ in range(3)]
    for p in poppers:
        with pytest.raises(heapkit.ClosedError, match="pop"):
            p.result()
    with pytest.raises(heapkit.ClosedError):
        q.push(3, "late")
    with pytest.raises(heapkit.ClosedError):
        q.pop_now()


def test_close_wakes_a_waiting_popper() -> None:
    clock = ManualClock()
    q = heapkit.blocking(heapkit.BinaryHeap(), clock=clock)
    r = Runner(q.pop)
    assert clock.wait_for_waits(1)
    q.close()
    with pytest.raises(heapkit.ClosedError):
        r.result()


@pytest.mark.parametrize("bad", [0, -1, 1.5, True, "3"])
def test_capacity_must_be_a_positive_int(bad: Any) -> None:
    with pytest.raises(ValueError, match="capacity"):
        heapkit.blocking(heapkit.BinaryHeap(), capacity=bad)


@pytest.mark.parametrize("bad", [-1, float("nan"), "1"])
def test_timeout_must_be_a_non_negative_number(bad: Any) -> None:
    q = heapkit.blocking(heapkit.BinaryHeap([(1, "a")]))
    with pytest.raises(ValueError, match="timeout"):
        q.pop(timeout=bad)
    with pytest.raises(ValueError, match="timeout"):
        q.push(2, "b", timeout=bad)
    assert len(q) == 1


def test_handles_and_check_through_the_wrapper() -> None:
    q = heapkit.blocking(heapkit.checked(heapkit.PairingHeap()))
    a = q.push(5, "a")
    b = q.push(6, "b")
    q.decrease_key(b, 1)
    q.change_key(a, 0)
    assert a in q and len(q) == 2
    assert heapkit.check(q).kind == "pairing"
    with heapkit.audit(heapkit.concurrent.unwrap(q)) as ledger:
        assert q.pop(timeout=0) == (0, "a")
    assert [r.op for r in ledger.records] == ["pop"]
    assert q.remove(b) == (1, "b")
    with pytest.raises(heapkit.InvalidHandleError):
        q.remove(b)
