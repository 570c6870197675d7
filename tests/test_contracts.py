"""``heapkit.check``: every rule of dary and pairing can fail and is named with
its entry and path; the protocol-only check of a user's own queue; keys
mutated in place by the user."""

from __future__ import annotations

from collections.abc import Callable, Iterator
from typing import Any

import pytest

import heapkit
from heapkit import BinaryHeap, DaryHeap, PairingHeap
from heapkit._core import Owner
from heapkit.errors import InvariantError
from tests.corruption import assert_breaks


# A binary heap of keys 0..9 pushed in order: the array is [0, 1, ..., 9]
# (each push lands at the end and never climbs).  Position i's parent is
# (i - 1) // 2 and it is child (i - 1) % 2 (Williams 1964; common practice).
def _binary() -> Any:
    h = BinaryHeap()
    for k in range(10):
        h.push(k, f"v{k}")
    return h


# 1 <- 2 <- 3: pushing 3 after 2 hangs it under 2; melding that heap into one
# holding 1 links 2 under 1 (the smaller root wins, Fredman et al. 1986).
def _pairing_chain() -> tuple[Any, Any, Any]:
    a = PairingHeap()
    a.push(2, "b")
    three = a.push(3, "c")
    h = PairingHeap()
    one = h.push(1, "a")
    h.meld(a)
    return h, one, three


def _dary_heap_order() -> tuple[Any, str, Any, list[str]]:
    h = _binary()
    x = h._a[4]
    x._key = x._k = -1
    return h, "heap-order", x, ["root", "child 0", "child 1"]


def _dary_index() -> tuple[Any, str, Any, list[str]]:
    h = _binary()
    x = h._a[5]
    x._i = 7
    return h, "index", x, ["root", "child 1", "child 0"]


def _dary_size() -> tuple[Any, str, Any, list[str]]:
    h = _binary()
    h._n = 11
    return h, "size", None, []


def _dary_ownership() -> tuple[Any, str, Any, list[str]]:
    h = _binary()
    x = h._a[2]
    x._tok = Owner()
    return h, "ownership", x, ["root", "child 1"]


def _dary_pair_verdicts() -> tuple[Any, str, Any, list[str]]:
    # Keys 0..20 pushed in order never climb; the pop's descent from the root
    # compares the pair at positions 3, 4 (keys 3 < 4: left wins), keeps that
    # verdict (the pair of the winner, position 1, is forgotten), and flipping it
    # makes it wrong.  Position 3 is the root's child 2 (4-ary: (3 - 1) % 4).
    h = DaryHeap(arity=4)
    for k in range(21):
        h.push(k, f"v{k}")
    h.pop()
    if h._w[1] != 1:
        raise AssertionError(f"expected the kept verdict 1 for positions 3, 4, got {h._w[1]}")
    h._w[1] = 2
    return h, "pair-verdicts", h._a[3], ["root", "child 2"]


def _pairing_heap_order() -> tuple[Any, str, Any, list[str]]:
    h, _, three = _pairing_chain()
    three._key = three._k = 0
    return h, "heap-order", three, ["root", "child 0", "child 0"]


def _pairing_links() -> tuple[Any, str, Any, list[str]]:
    h, one, three = _pairing_chain()
    three._prev = one
    return h, "links", three, ["root", "child 0", "child 0"]


def _pairing_size() -> tuple[Any, str, Any, list[str]]:
    h, _, _ = _pairing_chain()
    h._n = 2
    return h, "size", None, []


def _pairing_ownership() -> tuple[Any, str, Any, list[str]]:
    h, _, three = _pairing_chain()
    three._tok = Owner()
    return h, "ownership", three, ["root", "child 0", "child 0"]


CORRUPTIONS: dict[tuple[type, str], Callable[[], tuple[Any, str, Any, list[str]]]] = {
    (DaryHeap, "heap-order"): _dary_heap_order,
    (DaryHeap, "index"): _dary_index,
    (DaryHeap, "size"): _dary_size,
    (DaryHeap, "ownership"): _dary_ownership,
    (DaryHeap, "pair-verdicts"): _dary_pair_verdicts,
    (PairingHeap, "heap-order"): _pairing_heap_order,
    (PairingHeap, "links"): _pairing_links,
    (PairingHeap, "size"): _pairing_size,
    (PairingHeap, "ownership"): _pairing_ownership,
}


@pytest.mark.parametrize("cls", [DaryHeap, PairingHeap])
def test_every_rule_has_a_corruption_test(cls: type) -> None:
    assert {rule for c, rule in CORRUPTIONS if c is cls} == set(cls.RULES)  # type: ignore[attr-defined]


