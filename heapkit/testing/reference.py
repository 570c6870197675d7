"""``ReferenceHeap``: the executable specification of the heap protocol.

Obviously correct rather than fast: entries sit in a ``sortedcontainers``
``SortedList`` ordered by ``(key, push order)``, compared with ``<`` only.  It
pops in exactly the order a stable heap must, which is also a valid order for
an unstable one.  Every error the protocol names is raised here the same way.
"""

from __future__ import annotations

import itertools
from collections.abc import Iterable, Iterator
from typing import Any, Generic, TypeVar

from sortedcontainers import SortedList

from heapkit.errors import EmptyHeapError, InvalidHandleError, KeyOrderError

__all__ = ["RefHandle", "ReferenceHeap"]

K = TypeVar("K")
V = TypeVar("V")

_ORDER = itertools.count()


class RefHandle(Generic[K, V]):
    """Handle of a :class:`ReferenceHeap` entry."""

    __slots__ = ("_heap", "_key", "_seq", "value")

    _key: Any

    def __init__(self, key: K, value: V, heap: ReferenceHeap[K, V]) -> None:
        self._key = key
        self._seq = next(_ORDER)
        self._heap: ReferenceHeap[K, V] | None = heap
        self.value = value

    @property
    def key(self) -> K:
        key: K = self._key
        return key

    @property
    def alive(self) -> bool:
        return self._heap is not None

    def __lt__(self, other: RefHandle[K, V]) -> bool:
        # (key, push order) with one `<` on keys: the earlier push wins ties.
        if self._seq < other._seq:
            return not other._key < self._key
        return bool(self._key < other._key)

    def __repr__(self) -> str:
        return f"<ref handle key={self._key!r} value={self.value!r}{'' if self.alive else ', dead'}>"


class ReferenceHeap(Generic[K, V]):
    """The model every kind is tested against (O(log n) per operation, O(m) meld).

    >>> r = ReferenceHeap([(2, 'b'), (1, 'a')])
    >>> r.pop()
    (1, 'a')
    """

    def __init__(self, pairs: Iterable[tuple[K, V]] = (), *, stable: bool = True) -> None:
        self.stable = stable
        self._entries: SortedList = SortedList()
        self._ver = 0
        self.extend(pairs)

    def _mine(self, h: object, op: str) -> RefHandle[K, V]:
        if not isinstance(h, RefHandle):
            raise TypeError(f"{op}: expected a handle returned by push, got {h!r}")
        if h._heap is None:
            raise InvalidHandleError(f"{op}: handle {h!r} is dead")
        if h._heap is not self:
            raise InvalidHandleError(f"{op}: handle {h!r} belongs to another heap")
        return h

    @staticmethod
    def _ordered(op: str, key: K) -> None:
        if key != key:
            raise KeyOrderError(f"{op}: key {key!r} is not equal to itself")

    def push(self, key: K, value: V) -> RefHandle[K, V]:
        self._ordered("push", key)
        h = RefHandle(key, value, self)
        self._entries.add(h)
        self._ver += 1
        return h

    def extend(self, pairs: Iterable[tuple[K, V]]) -> list[RefHandle[K, V]]:
        pairs = list(pairs)
        for key, _ in pairs:
            self._ordered("extend", key)
        return [self.push(k, v) for k, v in pairs]

    def peek(self) -> RefHandle[K, V]:
        if not self._entries:
            raise EmptyHeapError("peek: the heap is empty")
        return self._entries[0]  # type: ignore[no-any-return]

    def pop(self) -> tuple[K, V]:
        if not self._entries:
            raise EmptyHeapError("pop: the heap is empty")
        h: RefHandle[K, V] = self._entries.pop(0)
        h._heap = None
        self._ver += 1
        return h._key, h.value

    def decrease_key(self, handle: RefHandle[K, V], key: K) -> None:
        h = self._mine(handle, "decrease_key")
        self._ordered("decrease_key", key)
        if h._key < key:  # keys are compared with < only
            raise KeyOrderError(f"decrease_key: new key {key!r} is larger than {h._key!r}")
        self._rekey(h, key)

    def change_key(self, handle: RefHandle[K, V], key: K) -> None:
        h = self._mine(handle, "change_key")
        self._ordered("change_key", key)
        self._rekey(h, key)

    def _rekey(self, h: RefHandle[K, V], key: K) -> None:
        self._entries.remove(h)
        h._key = key
        self._entries.add(h)
        self._ver += 1

    def remove(self, handle: RefHandle[K, V]) -> tuple[K, V]:
        h = self._mine(handle, "remove")
        self._entries.remove(h)
        h._heap = None
        self._ver += 1
        return h._key, h.value

    def meld(self, other: ReferenceHeap[K, V]) -> None:
        if other is self:
            raise ValueError("meld: cannot meld a heap into itself")
        if not isinstance(other, ReferenceHeap):
            raise TypeError(f"meld: expected another ReferenceHeap, got {type(other).__name__}")
        for h in other._entries:
            h._heap = self
            self._entries.add(h)
        other._entries.clear()
        self._ver += 1
        other._ver += 1

    def clear(self) -> None:
        for h in self._entries:
            h._heap = None
        self._entries.clear()
        self._ver += 1

    def __len__(self) -> int:
        return len(self._entries)

    def __bool__(self) -> bool:
        return bool(self._entries)

    def __iter__(self) -> Iterator[RefHandle[K, V]]:
        ver = self._ver
        for h in list(self._entries):
            if self._ver != ver:
                raise RuntimeError("ReferenceHeap changed during iteration")
            yield h
        if self._ver != ver:
            raise RuntimeError("ReferenceHeap changed during iteration")

    def __contains__(self, handle: object) -> bool:
        return isinstance(handle, RefHandle) and handle._heap is self

    def in_order(self) -> list[RefHandle[K, V]]:
        """Every handle in pop order (for tests)."""
        return list(self._entries)
