"""The Fibonacci heap's hot path, compiled by mypyc in the compiled build: the core class
with the protocol operations and the structure SPI, and the moves (lowering and raising a
key, the cascading cut, promoting a root's children, consolidation and its unwinding).

The public class, :class:`heapkit.FibonacciHeap` (``heap.py``, interpreted), subclasses
:class:`_FibonacciCore`; nothing constructs ``_FibonacciCore`` itself (modes switch the
public class, see ``docs/compiled-build.md``).  The moves are module-level functions
(direct calls when compiled).  Rules for this module: nodes typed as their class, no
``Generic``, no ``__weakref__``, no ``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator
from typing import Any

from heapkit._core import HeapBase, empty_error, nan_error, new_order, upward_error
from heapkit._mypyc import mypyc_attr
from heapkit.kinds.fibonacci.rings import _Node, export, import_, ring, walk

__all__ = ["_FibonacciCore"]


# Precondition: x is live in heap and k is not above x's ordering object.
# Compares k with the parent's and the min's first, then cuts.
def _lower(heap: _FibonacciCore, x: _Node, key: Any, k: Any) -> None:
    m: _Node = heap._min  # type: ignore[assignment]  # not None: x is live
    p = x._parent
    if p is None:
        if x is not m and k < m._k:
            heap._min = x
    elif k < p._k:
        if k < m._k:  # the truth value before the cut (bool() of it may raise)
            _cut(heap, x)
            heap._min = x
        else:
            _cut(heap, x)
    x._key = key
    x._k = k
    heap._ver += 1


# Precondition: x is live in heap and k is above x's ordering object.
# A non-minimal x is cut and sheds its children (no comparison at all); the
# min sheds its children, the other roots are consolidated, then the new
# min is chosen among them and x, all before x's key changes.
def _raise(heap: _FibonacciCore, x: _Node, key: Any, k: Any) -> None:
    if x is not heap._min:
        if x._parent is not None:
            _cut(heap, x)
        _promote(heap, x)
    else:
        _promote(heap, x)
        trees = _consolidate(heap, x)
        if trees:
            try:
                m = trees[0]
                for t in trees:
                    if t._k < m._k:
                        m = t
                if k < m._k:
                    wins = True
                else:
                    wins = False
            except BaseException:
                _unwind(heap, x, trees)
                raise
            heap._cons += 1  # x joins the final scan
            trees.append(x)
            ring(trees)
            heap._min = x if wins else m
        else:
            ring([x])
        heap._roots = len(trees) or 1
    x._key = key
    x._k = k
    heap._ver += 1


# Precondition: x is a non-root.  Restores: x is an unmarked root beside
# the min; each marked ancestor is cut in turn and the first unmarked
# non-root ancestor gets marked (cascading cut).  No comparison.
def _cut(heap: _FibonacciCore, x: _Node) -> None:
    m: _Node = heap._min  # type: ignore[assignment]  # not None: x is live
    p: _Node = x._parent  # type: ignore[assignment]  # not None: x is a non-root
    while True:
        r = x._right
        if r is x:
            p._child = None
        else:
            left = x._left
            left._right = r
            r._left = left
            if p._child is x:
                p._child = r
        p._degree -= 1
        mr = m._right
        x._left = m
        x._right = mr
        m._right = x
        mr._left = x
        x._parent = None
        heap._roots += 1
        if x._mark:
            x._mark = False
            heap._marks -= 1
        x = p
        up = x._parent
        if up is None:
            return
        p = up
        if not x._mark:
            x._mark = True
            heap._marks += 1
            return


# Precondition: z is a root.  Restores: z's children are unmarked roots
# beside z and z is childless.  No comparison.
def _promote(heap: _FibonacciCore, z: _Node) -> None:
    c = z._child
    if c is None:
        return
    x = c
    cleared = 0
    while True:
        x._parent = None
        if x._mark:
            x._mark = False
            cleared += 1
        x = x._right
        if x is c:
            break
    heap._marks -= cleared
    zr = z._right
    cl = c._left
    z._right = c
    c._left = z
    cl._right = zr
    zr._left = cl
    heap._roots += z._degree
    z._child = None
    z._degree = 0


# Precondition: z is a childless minimal root.  Returns the other roots
# linked until no two share a degree (z is left out of every ring).  If a
# comparison raises, every tree goes back into the root ring beside z, z
# stays the min, and the exception propagates.
def _consolidate(heap: _FibonacciCore, z: _Node) -> list[_Node]:
    # Walks the ring instead of copying it to a list first: pop ~5% faster
    # (100k random pops, best-of-5 process time 0.62-0.65 s -> 0.60-0.63 s).
    # Links touch only scanned nodes, so the unscanned ones still chain to z.
    table: list[_Node | None] = [None] * (heap._n.bit_length() * 3 // 2 + 2)
    links = 0
    scanned = 0
    held: _Node | None = None  # the tree in hand
    nxt = z._right
    try:
        while nxt is not z:
            x = nxt
            held = x
            nxt = x._right
            scanned += 1
            d = x._degree
            y = table[d]
            while y is not None:
                if y._k < x._k:
                    x, y = y, x
                    held = x
                table[d] = None
                c = x._child
                if c is None:
                    x._child = y
                    y._left = y._right = y
                else:
                    cl = c._left
                    y._left = cl
                    y._right = c
                    cl._right = y
                    c._left = y
                y._parent = x
                d += 1
                x._degree = d
                links += 1
                y = table[d]
            table[d] = x
            held = None
    except BaseException:
        trees = [] if held is None else [held]
        trees += [t for t in table if t is not None]
        while nxt is not z:
            trees.append(nxt)
            nxt = nxt._right
        _unwind(heap, z, trees)
        raise
    out = [t for t in table if t is not None]
    heap._cons = scanned + links + len(out)
    return out


# Restores: z and the trees form the root ring, z (still minimal) is the min.
def _unwind(heap: _FibonacciCore, z: _Node, trees: list[_Node]) -> None:
    ring([z, *trees])
    heap._min = z
    heap._roots = len(trees) + 1
    heap._ver += 1  # the trees moved: running iterations must stop


@mypyc_attr(allow_interpreted_subclasses=True)
class _FibonacciCore(HeapBase):
    """The protocol operations and the structure SPI of :class:`heapkit.FibonacciHeap`."""

    # _roots and _marks keep Phi in O(1); their cost is below the noise (200k
    # pushes, best of 9 process time: 0.114 s with the counter, 0.117 s without).
    __slots__ = ("_cons", "_marks", "_min", "_roots")

    def __init__(self, pairs: Iterable[tuple[Any, Any]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._min: _Node | None = None
        self._roots: int = 0
        self._marks: int = 0
        self._cons: int = -1  # scans + links of the last consolidation (the auditor reads it)
        self._finish_init(pairs)

    def push(self, key: Any, value: Any) -> Any:
        """Insert an entry as a new root and return its handle.  O(1) worst-case.

        >>> from heapkit import FibonacciHeap
        >>> h = FibonacciHeap()
        >>> h.push(3, 'c').key
        3
        """
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None else w(key, None)
        node = _Node(key, k, value, self._tok)
        m = self._min
        if m is None:
            self._min = node
        else:
            if k < m._k:  # the truth value first: bool() of it may raise
                wins = True
            else:
                wins = False
            r = m._right
            node._left = m
            node._right = r
            m._right = node
            r._left = node
            if wins:
                self._min = node
        self._roots += 1
        self._n += 1
        self._ver += 1
        return node

    def peek(self) -> Any:
        """The handle of a smallest entry.  O(1) worst-case.

        >>> from heapkit import FibonacciHeap
        >>> FibonacciHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        m = self._min
        if m is None:
            raise empty_error("peek")
        return m

    def pop(self) -> Any:
        """Remove and return a smallest ``(key, value)``.  O(log n) amortized.

        >>> from heapkit import FibonacciHeap
        >>> FibonacciHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        z = self._min
        if z is None:
            raise empty_error("pop")
        _promote(self, z)
        trees = _consolidate(self, z)
        if trees:
            m = trees[0]
            try:
                for t in trees:
                    if t._k < m._k:
                        m = t
            except BaseException:
                _unwind(self, z, trees)
                raise
            ring(trees)
            self._min = m
        else:
            self._min = None
        self._roots = len(trees)
        self._n -= 1
        self._ver += 1
        z._tok = None
        z._left = z._right = z  # out of every ring
        return z._key, z.value

    def decrease_key(self, handle: Any, key: Any) -> None:
        """Give the entry a key that is not larger.  O(1) amortized.

        >>> from heapkit import FibonacciHeap
        >>> h = FibonacciHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        k = new_order(self, handle, _Node, key, "decrease_key")
        x: _Node = handle
        if x._k < k:
            raise upward_error(x, key)
        _lower(self, x, key, k)

    def change_key(self, handle: Any, key: Any) -> None:
        """Give the entry any key.  O(log n) amortized (O(1) when it goes down).

        >>> from heapkit import FibonacciHeap
        >>> h = FibonacciHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        k = new_order(self, handle, _Node, key, "change_key")
        x: _Node = handle
        if x._k < k:
            _raise(self, x, key, k)
        else:
            _lower(self, x, key, k)

    def remove(self, handle: Any) -> Any:
        """Delete the entry and return ``(key, value)``.  O(log n) amortized.

        A non-minimal entry leaves without a single comparison: it is cut (with
        cascading cuts) and its children become roots.

        >>> from heapkit import FibonacciHeap
        >>> h = FibonacciHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        if type(handle) is not _Node or handle._tok is not self._tok:
            self._claim(handle, "remove")
        x: _Node = handle
        if x is self._min:
            return self.pop()  # a method call: a mode layer sees it
        if x._parent is not None:
            _cut(self, x)
        _promote(self, x)
        left = x._left
        right = x._right
        left._right = right
        right._left = left
        self._roots -= 1
        self._n -= 1
        self._ver += 1
        x._tok = None
        x._left = x._right = x
        return x._key, x.value

    # --- SPI ---------------------------------------------------------------
    def _meld_from(self, other: _FibonacciCore) -> None:
        a = self._min
        b = other._min
        if b is None:
            return
        if a is None:
            self._min = b
        else:
            if b._k < a._k:
                wins = True
            else:
                wins = False
            ar = a._right
            bl = b._left
            a._right = b
            b._left = a
            bl._right = ar
            ar._left = bl
            if wins:
                self._min = b
        self._roots += other._roots
        self._marks += other._marks

    def _reset(self) -> None:
        self._min = None
        self._roots = 0
        self._marks = 0

    def _kill(self, h: Any) -> None:
        x: _Node = h
        x._tok = x._parent = x._child = None
        x._left = x._right = x

    def _handles(self) -> Iterator[Any]:
        return walk(self._min)

    def _export(self) -> tuple[list[Any], Any]:
        return export(self._min)

    def _import(self, handles: list[Any], layout: Any) -> None:
        roots, marks = import_(handles, layout)
        self._min = roots[0] if roots else None
        self._roots = len(roots)
        self._marks = marks

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for x in walk(self._min):
            x._k = fn(x._k, x._key)
