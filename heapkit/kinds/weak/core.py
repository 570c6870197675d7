"""The weak heap's hot path, compiled by mypyc in the compiled build: the core class with
the protocol operations and the structure SPI, and the joins (the settle of pending
positions, the climb along distinguished ancestors, the sink along the left children).

Entries are the array heaps' handle :class:`heapkit.kinds.dary.slot._Slot` (``_i``: its
position).  The public class, :class:`heapkit.WeakHeap` (``heap.py``, interpreted),
subclasses :class:`_WeakCore`; nothing constructs ``_WeakCore`` itself (modes switch the
public class, see ``docs/compiled-build.md``).  The invariants, bounds and sources are in
``heap.py``'s docstring.  Every sift compares first and moves afterwards, so a raising
``<`` leaves a valid heap.  Rules for this module: entries typed as ``_Slot``, helpers at
module level (direct calls when compiled), no ``Generic``, no ``__weakref__``, no
``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator, Sequence
from heapq import heappop, heappush
from typing import Any, Final

from heapkit._core import HeapBase, empty_error, nan_error, upward_error
from heapkit._mypyc import mypyc_attr
from heapkit.kinds.dary.slot import _PURE, _Slot

__all__ = ["_WeakCore", "d_ancestor"]

# The pure build makes handles with ``_Slot.__new__`` (object's) and slot stores, as dary
# does; a compiled ``_Slot`` refuses that, so the compiled build calls the constructor
# (``slot._PURE``, the one switch for the array heaps).
_new: Final = _Slot.__new__


def d_ancestor(r: Sequence[int], j: int) -> int:
    """The distinguished ancestor of position ``j >= 1``.  O(log j), no comparison.

    >>> d_ancestor(bytearray(4), 2), d_ancestor(bytearray(4), 3)
    (0, 1)
    """
    while (j & 1) == r[j >> 1]:
        j >>= 1
    return j >> 1


# The marks ``up`` are a max-heap of positions kept by heapq as negated ints: the
# settle joins the highest pending position first (its join may mark an ancestor).
# Precondition: every settled position is ordered with its d-ancestor.
# Restores: nothing pending (or, if a comparison raised, what is left pending).
def _settle(heap: _WeakCore) -> None:
    a = heap._a
    r = heap._r
    up = heap._up
    n = len(a)
    lo = max(heap._s, 1)
    j = n - 1  # the tail [lo, j] is still to join, then the marks, highest first
    work = 0
    try:
        while True:
            tail = j >= lo
            if tail:
                q = j
            elif up:
                q = -up[0]
            else:
                break
            i = q
            while (i & 1) == r[i >> 1]:
                i >>= 1
            i >>= 1
            x = a[q]
            y = a[i]
            work += 1
            if x._k < y._k:
                a[i] = x
                x._i = i
                a[q] = y
                y._i = q
                if 2 * q < n:
                    r[q] ^= 1
                if 0 < i < lo:  # above the tail: a mark (in the tail: joined anyway)
                    heappush(up, -i)
            if tail:
                j -= 1
            else:
                while up and up[0] == -q:
                    heappop(up)
    finally:
        # If a comparison raised, what is left of the tail becomes marks.
        for q in range(lo, j + 1):
            heappush(up, -q)
        heap._s = n
        heap._work += work


# Compare only: how many d-ancestors above j an entry ordered by k passes (it lands
# at the last of them; j itself if none).  The moves (_lift) walk the same chain
# again: its positions depend on bits above the positions _lift flips, never on those.
def _climb(heap: _WeakCore, j: int, k: Any) -> int:
    a = heap._a
    r = heap._r
    steps = 0
    while j:
        i = j
        while (i & 1) == r[i >> 1]:
            i >>= 1
        i >>= 1
        heap._work += 1
        if k < a[i]._k:
            steps += 1
            j = i
        else:
            break
    return steps


# Move: j and the first `steps` d-ancestors above it, nearest first; each takes the
# entry of the next one and flips its bit (joins that swapped); x lands at the last.
def _lift(heap: _WeakCore, j: int, steps: int, x: _Slot) -> None:
    a = heap._a
    r = heap._r
    n = len(a)
    while steps:
        i = j
        while (i & 1) == r[i >> 1]:
            i >>= 1
        i >>= 1
        y = a[i]
        a[j] = y
        y._i = j
        if 2 * j < n:
            r[j] ^= 1
        j = i
        steps -= 1
    a[j] = x
    x._i = j


# Compare only: the positions below t (under m) whose join with t swaps when an
# entry ordered by k stands at t, deepest first (t's right child, then down the
# left children, joined bottom-up).
def _sink(heap: _WeakCore, t: int, k: Any, m: int) -> list[int]:
    a = heap._a
    r = heap._r
    j = 2 * t + 1 - r[t]
    swaps: list[int] = []
    if j >= m:
        return swaps
    c = 2 * j + r[j]
    while c < m:
        j = c
        c = 2 * j + r[j]
    heap._work += j.bit_length() - t.bit_length()
    while j != t:
        y = a[j]
        if y._k < k:
            swaps.append(j)
            k = y._k
        j >>= 1
    return swaps


# Move: apply the swaps _sink chose (n: the array's length for the bits); x ends
# where the joins leave it and the smallest entry of the subtree at t.
def _lower(heap: _WeakCore, t: int, swaps: list[int], x: _Slot, n: int) -> None:
    a = heap._a
    r = heap._r
    c = x
    for j in swaps:
        y = a[j]
        a[j] = c
        c._i = j
        if 2 * j < n:
            r[j] ^= 1
        c = y
    a[t] = c
    c._i = t


# Move: drop the last position (no comparison); a parent left childless gets bit 0.
def _drop_last(heap: _WeakCore) -> None:
    heap._a.pop()
    r = heap._r
    r.pop()
    m = len(r)
    if m and not m & 1:
        r[m >> 1] = 0
    if heap._s > m:
        heap._s = m


@mypyc_attr(allow_interpreted_subclasses=True)
class _WeakCore(HeapBase):
    """The protocol operations and the structure SPI of :class:`heapkit.WeakHeap`."""

    __slots__ = ("_a", "_r", "_s", "_up", "_work")

    def __init__(self, pairs: Iterable[tuple[Any, Any]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._a: list[_Slot] = []
        # One int per bit, not a bytearray: compiled, a list read is a C array read (a
        # bytearray read boxes the index and calls back into Python).
        self._r: list[int] = []
        self._s: int = 0
        self._up: list[int] = []
        self._work: int = 0  # key comparisons made so far: the audit's cost unit (cost.py)
        self._finish_init(pairs)

    def push(self, key: Any, value: Any) -> Any:
        """Insert an entry and return its handle.  O(1) worst-case, 2 comparisons amortized.

        >>> from heapkit import WeakHeap
        >>> WeakHeap().push(3, 'c').key
        3
        """
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None else w(key, None)
        a = self._a
        x: _Slot
        if _PURE:
            # __new__ and slot stores instead of __init__, as in dary/heap.py (measured there).
            x = _new(_Slot)
            x._key = key
            x._k = k
            x.value = value
            x._tok = self._tok
        else:
            x = _Slot(key, k, value, self._tok)
        x._i = len(a)
        a.append(x)
        self._r.append(0)
        self._n += 1
        self._ver += 1
        return x

    def peek(self) -> Any:
        """The handle of a smallest entry.  O(1) once settled; a settle first, O(log n) amortized.

        >>> from heapkit import WeakHeap
        >>> WeakHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        a = self._a
        if not a:
            raise empty_error("peek")
        if self._s < len(a) or self._up:
            _settle(self)
        return a[0]

    def pop(self) -> Any:
        """Remove and return a smallest ``(key, value)``.  O(log n) amortized comparisons.

        >>> from heapkit import WeakHeap
        >>> WeakHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        a = self._a
        if not a:
            raise empty_error("pop")
        if self._s < len(a) or self._up:
            _settle(self)
        top = a[0]
        m = len(a) - 1
        r = self._r
        # _sink(0, ...), _drop_last and _lower written inline: 5-6% less time on sort and
        # Dijkstra at n = 3e4 (median of 6 alternating runs; measured).
        if m > 1:
            last = a[m]
            k = last._k
            j = 1
            c = 2 + r[1]
            while c < m:
                j = c
                c = 2 * j + r[j]
            self._work += j.bit_length()
            swaps: list[int] = []
            while j:
                y = a[j]
                if y._k < k:
                    swaps.append(j)
                    k = y._k
                j >>= 1
            a.pop()
            r.pop()
            if not m & 1:
                r[m >> 1] = 0
            if self._s > m:
                self._s = m
            x = last
            for j in swaps:
                y = a[j]
                a[j] = x
                x._i = j
                if 2 * j < m:
                    r[j] ^= 1
                x = y
            a[0] = x
            x._i = 0
        else:
            last = a[m]
            _drop_last(self)
            if m:
                a[0] = last
                last._i = 0
        self._n = m
        self._ver += 1
        top._tok = None
        return top._key, top.value

    def decrease_key(self, handle: Any, key: Any) -> None:
        """Give the entry a key that is not larger.  O(log n) worst-case.

        >>> from heapkit import WeakHeap
        >>> h = WeakHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        # _core.new_order written inline: in the pure build the call is ~50 ns, 5% of a pairing decrease_key (measured).
        if type(handle) is not _Slot or handle._tok is not self._tok:
            self._claim(handle, "decrease_key")
        x: _Slot = handle
        if key != key:
            raise nan_error("decrease_key", key)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        self._work += 1
        if x._k < k:
            raise upward_error(x, key)
        j = x._i
        steps = _climb(self, j, k)
        x._key = key
        x._k = k
        _lift(self, j, steps, x)
        self._ver += 1

    def change_key(self, handle: Any, key: Any) -> None:
        """Give the entry any key.  O(log n) amortized comparisons.

        >>> from heapkit import WeakHeap
        >>> h = WeakHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        if type(handle) is not _Slot or handle._tok is not self._tok:
            self._claim(handle, "change_key")
        x: _Slot = handle
        if key != key:
            raise nan_error("change_key", key)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        self._work += 1
        if x._k < k:
            a = self._a
            if self._s < len(a) or self._up:
                _settle(self)
            t = x._i
            swaps = _sink(self, t, k, len(a))
            x._key = key
            x._k = k
            _lower(self, t, swaps, x, len(a))
        else:
            j = x._i
            steps = _climb(self, j, k)
            x._key = key
            x._k = k
            _lift(self, j, steps, x)
        self._ver += 1

    def remove(self, handle: Any) -> Any:
        """Delete the entry and return ``(key, value)``.  O(log n) amortized comparisons.

        >>> from heapkit import WeakHeap
        >>> h = WeakHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        if type(handle) is not _Slot or handle._tok is not self._tok:
            self._claim(handle, "remove")
        x: _Slot = handle
        a = self._a
        if self._s < len(a) or self._up:
            _settle(self)
        m = len(a) - 1
        t = x._i
        if t == m:
            _drop_last(self)
        else:
            last = a[m]
            lk = last._k
            if t:
                i = d_ancestor(self._r, t)
                self._work += 1
                lifts = lk < a[i]._k
            else:
                i = 0
                lifts = False
            if lifts:
                steps = _climb(self, i, lk)
                _drop_last(self)
                # t takes i's entry (the first join), then the chain above i as in decrease_key.
                y = a[i]
                a[t] = y
                y._i = t
                if 2 * t < m:
                    self._r[t] ^= 1
                _lift(self, i, steps, last)
            else:
                swaps = _sink(self, t, lk, m)
                _drop_last(self)
                _lower(self, t, swaps, last, m)
        self._n = m
        self._ver += 1
        x._tok = None
        return x._key, x.value

    # --- SPI ---------------------------------------------------------------------
    def _meld_from(self, other: _WeakCore) -> None:
        a = self._a
        tok = self._tok
        b = other._a
        for x in b:
            x._i = len(a)
            x._tok = tok
            a.append(x)
        self._r.extend([0] * len(b))

    def _reset(self) -> None:
        self._a = []
        self._r = []
        self._s = 0
        self._up = []

    def _handles(self) -> Iterator[Any]:
        # A copy: peek may settle (reorder the array) while an iteration runs.
        return iter(self._a[:])

    def _export(self) -> tuple[list[Any], Any]:
        return list(self._a), (bytes(self._r), self._s, sorted(set(self._up)))

    def _import(self, handles: list[Any], layout: Any) -> None:
        bits, s, up = layout
        a: list[_Slot] = handles
        for i, x in enumerate(a):
            x._i = i
        self._a = a
        self._r = list(bits)
        self._s = s
        self._up = list(up)

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for x in self._a:
            x._k = fn(x._k, x._key)
