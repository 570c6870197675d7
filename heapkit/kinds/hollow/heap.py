"""Hollow heap (one-tree variant): a heap-ordered DAG whose nodes hold an entry or are hollow.

Invariants
----------
Each node ``x`` has an ordering object ``x.k`` (kept when it goes hollow), a rank,
a ranked child list ``x.rk`` and an unranked child list ``x.uk`` (both linked by
``nx``), and at most a second parent ``x.ep``.  ``h`` is the one root.

* heap order: ``not (c.k < p.k)`` for every DAG edge ``p -> c`` (hollow nodes too);
* rank: the ranked children of a full node of rank ``r`` have ranks ``r-1, r-2, ..., 0``
  in list order; a hollow node's ranked children are a prefix of that list;
* second parent: ``c.ep = p`` only for a hollow ``c`` that is the last node of
  ``p.uk`` and also a child of one other (first) parent; so every non-root node
  has exactly ``1 + (ep is not None)`` parents;
* root: ``h`` is full, has no parent, and ``not (f.k < h.k)`` for every full ``f``;
* size: the full nodes number ``len(heap)``; the hollow nodes number ``H`` and
  ``H <= 2 len(heap) + 16`` after every operation (rebuild keeps memory O(n));
* ownership, handle: every handle's owner token resolves to this heap's; a live
  handle ``e`` points at a full node ``e._node`` with ``e._node.item is e`` and
  the same key and ordering object.

Consequence (Hansen et al., recalled from memory): a node of rank ``r`` has at
least ``F(r+3) - 1`` descendants (it keeps ranked children of ranks ``r-1`` and
``r-2``), so ranks are at most ``log_phi N`` for ``N`` nodes.

Bounds
------
push, meld, peek: O(1) worst-case.  decrease_key: O(1) worst-case (one
comparison with the root, one link) plus a rebuild, O(n) without comparisons,
once per Theta(n) hollow nodes: O(1) amortized.  pop, remove, change_key: O(log n)
amortized.

decrease_key on a full non-root node ``u`` of rank ``r`` makes a new node ``v``
of rank ``max(0, r-2)`` holding the entry; ``v`` takes ``u``'s ranked children of
ranks ``r-3 .. 0`` (a tail of ``u.rk``, moved in O(1)) and ``u`` itself as its
last unranked child (``u.ep = v``); ``u`` goes hollow, keeping ranks ``r-1, r-2``.

Audit: cost unit = links + hollow nodes destroyed + 1.  Potential
``Phi = U + HR + H`` with ``c = 2``: U = unranked child edges (second-parent
edges included), HR = ranked children of hollow nodes, H = hollow nodes.  A
pop destroying D nodes frees at least as many edges as it makes roots T, links
T - 1 times (at most R + 1 of them unranked, R the rank bound), so its amortized
cost is at most 4R + 6; push and meld 4; decrease_key 12; remove 2R + 3 (the
hollow node pays for its ranked children); change_key 4R + 10.

Source: T. D. Hansen, H. Kaplan, R. E. Tarjan, U. Zwick, "Hollow heaps",
ICALP 2015, and ACM Transactions on Algorithms 13(3) (2017).  The potential and
constants above are this module's own accounting in the paper's style.
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import TYPE_CHECKING, Any, ClassVar, TypeVar

from heapkit._face import HeapFace
from heapkit.kinds.hollow import cost as _cost
from heapkit.kinds.hollow import rules as _rules
from heapkit.kinds.hollow.core import _HollowCore
from heapkit.kinds.hollow.dag import _Entry
from heapkit.protocol import Handle

__all__ = ["HollowHeap"]

K = TypeVar("K")
V = TypeVar("V")


class HollowHeap(HeapFace[K, V], _HollowCore):
    """Hollow heap with handles: O(1) push, meld and decrease_key.

    >>> h = HollowHeap([(5, 'e'), (2, 'b')])
    >>> x = h.push(9, 'i')
    >>> h.decrease_key(x, 1)
    >>> [h.pop() for _ in range(len(h))]
    [(1, 'i'), (2, 'b'), (5, 'e')]
    """

    __slots__ = ("__weakref__",)  # the core (core.py, compiled) holds the fields

    KIND: ClassVar[str] = "hollow"
    BOUNDS: ClassVar[str] = "push, meld, decrease_key O(1) worst-case; pop, remove, change_key O(log n) amortized"
    _NODE: ClassVar[type[Any]] = _Entry
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

    @classmethod
    def _bound(cls, op: str, n: int) -> float:
        return _cost.bound(op, n)
