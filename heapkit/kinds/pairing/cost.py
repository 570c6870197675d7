"""The pairing heap's audit hooks: its potential kept exactly, its actual costs.

``Phi = sum over nodes of log2(binary-view subtree size)`` (child left, next
right; Fredman, Sedgewick, Sleator, Tarjan 1986).  In audit mode every node's
size lives in ``heap._ext["phi"]`` (a :class:`Sizes`), built in O(n) on the
first ``_phi`` and fixed after each operation along what it changed: O(1) for
push, O(r) for a pop with r children, O(binary-view depth) for a cut.  The
bounds are derived in the docstring of ``heap.py``.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from typing import Any

from heapkit.kinds.pairing.core import _children

__all__ = ["COST_UNIT", "PHI_C", "POTENTIAL", "Sizes", "actual", "bound", "phi", "probe", "sizes"]

COST_UNIT = "links + nodes cut + 1"
POTENTIAL = "sum over nodes of log2(binary-view subtree size)"
PHI_C = 1.0


class Sizes:
    """Audit cache: ``size[x]`` = x's binary-view subtree size (child left, next
    right), ``phi`` = sum of their log2, ``ver`` = the heap's ``_ver`` they match."""

    __slots__ = ("phi", "size", "ver")

    def __init__(self, heap: Any) -> None:
        order: list[Any] = []
        stack = [] if heap._root is None else [heap._root]
        while stack:
            x = stack.pop()
            order.append(x)
            if x._child is not None:
                stack.append(x._child)
            if x._next is not None:
                stack.append(x._next)
        size: dict[Any, int] = {}
        phi = 0.0
        log2 = math.log2
        for x in reversed(order):
            c, nx = x._child, x._next
            s = 1 + (0 if c is None else size[c]) + (0 if nx is None else size[nx])
            size[x] = s
            phi += log2(s)
        self.size = size
        self.phi = phi
        self.ver: int = heap._ver

    def merge(self, other: Sizes) -> None:
        """Take another heap's sizes (smaller dict into the larger)."""
        if len(other.size) > len(self.size):
            self.size, other.size = other.size, self.size
        self.size.update(other.size)
        self.phi += other.phi


# Precondition: members are the old root's children, now one tree under top
# (every binary ancestor of a member is a member).  Restores: their sizes and
# phi, with the popped root's size ``gone`` taken out.  O(members).
def _settle(st: Sizes, top: Any, members: set[Any], gone: int) -> None:
    size = st.size
    order = [top]
    stack = [top]
    add = order.append
    push = stack.append
    pop = stack.pop
    while stack:
        x = pop()
        c = x._child
        if c in members:
            push(c)
            add(c)
        c = x._next
        if c in members:
            push(c)
            add(c)
    new = old = 1
    for x in reversed(order):
        c = x._child
        nx = x._next
        s = 1 + (0 if c is None else size[c]) + (0 if nx is None else size[nx])
        old *= size[x]
        new *= s
        size[x] = s
    log2 = math.log2
    st.phi += log2(new) - log2(old) - log2(gone)


# Precondition: as _refresh, with no dirty node below another's binary-view
# path except through the ones listed after it (a cut and a link: prev, x, root).
# Restores: sizes and phi, walking each path up until a size is unchanged.
def _climb(st: Sizes, dirty: tuple[Any, ...]) -> None:
    size = st.size
    new = old = 1
    for x in dirty:
        while x is not None:
            c, nx = x._child, x._next
            s = 1 + (0 if c is None else size[c]) + (0 if nx is None else size[nx])
            o = size[x]
            if o == s:
                break
            new *= s
            old *= o
            size[x] = s
            x = x._prev
    st.phi += math.log2(new) - math.log2(old)


# Precondition: every node whose child or next link changed is in dirty (or
# removed); sizes of all other nodes are unchanged.  Restores: sizes and phi.
# The live dirty nodes are recomputed children-first (a post-order from each
# one whose binary parent, ``_prev``, is not dirty), then each such top's
# ancestors up the prev chain until a size comes out unchanged (nothing above
# it can change through it).  O(dirty + the ancestor paths walked).
def _refresh(st: Sizes, dirty: Iterable[Any], removed: Iterable[Any]) -> None:
    size = st.size
    # Products of the old and new sizes, one log2 each at the end: exact
    # integers, and 3x fewer log2 calls on pops (measured on Dijkstra, 10^5 nodes).
    gone = 1
    for x in removed:
        s = size.pop(x, None)
        if s is not None:
            gone *= s
    members = {d for d in dirty if d is not None and d._tok is not None}
    tops = [d for d in members if d._prev not in members]
    new = old = 1
    for top in tops:
        order = [top]
        stack = [top]
        while stack:
            x = stack.pop()
            c, nx = x._child, x._next
            if c in members:
                stack.append(c)
                order.append(c)
            if nx in members:
                stack.append(nx)
                order.append(nx)
        for x in reversed(order):
            c, nx = x._child, x._next
            s = 1 + (0 if c is None else size[c]) + (0 if nx is None else size[nx])
            o = size.get(x)
            if o != s:
                new *= s
                if o is not None:
                    old *= o
                size[x] = s
    for top in tops:
        x = top._prev
        while x is not None:
            c, nx = x._child, x._next
            s = 1 + (0 if c is None else size[c]) + (0 if nx is None else size[nx])
            o = size[x]
            if o == s:
                break
            new *= s
            old *= o
            size[x] = s
            x = x._prev
    log2 = math.log2
    st.phi += log2(new) - log2(old) - log2(gone)


