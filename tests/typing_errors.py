"""Negative typing tests: ``tests/test_typing.py`` runs mypy on this file and compares.

Every line marked ``# E: <error code>`` must give exactly that mypy error, and no other line
may give one.  Never executed (the functions are only defined).
"""

from __future__ import annotations

import heapkit
from heapkit import FibonacciHeap, Heap, KindName, PairingHeap, RadixHeap


def typo_in_a_kind_name(name: str) -> None:
    kind: KindName = "pairng"  # E: assignment
    h: PairingHeap[int, str] = heapkit.new("pairng")  # E: assignment
    ok: Heap[int, str] = heapkit.new(name)  # a str known only at run time: the protocol
    print(kind, h, ok)


def kind_gives_its_class_not_another() -> None:
    h: PairingHeap[int, str] = heapkit.new("fibonacci")  # E: assignment
    print(h)


def key_and_value_types_are_inferred_from_pairs() -> None:
    h = heapkit.new("pairing", [(1, "a")])
    h.push("x", "y")  # E: arg-type
    h.push(2, 3)  # E: arg-type


def iteration_and_extend_are_typed() -> None:
    h = heapkit.new("lazy", [(1, "a")])
    for x in h:
        x.key + "s"  # E: operator
    h.extend([("x", "y")])  # E: list-item


def locked_keeps_the_types() -> None:
    q = heapkit.locked(PairingHeap[float, str]())
    q.push(1.0, 2)  # E: arg-type


def handle_key_is_read_only() -> None:
    x = heapkit.new("binary", [(1, "a")]).peek()
    x.key = 2  # E: misc


def radix_keys_are_ints() -> None:
    r: RadixHeap[str, str] = RadixHeap()  # E: type-var
    print(r)


def checked_takes_heaps_only() -> None:
    heapkit.checked(object())  # E: type-var


def kind_specific_options() -> None:
    FibonacciHeap(arity=3)  # E: call-arg
