"""The rank-pairing heap's nodes, and the half of its work that compares nothing.

Compiled by mypyc in the compiled build (``heapkit/_compiled.py``): the node class
:class:`_Node`, root-list splicing, the cut of a node with its left subtree followed
by the rank-reduction walk (type-2 rule), and the spilling of a left spine into
roots.  Each keeps the heap's counters (rank sum, roots, 0,i-nodes, work) exact.
The rules are stated in ``heap.py``; the operations that compare are ``core.py``'s.
Rules for this module (``docs/compiled-build.md`` §3): nodes typed as their class,
helpers at module level, no ``Generic``, no ``__weakref__``, no ``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from heapkit._core import HandleBase

if TYPE_CHECKING:  # the heap's type for the helpers below (core.py imports this module)
    from heapkit.kinds.rank_pairing.core import _RankPairingCore

__all__ = ["_Node", "cut", "enlist", "ring", "spill", "unspine"]


class _Node(HandleBase):
    """Handle and node: ``_left``, ``_right``, ``_up`` (parent; None at a root),
    ``_next``/``_prev`` (root list; None below the roots), ``_rank`` (sealed: never
    subclass it)."""

    __slots__ = ("_left", "_next", "_prev", "_rank", "_right", "_up")

    def __init__(self, key: Any, k: Any, value: Any, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._left: _Node | None = None
        self._right: _Node | None = None
        self._up: _Node | None = None
        self._next: _Node | None = None
        self._prev: _Node | None = None
        self._rank: int = 0


# Precondition: first is a root of a circular list and x a detached root.
# Restores: x sits just before first (at the end of the list).  No comparison.
def enlist(first: _Node, x: _Node) -> None:
    last: _Node = first._prev  # type: ignore[assignment]  # not None: the list is circular
    last._next = x
    x._prev = last
    x._next = first
    first._prev = x


# Precondition: trees are detached half-trees.  Restores: a circular list in
# that order; returns its first node.
def ring(trees: list[_Node]) -> _Node:
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
def cut(heap: _RankPairingCore, x: _Node) -> None:
    p: _Node = x._up  # type: ignore[assignment]  # not None: x is not a root
    y = x._right
    left = x._left
    a: int = -1 if left is None else left._rank
    b: int = -1 if y is None else y._rank
    zs: int = heap._zs
    if a - b > 1 or b - a > 1:
        zs -= 1
    if p._left is x:
        p._left = y
    else:
        p._right = y
    if y is not None:
        y._up = p
    x._right = x._up = None
    old: int = x._rank  # the rank of the child of u that just changed
    u = p
    rs: int = heap._rs
    work: int = 1
    r: int
    while True:
        ur = u._rank
        left = u._left
        a = -1 if left is None else left._rank
        up = u._up
        if up is None:
            if a + 1 != ur:
                rs += a + 1 - ur
                u._rank = a + 1
                work += 1
            break
        right = u._right
        b = -1 if right is None else right._rank
        if a - b > 1:
            r = a
            zs += 1
        elif b - a > 1:
            r = b
            zs += 1
        else:
            r = (a if a > b else b) + 1
        if old == ur or a == ur or b == ur:
            zs -= 1
        if r >= ur:
            break
        rs += r - ur
        u._rank = r
        work += 1
        old = ur
        u = up
    heap._rs = rs
    heap._zs = zs
    heap._work += work


# Precondition: y heads the right spine of a detached node's left subtree.
# Restores: every spine node is a detached half-tree (rank one above its left
# child), appended to ``out`` in spine order.  Returns the change of the rank sum
# and adds the change of the number of non-root 0,i-nodes to the heap's count.
# No comparison.
def unspine(heap: _RankPairingCore, y: _Node | None, out: list[_Node]) -> int:
    drs: int = 0
    dzs: int = 0
    while y is not None:
        nxt = y._right
        left = y._left
        a: int = -1 if left is None else left._rank
        b: int = -1 if nxt is None else nxt._rank
        if a - b > 1 or b - a > 1:
            dzs -= 1
        drs += a + 1 - y._rank
        y._rank = a + 1
        y._right = y._up = None
        out.append(y)
        y = nxt
    heap._zs += dzs
    return drs


# Precondition: x is detached (a root or about to leave).  Restores: the right
# spine of x's left child are roots (behind the first root), x has no left.
def spill(heap: _RankPairingCore, x: _Node) -> None:
    first: _Node = heap._first  # type: ignore[assignment]  # not None: x was live with others or is first
    y = x._left
    x._left = None
    spine: list[_Node] = []
    heap._rs += unspine(heap, y, spine)
    for t in spine:
        enlist(first, t)
    count = len(spine)
    heap._rt += count
    heap._work += 2 * count
