"""Array weak heap with reverse bits, handles and lazily settled insertions.

Invariants (``a``: the array of entries, ``r``: one reverse bit per position, ``n = len(a)``)
---------------------------------------------------------------------------------------------
* shape: position ``i`` has children ``2i + r[i]`` (left) and ``2i + 1 - r[i]`` (right),
  those below ``n``; ``r[0] == 0``, so the root has only the right child 1;
* distinguished ancestor: ``da(j)`` for ``j >= 1`` climbs from ``j`` while it is a left
  child (``j & 1 == r[j >> 1]``), then takes the parent;
* weak-heap order: ``not a[j] < a[da(j)]`` for every settled ``j >= 1``, equivalently the
  entry at ``i`` is not above any entry of ``i``'s right subtree, so ``a[0]`` is a minimum
  once nothing is pending;
* pending: the positions ``j >= s`` (entries appended since the last settle) and the
  positions in ``up`` (each ``< s``) are exempt from the order until the next settle;
* reverse bits: ``len(r) == n``, every bit is 0 or 1, a position without children has 0;
* index: ``a[i]._i == i``; size: ``n == len(heap)``; ownership as in every kind.

Operations and bounds (amortized, in key comparisons; ``L = bit_length(n)``)
---------------------------------------------------------------------------
push appends (0 comparisons; 2 amortized).  Settling, done by the first pop, peek,
change_key upwards or remove after pushes, joins every pending position with its
distinguished ancestor from the highest position down; a join that swaps marks the
ancestor, which is joined in turn.  For ``k`` appended positions the marked ancestors
number at most ``k + 2L`` (a contiguous run of ``k`` positions has at most
``ceil(k / 2^l) + 1`` ancestors ``l`` levels up), so a settle costs at most
``2k + 2L`` comparisons.  pop moves the last entry to the root, walks the left
children from position 1 to the bottom and joins the root with each position on the
way back up: at most ``L`` comparisons.  decrease_key climbs the distinguished
ancestors (at most ``L``); change_key upwards and remove sink along one path.  All
operations are O(log n) worst-case time except a settle (amortized).  Meld appends
the other heap's entries as pending positions: O(m) moves and no comparison; the next
settle pays at most ``2m + 2L`` comparisons for them (amortized O(m)).  extend is a
meld of a heap of pending entries: the first settle is Dutton's O(n) construction,
``n - 1`` comparisons.

The operations live in ``core.py`` (compiled in the compiled build); this module keeps the
public class, its rules/cost hooks and its typed face.

Exception safety: every sift collects its comparisons first (the d-ancestor chain or
the sinking path does not depend on the bits it flips) and moves entries afterwards;
a settle changes one join at a time, each a complete step, and keeps what is still
pending, so a raising ``<`` (or ``bool()`` of its result) leaves a valid heap.

Sources: R. D. Dutton, "Weak-heap sort", BIT 33 (1993); S. Edelkamp, A. Elmasry,
J. Katajainen, "The weak-heap data structure: variants and applications", JDA 16
(2012).  Recalled from memory, not looked up: the index formulas with reverse bits,
the join, the bottom-up construction with ``n - 1`` comparisons and the sift-down
along the left spine; the lazy settling of a run of insertions follows the bulk
insertion idea of the 2012 survey as recalled, with its bound derived above.
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator
from typing import TYPE_CHECKING, Any, ClassVar, TypeVar

from heapkit._face import HeapFace
from heapkit.kinds.dary.slot import _Slot  # the array-position handle, shared with the d-ary heap
from heapkit.kinds.weak import cost as _cost
from heapkit.kinds.weak import rules as _rules
from heapkit.kinds.weak.core import _WeakCore, d_ancestor
from heapkit.protocol import Handle

__all__ = ["WeakHeap", "d_ancestor"]

K = TypeVar("K")
V = TypeVar("V")


class WeakHeap(HeapFace[K, V], _WeakCore):
    """Weak heap in an array (Dutton 1993) with handles; the fewest key comparisons.

    ``meld`` appends the other heap's entries as pending positions: O(m) moves, no
    comparison; the next pop, peek, upward change_key or remove settles them.

    >>> h = WeakHeap([(5, 'e'), (2, 'b')])
    >>> x = h.push(9, 'i')
    >>> h.decrease_key(x, 1)
    >>> [h.pop() for _ in range(len(h))]
    [(1, 'i'), (2, 'b'), (5, 'e')]
    """

    __slots__ = ("__weakref__",)  # the core (core.py, compiled) holds the fields

    KIND: ClassVar[str] = "weak"
    BOUNDS: ClassVar[str] = (
        "amortized comparisons: push 2, pop/remove/change_key 3 log2 n, decrease_key log2 n; meld O(m)"
    )
    WORST_CASE: ClassVar[bool] = False
    RULES: ClassVar[dict[str, str]] = _rules.RULES
    COST_UNIT: ClassVar[str] = _cost.COST_UNIT
    POTENTIAL: ClassVar[str] = _cost.POTENTIAL
    PHI_C: ClassVar[float] = _cost.PHI_C
    _NODE: ClassVar[type[Any]] = _Slot

    if TYPE_CHECKING:  # the typed public face (the compiled core takes Any keys and values)

        def __init__(self, pairs: Iterable[tuple[K, V]] = (), *, stable: bool = False) -> None: ...

        def push(self, key: K, value: V) -> Handle[K, V]: ...

        def peek(self) -> Handle[K, V]: ...

        def pop(self) -> tuple[K, V]: ...

        def decrease_key(self, handle: Handle[K, V], key: K) -> None: ...

        def change_key(self, handle: Handle[K, V], key: K) -> None: ...

        def remove(self, handle: Handle[K, V]) -> tuple[K, V]: ...

    def _family(self) -> type:
        return WeakHeap

    def _pending(self) -> int:
        """Positions exempt from the order until the next settle (the root never counts)."""
        return max(0, len(self._a) - max(self._s, 1)) + len(self._up)

    # Rules, checks and drawing (rules.py); audit hooks (cost.py).
    def _survey(self, report: Any) -> dict[str, Any]:
        return _rules.survey(self, report)

    def _dot_edges(self) -> Iterator[tuple[Any, Any, str]]:
        return _rules.dot_edges(self)

    def _layout_problem(self, handles: list[Any], layout: Any) -> str | None:
        return _rules.layout_problem(handles, layout)

    def _phi(self) -> float:
        return _cost.phi(self)

    def _cost_probe(self, op: str, handle: Any) -> Any:
        return _cost.probe(self, op, handle)

    def _cost(self, op: str, probe: Any, handle: Any) -> int:
        return _cost.actual(self, op, probe, handle)

    @classmethod
    def _bound(cls, op: str, n: int) -> float:
        return _cost.bound(op, n)
