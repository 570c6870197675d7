"""The binomial heap's hot path, compiled by mypyc in the compiled build: the core class
with the protocol operations and the structure SPI, and the moves (a key lowered along
its root path, a node lifted by structural swaps, a node's children cut loose as roots).

The public class, :class:`heapkit.BinomialHeap` (``heap.py``, interpreted), subclasses
:class:`_BinomialCore`; nothing constructs ``_BinomialCore`` itself (modes switch the
public class, see ``docs/compiled-build.md``).  The moves are module-level functions
(direct calls when compiled); the link planner is ``forest.py``'s.  Rules for this
module: nodes typed as their class, no ``Generic``, no ``__weakref__``, no
``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator
from typing import Any

from heapkit._core import HeapBase, empty_error, nan_error, new_order, upward_error
from heapkit._mypyc import mypyc_attr
from heapkit.kinds.binomial.forest import _ancestors, _apply, _Node, _plan, _plan_push, _scan

__all__ = ["_BinomialCore"]


# Precondition: x is live in heap, k is not above x's ordering object.
# Compares along the path first (and with the min), then swaps.
def _lower(heap: _BinomialCore, x: _Node, key: Any, k: Any) -> None:
    path: list[_Node] = []
    y = x
    while True:
        p = y._prev  # walk left to the leftmost sibling: its prev is the parent
        while p is not None and p._child is not y:
            y = p
            p = y._prev
        if p is None or not k < p._k:
            break
        path.append(p)
        y = p
    mn: _Node = heap._min  # type: ignore[assignment]  # not None: x is live
    if p is None and mn is not x and ((path and path[-1] is mn) or k < mn._k):
        mn = x
    x._key = key
    x._k = k
    _lift(heap, x, path)
    heap._min = mn
    heap._ver += 1


# Compare-free: the ancestors x passes on its way to a root, and the root
# array of the children x has once it is there (the top ancestor takes the
# place of the child on the path).
def _lift_plan(heap: _BinomialCore, x: _Node) -> tuple[list[_Node], list[_Node | None]]:
    path = _ancestors(x, heap._n)
    top = path[-1] if path else x
    kids = _kids(top)
    if path:
        below = path[-2] if len(path) > 1 else x
        kids[below._deg] = top
    return path, kids


# Moves x up past every node of path (its ancestors, nearest first).
def _lift(heap: _BinomialCore, x: _Node, path: list[_Node]) -> None:
    for p in path:
        _swap_up(heap, x, p)


# x's children as a root array (index = degree).  No comparison.
def _kids(x: _Node) -> list[_Node | None]:
    kids: list[_Node | None] = [None] * x._deg
    c = x._child
    while c is not None:
        kids[c._deg] = c
        c = c._next
    return kids


# Cut x's children loose as detached roots; x becomes childless.
def _detach(x: _Node, kids: list[_Node | None]) -> None:
    for c in kids:
        if c is not None:
            c._prev = c._next = None
    x._child = None


# Precondition: x is a child of p.  Swaps their places (x goes up, p down,
# each taking the other's links and degree).  O(1), no comparison.
def _swap_up(heap: _BinomialCore, x: _Node, p: _Node) -> None:
    pp = p._prev
    pn = p._next
    pc: _Node = p._child  # type: ignore[assignment]  # not None: x is a child of p
    pd = p._deg
    xp: _Node = x._prev  # type: ignore[assignment]  # not None: x is a child
    xn = x._next
    xc = x._child
    xd = x._deg
    x._prev = pp
    x._next = pn
    x._child = p if pc is x else pc
    x._deg = pd
    p._prev = x if xp is p else xp
    p._next = xn
    p._child = xc
    p._deg = xd
    if pp is None:
        heap._roots[pd] = x
    elif pp._child is p:
        pp._child = x
    else:
        pp._next = x
    if pn is not None:
        pn._prev = x
    if pc is not x:
        pc._prev = x
    if xp is not p:
        xp._next = p
    if xn is not None:
        xn._prev = p
    if xc is not None:
        xc._prev = p


@mypyc_attr(allow_interpreted_subclasses=True)
class _BinomialCore(HeapBase):
    """The protocol operations and the structure SPI of :class:`heapkit.BinomialHeap`."""

    __slots__ = ("_min", "_raised", "_roots")

    def __init__(self, pairs: Iterable[tuple[Any, Any]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._roots: list[_Node | None] = [None]
        self._min: _Node | None = None
        self._raised: int = 0  # change_key calls that moved a key up (the auditor tells them apart)
        self._finish_init(pairs)

    def push(self, key: Any, value: Any) -> Any:
        """Insert an entry and return its handle.  O(1) amortized, O(log n) worst-case.

        >>> from heapkit import BinomialHeap
        >>> h = BinomialHeap()
        >>> h.push(3, 'c').key
        3
        """
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None else w(key, None)
        x = _Node(key, k, value, self._tok)
        roots = self._roots
        mn = self._min
        bits = 0
        d: int
        if mn is None:
            self._min = x
        elif k < mn._k:
            self._min = x  # x is below every root: it wins every link
        else:
            # Compare first: bit d set when the root of degree d wins its link.
            # Once the min joins the carry it wins every later link unasked
            # (so a tie never buries the min below a root).
            ck = k
            d = 0
            r = roots[0]
            while r is not None:
                if r is mn:
                    bits |= 1 << d
                    break
                rk = r._k
                if not ck < rk:
                    bits |= 1 << d
                    ck = rk
                d += 1
                r = roots[d]
        c = x
        d = 0
        t = roots[0]
        while t is not None:
            roots[d] = None
            if bits >> d & 1:
                c, t = t, c
            s = c._child
            t._next = s
            if s is not None:
                s._prev = t
            t._prev = c
            c._child = t
            c._deg += 1
            d += 1
            t = roots[d]
        roots[d] = c
        if d == len(roots) - 1:
            roots.append(None)
        self._n += 1
        self._ver += 1
        return x

    def peek(self) -> Any:
        """The handle of a smallest entry.  O(1) worst-case.

        >>> from heapkit import BinomialHeap
        >>> BinomialHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        mn = self._min
        if mn is None:
            raise empty_error("peek")
        return mn

    def pop(self) -> Any:
        """Remove and return a smallest ``(key, value)``.  O(log n) worst-case.

        >>> from heapkit import BinomialHeap
        >>> BinomialHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        m = self._min
        if m is None:
            raise empty_error("pop")
        kids = _kids(m)
        links: list[_Node] = []
        roots = _plan(self._roots, kids, m._deg, links)
        mn = _scan(roots)
        _detach(m, kids)
        self._roots = roots
        self._min = _apply(links, mn)
        self._n -= 1
        self._ver += 1
        m._tok = None
        return m._key, m.value

    def decrease_key(self, handle: Any, key: Any) -> None:
        """Give the entry a key that is not larger.  O(log n) worst-case.

        >>> from heapkit import BinomialHeap
        >>> h = BinomialHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        k = new_order(self, handle, _Node, key, "decrease_key")
        x: _Node = handle
        if x._k < k:
            raise upward_error(x, key)
        _lower(self, x, key, k)

    def change_key(self, handle: Any, key: Any) -> None:
        """Give the entry any key.  O(log n) worst-case.

        >>> from heapkit import BinomialHeap
        >>> h = BinomialHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        k = new_order(self, handle, _Node, key, "change_key")
        x: _Node = handle
        if not x._k < k:
            _lower(self, x, key, k)
            return
        # Raise: take x out (as remove does), then push it back with key k.
        path, kids = _lift_plan(self, x)
        links: list[_Node] = []
        roots = _plan(self._roots, kids, len(kids), links)
        _plan_push(roots, x, k, links)
        mn = self._min
        if mn is x:
            mn = _scan(roots, x, k)
        _lift(self, x, path)
        _detach(x, kids)
        x._deg = 0
        x._key = key
        x._k = k
        self._roots = roots
        self._min = _apply(links, mn)
        self._raised += 1
        self._ver += 1

    def remove(self, handle: Any) -> Any:
        """Delete the entry and return ``(key, value)``.  O(log n) worst-case.

        >>> from heapkit import BinomialHeap
        >>> h = BinomialHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        if type(handle) is not _Node or handle._tok is not self._tok:
            self._claim(handle, "remove")
        x: _Node = handle
        path, kids = _lift_plan(self, x)
        links: list[_Node] = []
        roots = _plan(self._roots, kids, len(kids), links)
        mn = self._min
        if mn is x:
            mn = _scan(roots)
        _lift(self, x, path)
        _detach(x, kids)
        self._roots = roots
        self._min = _apply(links, mn)
        self._n -= 1
        self._ver += 1
        x._tok = None
        return x._key, x.value

    # --- SPI ---------------------------------------------------------------
    def _meld_from(self, other: _BinomialCore) -> None:
        links: list[_Node] = []
        roots = _plan(self._roots, other._roots, -1, links)
        a = self._min
        b: _Node = other._min  # type: ignore[assignment]  # not None: other is not empty
        mn = b if a is None or b._k < a._k else a
        self._roots = roots
        self._min = _apply(links, mn)

    def _reset(self) -> None:
        self._roots = [None]
        self._min = None

    def _kill(self, h: Any) -> None:
        x: _Node = h
        x._tok = x._child = x._next = x._prev = None
        x._deg = 0

    def _handles(self) -> Iterator[Any]:
        stack = [r for r in self._roots if r is not None]
        while stack:
            x = stack.pop()
            yield x
            if x._next is not None:
                stack.append(x._next)
            if x._child is not None:
                stack.append(x._child)

    def _export(self) -> tuple[list[Any], Any]:
        """Preorder per tree (children left to right); the layout is the root
        degrees (a binomial tree's shape follows from its degree) and the
        index of the min.  No comparison, no recursion."""
        out: list[Any] = []
        degs: list[int] = []
        for r in self._roots:
            if r is None:
                continue
            degs.append(r._deg)
            stack = [r]
            while stack:
                x = stack.pop()
                out.append(x)
                if x._next is not None and x is not r:
                    stack.append(x._next)
                if x._child is not None:
                    stack.append(x._child)
        at = next((i for i, x in enumerate(out) if x is self._min), -1)
        return out, (degs, at)

    def _import(self, handles: list[Any], layout: Any) -> None:
        degs: list[int] = layout[0]
        at: int = layout[1]
        roots: list[_Node | None] = [None] * (max(degs, default=-1) + 2)
        it = iter(handles)
        for d in degs:
            r: _Node = next(it)
            r._prev = r._next = None
            roots[d] = r
            # open nodes: the node, the degree of its next child, its last child
            nodes: list[_Node] = [r]
            nexts: list[int] = [d - 1]
            lasts: list[_Node | None] = [None]
            r._child = None
            r._deg = d
            while nodes:
                if nexts[-1] < 0:
                    nodes.pop()
                    nexts.pop()
                    lasts.pop()
                    continue
                x: _Node = next(it)
                x._child = x._next = None
                x._deg = nexts[-1]
                top = nodes[-1]
                last = lasts[-1]
                if last is None:
                    top._child = x
                    x._prev = top
                else:
                    last._next = x
                    x._prev = last
                lasts[-1] = x
                nexts[-1] -= 1
                nodes.append(x)
                nexts.append(x._deg - 1)
                lasts.append(None)
        self._roots = roots
        self._min = handles[at] if handles else None

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for x in self._handles():
            x._k = fn(x._k, x._key)
