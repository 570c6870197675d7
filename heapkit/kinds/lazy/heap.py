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

from collections.abc import Callable, Iterable, Iterator
from heapq import heapify, heappop, heappush
from typing import Any, ClassVar, TypeVar

from heapkit._core import (
    HeapBase,
    Owner,
    empty_error,
    foreign_error,
    nan_error,
    owner_root,
    upward_error,
)
from heapkit._face import HeapFace
from heapkit.errors import InvalidHandleError
from heapkit.kinds.lazy import cost as _cost
from heapkit.kinds.lazy import rules as _rules
from heapkit.kinds.lazy.entries import (
    _RAW,
    _fresh,
    _Handle,
    _normal,
    _Ord,
    _order,
    _unpop,
    _unpush,
    _user_key,
    flatten,
    rebuild,
)
from heapkit.protocol import Handle

__all__ = ["LazyHeap"]

K = TypeVar("K")
V = TypeVar("V")


class LazyHeap(HeapFace[K, V], HeapBase):
    """Binary array heap on the C ``heapq`` functions, invalidating entries lazily.

    >>> h = LazyHeap([(5, 'e'), (2, 'b')])
    >>> x = h.push(9, 'i')
    >>> h.decrease_key(x, 1)
    >>> [h.pop() for _ in range(len(h))]
    [(1, 'i'), (2, 'b'), (5, 'e')]
    """

    __slots__ = ("__weakref__", "_a", "_stale")
    KIND: ClassVar[str] = "lazy"
    BOUNDS: ClassVar[str] = "push O(log n); pop, decrease_key, change_key O(log n) amortized; remove O(1) amortized"
    WORST_CASE: ClassVar[bool] = False
    RULES: ClassVar[dict[str, str]] = _rules.RULES
    COST_UNIT: ClassVar[str] = _cost.COST_UNIT
    POTENTIAL: ClassVar[str] = _cost.POTENTIAL
    PHI_C: ClassVar[float] = _cost.PHI_C

    _a: list[tuple[Any, _Handle[K, V], Owner]]
    _stale: int

    def __init__(self, pairs: Iterable[tuple[K, V]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._a = []
        self._stale = 0
        self._finish_init(pairs)

    def _family(self) -> type:
        return LazyHeap

    # --- ownership ---------------------------------------------------------
    def __contains__(self, handle: object) -> bool:
        """True if ``handle`` is live in this heap.  O(1) amortized.

        >>> h = LazyHeap(); x = h.push(1, 'a'); x in h, x in LazyHeap()
        (True, False)
        """
        e = getattr(handle, "_e", None) if isinstance(handle, _Handle) else None
        if type(e) is not tuple:
            return False
        tok = e[2]
        return tok is self._tok or owner_root(tok) is self._tok

    def _claim(self, h: Any, op: str) -> Any:
        """Slow path of the ownership check: the handle's entry, or raise."""
        if not isinstance(h, _Handle):
            raise foreign_error(op, h)
        e = h._e
        if type(e) is not tuple:
            raise InvalidHandleError(f"{op}: handle {h!r} is dead (its entry was popped, removed or cleared)")
        if owner_root(e[2]) is not self._tok:
            raise InvalidHandleError(f"{op}: handle {h!r} belongs to another heap")
        return e

    # --- protocol ----------------------------------------------------------
    def push(self, key: K, value: V) -> Handle[K, V]:
        """Insert an entry and return its handle.  O(log n) worst-case.

        >>> LazyHeap().push(3, 'c').key
        3
        """
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None and type(key) in _RAW else _Ord(key) if w is None else w(key, None)
        h: _Handle[K, V] = _Handle()
        h.value = value
        h._e = e = (k, h, self._tok)
        a = self._a
        try:
            heappush(a, e)
        except BaseException:
            _unpush(a, e)
            h._e = k
            raise
        self._n += 1
        self._ver += 1
        return h

    def peek(self) -> Handle[K, V]:
        """The handle of a smallest entry.  O(1) amortized (drops stale entries on top).

        >>> LazyHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        if not self._n:
            raise empty_error("peek")
        if self._stale >= self._n:
            self._compact()  # as pop would: a compaction may reorder tied entries
        a = self._a
        while True:
            e = a[0]
            h = e[1]
            if h._e is e:
                return h
            last = a[-1]
            try:
                heappop(a)
            except BaseException:
                _unpop(a, e, last)
                raise
            self._stale -= 1

    def pop(self) -> tuple[K, V]:
        """Remove and return a smallest ``(key, value)``.  O(log n) amortized.

        >>> LazyHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        if not self._n:
            raise empty_error("pop")
        if self._stale >= self._n:
            self._compact()
        a = self._a
        while True:
            e = a[0]
            last = a[-1]
            try:
                heappop(a)
            except BaseException:
                _unpop(a, e, last)
                raise
            h = e[1]
            if h._e is e:
                break
            self._stale -= 1
        k = e[0]
        h._e = k
        self._n -= 1
        self._ver += 1
        return (k if type(k) in _RAW else _user_key(k)), h.value

    def decrease_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry a key that is not larger.  O(log n) amortized.

        >>> h = LazyHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        x: Any = handle
        # Preamble inline (its own entry tuples): a call is ~50 ns, 5% of a pairing decrease_key (measured).
        e = x._e if type(x) is _Handle else None
        if type(e) is not tuple or e[2] is not self._tok:
            e = self._claim(x, "decrease_key")
        if key != key:
            raise nan_error("decrease_key", key)
        w = self._wrap
        k = key if w is None and type(key) in _RAW else _Ord(key) if w is None else w(key, e[0])
        if e[0] < k:
            raise upward_error(x, key)
        self._repush(x, k)

    def change_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry any key.  O(log n) amortized.

        >>> h = LazyHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        x: Any = handle
        e = x._e if type(x) is _Handle else None
        if type(e) is not tuple or e[2] is not self._tok:
            e = self._claim(x, "change_key")
        if key != key:
            raise nan_error("change_key", key)
        w = self._wrap
        k = key if w is None and type(key) in _RAW else _Ord(key) if w is None else w(key, e[0])
        self._repush(x, k)

    # Push a fresh entry for live handle x with ordering object k (the old one goes stale); compacts if stale >= n.
    def _repush(self, x: Any, k: Any) -> None:
        if self._stale >= self._n:
            self._compact()
        a = self._a
        e = (k, x, self._tok)
        try:
            heappush(a, e)
        except BaseException:
            _unpush(a, e)
            raise
        x._e = e
        self._stale += 1
        self._ver += 1

    def remove(self, handle: Handle[K, V]) -> tuple[K, V]:
        """Delete the entry and return ``(key, value)``.  O(1) amortized (marks it stale).

        >>> h = LazyHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        x: Any = handle
        e = x._e if type(x) is _Handle else None
        if type(e) is not tuple or e[2] is not self._tok:
            e = self._claim(x, "remove")
        if self._stale >= self._n:
            self._compact()
        k = e[0]
        x._e = k
        self._stale += 1
        self._n -= 1
        self._ver += 1
        return _user_key(k), x.value

    # Copy the live entries to a new list and heapify it; on failure the old
    # list is untouched.  O(n).
    def _compact(self) -> None:
        b = [e for e in self._a if e[1]._e is e]
        heapify(b)
        self._a = b
        self._stale = 0

    # --- SPI ---------------------------------------------------------------
    def _build(self, pairs: Iterable[tuple[K, V]]) -> list[Any]:
        """Heapify the new entries: O(k) for k pairs (on an empty heap)."""
        w = self._wrap
        tok = self._tok
        handles: list[Any] = []
        b: list[Any] = []
        for key, value in pairs:
            if key != key:
                raise nan_error("extend", key)
            h = _fresh(_order(key) if w is None else w(key, None), value)
            handles.append(h)
            b.append((h._e, h, tok))
        heapify(b)
        for e in b:
            e[1]._e = e
        self._a = b
        self._n = len(b)
        return handles

    def _pushes_win(self, m: int) -> bool:
        """Meld m live entries by pushes (else by one heapify of everything)."""
        n = len(self._a)
        return m * max(1, n.bit_length()) < n + m

    def _meld_from(self, other: LazyHeap[K, V]) -> None:
        tok = self._tok
        fresh = [(e[0], e[1], tok) for e in other._a if e[1]._e is e]
        a = self._a
        if not a and not other._stale:
            self._a = fresh  # other's list order: already a heap (extend into an empty heap)
        elif self._pushes_win(len(fresh)):
            done = 0
            try:
                for e in fresh:
                    heappush(a, e)
                    done += 1
            except BaseException:
                for e in reversed(fresh[: done + 1]):
                    _unpush(a, e)
                raise
        else:
            b = [e for e in a if e[1]._e is e]
            b += fresh
            heapify(b)
            self._a = b
            self._stale = 0
        for e in fresh:
            e[1]._e = e

    def _reset(self) -> None:
        self._a = []
        self._stale = 0

    def _kill(self, h: Any) -> None:
        h._e = h._e[0]

    def _handles(self) -> Iterator[_Handle[K, V]]:
        # A snapshot: peek may drop stale entries while an iteration runs.
        for e in list(self._a):
            h = e[1]
            if h._e is e:
                yield h

    def _export(self) -> tuple[list[Any], list[Any]]:
        return flatten(self._a)

    def _import(self, handles: list[Any], layout: list[Any]) -> None:
        self._a, self._stale = rebuild(handles, layout, self._tok, self._wrap)

    def _layout_problem(self, handles: list[Any], layout: Any) -> str | None:
        return _rules.layout_problem(self, handles, layout)

    def __setstate__(self, state: tuple[list[Any], Any]) -> None:
        handles, layout = self._validate(state, _Handle)
        self._import(handles, layout)
        self._n = len(handles)

    def __copy__(self) -> LazyHeap[K, V]:
        """A new heap with the same entries (keys and values shared) and new handles."""
        handles, layout = self._export()
        new: LazyHeap[K, V] = self._spawn()
        new.__setstate__(([_fresh(h._e[0], h.value) for h in handles], layout))
        return new

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        tok = self._tok
        a = self._a
        for i, e in enumerate(a):
            h = e[1]
            k = e[0]
            ne = (fn(k, _user_key(k)), h, tok)
            a[i] = ne
            if h._e is e:
                h._e = ne

    def _rewrap(self, wrap: Any) -> None:
        super()._rewrap(wrap)
        if wrap is None:
            self._map_order(lambda o, key: _normal(o))

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