def phi(heap: Any) -> float:
    """The potential now, from the cached sizes (O(n) when rebuilt)."""
    return sizes(heap).phi


# The cached binary-view sizes, rebuilt in O(n) when the heap changed
# since they were last fixed (or were never computed).
def sizes(heap: Any) -> Sizes:
    ext = heap._ext
    st = None if ext is None else ext.get("phi")
    if st is None or st.ver != heap._ver:
        st = Sizes(heap)
        if ext is None:
            ext = heap._ext = {}
        ext["phi"] = st
    return st


def probe(heap: Any, op: str, handle: Any) -> Any:
    """Before ``op``: what it may relink, and the other heap's sizes for a meld."""
    root = heap._root
    if op == "push":
        return root
    if op == "pop":
        kids: set[Any] = set()
        c = root._child
        while c is not None:
            kids.add(c)
            c = c._next
        return (root, kids)
    if op == "meld":
        other = sizes(handle)
        ext = handle._ext
        del ext["phi"]
        if not ext:
            handle._ext = None
        return (root, handle._root, other)
    x = handle
    below = [] if op == "decrease_key" else _children(x)
    return (x is root, x._prev, root, below)


def actual(heap: Any, op: str, probe: Any, handle: Any) -> int:
    """After ``op``: its actual cost; fixes the cached sizes along what it changed."""
    st = _sizes_kept(heap)
    if op == "push":
        # O(1): the new node's binary subtree is everything but the root
        # (or, as the new root, everything); the root's grows by one.
        size = st.size
        if probe is None:
            size[handle] = 1
            cost = 1
        else:
            n = size[probe]
            size[handle] = n + 1 if handle._child is probe else n
            size[heap._root] = n + 1
            st.phi += math.log2(n + 1)
            cost = 2
    elif op == "pop":
        root, kids = probe
        if kids:
            _settle(st, heap._root, kids, st.size.pop(root))
        else:
            st.size.pop(root)
        cost = max(1, len(kids))
    elif op == "meld":
        a, b, other = probe
        st.merge(other)
        _refresh(st, (a, b), ())
        cost = 1 if a is None or b is None else 2
    else:
        was_root, prev, root, kids = probe
        x: Any = handle
        r = len(kids)
        if op == "remove":
            _refresh(st, (prev, root, *kids), (x,))
            cost = max(1, r) if was_root else r + 2
        else:
            if kids:
                _refresh(st, (prev, x, root, *kids), ())
            elif not was_root:
                _climb(st, (prev, x, root))
            if was_root:
                first: Any = x._child
                raised = heap._root is not x or (r >= 2 and first._next is None)
                cost = r + 1 if raised else 1
            elif r and x._child is None:  # change_key upward: children paired, x re-hung
                cost = r + 3
            else:
                cost = 3
    st.ver = heap._ver
    return cost


# The cache as the operation found it (the op changed _ver; _cost fixes it).
def _sizes_kept(heap: Any) -> Sizes:
    ext = heap._ext
    st = None if ext is None else ext.get("phi")
    if st is None:
        raise RuntimeError("pairing audit: potential cache missing (was _phi called first?)")
    return st  # type: ignore[no-any-return]


#: Audit bounds (heap.py's docstring): op -> (a, b), amortized cost <= a log2 n + b.
_BOUNDS: dict[str, tuple[int, int]] = {
    "pop": (2, 1),
    "meld": (1, 2),
    "decrease_key": (1, 3),
    "remove": (3, 3),
    "change_key": (4, 4),
}


def bound(op: str, n: int) -> float:
    """The amortized bound of ``op`` at size ``n``."""
    if op == "push":
        return math.log2(n + 1) + 2
    a, b = _BOUNDS[op]
    return a * math.log2(n) + b if n > 1 else float(b)
