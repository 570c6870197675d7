"""The testing kit passes every heapkit kind and catches deliberately broken queues,
each with a short shrunk sequence (issue: "Testing kit")."""

from __future__ import annotations

import re
from typing import Any

import pytest
from hypothesis import given
from hypothesis import strategies as st

import heapkit
from heapkit.testing import adapt, assert_conforms, machine, strategies
from heapkit.testing.reference import ReferenceHeap
from tests.kinds import NAMES, make, monotone


@pytest.mark.parametrize("name", [n for n in NAMES if not monotone(n)])
@pytest.mark.parametrize("stable", [False, True])
def test_every_kind_passes_the_kit(name: str, stable: bool) -> None:
    assert_conforms(lambda: make(name, stable), stable=stable, max_examples=25)


# The kit's own state machine, collected by pytest the documented way.
TestPairingThroughTheKit = machine(lambda: make("pairing")).TestCase


class WrongPopAtSeven(ReferenceHeap[Any, Any]):
    """Pops the second smallest entry, but only when it holds exactly 7."""

    def pop(self) -> tuple[Any, Any]:
        if len(self) == 7:
            order = self.in_order()
            return self.remove(order[1])
        return super().pop()


class LosesOnMeld(ReferenceHeap[Any, Any]):
    """Drops the other heap's smallest entry while melding."""

    def meld(self, other: ReferenceHeap[Any, Any]) -> None:
        if len(other):
            other.pop()
        super().meld(other)


class EqualDecreaseDrops(ReferenceHeap[Any, Any]):
    """A decrease_key to an equal key retires the entry and queues nothing."""

    def decrease_key(self, handle: Any, key: Any) -> None:
        if not (key < handle.key) and not (handle.key < key):
            super().remove(handle)
            handle._heap = self  # the handle still claims to be alive
            return
        super().decrease_key(handle, key)


class LifoTies(ReferenceHeap[Any, Any]):
    """Claims stable, but pops the latest push first among equal keys."""

    def pop(self) -> tuple[Any, Any]:
        order = self.in_order()
        top = order[0]
        ties = [h for h in order if not (top.key < h.key)]
        return self.remove(ties[-1])


def _steps(message: str) -> int:
    found = re.search(r"\((\d+) operations\)", message)
    assert found, message
    return int(found.group(1))


_CAUGHT: dict[type, str] = {}


def _caught(broken: type, **flags: Any) -> str:
    """The kit's message for a broken queue (computed once per variant)."""
    if broken not in _CAUGHT:
        with pytest.raises(AssertionError) as caught:
            assert_conforms(broken, max_examples=300, **flags)
        _CAUGHT[broken] = str(caught.value)
    return _CAUGHT[broken]


@pytest.mark.parametrize(
    ("broken", "flags"),
    [
        (WrongPopAtSeven, {"meld": False, "change_key": False}),
        (LosesOnMeld, {}),
        (EqualDecreaseDrops, {}),
        (LifoTies, {"stable": True}),
    ],
)
def test_broken_queues_are_caught_with_a_short_sequence(broken: type, flags: dict[str, Any]) -> None:
    message = _caught(broken, **flags)
    assert "h = factory()" in message
    # 12 lines held until the kit preferred small keys: with every key 0, WrongPopAtSeven's
    # second-smallest pop is a tie, visible only through the peek/pop rule, and the derandomised
    # ci profile shrinks that to 13 lines (9 pushes, 2 pops, peek, pop); 14 keeps the margin.
    assert _steps(message) <= 14, message


def test_message_lines_replay_the_failure() -> None:
    message = _caught(WrongPopAtSeven, meld=False, change_key=False)
    lines = [ln.strip() for ln in message.splitlines() if ln.startswith("    ")]
    *setup, last = lines
    assert last == "h.pop()", message
    popped = []
    named = []
    for factory in (WrongPopAtSeven, ReferenceHeap):
        scope: dict[str, Any] = {"factory": factory}
        for line in setup:
            exec(compile(line, "<kit output>", "exec"), scope)
        assert len(scope["h"]) == 7
        top = scope["h"].peek()
        named.append((top.key, top.value))
        popped.append(eval(last, scope))
    # the model (heapkit.testing.ReferenceHeap, on sortedcontainers) pops what its peek named
    assert popped[1] == named[1]
    # the broken queue pops a larger key than the model does on the same sequence, or
    # (when the shrunk sequence peeks just before) not the entry its own peek named
    wrong_key = popped[1][0] < popped[0][0]
    assert wrong_key or (setup[-1] == "h.peek()" and popped[0] != named[0]), (popped, message)


class Jobs:
    """A queue with its own method names (on the reference model)."""

    def __init__(self) -> None:
        self.q: ReferenceHeap[Any, Any] = ReferenceHeap()

    def add(self, k: Any, v: Any) -> Any:
        return self.q.push(k, v)

    def take(self) -> Any:
        return self.q.pop()

    def first(self) -> Any:
        return self.q.peek()

    def __len__(self) -> int:
        return len(self.q)

    def __iter__(self) -> Any:
        return iter(self.q)


def test_adapt_maps_other_names() -> None:
    q = adapt(Jobs(), push="add", pop="take", peek=lambda jobs: jobs.q.peek())
    q.push(3, "c")
    q.push(1, "a")
    assert q.peek().key == 1 and q.pop() == (1, "a") and len(q) == 1
    assert_conforms(
        lambda: adapt(Jobs(), push="add", pop="take", peek=lambda j: j.q.peek()),
        decrease_key=False,
        change_key=False,
        remove=False,
        meld=False,
        max_examples=20,
    )


@given(ks=st.lists(strategies.keys(), min_size=5), ts=st.lists(strategies.tuple_keys()), ops=strategies.operations())
def test_strategies_draw_what_they_promise(ks: list[Any], ts: list[Any], ops: list[Any]) -> None:
    assert all(k == k for k in ks)  # never NaN
    assert all(isinstance(t, tuple) and len(t) == 2 for t in ts)
    assert all(op in strategies.OPERATIONS for op, _ in ops)


def test_check_works_on_an_adapt_wrapper() -> None:
    jobs = adapt(Jobs(), push="add", pop="take", peek="first")
    for k in (5, 2, 8):
        jobs.push(k, f"job {k}")
    shape = heapkit.check(jobs)
    assert shape.size == 3 and shape.details["checked"] == "protocol only"
