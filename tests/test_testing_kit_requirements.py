"""What the testing kit asks of a queue, said clearly; its options; one report; small keys;
``heapkit.check`` on a user's queue and on an ``adapt`` wrapper (issue 13, "Testing kit")."""

from __future__ import annotations

import heapq
import re
from typing import Any

import pytest
from hypothesis import settings

import heapkit
from heapkit.testing import adapt, assert_conforms, machine

PLAIN = {"decrease_key": False, "change_key": False, "remove": False, "meld": False}


class PairQueue:
    """push/pop/peek on the `heapq` functions (heapq is the outside reference of order);
    ``peek`` and ``pop`` give ``(key, value)`` pairs, as many hand-written queues do."""

    def __init__(self) -> None:
        self.a: list[tuple[Any, int, Any]] = []
        self.n = 0

    def push(self, key: Any, value: Any) -> None:
        self.n += 1
        heapq.heappush(self.a, (key, self.n, value))

    def pop(self) -> Any:
        key, _, value = heapq.heappop(self.a)  # IndexError when empty
        return key, value

    def peek(self) -> Any:
        key, _, value = self.a[0]  # IndexError when empty
        return key, value

    def __len__(self) -> int:
        return len(self.a)


def _message(factory: Any, **flags: Any) -> str:
    with pytest.raises(AssertionError) as caught:
        assert_conforms(factory, max_examples=200, **{**PLAIN, **flags})
    return str(caught.value)


def test_a_correct_pair_queue_passes() -> None:
    assert_conforms(PairQueue, max_examples=30, **PLAIN)


def test_peek_without_a_key_names_the_adapter_argument() -> None:
    class BareKeyPeek(PairQueue):
        def peek(self) -> Any:
            return self.a[0][0]  # the key alone: no .key, not a pair

    message = _message(BareKeyPeek)
    assert "has no .key" in message and "adapt(q, peek=" in message and "peek=False" in message


def test_peek_can_be_left_out() -> None:
    class NoPeek(PairQueue):
        peek = None  # type: ignore[assignment]

    assert_conforms(NoPeek, peek=False, max_examples=30, **PLAIN)


def test_empty_peek_that_does_not_raise_names_the_fix() -> None:
    class QuietPeek(PairQueue):
        def peek(self) -> Any:
            return super().peek() if self.a else None

    message = _message(QuietPeek)
    assert "expected IndexError" in message and "adapt(q, peek=" in message


def test_pop_that_is_not_a_pair_names_the_fix() -> None:
    class ListPop(PairQueue):
        def pop(self) -> Any:
            return list(super().pop())

    message = _message(ListPop)
    assert "expected a (key, value) pair" in message and "adapt(q, pop=" in message


def test_machine_takes_max_examples_and_settings() -> None:
    made = []

    def factory() -> PairQueue:
        made.append(1)
        return PairQueue()

    cls = machine(factory, max_examples=4, **PLAIN)
    assert cls.TestCase.settings.max_examples == 4
    cls.TestCase("runTest").runTest()
    assert 1 <= len(made) <= 8  # one queue per example (plus a replay or two), not the default 100s
    assert machine(PairQueue, settings=settings(max_examples=3)).TestCase.settings.max_examples == 3
    both = machine(PairQueue, settings=settings(max_examples=3, deadline=None), max_examples=9)
    assert both.TestCase.settings.max_examples == 9 and both.TestCase.settings.deadline is None


class AbsOrder(PairQueue):
    """Orders by ``abs(key)``: wrong as soon as a negative key meets a positive one."""

    def push(self, key: Any, value: Any) -> None:
        self.n += 1
        heapq.heappush(self.a, (abs(key), self.n, key, value))  # type: ignore[arg-type]

    def pop(self) -> Any:
        _, _, key, value = heapq.heappop(self.a)  # type: ignore[misc]
        return key, value

    def peek(self) -> Any:
        _, _, key, value = self.a[0]  # type: ignore[misc]
        return key, value


def test_one_report_without_hypothesis_notes() -> None:
    with pytest.raises(AssertionError) as caught:
        assert_conforms(AbsOrder, max_examples=200, **PLAIN)
    err = caught.value
    assert str(err).count("shortest failing sequence") == 1
    assert not getattr(err, "__notes__", None), err.__notes__  # no "Failing test case" / "Explanation"
    assert err.__cause__ is None and err.__suppress_context__


def test_shrinking_shows_small_keys() -> None:
    message = _message(AbsOrder)
    pushed = [float(k) for k in re.findall(r"\.push\(([^,]+),", message)]
    assert pushed, message
    # the small keys that fail (0 and -1), not -1e+308, which the strategy also draws
    assert all(abs(k) <= 12 for k in pushed), message


def test_check_works_on_a_non_iterable_adapt_wrapper() -> None:
    bare = adapt(PairQueue())  # not iterable: only len, bool and peek are checked
    bare.push(1, "a")
    assert heapkit.check(bare).details["checked"].startswith("len, bool and peek only")


def test_check_on_a_users_queue_finds_a_wrong_minimum() -> None:
    class WrongPeek(PairQueue):
        def peek(self) -> Any:
            return max(self.a)[0], max(self.a)[2]

        def __iter__(self) -> Any:
            return iter([(k, v) for k, _, v in self.a])

    q = WrongPeek()
    q.push(3, "c")
    q.push(1, "a")
    with pytest.raises(heapkit.InvariantError, match="minimum"):
        heapkit.check(q)
    good = PairQueue()
    good.push(2, "b")
    assert heapkit.check(good).size == 1
