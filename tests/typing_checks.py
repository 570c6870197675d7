"""Typing tests: checked by ``mypy --strict`` in CI, never executed.

Each ``# type: ignore[code]`` marks an error mypy must report; with
``warn_unused_ignores`` (part of --strict) a missing error fails the check.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import assert_type

import heapkit
from heapkit import (
    BinaryHeap,
    BinomialHeap,
    DaryHeap,
    FibonacciHeap,
    Handle,
    Heap,
    HollowHeap,
    KindName,
    LazyHeap,
    Locked,
    PairingHeap,
    RadixHeap,
    RankPairingHeap,
    WeakHeap,
    trace,
)


def protocol_holds() -> None:
    h: Heap[int, str] = PairingHeap()
    handle: Handle[int, str] = h.push(3, "x")
    key: int = handle.key
    value: str = handle.value
    popped: tuple[int, str] = h.pop()
    h.decrease_key(handle, 1)
    print(key, value, popped)


def wrong_key_type_is_an_error() -> None:
    h: Heap[int, str] = PairingHeap()
    h.push("x", "y")  # type: ignore[arg-type]


def wrong_value_type_is_an_error() -> None:
    h: Heap[int, str] = PairingHeap()
    h.push(1, 2)  # type: ignore[arg-type]


def key_is_read_only() -> None:
    h: PairingHeap[int, str] = PairingHeap()
    handle = h.push(1, "a")
    handle.key = 2  # type: ignore[misc]


def pop_gives_key_and_value_types() -> None:
    h: PairingHeap[float, bytes] = PairingHeap()
    h.push(1.5, b"a")
    k, v = h.pop()
    wrong: str = k  # type: ignore[assignment]
    print(wrong, v)


def weak_heap_satisfies_the_protocol() -> None:
    h: Heap[int, str] = WeakHeap()
    handle: Handle[int, str] = h.push(3, "x")
    h.decrease_key(handle, 1)
    h.push("x", "y")  # type: ignore[arg-type]


# --- issue 13: the typed front door -------------------------------------------------


def new_by_literal_kind_gives_the_class() -> None:
    assert_type(heapkit.new("binary", [(1, "a")]), BinaryHeap[int, str])
    assert_type(heapkit.new("binomial", [(1, "a")]), BinomialHeap[int, str])
    assert_type(heapkit.new("dary", [(1.5, b"a")], arity=3), DaryHeap[float, bytes])
    assert_type(heapkit.new("fibonacci", [(1, "a")]), FibonacciHeap[int, str])
    assert_type(heapkit.new("hollow", [(1, "a")]), HollowHeap[int, str])
    assert_type(heapkit.new("lazy", [(1, "a")], stable=True), LazyHeap[int, str])
    assert_type(heapkit.new("pairing", [(1, "a")]), PairingHeap[int, str])
    assert_type(heapkit.new("radix", [(1, "a")]), RadixHeap[int, str])
    assert_type(heapkit.new("rank-pairing", [(1, "a")]), RankPairingHeap[int, str])
    assert_type(heapkit.new("weak", [(1, "a")]), WeakHeap[int, str])


def new_types_given_explicitly() -> None:
    h: PairingHeap[float, str] = heapkit.new("pairing")
    assert_type(h.pop(), tuple[float, str])
    g: Heap[int, str] = heapkit.new("lazy")
    assert_type(g.peek(), Handle[int, str])
    d: Heap[int, str] = heapkit.new()  # DEFAULT
    assert_type(d, Heap[int, str])


def new_by_runtime_str_gives_the_protocol(name: str) -> None:
    assert_type(heapkit.new(name, [(1, "a")]), Heap[int, str])
    assert_type(heapkit.new(name, [(1, "a")], stable=True, arity=3), Heap[int, str])
    kind: KindName = "rank-pairing"  # a checked name; as a union of names it gives the protocol
    assert_type(heapkit.new(kind, [(1, "a")]), Heap[int, str])


def no_any_reaches_user_code() -> None:
    h = PairingHeap([(2.0, "b")])
    assert_type(h.push(1.0, "a"), Handle[float, str])
    assert_type(h.peek(), Handle[float, str])
    assert_type(h.extend([(3.0, "c")]), list[Handle[float, str]])
    assert_type(iter(h), Iterator[Handle[float, str]])
    for x in h:
        assert_type(x, Handle[float, str])
        assert_type(x.key, float)
        assert_type(x.value, str)
        assert_type(x.alive, bool)
    assert_type(heapkit.locked(PairingHeap[float, str]()), Locked[float, str])
    assert_type(heapkit.locked(h).push(1.0, "a"), Handle[float, str])


def checked_accepts_a_protocol_typed_heap() -> None:
    h: Heap[int, str] = heapkit.new("pairing")
    assert_type(heapkit.checked(h), Heap[int, str])
    assert_type(heapkit.unchecked(h), Heap[int, str])
    p = PairingHeap([(1, "a")])
    assert_type(heapkit.checked(p, every=2), PairingHeap[int, str])


def radix_takes_two_type_parameters() -> None:
    r: RadixHeap[int, str] = RadixHeap([(3, "c")])
    assert_type(r.pop(), tuple[int, str])
    assert_type(r.push(4, "d"), Handle[int, str])
    protocol_view: Heap[int, str] = r
    print(protocol_view)


def every_kind_is_a_heap() -> None:
    kinds: list[Heap[int, str]] = [
        BinaryHeap(),
        BinomialHeap(),
        DaryHeap(),
        FibonacciHeap(),
        HollowHeap(),
        LazyHeap(),
        PairingHeap(),
        RadixHeap(),
        RankPairingHeap(),
        WeakHeap(),
        heapkit.locked(PairingHeap()),
    ]
    for q in kinds:
        q.meld(heapkit.new("pairing"))  # same kind needed at run time (TypeError otherwise)


def recorded_heaps_keep_their_types(path: str) -> None:
    with trace.record(PairingHeap[float, str](), path) as q:
        assert_type(q, trace.Recorder[float, str])
        h = q.push(1.0, "a")
        assert_type(h, Handle[float, str])
        assert_type(q.peek(), Handle[float, str])
        assert_type(q.extend([(2.0, "b")]), list[Handle[float, str]])
        q.decrease_key(h, 0.5)
        assert_type(q.pop(), tuple[float, str])
        assert_type(iter(q), Iterator[Handle[float, str]])
        other = q.sibling(LazyHeap[int, bytes]())
        assert_type(other, trace.Recorder[int, bytes])
        q.push("x", "y")  # type: ignore[arg-type]
        protocol_view: Heap[float, str] = q
        print(protocol_view)
