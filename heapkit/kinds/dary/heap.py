"""Implicit d-ary heap: a complete d-ary tree stored level by level in a list.

Invariants
----------
* heap order: ``not (a[i].k < a[(i - 1) // d].k)`` for every ``0 < i < n``;
* index: ``a[i].i == i`` for every position (the handle knows where it is);
* size: ``len(a) == len(heap)``;
* ownership: every handle's owner token resolves to the heap's token;
* pair verdicts (arity 4 only): for each pair ``p`` of siblings at ``2p + 1`` and
  ``2p + 2`` (both ``< n``), ``w[p] == 2`` implies ``a[2p+2].k < a[2p+1].k``,
  ``w[p] == 1`` implies ``not (a[2p+2].k < a[2p+1].k)``; 0 is "unknown".

Bounds (worst-case)
-------------------
push, decrease_key: O(log_d n) levels, one comparison each.  pop, remove,
change_key: O(d log_d n) comparisons.  peek O(1); meld O(m log(n + m)) by pushes
or O(n + m) by Floyd's heapify, whichever is smaller; extend O(k) then a meld.

Sifting down is bottom-up (I. Wegener, "Bottom-up-heapsort, a new variant of
heapsort beating, on an average, quicksort", TCS 118 (1993); details recalled
from memory): walk the least children to a leaf, then climb back to where the
moved entry belongs (usually a level or two).  The least of d children costs
``d - 1`` comparisons, 1.5 per binary level at d = 4 (pops alone ~1.5 log2(n!)),
unless earlier verdicts are kept: at arity 4 the two sibling pairs of a group
are a two-round tournament whose first-round results stay in ``w`` until an
entry of the pair changes, so a level costs 1 comparison with both verdicts
known, 2 with one (the usual case on a pop path: the last pop replaced one
winner), 3 with none.  n pushes + n pops: 1.63 -> 1.16 log2(n!) at n = 1e5,
as ``heapq``'s binary heap (measured).  Every operation compares first and moves
entries afterwards, so an exception from ``<`` leaves the heap untouched (a
verdict is stored only after its comparison returned, and forgetting is safe).

Audit: worst-case, ``Phi = 0``; the cost unit and the bounds with their derivation are in
``cost.py``.  The operations are in ``core.py`` (compiled in the compiled build, with the
walks of ``paths.py``); this module keeps the public class: options, the bulk SPI
(``bulk.py``) and the hooks of the rules (``rules.py``) and the audit (``cost.py``).

Sources: J. W. J. Williams, "Algorithm 232: Heapsort", CACM 7 (1964); R. W.
Floyd, "Algorithm 245: Treesort 3", CACM 7 (1964); D. B. Johnson, "Priority
queues with update and finding minimum spanning trees", IPL 4 (1975) (d-ary).
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator
from typing import TYPE_CHECKING, Any, ClassVar, TypeVar

from heapkit._face import HeapFace
from heapkit.kinds.dary import bulk as _bulk
from heapkit.kinds.dary import cost as _cost
from heapkit.kinds.dary import rules as _rules
from heapkit.kinds.dary.core import _DaryCore
from heapkit.kinds.dary.slot import _Slot
from heapkit.protocol import Handle

__all__ = ["DaryHeap"]

K = TypeVar("K")
V = TypeVar("V")


class DaryHeap(HeapFace[K, V], _DaryCore):
    """Array heap of any arity (``dary`` is 4; ``binary``, in kinds/binary/, is 2) with handles.

    >>> h = DaryHeap([(5, 'e'), (2, 'b')], arity=4)
    >>> x = h.push(9, 'i')
    >>> h.decrease_key(x, 1)
    >>> [h.pop() for _ in range(len(h))]
    [(1, 'i'), (2, 'b'), (5, 'e')]
    """

    __slots__ = ("__weakref__",)  # the core (core.py, compiled) holds the fields

    KIND: ClassVar[str] = "dary"
    _NODE: ClassVar[type[Any]] = _Slot
    BOUNDS: ClassVar[str] = "worst-case: push, decrease_key O(log_d n); pop, remove, change_key O(d log_d n); peek O(1)"
    WORST_CASE: ClassVar[bool] = True
    DEFAULT_ARITY: ClassVar[int] = 4
    RULES: ClassVar[dict[str, str]] = _rules.RULES
    COST_UNIT: ClassVar[str] = _cost.COST_UNIT
    PHI_C: ClassVar[float] = _cost.PHI_C
    POTENTIAL: ClassVar[str] = _cost.POTENTIAL

    def __init__(self, pairs: Iterable[tuple[K, V]] = (), *, stable: bool = False, arity: int | None = None) -> None:
        d = self.DEFAULT_ARITY if arity is None else arity
        if not isinstance(d, int) or isinstance(d, bool) or d < 2:
            raise ValueError(f"arity must be an integer of at least 2, got {arity!r}")
        self._setup(stable)
        self._a = []
        self._d = d
        self._w = []
        self._finish_init(pairs)

    if TYPE_CHECKING:  # the typed public face (the compiled core takes Any keys and values)

        def push(self, key: K, value: V) -> Handle[K, V]: ...

        def peek(self) -> Handle[K, V]: ...

        def pop(self) -> tuple[K, V]: ...

        def decrease_key(self, handle: Handle[K, V], key: K) -> None: ...

        def change_key(self, handle: Handle[K, V], key: K) -> None: ...

        def remove(self, handle: Handle[K, V]) -> tuple[K, V]: ...

    def _options(self) -> dict[str, object]:
        return {"arity": self._d}

    def _family(self) -> type:
        return DaryHeap

    # --- SPI ---------------------------------------------------------------
    # Floyd's build, meld and the undo of pushes live in bulk.py; the SPI in _core.py
    # calls these names.
    def _build(self, pairs: Iterable[tuple[K, V]]) -> list[Any]:
        return _bulk.build(self, pairs)

    def _heapify(self) -> None:
        _bulk.heapify(self)

    def _meld_from(self, other: DaryHeap[K, V]) -> None:
        _bulk.meld_from(self, other)

    def _unpush(self, x: Any) -> None:
        _bulk.unpush(self, x)

    # The meld strategy: push m entries into n (m log(n + m) work) or heapify the
    # concatenation (n + m work), whichever bound is smaller.
    @staticmethod
    def _pushes(n: int, m: int) -> bool:
        return m * (n + m).bit_length() < n + m

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

    # An instance method, not a classmethod: the bound depends on the arity.
    def _bound(self, op: str, n: int) -> float:
        return _cost.bound(self, op, n)
