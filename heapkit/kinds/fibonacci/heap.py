"""Fibonacci heap: a forest of heap-ordered trees in circular doubly linked lists.

Invariants
----------
* heap order: ``not (c.k < c.parent.k)`` for every non-root ``c``;
* links: every ring is closed and symmetric (``x.right.left is x``,
  ``x.left.right is x``); every node of ``p``'s child ring has ``parent is p``;
  roots have ``parent is None``; ``p.degree == |child ring of p|``;
* roots unmarked: ``parent is None  =>  not mark``;
* min: ``min`` is a root and ``not (r.k < min.k)`` for every root ``r``;
* degree-size: ``|subtree(x)| >= F(degree(x) + 2)`` (Fibonacci numbers,
  ``F(1) = F(2) = 1``), hence ``degree(x) <= D(n) = floor(log_phi n)``;
* size, ownership, counters: ``n`` nodes are reachable, each owned by this
  heap; the kept counts of roots and marks are exact.

Bounds (amortized, except meld and peek)
----------------------------------------
Cost unit: roots scanned + links + cuts + 1 (a child promoted to a root counts
as a cut).  Potential ``Phi = trees + 2 * marked``, charged with ``c = 2``.

* push 3, meld 1 (worst-case; ``Phi`` of the two heaps together is unchanged);
* decrease_key 8: k cuts cost ``1 + k`` and change Phi by at most ``4 - k``
  (CLRS 3rd ed., section 19.3, recalled from memory), so ``1 + k + 2(4 - k) <= 8``;
* pop ``5 (D(n) + 1)``: with t roots and a min of degree d, actual cost
  ``1 + d + (t - 1 + d) + L + r`` where ``L = t - 1 + d - r`` links leave r
  trees; Phi changes by ``<= r - t``, so amortized ``<= 3d + 2r - 1 <= 5D + 1``;
* remove ``max(5 (D + 1), 3D + 6)``; change_key ``max(5 (D + 1), 3D + 8)``.

The constant ``c = 2`` (not 1) is forced by this unit: consolidation pays one
scan *and* one link per root it absorbs, and each absorbed tree frees only one
unit of Phi.  ``D(n) <= log_phi n``: the i-th child (in link order) of a node has
degree ``>= i - 2`` (Fredman-Tarjan 1987; CLRS lemma 19.4, recalled from memory).

Source: M. L. Fredman, R. E. Tarjan, "Fibonacci heaps and their uses in
improved network optimization algorithms", J. ACM 34(3) (1987) 596-615
(pages recalled from memory).
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator
from typing import TYPE_CHECKING, Any, ClassVar, TypeVar

from heapkit._face import HeapFace
from heapkit.kinds.fibonacci import cost as _cost
from heapkit.kinds.fibonacci import rules as _rules
from heapkit.kinds.fibonacci.core import _FibonacciCore
from heapkit.kinds.fibonacci.rings import _Node
from heapkit.protocol import Handle

__all__ = ["FibonacciHeap"]

K = TypeVar("K")
V = TypeVar("V")


class FibonacciHeap(HeapFace[K, V], _FibonacciCore):
    """Fredman-Tarjan Fibonacci heap with handles.

    >>> h = FibonacciHeap([(5, 'e'), (2, 'b')])
    >>> x = h.push(9, 'i')
    >>> h.decrease_key(x, 1)
    >>> h.pop(), h.pop(), len(h)
    ((1, 'i'), (2, 'b'), 1)
    """

    __slots__ = ("__weakref__",)  # the core (core.py, compiled) holds the fields

    KIND: ClassVar[str] = "fibonacci"
    BOUNDS: ClassVar[str] = "push, meld O(1); decrease_key O(1) amortized; pop, remove, change_key O(log n) amortized"
    _NODE: ClassVar[type[Any]] = _Node
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

    def _touched(self, op: str, handle: Any) -> list[Any]:
        return _rules.touched(self, op, handle)

    def _survey_local(self, report: Any, touched: Any, handle: Any) -> None:
        _rules.survey_local(self, report, touched, handle)

    def _dot_edges(self) -> Iterator[tuple[Any, Any, str]]:
        return _rules.dot_edges(self)

    def _layout_problem(self, handles: list[Any], layout: Any) -> str | None:
        return _rules.layout_problem(self, handles, layout)

    def _phi(self) -> float:
        return _cost.phi(self)

    def _cost_probe(self, op: str, handle: Any) -> Any:
        return _cost.probe(self, op, handle)

    def _cost(self, op: str, probe: Any, handle: Any) -> int:
        return _cost.actual(self, op, probe, handle)

    @classmethod
    def _bound(cls, op: str, n: int) -> float:
        return _cost.bound(op, n)
