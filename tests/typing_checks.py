"""Typing tests: checked by ``mypy --strict`` in CI, never executed.

Each ``# type: ignore[code]`` marks an error mypy must report; with
``warn_unused_ignores`` (part of --strict) a missing error fails the check.
"""

from __future__ import annotations

from heapkit import Handle, Heap, PairingHeap, WeakHeap


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
