"""Pairing heap: a heap-ordered multiway tree, children in a sibling list.

Invariants
----------
* heap order: ``not (child.k < parent.k)`` for every parent/child pair;
* links: ``root.prev = root.next = None``; the first child's ``prev`` is its
  parent, every other child's ``prev`` is its left sibling, ``x.next.prev = x``;
* size: the nodes reachable from the root number ``len(heap)``, none twice;
* ownership: every node's owner token resolves to the heap's token.

Bounds (amortized unless said)
------------------------------
push, peek, meld: O(1) worst-case.  pop, remove, decrease_key, change_key:
O(log n) amortized (Fredman et al. 1986).  The standard potential is
``Phi = sum over nodes x of log2(size of x's subtree in the binary view)``,
where the binary view takes ``child`` as left and ``next`` as right.

Audit (``heapkit.audit``; hooks in ``cost.py``)
--------------------------------------------------------
Cost: links + nodes cut + 1.  ``PHI_C = 1``, ``Phi`` as above.  Recalled from
memory: FSST 1986 get O(log n) amortized for all operations from this Phi and
``log2 x + log2 y <= 2 log2(x + y) - 2``.  Constants derived here: pop
``2 log2 n + 1`` (first pass <= 2 log2(n-1) - 2 floor(r/2), second <= log2(n-1),
root -log2 n, actual r); push ``log2(n+1) + 2``; meld ``log2 N + 2``
(n1 n2 >= N - 1); decrease_key ``log2 n + 3`` (a cut only shrinks ancestors);
remove ``3 log2 n + 3``; change_key ``4 log2 n + 4`` (pair, cut, two hangs).

Source: M. L. Fredman, R. Sedgewick, D. D. Sleator, R. E. Tarjan, "The pairing
heap: a new form of self-adjusting heap", Algorithmica 1 (1986) 111-129.
Two-pass pairing: link children in pairs left to right, then fold the results
right to left.
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator
from typing import TYPE_CHECKING, Any, ClassVar, TypeVar

from heapkit._face import HeapFace
from heapkit.kinds.pairing import cost as _cost
from heapkit.kinds.pairing import rules as _rules
from heapkit.kinds.pairing.core import _Node, _PairingCore
from heapkit.protocol import Handle

__all__ = ["PairingHeap"]

K = TypeVar("K")
V = TypeVar("V")


class PairingHeap(HeapFace[K, V], _PairingCore):
    """Two-pass pairing heap with handles.

    >>> h = PairingHeap([(5, 'e'), (2, 'b')])
    >>> x = h.push(9, 'i')
    >>> h.decrease_key(x, 1)
    >>> h.pop(), h.pop(), len(h)
    ((1, 'i'), (2, 'b'), 1)
    """

    __slots__ = ("__weakref__",)  # the core (core.py, compiled) holds the fields

    KIND: ClassVar[str] = "pairing"
    _NODE: ClassVar[type[Any]] = _Node
    BOUNDS: ClassVar[str] = "push, meld, peek O(1) worst-case; pop, remove, decrease_key, change_key O(log n) amortized"
    RULES: ClassVar[dict[str, str]] = _rules.RULES
    COST_UNIT: ClassVar[str] = _cost.COST_UNIT
    PHI_C: ClassVar[float] = _cost.PHI_C
    POTENTIAL: ClassVar[str] = _cost.POTENTIAL

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
