"""The one protocol every heap kind satisfies, the handle protocol, and ``Shape``.

A *heap* holds entries ``(key, value)``; keys are ordered with ``<`` only and the
smallest pops first.  ``push`` returns a *handle* that names its entry for as long
as the entry is in a heap (across melds too).
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator, Mapping
from typing import Protocol, TypeVar, runtime_checkable

__all__ = ["Handle", "Heap", "Shape"]

K = TypeVar("K")
V = TypeVar("V")
K_co = TypeVar("K_co", covariant=True)


@runtime_checkable
class Handle(Protocol[K_co, V]):
    """Names one entry of a heap, from ``push`` until the entry is popped, removed or cleared.

    Every kind's ``push`` and ``peek`` return this type (the node classes behind it
    are private).  Pass it back to ``decrease_key``, ``change_key`` or ``remove``.
    """

    @property
    def key(self) -> K_co:
        """The entry's key; read-only (change it with ``decrease_key``/``change_key``)."""
        ...

    @property
    def value(self) -> V:
        """The payload carried with the key; never compared."""
        ...

    @value.setter
    def value(self, value: V) -> None:
        """Replace the payload; the entry keeps its place (order depends on the key alone)."""
        ...

    @property
    def alive(self) -> bool:
        """True while the entry is in a heap; False once popped, removed or cleared."""
        ...


@runtime_checkable
class Heap(Protocol[K, V]):
    """An addressable priority queue: the protocol every kind satisfies.

    The README's "The protocol" section gives the contract and the errors each
    member raises; ``heapkit.KINDS`` lists the classes.
    """

    def push(self, key: K, value: V) -> Handle[K, V]:
        """Insert ``(key, value)`` and return its handle.  KeyOrderError for a NaN key."""
        ...

    def extend(self, pairs: Iterable[tuple[K, V]]) -> list[Handle[K, V]]:
        """Insert every ``(key, value)`` pair, all or nothing; the handles in order."""
        ...

    def peek(self) -> Handle[K, V]:
        """The handle of an entry with the smallest key.  EmptyHeapError when empty."""
        ...

    def pop(self) -> tuple[K, V]:
        """Remove and return ``(key, value)`` of the entry ``peek`` names.  EmptyHeapError when empty."""
        ...

    def decrease_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry a key that is not larger.

        KeyOrderError if the current key < ``key`` (or ``key`` is NaN);
        InvalidHandleError for a dead handle or one of another heap.
        """
        ...

    def change_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry any key.  InvalidHandleError for a dead or foreign handle."""
        ...

    def remove(self, handle: Handle[K, V]) -> tuple[K, V]:
        """Delete the entry and return its ``(key, value)``.  InvalidHandleError for a dead or foreign handle."""
        ...

    def meld(self, other: Heap[K, V]) -> None:
        """Move every entry of ``other`` (same kind, same options) into this heap; ``other`` is left empty.

        Handles of ``other`` stay valid and now belong to this heap.  TypeError for
        another kind or other options; ValueError for ``meld(self)``.
        """
        ...

    def clear(self) -> None:
        """Remove every entry; every handle becomes dead."""
        ...

    def __len__(self) -> int:
        """Number of entries."""
        ...

    def __bool__(self) -> bool:
        """True when the heap holds an entry."""
        ...

    def __iter__(self) -> Iterator[Handle[K, V]]:
        """Every live handle, no order promised.  RuntimeError if the heap changes meanwhile."""
        ...

    def __contains__(self, handle: object) -> bool:
        """True if ``handle`` is live in this heap."""
        ...


class Shape:
    """What ``heapkit.check`` found: the heap's figures once every rule held (read-only).

    ``marked`` is None where the kind has no marks, ``potential`` None where it
    defines none; ``details`` holds kind-specific figures.  Written by hand rather
    than as a frozen dataclass: ``dataclasses`` imports ``inspect`` and ``ast``,
    a third of ``import heapkit``'s time.

    >>> Shape("pairing", 1, 1, 1, 0)
    Shape(kind='pairing', size=1, roots=1, height=1, max_degree=0, marked=None, potential=None, details={})
    """

    __slots__ = ("details", "height", "kind", "marked", "max_degree", "potential", "roots", "size")
    _FIELDS = ("kind", "size", "roots", "height", "max_degree", "marked", "potential", "details")

    kind: str
    size: int
    roots: int
    height: int
    max_degree: int
    marked: int | None
    potential: float | None
    details: Mapping[str, object]

    def __init__(
        self,
        kind: str,
        size: int,
        roots: int,
        height: int,
        max_degree: int,
        marked: int | None = None,
        potential: float | None = None,
        details: Mapping[str, object] | None = None,
    ) -> None:
        values = (kind, size, roots, height, max_degree, marked, potential, {} if details is None else details)
        for name, value in zip(self._FIELDS, values, strict=True):
            object.__setattr__(self, name, value)

    def __setattr__(self, name: str, value: object) -> None:
        raise AttributeError(f"Shape is read-only: cannot set {name!r}")

    def __delattr__(self, name: str) -> None:
        raise AttributeError(f"Shape is read-only: cannot delete {name!r}")

    def _values(self) -> tuple[object, ...]:
        return tuple(getattr(self, name) for name in self._FIELDS)

    def __eq__(self, other: object) -> bool:
        if type(other) is not Shape:
            return NotImplemented
        return self._values() == other._values()

    __hash__ = None  # type: ignore[assignment]  # details is a mapping

    def __repr__(self) -> str:
        return "Shape(" + ", ".join(f"{name}={getattr(self, name)!r}" for name in self._FIELDS) + ")"
