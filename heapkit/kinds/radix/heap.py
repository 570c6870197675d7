"""Radix heap: monotone non-negative integer keys in buckets by highest differing bit.

Invariants (``L`` = the last popped key, 0 before the first pop)
-------------------------------------------------------------------
* key type: every key is an ``int`` (not a ``bool``) with ``key >= 0``;
* monotone: ``not (key < L)`` for every entry;
* bucket: the entry with key ``k`` sits in ``B[b(k)]`` with
  ``b(k) = (k ^ L).bit_length()`` (0 for ``k == L``, else 1 + the highest bit
  where ``k`` and ``L`` differ);
* index: ``B[b(x.key)][x._i] is x`` for every handle ``x`` (a handle keeps only
  its place ``_i``: its bucket follows from its key);
* size: ``sum(len(B[b]) for b) == len(heap)``;
* ownership: every handle's owner token resolves to the heap's token.

Every key in ``B[b]`` (b >= 1) agrees with ``L`` above bit ``b - 1`` and has a
1 there; so the smallest key ``m`` of the first non-empty bucket is the minimum,
and with ``L := m`` every other key of that bucket lands in a lower bucket.

Bounds
------
push, remove, decrease_key, change_key: O(1) worst-case (a swap-remove and an
append), keys below ``2 ** MAX_BITS`` (4096): a push or change_key that opens a new
highest bucket first appends the empty buckets below it (at most ``MAX_BITS + 1`` ever
exist; pop trims empty top buckets, each once per append).
pop: O(log C) amortized where ``C`` bounds ``key - L``; peek: O(s)
worst-case for the s entries of the first non-empty bucket (it moves nothing).  meld: O(m) for the m
entries moved.  Dijkstra with integer weights up to C: O(m + n log C).
``stable=True`` adds a scan of bucket 0 to pop: O(t) for the t entries tied
with ``L``.

Potential ``Phi = sum over entries of b(key)`` with ``c = 1``; cost unit:
entries examined + buckets skipped + 1.  Push: actual 1, Phi grows by at most
``D`` (the number of buckets in use, about log2 C), so amortized <= 1 + D.
Pop from bucket ``j`` of size ``s``: actual 1 + j + s; the popped entry takes
``j`` away and each of the other ``s - 1`` drops a bucket or more, so
amortized <= 2 (plus t when stable).  decrease_key never raises ``b``
(amortized 1); change_key: at most 1 + D; remove: 1.  (This potential puts the
log C on push; every entry is charged it once, which is the O(n log C) of
Dijkstra.  No potential can make push O(1) and pop O(log C) amortized at once
for workloads that pop little: k pops can move each of n entries k times.)

Source: R. K. Ahuja, K. Mehlhorn, J. B. Orlin, R. E. Tarjan, "Faster
algorithms for the shortest path problem", Journal of the ACM 37(2) (1990)
213-223 (the one-level radix heap; buckets here are indexed by the highest
differing bit against the last minimum, a common formulation of it).
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import TYPE_CHECKING, Any, ClassVar, TypeVar

from heapkit._face import HeapFace
from heapkit.kinds.radix import cost as _cost
from heapkit.kinds.radix import rules as _rules
from heapkit.kinds.radix.core import MAX_BITS, _Item, _RadixCore
from heapkit.protocol import Handle

__all__ = ["MAX_BITS", "RadixHeap"]

#: Radix keys are ints (``bool`` is refused at run time); ``K`` lets a caller name a subtype.
K = TypeVar("K", bound=int)
V = TypeVar("V")


class RadixHeap(HeapFace[K, V], _RadixCore):
    """Radix heap for monotone non-negative integer keys (Dijkstra, event times).

    >>> h = RadixHeap([(5, 'e'), (2, 'b')])
    >>> x = h.push(9, 'i')
    >>> h.decrease_key(x, 3)
    >>> [h.pop() for _ in range(len(h))]
    [(2, 'b'), (3, 'i'), (5, 'e')]
    >>> h.push(1, 'a')  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    heapkit.errors.KeyOrderError: push: key 1 is too low: ... the last popped key, which is 5
    """

    __slots__ = ("__weakref__",)  # the core (core.py, compiled) holds the fields

    KIND: ClassVar[str] = "radix"
    _NODE: ClassVar[type[Any]] = _Item
    BOUNDS: ClassVar[str] = "monotone int keys; push, decrease_key, remove O(1); pop O(log C) amortized"
    #: Takes only monotone non-negative int keys (the benchmark and tools select by this).
    MONOTONE: ClassVar[bool] = True
    RULES: ClassVar[dict[str, str]] = _rules.RULES
    COST_UNIT: ClassVar[str] = _cost.COST_UNIT
    POTENTIAL: ClassVar[str] = _cost.POTENTIAL
    PHI_C: ClassVar[float] = _cost.PHI_C

    if TYPE_CHECKING:  # the typed public face (the compiled core takes Any keys and values)

        def __init__(self, pairs: Iterable[tuple[K, V]] = (), *, stable: bool = False) -> None: ...

        @property
        def last(self) -> int: ...

        def push(self, key: K, value: V) -> Handle[K, V]: ...

        def peek(self) -> Handle[K, V]: ...

        def pop(self) -> tuple[K, V]: ...

        def decrease_key(self, handle: Handle[K, V], key: K) -> None: ...

        def change_key(self, handle: Handle[K, V], key: K) -> None: ...

        def remove(self, handle: Handle[K, V]) -> tuple[K, V]: ...

    # --- SPI ---------------------------------------------------------------
    def _spawn(self) -> RadixHeap[K, V]:
        new: RadixHeap[K, V] = RadixHeap(stable=self._stable)
        new._last = self._last
        return new

    def _layout_problem(self, handles: list[Any], layout: Any) -> str | None:
        return _rules.layout_problem(self, handles, layout)

    # Rules, checks and drawing (rules.py); audit hooks (cost.py).
    def _survey(self, report: Any) -> dict[str, Any]:
        return _rules.survey(self, report)

    def _touched(self, op: str, handle: Any) -> Any:
        return _rules.touched(self, op, handle)

    def _survey_local(self, report: Any, touched: Any, handle: Any) -> None:
        _rules.survey_local(self, report, touched, handle)

    def _phi(self) -> float:
        return _cost.phi(self)

    def _cost_probe(self, op: str, handle: Any) -> Any:
        return _cost.probe(self, op, handle)

    def _cost(self, op: str, probe: Any, handle: Any) -> int:
        return _cost.actual(self, op, probe, handle)

    # An instance method, not a classmethod: the bound depends on the buckets in use.
    def _bound(self, op: str, n: int) -> float:
        return _cost.bound(self, op, n)
