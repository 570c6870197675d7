"""Implicit d-ary heap: a complete d-ary tree stored level by level in a list.

Invariants
----------
* heap order: ``not (a[i].k < a[(i - 1) // d].k)`` for every ``0 < i < n``;
* index: ``a[i].i == i`` for every position (the handle knows where it is);
* size: ``len(a) == len(heap)``;
* ownership: every handle's owner token resolves to the heap's token.

Bounds (worst-case)
-------------------
push, decrease_key: O(log_d n) levels, one comparison each.  pop, remove,
change_key: O(d log_d n) comparisons.  peek O(1); meld O(m log(n + m)) by pushes
or O(n + m) by Floyd's heapify, whichever is smaller; extend O(k) then a meld.

Sifting down is bottom-up: walk the smaller children to a leaf (``d - 1``
comparisons a level), then climb back to where the moved entry belongs (usually
a level or two).  For n pushes and n pops on random keys this keeps the count
near that of CPython's ``heapq``, which documents the same strategy (see the
comment block in ``Lib/heapq.py`` and Knuth, TAOCP vol. 3, ex. 5.2.3-18).
Every operation compares first and moves entries afterwards, so an exception
from ``<`` leaves the heap untouched.

Audit (``heapkit.audit``; hooks in ``dary_audit.py``)
-----------------------------------------------------
Worst-case kind: ``Phi = 0``, so amortized = actual.  Cost unit: the levels
the moving entry travels + 1 (the pushed, changed or re-seated last entry).
Bounds, with ``L(s)`` the number of levels of a complete d-ary tree of ``s``
entries (``L(s) = depth(s - 1) + 1``): push ``L(n + 1)``, pop, remove,
decrease_key, change_key ``L(n)``: an entry moves at most between the root and
the deepest level.  Meld: the cost is half the total level displacement of the
entries it moves + 1; Floyd's heapify moves entries at most the sum of the
heights, < N levels (O(N) in CLRS, 3rd ed., 6.3; "< N" recalled from memory:
N - popcount(N) for d = 2, less for larger d), and the pushes branch is
taken only when ``m * bitlength(N) < N``, so the bound is ``N + 1`` for the
combined size N.  The ``d`` factor of pop shows in the comparisons column
(``d - 1`` a level down, bottom-up), not in this unit.

Sources: J. W. J. Williams, "Algorithm 232: Heapsort", CACM 7 (1964); R. W.
Floyd, "Algorithm 245: Treesort 3", CACM 7 (1964); D. B. Johnson, "Priority
queues with update and finding minimum spanning trees", IPL 4 (1975) (d-ary).
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator
from typing import Any, ClassVar, Generic, TypeVar

from heapkit._core import HandleBase, HeapBase, empty_error, nan_error, upward_error
from heapkit.kinds.dary import cost as _cost
from heapkit.kinds.dary import rules as _rules
from heapkit.protocol import Handle

__all__ = ["DaryHeap"]

K = TypeVar("K")
V = TypeVar("V")

_new = object.__new__


class _Slot(HandleBase[K, V]):
    """Handle of an array heap entry; ``_i`` is its position in the list."""

    __slots__ = ("_i",)

    def __init__(self, key: K, k: Any, value: V, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._i = -1


class DaryHeap(HeapBase[K, V], Generic[K, V]):
    """Array heap of any arity (``dary`` is 4; ``binary``, in kinds/binary/, is 2) with handles.

    >>> h = DaryHeap([(5, 'e'), (2, 'b')], arity=4)
    >>> x = h.push(9, 'i')
    >>> h.decrease_key(x, 1)
    >>> [h.pop() for _ in range(len(h))]
    [(1, 'i'), (2, 'b'), (5, 'e')]
    """

    __slots__ = ("_a", "_d")

    KIND: ClassVar[str] = "dary"
    _NODE: ClassVar[type[Any]] = _Slot
    BOUNDS: ClassVar[str] = "worst-case: push, decrease_key O(log_d n); pop, remove, change_key O(d log_d n); peek O(1)"
    WORST_CASE: ClassVar[bool] = True
    DEFAULT_ARITY: ClassVar[int] = 4
    RULES: ClassVar[dict[str, str]] = _rules.RULES
    COST_UNIT: ClassVar[str] = _cost.COST_UNIT
    PHI_C: ClassVar[float] = _cost.PHI_C
    POTENTIAL: ClassVar[str] = _cost.POTENTIAL

    _a: list[_Slot[K, V]]
    _d: int

    def __init__(
        self, pairs: Iterable[tuple[K, V]] = (), *, stable: bool = False, arity: int | None = None
    ) -> None:
        d = self.DEFAULT_ARITY if arity is None else arity
        if not isinstance(d, int) or isinstance(d, bool) or d < 2:
            raise ValueError(f"arity must be an integer of at least 2, got {arity!r}")
        self._setup(stable)
        self._a = []
        self._d = d
        self._finish_init(pairs)

    def _options(self) -> dict[str, object]:
        return {"arity": self._d}

    def _family(self) -> type:
        return DaryHeap

    # Compare only: the position, at or above j, where an entry ordered by k
    # belongs if every ancestor of j that is larger than k moves down a level.
    def _climb(self, j: int, k: Any) -> int:
        a = self._a
        d = self._d
        while j:
            p = (j - 1) // d
            if k < a[p]._k:
                j = p
            else:
                break
        return j

    # Compare only: the position in the subtree of s where an entry ordered by
    # k belongs if the smaller child moves up a level along the way (positions
    # below m only).  Bottom-up: down to a leaf, then back up.
    def _descend(self, s: int, k: Any, m: int) -> int:
        a = self._a
        d = self._d
        i = s
        while True:
            c = d * i + 1
            if c >= m:
                break
            best = c
            bk = a[c]._k
            e = c + d
            if e > m:
                e = m
            if e - c == 4:
                # Four children written out (the dary default): pop 18% faster at
                # n = 500, 28% at 1e5 (measured).
                jk = a[c + 1]._k
                if jk < bk:
                    best = c + 1
                    bk = jk
                jk = a[c + 2]._k
                if jk < bk:
                    best = c + 2
                    bk = jk
                if a[c + 3]._k < bk:
                    best = c + 3
            else:
                for j in range(c + 1, e):
                    jk = a[j]._k
                    if jk < bk:
                        best = j
                        bk = jk
            i = best
        while i != s and k < a[i]._k:
            i = (i - 1) // d
        return i

    # Move: the ancestors of j up to (not including) t each go down a level
    # along the path; x lands at t.
    def _lower_path(self, j: int, t: int, x: Any) -> None:
        a = self._a
        d = self._d
        while j != t:
            p = (j - 1) // d
            q = a[p]
            a[j] = q
            q._i = j
            j = p
        a[t] = x
        x._i = t

    # Move: the entries on the path from below s down to t each go up a level;
    # x lands at t; what stood at s is dropped from the array.
    def _raise_path(self, s: int, t: int, x: Any) -> None:
        a = self._a
        d = self._d
        carry = a[t]
        a[t] = x
        x._i = t
        while t != s:
            t = (t - 1) // d
            q = a[t]
            a[t] = carry
            carry._i = t
            carry = q

    def push(self, key: K, value: V) -> Handle[K, V]:
        """Insert an entry and return its handle.  O(log_d n) worst-case.

        >>> DaryHeap().push(3, 'c').key
        3
        """
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None else w(key, None)
        # __new__ and slot stores instead of __init__: handle creation 122 -> 89 ns (measured).
        x = _new(_Slot)
        x._key = key
        x._k = k
        x.value = value
        x._tok = self._tok
        # _climb and _lower_path written inline: push 20% faster (measured).
        a = self._a
        d = self._d
        j = t = len(a)
        while t:
            p = (t - 1) // d
            if k < a[p]._k:
                t = p
            else:
                break
        a.append(x)
        while j != t:
            p = (j - 1) // d
            q = a[p]
            a[j] = q
            q._i = j
            j = p
        a[t] = x
        x._i = t
        self._n += 1
        self._ver += 1
        return x

    def peek(self) -> Handle[K, V]:
        """The handle of a smallest entry.  O(1) worst-case.

        >>> DaryHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        if not self._a:
            raise empty_error("peek")
        return self._a[0]

    def pop(self) -> tuple[K, V]:
        """Remove and return a smallest ``(key, value)``.  O(d log_d n) worst-case.

        >>> DaryHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        a = self._a
        m = len(a) - 1
        if m < 0:
            raise empty_error("pop")
        top = a[0]
        if m:
            last = a[m]
            t = self._descend(0, last._k, m)
            a.pop()
            self._raise_path(0, t, last)
        else:
            a.pop()
        self._n = m
        self._ver += 1
        top._tok = None
        return top._key, top.value

    def decrease_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry a key that is not larger.  O(log_d n) worst-case.

        >>> h = DaryHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        x: Any = handle
        # Preamble inline, not HeapBase._new_order: a call is ~50 ns, 5% of a pairing decrease_key (measured).
        if type(x) is not _Slot or x._tok is not self._tok:
            self._claim(x, "decrease_key")
        if key != key:
            raise nan_error("decrease_key", key)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        if x._k < k:
            raise upward_error(x, key)
        # _climb and _lower_path written inline: decrease_key 9% faster (measured).
        a = self._a
        d = self._d
        j = t = x._i
        while t:
            p = (t - 1) // d
            if k < a[p]._k:
                t = p
            else:
                break
        x._key = key
        x._k = k
        while j != t:
            p = (j - 1) // d
            q = a[p]
            a[j] = q
            q._i = j
            j = p
        a[t] = x
        x._i = t
        self._ver += 1

    def change_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry any key.  O(d log_d n) worst-case.

        >>> h = DaryHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        x: Any = handle
        # Preamble inline, not HeapBase._new_order: a call is ~50 ns, 5% of a pairing decrease_key (measured).
        if type(x) is not _Slot or x._tok is not self._tok:
            self._claim(x, "change_key")
        if key != key:
            raise nan_error("change_key", key)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        i = x._i
        if x._k < k:
            t = self._descend(i, k, len(self._a))
            x._key = key
            x._k = k
            self._raise_path(i, t, x)
        else:
            t = self._climb(i, k)
            x._key = key
            x._k = k
            self._lower_path(i, t, x)
        self._ver += 1

    def remove(self, handle: Handle[K, V]) -> tuple[K, V]:
        """Delete the entry and return ``(key, value)``.  O(d log_d n) worst-case.

        >>> h = DaryHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        x: Any = handle
        if type(x) is not _Slot or x._tok is not self._tok:
            self._claim(x, "remove")
        a = self._a
        m = len(a) - 1
        i = x._i
        if i == m:
            a.pop()
        else:
            last = a[m]
            lk = last._k
            if i and lk < a[(i - 1) // self._d]._k:
                t = self._climb(i, lk)
                a.pop()
                self._lower_path(i, t, last)
            else:
                t = self._descend(i, lk, m)
                a.pop()
                self._raise_path(i, t, last)
        self._n = m
        self._ver += 1
        x._tok = None
        return x._key, x.value

    # --- SPI ---------------------------------------------------------------
    def _build(self, pairs: Iterable[tuple[K, V]]) -> list[Any]:
        """Floyd's bottom-up heapify: O(k) for k pairs (on an empty heap)."""
        w = self._wrap
        tok = self._tok
        a = self._a
        for key, value in pairs:
            if key != key:
                raise nan_error("extend", key)
            x = _Slot(key, key if w is None else w(key, None), value, tok)
            x._i = len(a)
            a.append(x)
        handles = list(a)
        self._heapify()
        self._n = len(a)
        return handles

    # Floyd: sink every inner position, last first.  Each sink compares first.
    def _heapify(self) -> None:
        a = self._a
        m = len(a)
        for s in range((m - 2) // self._d, -1, -1):
            x = a[s]
            t = self._descend(s, x._k, m)
            self._raise_path(s, t, x)

    def _meld_from(self, other: DaryHeap[K, V]) -> None:
        a = self._a
        b = other._a
        n, m = len(a), len(b)
        tok = self._tok
        if self._pushes(n, m):
            # A few entries into many: push them, undoing in reverse on failure.
            done = 0
            try:
                for x in b:
                    j = len(a)
                    t = self._climb(j, x._k)
                    a.append(x)
                    self._lower_path(j, t, x)
                    done += 1
            except BaseException:
                for x in reversed(b[:done]):
                    self._unpush(x)
                for i, x in enumerate(b):
                    x._i = i
                raise
        else:
            whole = a + b
            self._a = whole
            for i, x in enumerate(whole):
                x._i = i
            try:
                self._heapify()
            except BaseException:
                self._a = a
                for i, x in enumerate(a):
                    x._i = i
                for i, x in enumerate(b):
                    x._i = i
                raise
        for x in b:
            x._tok = tok

    # Precondition: x was the last entry pushed and nothing moved since.
    # Restores: the array as it was before that push.  No comparison.
    def _unpush(self, x: Any) -> None:
        a = self._a
        d = self._d
        j = len(a) - 1
        chain = [j]
        while j != x._i:
            j = (j - 1) // d
            chain.append(j)
        for lo, hi in zip(chain[-1:0:-1], chain[-2::-1], strict=True):
            q = a[hi]
            a[lo] = q
            q._i = lo
        a.pop()

    def _reset(self) -> None:
        self._a = []

    def _handles(self) -> Iterator[_Slot[K, V]]:
        return iter(self._a)

    def _export(self) -> tuple[list[Any], None]:
        return list(self._a), None

    def _import(self, handles: list[Any], layout: None) -> None:
        self._a = handles
        for i, x in enumerate(handles):
            x._i = i

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for x in self._a:
            x._k = fn(x._k, x._key)

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
