"""The rank-pairing heap's hot path, compiled by mypyc in the compiled build: the core
class with the protocol operations and the structure SPI, and the operations' module-level
helpers (multipass linking with its unwinding, lowering and raising a key).

The public class, :class:`heapkit.RankPairingHeap` (``heap.py``, interpreted), subclasses
:class:`_RankPairingCore`; nothing constructs ``_RankPairingCore`` itself (modes switch
the public class, see ``docs/compiled-build.md``).  The nodes and the cuts, which compare
nothing, are ``cuts.py``'s; the walks behind copy and pickle are ``trees.py``'s.  Rules
for this module: nodes typed as their class, helpers at module level (direct calls when
compiled), no ``Generic``, no ``__weakref__``, no ``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator
from typing import Any

from heapkit._core import HeapBase, empty_error, nan_error, new_order, upward_error
from heapkit._mypyc import mypyc_attr
from heapkit.kinds.rank_pairing.cuts import _Node, cut, enlist, ring, spill, unspine
from heapkit.kinds.rank_pairing.trees import export_trees, import_trees, nodes_of, roots_of, tally

__all__ = ["_RankPairingCore"]


# Precondition: m is the first root.  Restores: m is out of the structure
# (detached, rank 0) and the rest is multipass linked, the least root first.
# If a comparison raises, every half-tree goes back into the root list
# behind m (no larger than any of them, now rank 0) before it propagates.
def _consolidate(heap: _RankPairingCore, m: _Node) -> None:
    trees: list[_Node] = []
    x: _Node = m._next  # type: ignore[assignment]  # not None: the root list is circular
    while x is not m:
        trees.append(x)
        x = x._next  # type: ignore[assignment]
    before = len(trees)
    y = m._left
    m._left = None
    drs = unspine(heap, y, trees)  # m's left spine becomes half-trees
    spine = len(trees) - before
    rs: int = heap._rs - m._rank + drs
    m._rank = 0
    bins = heap._bins
    need: int = (heap._n.bit_length() * 3 >> 1) + 3  # > log_phi n + 2 >= every rank + 1
    if len(bins) < need:
        bins.extend([None] * (need - len(bins)))
    out: list[_Node] = []
    top: int = -1
    links: int = 0
    r: int
    best: _Node | None = None
    try:
        for t in trees:
            r = t._rank
            u = bins[r]
            while u is not None:  # multipass: carry the winner until its rank is free
                if t._k < u._k:
                    u, t = t, u
                bins[r] = None
                c = u._left  # link: t becomes u's left child, c t's right
                t._right = c
                if c is not None:
                    c._up = t
                t._up = u
                t._next = t._prev = None  # no longer a root: drop its root-list links
                u._left = t
                r += 1
                u._rank = r
                links += 1
                t = u
                u = bins[r]
            bins[r] = t
            if r > top:
                top = r
        for r in range(top + 1):
            u = bins[r]
            if u is not None:
                out.append(u)
                bins[r] = None
        top = -1
        if out:
            # ring the roots and find the least in one loop (saves ~5% of a pop)
            it = iter(out)
            best = prev = next(it)
            last = out[-1]
            best._prev = last
            last._next = best
            for u in it:
                u._prev = prev
                prev._next = u
                prev = u
                if u._k < best._k:
                    best = u
    except BaseException:
        _unwind(heap, m, trees, out, top, rs + links)
        heap._work += 2 * links + 2 * spine + len(trees)
        raise
    heap._rs = rs + links
    heap._rt = len(out)
    heap._work += 2 * links + 2 * spine + len(trees)
    heap._first = best


# Precondition: a comparison in _consolidate raised.  Restores: m first (rank
# 0, no children), then every half-tree that is not under another, as roots.
def _unwind(heap: _RankPairingCore, m: _Node, trees: list[_Node], out: list[_Node], top: int, rs: int) -> None:
    bins = heap._bins
    for r in range(top + 1):
        u = bins[r]
        if u is not None:
            out.append(u)
            bins[r] = None
    placed = {id(u) for u in out}
    out.extend(t for t in trees if t._up is None and id(t) not in placed)
    heap._rs = rs
    heap._rt = 1 + len(out)
    heap._first = ring([m, *out])
    heap._ver += 1


# Precondition: x is live here and k is not above its ordering object.
# Compares k with the first root only, then cuts x (one cut) and re-ranks.
def _lower(heap: _RankPairingCore, x: _Node, key: Any, k: Any) -> None:
    first: _Node = heap._first  # type: ignore[assignment]  # not None: x is live
    if x is not first:
        if k < first._k:
            wins = True
        else:
            wins = False
        if x._up is not None:
            cut(heap, x)
            left = x._left
            r: int = 0 if left is None else left._rank + 1
            heap._rs += r - x._rank
            x._rank = r
            enlist(first, x)
            heap._rt += 1
            heap._work += 1  # x's rank
        if wins:
            heap._first = x
    x._key = key
    x._k = k
    heap._ver += 1


# Precondition: x is live here and k is above its ordering object.  x leaves
# its place (its left spine becomes roots) and comes back as a one-node root.
def _raise(heap: _RankPairingCore, x: _Node, key: Any, k: Any) -> None:
    first: _Node = heap._first  # type: ignore[assignment]  # not None: x is live
    if x is first:
        _consolidate(heap, x)
        nxt = heap._first
        if nxt is None:
            x._next = x._prev = x
            heap._first = x
        else:
            try:
                if k < nxt._k:
                    wins = True
                else:
                    wins = False
            except BaseException:
                enlist(nxt, x)  # x, still at its old key, is the least
                heap._first = x
                heap._rt += 1
                heap._ver += 1
                raise
            enlist(nxt, x)
            if wins:
                heap._first = x
        heap._rt += 1
    else:
        if x._up is not None:
            cut(heap, x)
            enlist(first, x)
            heap._rt += 1
        spill(heap, x)
        heap._rs -= x._rank
        x._rank = 0
    heap._work += 1
    x._key = key
    x._k = k
    heap._ver += 1


@mypyc_attr(allow_interpreted_subclasses=True)
class _RankPairingCore(HeapBase):
    """The protocol operations and the structure SPI of :class:`heapkit.RankPairingHeap`."""

    __slots__ = ("_bins", "_first", "_rs", "_rt", "_work", "_zs")

    def __init__(self, pairs: Iterable[tuple[Any, Any]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._bins: list[_Node | None] = [None] * 8
        self._first: _Node | None = None
        self._rs: int = 0  # sum of all ranks
        self._rt: int = 0  # number of roots
        self._zs: int = 0  # number of non-root 0,i-nodes
        self._work: int = 0
        self._finish_init(pairs)

    def push(self, key: Any, value: Any) -> Any:
        """Insert an entry and return its handle.  O(1) worst-case.

        >>> from heapkit import RankPairingHeap
        >>> h = RankPairingHeap()
        >>> h.push(3, 'c').key
        3
        """
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None else w(key, None)
        node = _Node(key, k, value, self._tok)
        first = self._first
        if first is None:
            node._next = node._prev = node
            self._first = node
        else:
            wins = bool(k < first._k)  # the truth value now: bool() may raise
            enlist(first, node)
            if wins:
                self._first = node
        self._n += 1
        self._rt += 1
        self._ver += 1
        return node

    def peek(self) -> Any:
        """The handle of a smallest entry.  O(1) worst-case.

        >>> from heapkit import RankPairingHeap
        >>> RankPairingHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        first = self._first
        if first is None:
            raise empty_error("peek")
        return first

    def pop(self) -> Any:
        """Remove and return a smallest ``(key, value)``.  O(log n) amortized.

        >>> from heapkit import RankPairingHeap
        >>> RankPairingHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        m = self._first
        if m is None:
            raise empty_error("pop")
        _consolidate(self, m)
        self._n -= 1
        self._ver += 1
        m._tok = m._next = m._prev = None
        return m._key, m.value

    def decrease_key(self, handle: Any, key: Any) -> None:
        """Give the entry a key that is not larger.  O(1) amortized.

        >>> from heapkit import RankPairingHeap
        >>> h = RankPairingHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        k = new_order(self, handle, _Node, key, "decrease_key")
        x: _Node = handle
        if x._k < k:
            raise upward_error(x, key)
        _lower(self, x, key, k)

    def change_key(self, handle: Any, key: Any) -> None:
        """Give the entry any key.  O(1) amortized down, O(log n) amortized up.

        >>> from heapkit import RankPairingHeap
        >>> h = RankPairingHeap([(4, 'd')])
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

        >>> from heapkit import RankPairingHeap
        >>> h = RankPairingHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        if type(handle) is not _Node or handle._tok is not self._tok:
            self._claim(handle, "remove")
        x: _Node = handle
        if x is self._first:
            return self.pop()  # a method call: a mode layer sees it
        if x._up is None:
            p: _Node = x._prev  # type: ignore[assignment]  # not None: x is a root
            n: _Node = x._next  # type: ignore[assignment]
            p._next = n
            n._prev = p
            self._rt -= 1
        else:
            cut(self, x)
        spill(self, x)
        self._rs -= x._rank
        self._n -= 1
        self._ver += 1
        x._tok = x._next = x._prev = None
        return x._key, x.value

    # --- SPI ---------------------------------------------------------------
    def _meld_from(self, other: _RankPairingCore) -> None:
        a = self._first
        b = other._first
        if a is None:
            self._first = b
        elif b is not None:
            if b._k < a._k:
                wins = True
            else:
                wins = False
            a_last: _Node = a._prev  # type: ignore[assignment]  # not None: circular lists
            b_last: _Node = b._prev  # type: ignore[assignment]
            a_last._next = b
            b._prev = a_last
            b_last._next = a
            a._prev = b_last
            if wins:
                self._first = b
        self._rs += other._rs
        self._rt += other._rt
        self._zs += other._zs

    def _reset(self) -> None:
        self._first = None
        self._rs = 0
        self._rt = 0
        self._zs = 0

    def _kill(self, h: Any) -> None:
        x: _Node = h
        x._tok = x._left = x._right = x._up = x._next = x._prev = None

    def _handles(self) -> Iterator[Any]:
        return nodes_of(self)

    def _export(self) -> tuple[list[Any], Any]:
        return export_trees(roots_of(self))

    def _import(self, handles: list[Any], layout: Any) -> None:
        self._reset()
        roots = import_trees(handles, layout)
        self._first = ring(roots) if roots else None
        self._rs, self._rt, self._zs = tally(roots)

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for x in nodes_of(self):
            x._k = fn(x._k, x._key)
