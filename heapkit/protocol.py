"""The one protocol every heap kind satisfies, the handle protocol, and ``Shape``.

A *heap* holds entries ``(key, value)``; keys are ordered with ``<`` only and the
smallest pops first.  ``push`` returns a *handle* that names its entry for as long
as the entry is in a heap (across melds too).
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator, Mapping
from dataclasses import dataclass, field
from typing import Protocol, TypeVar, runtime_checkable

__all__ = ["Handle", "Heap", "Shape"]

K = TypeVar("K")
V = TypeVar("V")
K_co = TypeVar("K_co", covariant=True)


@runtime_checkable
class Handle(Protocol[K_co, V]):
    """Names one entry of a heap: ``key`` (read-only), ``value`` (read-write), ``alive``."""

    @property
    def key(self) -> K_co: ...

    @property
    def value(self) -> V: ...

    @value.setter
    def value(self, value: V) -> None: ...

    @property
    def alive(self) -> bool: ...


@runtime_checkable
class Heap(Protocol[K, V]):
    """An addressable priority queue; see ``design/api.md`` for the full contract."""

    def push(self, key: K, value: V) -> Handle[K, V]: ...

    def extend(self, pairs: Iterable[tuple[K, V]]) -> list[Handle[K, V]]: ...

    def peek(self) -> Handle[K, V]: ...

    def pop(self) -> tuple[K, V]: ...

    def decrease_key(self, handle: Handle[K, V], key: K) -> None: ...

    def change_key(self, handle: Handle[K, V], key: K) -> None: ...

    def remove(self, handle: Handle[K, V]) -> tuple[K, V]: ...

    def meld(self, other: Heap[K, V]) -> None: ...

    def clear(self) -> None: ...

    def __len__(self) -> int: ...

    def __bool__(self) -> bool: ...

    def __iter__(self) -> Iterator[Handle[K, V]]: ...

    def __contains__(self, handle: object) -> bool: ...


@dataclass(frozen=True)
class Shape:
    """What ``heapkit.check`` found: the heap's figures once every rule held.

    ``marked`` is None where the kind has no marks, ``potential`` None where it
    defines none; ``details`` holds kind-specific figures.
    """

    kind: str
    size: int
    roots: int
    height: int
    max_degree: int
    marked: int | None = None
    potential: float | None = None
    details: Mapping[str, object] = field(default_factory=dict)
