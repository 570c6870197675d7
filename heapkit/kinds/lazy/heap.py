"""Lazy array heap: the C ``heapq`` functions over entry tuples, stale entries skipped.

Invariants
----------
The list ``a`` holds entries ``e = (k, h, tok)``: an ordering object, a handle,
the heap's owner token.  ``e`` is *live* iff ``h._e is e``, else *stale*.

* heap order: ``not (a[i] < a[(i - 1) // 2])`` for every ``0 < i < len(a)``
  (tuples compared as ``heapq`` compares them; stale entries included);
* stale count: ``stale == #{e in a : e[1]._e is not e}``;
* entry: no entry object stands in ``a`` twice;
* size: ``#{e in a : e[1]._e is e} == len(heap)``;
* stale bound: ``stale <= len(heap) + 1``, so ``len(a) <= 2 len(heap) + 1``;
* bare keys: every ``k`` is an exact ``int``/``float``/``str`` or a wrapper
  whose ``__eq__`` is False (tuple comparison never calls a user's ``==``);
* ownership: ``e[2] is heap._tok`` for every entry, stale included.

A dead handle holds its last ordering object in ``_e`` (not a tuple).
``decrease_key``/``change_key`` push a fresh entry and leave the old one
stale; ``remove`` marks the entry stale; ``pop``/``peek`` discard stale
entries they meet at the top.  At the start of ``pop``, ``decrease_key``,
``change_key`` and ``remove``, if ``stale >= len(heap) > 0`` the live entries
are copied to a new list and heapified (compaction); a failure leaves the old list.

Bounds
------
push: O(log n) worst-case (one C ``heappush``; the list holds at most 2n + 1
entries).  decrease_key, change_key: O(log n) amortized (worst-case but for an
occasional O(n) compaction).  pop: O(log n) amortized (each skipped stale entry
was paid for by the operation that made it stale).  remove, peek: O(1) amortized.
meld: O(m log(n + m)) by pushes or O(n + m) by heapify, whichever is smaller.

Audit: cost unit = entries moved through the C heap (1 per push, 1 per popped
entry, stale ones included, 1 per live entry a compaction or meld rebuilds);
``Phi = stale``, ``c = 1``.  push: 1 + 0.  pop: 1 + s skipped - s = 1; with a
compaction first, n + 1 - s <= 1 since s >= n.  decrease_key/change_key:
1 + 1 = 2 (<= 2 with compaction).  remove: 0 + 1 = 1.  meld at combined size n:
at most n entries moved, Phi does not grow.  Each unit costs O(log n)
comparisons (Williams 1964; Floyd 1964 for heapify, O(n) for n entries).

Sources: J. W. J. Williams, "Algorithm 232: Heapsort", CACM 7 (1964);
R. W. Floyd, "Algorithm 245: Treesort 3", CACM 7 (1964).  Invalidating an
entry and pushing a fresh one is the idiom of the Python ``heapq``
documentation ("Priority Queue Implementation Notes"); lazy deletion with
periodic rebuilding is common practice.
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator
from typing import TYPE_CHECKING, Any, ClassVar, TypeVar

from heapkit._face import HeapFace
from heapkit.kinds.lazy import cost as _cost
from heapkit.kinds.lazy import rules as _rules
from heapkit.kinds.lazy.core import _LazyCore
from heapkit.protocol import Handle

__all__ = ["LazyHeap"]

K = TypeVar("K")
V = TypeVar("V")


class LazyHeap(HeapFace[K, V], _LazyCore):
    """Binary array heap on the C ``heapq`` functions, invalidating entries lazily.

    >>> h = LazyHeap([(5, 'e'), (2, 'b')])
    >>> x = h.push(9, 'i')
    >>> h.decrease_key(x, 1)
    >>> [h.pop() for _ in range(len(h))]
    [(1, 'i'), (2, 'b'), (5, 'e')]
    """

    __slots__ = ("__weakref__",)  # the core (core.py, compiled) holds the fields
    KIND: ClassVar[str] = "lazy"
    BOUNDS: ClassVar[str] = "push O(log n); pop, decrease_key, change_key O(log n) amortized; remove O(1) amortized"
    WORST_CASE: ClassVar[bool] = False
    RULES: ClassVar[dict[str, str]] = _rules.RULES
    COST_UNIT: ClassVar[str] = _cost.COST_UNIT
    POTENTIAL: ClassVar[str] = _cost.POTENTIAL
    PHI_C: ClassVar[float] = _cost.PHI_C

    if TYPE_CHECKING:  # the typed public face (the compiled core takes Any keys and values)

        def __init__(self, pairs: Iterable[tuple[K, V]] = (), *, stable: bool = False) -> None: ...

        def push(self, key: K, value: V) -> Handle[K, V]: ...

        def peek(self) -> Handle[K, V]: ...

        def pop(self) -> tuple[K, V]: ...

        def decrease_key(self, handle: Handle[K, V], key: K) -> None: ...

        def change_key(self, handle: Handle[K, V], key: K) -> None: ...

        def remove(self, handle: Handle[K, V]) -> tuple[K, V]: ...

        def __copy__(self) -> LazyHeap[K, V]: ...

    def _family(self) -> type:
        return LazyHeap

    def _layout_problem(self, handles: list[Any], layout: Any) -> str | None:
        return _rules.layout_problem(self, handles, layout)

    # Rules, checks and drawing (rules.py); audit hooks (cost.py).
    def _survey(self, report: Any) -> dict[str, Any]:
        return _rules.survey(self, report)

    def _touched(self, op: str, handle: Any) -> Any:
        return _rules.touched(self, op, handle)

    def _survey_local(self, report: Any, touched: Any, handle: Any) -> None:
        _rules.survey_local(self, report, touched, handle)

    def _dot_edges(self) -> Iterator[tuple[Any, Any, str]]:
        return _rules.dot_edges(self)

    def _phi(self) -> float:
        return _cost.phi(self)

    def _cost_probe(self, op: str, handle: Any) -> Any:
        return _cost.probe(self, op, handle)

    def _cost(self, op: str, probe: Any, handle: Any) -> int:
        return _cost.actual(self, op, probe, handle)

    @classmethod
    def _bound(cls, op: str, n: int) -> float:
        return _cost.bound(op, n)
