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

from collections.abc import Callable, Iterable, Iterator
from operator import attrgetter
from typing import Any, ClassVar, Generic, TypeVar

from heapkit._core import HandleBase, HeapBase, empty_error, upward_error
from heapkit._face import HeapFace
from heapkit.errors import KeyOrderError
from heapkit.kinds.radix import cost as _cost
from heapkit.kinds.radix import rules as _rules
from heapkit.protocol import Handle

__all__ = ["RadixHeap"]

#: Radix keys are ints (``bool`` is refused at run time); ``K`` lets a caller name a subtype.
K = TypeVar("K", bound=int)
V = TypeVar("V")

_order = attrgetter("_k")


class _Item(HandleBase, Generic[K, V]):
    """Handle of a radix heap entry: ``_i`` is its place in its bucket."""

    __slots__ = ("_i",)

    def __init__(self, key: K, k: Any, value: V, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._i = 0


#: Keys are below ``2 ** MAX_BITS``: at most ``MAX_BITS + 1`` buckets ever exist.
MAX_BITS = 4096


def _key_error(op: str, key: object, last: int) -> KeyOrderError:
    if isinstance(key, bool) or not isinstance(key, int):
        why = f"is a {type(key).__name__}"
    elif key < 0:
        why = "is negative"
    elif key >= last:
        return KeyOrderError(
            f"{op}: key of {key.bit_length()} bits is too large: radix heap keys are below 2**{MAX_BITS}"
        )
    else:
        why = "is too low"
    return KeyOrderError(
        f"{op}: key {key!r} {why}: radix heap keys are non-negative ints, "
        f"never below the last popped key, which is {last!r}"
    )


# The node class's __new__: object's when pure; a compiled HandleBase refuses object.__new__.
_new = _Item.__new__


class RadixHeap(HeapFace[K, V], HeapBase):
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

    __slots__ = ("__weakref__", "_buckets", "_last")

    KIND: ClassVar[str] = "radix"
    _NODE: ClassVar[type[Any]] = _Item
    BOUNDS: ClassVar[str] = "monotone int keys; push, decrease_key, remove O(1); pop O(log C) amortized"
    #: Takes only monotone non-negative int keys (the benchmark and tools select by this).
    MONOTONE: ClassVar[bool] = True
    RULES: ClassVar[dict[str, str]] = _rules.RULES
    COST_UNIT: ClassVar[str] = _cost.COST_UNIT
    POTENTIAL: ClassVar[str] = _cost.POTENTIAL
    PHI_C: ClassVar[float] = _cost.PHI_C

    _buckets: list[list[_Item[K, V]]]
    _last: int

    def __init__(self, pairs: Iterable[tuple[K, V]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._buckets = [[]]
        self._last = 0
        self._finish_init(pairs)

    @property
    def last(self) -> int:
        """The last popped key (0 before the first pop): no key may go below it.  O(1) worst-case.

        >>> h = RadixHeap([(4, 'd')]); h.pop(); h.last
        (4, 'd')
        4
        """
        return self._last

    # Precondition: x is not in any bucket, b <= MAX_BITS.  Restores: x is at the end of bucket b.
    def _put(self, x: Any, b: int) -> None:
        buckets = self._buckets
        while b >= len(buckets):
            buckets.append([])
        bl = buckets[b]
        x._i = len(bl)
        bl.append(x)

    # Precondition: x is in its bucket.  Restores: it is not; the bucket's last
    # entry fills its place (swap-remove, O(1)).
    def _take(self, x: Any) -> None:
        bl = self._buckets[(x._key ^ self._last).bit_length()]
        y = bl.pop()
        if y is not x:
            i = x._i
            bl[i] = y
            y._i = i

    def push(self, key: K, value: V) -> Handle[K, V]:
        """Insert an entry and return its handle.  O(1) worst-case.

        >>> RadixHeap().push(3, 'c').key
        3
        """
        last = self._last
        if (type(key) is not int and (isinstance(key, bool) or not isinstance(key, int))) or key < last:
            raise _key_error("push", key, last)
        w = self._wrap
        # fields set without an __init__ frame: push 13% faster (100k pushes, min of 9)
        x = _new(_Item)
        x._key = key
        x._k = key if w is None else w(key, None)
        x.value = value
        x._tok = self._tok
        b = (key ^ last).bit_length()
        buckets = self._buckets
        if b < len(buckets):
            # inlined _put: push 12% faster (100k pushes, min of 9)
            bl = buckets[b]
            x._i = len(bl)
            bl.append(x)
        elif b > MAX_BITS:
            raise _key_error("push", key, last)
        else:
            self._put(x, b)
        self._n += 1
        self._ver += 1
        return x

    # Precondition: the heap is not empty.  Restores: bucket 0 is not empty
    # (moves the first non-empty bucket down around its minimum).  Compares
    # before it moves anything.
    def _settle(self) -> list[_Item[K, V]]:
        buckets = self._buckets
        b0 = buckets[0]
        if b0:
            return b0
        # next(filter(None, ...)) finds the first non-empty bucket in C: 22% faster than a loop
        src = next(filter(None, buckets))
        m = min(src, key=_order)
        last = m._key
        self._last = last
        for x in src:
            if x is not m:
                bl = buckets[(x._key ^ last).bit_length()]
                x._i = len(bl)
                bl.append(x)
        m._i = len(b0)
        b0.append(m)  # last in bucket 0: pop takes the entry peek named
        src.clear()
        while not buckets[-1] and len(buckets) > 1:  # each bucket trimmed once per append
            buckets.pop()
        self._ver += 1  # entries moved: running iterations must stop even if a later `<` raises
        return b0

    def peek(self) -> Handle[K, V]:
        """The handle of a smallest entry.  O(s) worst-case for the s entries of the first
        non-empty bucket; it moves nothing, so the keys a push accepts stay the same.

        >>> RadixHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        if not self._n:
            raise empty_error("peek")
        b0 = self._buckets[0]
        if b0:
            return min(b0, key=_order) if self._stable else b0[-1]
        return min(next(filter(None, self._buckets)), key=_order)

    def pop(self) -> tuple[K, V]:
        """Remove and return a smallest ``(key, value)``.  O(log C) amortized.

        >>> RadixHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        if not self._n:
            raise empty_error("pop")
        b0 = self._buckets[0]
        if not b0:
            b0 = self._settle()
        if self._stable:
            x = min(b0, key=_order)
            self._take(x)
        else:
            x = b0.pop()
        self._n -= 1
        self._ver += 1
        x._tok = None
        return x._key, x.value

    def decrease_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry a key that is not larger (nor below ``last``).  O(1) worst-case.

        >>> h = RadixHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        x: Any = handle
        if type(x) is not _Item or x._tok is not self._tok:
            self._claim(x, "decrease_key")
        last = self._last
        if (type(key) is not int and (isinstance(key, bool) or not isinstance(key, int))) or key < last:
            raise _key_error("decrease_key", key, last)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        if x._k < k:
            raise upward_error(x, key)
        b = (key ^ last).bit_length()
        ob = (x._key ^ last).bit_length()
        if b != ob:
            # inlined _take/_put: 55% faster when the bucket changes (100k decrease_keys, min of 9)
            buckets = self._buckets
            bl = buckets[ob]
            y = bl.pop()
            if y is not x:
                i = x._i
                bl[i] = y
                y._i = i
            bl = buckets[b]
            x._i = len(bl)
            bl.append(x)
        x._key = key
        x._k = k
        self._ver += 1

    def change_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry any key not below ``last``.  O(1) worst-case.

        >>> h = RadixHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        x: Any = handle
        if type(x) is not _Item or x._tok is not self._tok:
            self._claim(x, "change_key")
        last = self._last
        if (type(key) is not int and (isinstance(key, bool) or not isinstance(key, int))) or key < last:
            raise _key_error("change_key", key, last)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        b = (key ^ last).bit_length()
        if b > MAX_BITS:
            raise _key_error("change_key", key, last)
        if b != (x._key ^ last).bit_length():
            self._take(x)
            self._put(x, b)
        x._key = key
        x._k = k
        self._ver += 1

    def remove(self, handle: Handle[K, V]) -> tuple[K, V]:
        """Delete the entry and return ``(key, value)``.  O(1) worst-case.

        >>> h = RadixHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        x: Any = handle
        if type(x) is not _Item or x._tok is not self._tok:
            self._claim(x, "remove")
        self._take(x)
        self._n -= 1
        self._ver += 1
        x._tok = None
        return x._key, x.value

    # --- SPI ---------------------------------------------------------------
    def _spawn(self) -> RadixHeap[K, V]:
        new: RadixHeap[K, V] = RadixHeap(stable=self._stable)
        new._last = self._last
        return new

    def _meld_from(self, other: RadixHeap[K, V]) -> None:
        if other._last != self._last:
            raise KeyOrderError(
                f"meld: the other heap's last popped key {other._last!r} differs from this "
                f"heap's {self._last!r}; radix heaps meld only at the same last popped key"
            )
        tok = self._tok
        put = self._put
        for bl in other._buckets:
            for x in bl:
                put(x, (x._key ^ self._last).bit_length())
                x._tok = tok

    def _reset(self) -> None:
        self._buckets = [[]]
        self._last = 0

    def _handles(self) -> Iterator[_Item[K, V]]:
        for bl in self._buckets:
            yield from bl

    def _export(self) -> tuple[list[Any], tuple[int, list[int]]]:
        out = [x for bl in self._buckets for x in bl]
        return out, (self._last, [len(bl) for bl in self._buckets])

    def _layout_problem(self, handles: list[Any], layout: Any) -> str | None:
        return _rules.layout_problem(self, handles, layout)

    def _import(self, handles: list[Any], layout: tuple[int, list[int]]) -> None:
        last, sizes = layout
        self._last = last
        self._buckets = []
        at = 0
        for s in sizes:
            bl = handles[at : at + s]
            at += s
            for i, x in enumerate(bl):
                x._i = i
            self._buckets.append(bl)
        if not self._buckets:
            self._buckets.append([])

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for x in self._handles():
            x._k = fn(x._k, x._key)

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
