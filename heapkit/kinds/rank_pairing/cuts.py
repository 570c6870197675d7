"""Cuts and re-ranking in a rank-pairing heap: the half of its work that compares nothing.

Root-list splicing, the cut of a node with its left subtree followed by the
rank-reduction walk (type-2 rule), and the spilling of a left spine into roots.
Each keeps the heap's counters (rank sum, roots, 0,i-nodes, work) exact.  The
rules are stated in ``heap.py``.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

__all__ = ["cut", "enlist", "ring", "spill", "unspine"]


# Precondition: first is a root of a circular list and x a detached root.
# Restores: x sits just before first (at the end of the list).  No comparison.
def enlist(first: Any, x: Any) -> None:
    last = first._prev
    last._next = x
    x._prev = last
    x._next = first
    first._prev = x


# Precondition: trees are detached half-trees.  Restores: a circular list in
# that order; returns its first node.
def ring(trees: list[Any]) -> Any:
    prev = trees[-1]
    for t in trees:
        t._prev = prev
        prev._next = t
        prev = t
    return trees[0]


# Precondition: x is a non-root node.  Restores: x is detached with its left
# subtree, its right child takes its place, and ranks are reduced up the path
# (type-2 rule; a root is one above its left child).  No comparison.  The
# counters drop x's 0,i status; x's own rank is the caller's to set.
def cut(heap: Any, x: Any) -> None:
    p = x._up
    y = x._right
    left = x._left
    a = -1 if left is None else left._rank
    b = -1 if y is None else y._rank
    zs = heap._zs
    if a - b > 1 or b - a > 1:
        zs -= 1
    if p._left is x:
        p._left = y
    else:
        p._right = y
    if y is not None:
        y._up = p
    x._right = x._up = None
    old = x._rank  # the rank of the child of u that just changed
    u = p
    rs = heap._rs
    work = 1
    while True:
        ur = u._rank
        left = u._left
        a = -1 if left is None else left._rank
        if u._up is None:
            if a + 1 != ur:
                rs += a + 1 - ur
                u._rank = a + 1
                work += 1
            break
        right = u._right
        b = -1 if right is None else right._rank
        if a - b > 1:
            r, zero = a, True
        elif b - a > 1:
            r, zero = b, True
        else:
            r, zero = (a if a > b else b) + 1, False
        was = old == ur or a == ur or b == ur
        zs += zero - was
        if r >= ur:
            break
        rs += r - ur
        u._rank = r
        work += 1
        old = ur
        u = u._up
    heap._rs = rs
    heap._zs = zs
    heap._work += work


# Precondition: y heads the right spine of a detached node's left subtree.
# Restores: every spine node is a detached half-tree (rank one above its left
# child), handed to ``take`` in spine order.  Returns (count, change of the rank
# sum, change of the number of non-root 0,i-nodes).  No comparison.
def unspine(y: Any, take: Callable[[Any], object]) -> tuple[int, int, int]:
    count = drs = dzs = 0
    while y is not None:
        nxt = y._right
        left = y._left
        a = -1 if left is None else left._rank
        b = -1 if nxt is None else nxt._rank
        if a - b > 1 or b - a > 1:
            dzs -= 1
        drs += a + 1 - y._rank
        y._rank = a + 1
        y._right = y._up = None
        take(y)
        count += 1
        y = nxt
    return count, drs, dzs


# Precondition: x is detached (a root or about to leave).  Restores: the right
# spine of x's left child are roots (behind the first root), x has no left.
def spill(heap: Any, x: Any) -> None:
    first = heap._first
    y = x._left
    x._left = None
    count, drs, dzs = unspine(y, lambda t: enlist(first, t))
    heap._rs += drs
    heap._zs += dzs
    heap._rt += count
    heap._work += 2 * count