@pytest.mark.parametrize(
    "case", sorted(CORRUPTIONS, key=lambda c: (c[0].__name__, c[1])), ids=lambda c: f"{c[0].__name__}-{c[1]}"
)
def test_each_rule_can_fail(case: tuple[type, str]) -> None:
    heap, rule, handle, path = CORRUPTIONS[case]()
    assert rule == case[1]
    assert_breaks(heap, rule, handle, path)


def test_message_names_rule_entry_and_path() -> None:
    heap, _, _, _ = _pairing_heap_order()
    with pytest.raises(InvariantError) as info:
        heapkit.check(heap)
    assert "rule 'heap-order' broken at root → child 0 → child 0 entry (0, 'c')" in str(info.value)


def test_several_broken_rules_are_all_reported_up_to_the_limit() -> None:
    h = _binary()
    for x in h._a[1:]:
        x._key = x._k = -1 - x._key  # every non-root entry now below its parent
    with pytest.raises(InvariantError) as info:
        heapkit.check(h)
    assert len(info.value.problems) == heapkit.contracts.LIMIT


def test_healthy_heaps_give_their_shape() -> None:
    shape = heapkit.check(DaryHeap([(k, k) for k in range(100)], arity=4))
    # A complete d-ary tree's levels hold 1, d, d^2, ... entries (common practice): with d = 4,
    # four levels hold 85, so 100 entries need a fifth level, height 4.
    assert (shape.kind, shape.size, shape.roots, shape.height) == ("dary", 100, 1, 4)
    assert shape.details == {"arity": 4}
    # Binary: 7 = 1 + 2 + 4 entries fill three levels (height 2); the 8th opens a fourth.
    assert [heapkit.check(BinaryHeap([(k, k) for k in range(n)])).height for n in (1, 7, 8)] == [0, 2, 3]


def test_a_key_mutated_in_place_is_caught_with_its_entry() -> None:
    h = PairingHeap()
    h.push([1], "a")
    k = [5]
    x = h.push(k, "five")
    k[0] = 0  # the user changes the key behind the heap's back
    assert_breaks(h, "heap-order", x, ["root", "child 0"])
    with pytest.raises(InvariantError, match=r"entry \(\[0\], 'five'\)"):
        heapkit.check(h)


def test_deep_chain_is_checked_without_recursion() -> None:
    h = PairingHeap()
    for k in range(50_000, 0, -1):  # each push becomes the root over the last: a chain
        h.push(k, None)
    shape = heapkit.check(h)
    assert (shape.size, shape.height) == (50_000, 49_999)


# --- a user's own queue: what the protocol alone can show -------------------


class _Ticket:
    def __init__(self, key: Any, value: Any) -> None:
        self.key, self.value, self.alive = key, value, True


class ListQueue:
    """A small user queue on a plain list (the kind of thing the check must accept)."""

    def __init__(self) -> None:
        self.items: list[_Ticket] = []

    def push(self, key: Any, value: Any) -> _Ticket:
        t = _Ticket(key, value)
        self.items.append(t)
        return t

    def peek(self) -> _Ticket:
        return min(self.items, key=lambda t: t.key)

    def __len__(self) -> int:
        return len(self.items)

    def __bool__(self) -> bool:
        return bool(self.items)

    def __iter__(self) -> Iterator[_Ticket]:
        return iter(self.items)

    def __contains__(self, t: object) -> bool:
        return any(t is x for x in self.items)


def _queue(*keys: int) -> ListQueue:
    q = ListQueue()
    for k in keys:
        q.push(k, str(k))
    return q


def test_protocol_check_accepts_a_sound_user_queue() -> None:
    shape = heapkit.check(_queue(3, 1, 2))
    assert (shape.kind, shape.size) == ("ListQueue", 3)


def test_protocol_check_names_a_lying_len() -> None:
    q = _queue(3, 1)
    q.__class__ = type("Liar", (ListQueue,), {"__len__": lambda self: 5})
    assert_breaks(q, "size")


def test_protocol_check_names_a_wrong_minimum() -> None:
    q = _queue(3, 1, 2)
    q.__class__ = type("Wrong", (ListQueue,), {"peek": lambda self: self.items[0]})
    bad = q.items[1]
    assert_breaks(q, "minimum", bad)


def test_protocol_check_names_dead_and_repeated_handles() -> None:
    q = _queue(3, 1)
    q.items[0].alive = False
    assert_breaks(q, "alive", q.items[0])
    q = _queue(3, 1)
    q.items.append(q.items[0])
    assert_breaks(q, "unique", q.items[0])


def test_protocol_check_names_a_nan_key() -> None:
    q = _queue(1)
    nan = q.push(float("nan"), "nan")
    assert_breaks(q, "key", nan)
