"""The hollow heap's DAG: its nodes, the entries they hold, child lists and delete-root linking.

Split from ``heap.py`` (the public class, invariants and bounds) and ``core.py`` (the
operations); ``rules.py`` surveys the DAG.  Compiled by mypyc in the compiled build
(``heapkit/_compiled.py``).  Rules for this module (``docs/compiled-build.md`` §3): nodes
and entries typed as their classes, helpers at module level, no ``Generic``, no
``__weakref__``, no ``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import TYPE_CHECKING, Any

from heapkit._core import HandleBase

if TYPE_CHECKING:  # the heap's type for delete_root (core.py imports this module)
    from heapkit.kinds.hollow.core import _HollowCore

__all__ = ["Node", "_Entry", "children", "delete_root", "max_rank"]


class _Entry(HandleBase):
    """Handle of a hollow heap entry; ``_node`` is the full node holding it now (sealed:
    never subclass it)."""

    __slots__ = ("_node",)

    def __init__(self, key: Any, k: Any, value: Any, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._node: Node | None = None


class Node:
    """DAG node: ``item`` (the handle, None when hollow), ``k``/``key`` (kept when
    hollow), ``rank``, ``rk``/``uk`` (first ranked/unranked child), ``nx`` (next
    sibling in the first parent's list), ``ep`` (second parent).  Sealed."""

    __slots__ = ("ep", "item", "k", "key", "nx", "rank", "rk", "uk")

    def __init__(self, k: Any, key: Any, item: _Entry | None) -> None:
        self.k = k
        self.key = key
        self.item = item
        self.rank: int = 0
        self.rk: Node | None = None
        self.uk: Node | None = None
        self.nx: Node | None = None
        self.ep: Node | None = None


def children(v: Node) -> Iterator[tuple[Node, bool]]:
    """Every child of ``v`` with True for ranked ones (the unranked list ends at the
    node whose second parent is ``v``)."""
    c = v.rk
    while c is not None:
        yield c, True
        c = c.nx
    c = v.uk
    while c is not None:
        yield c, False
        if c.ep is v:
            return
        c = c.nx


def max_rank(n: int) -> int:
    """The largest r with F(r+3) - 1 <= N for N = 3n + 17 nodes at most."""
    cap = 3 * n + 17
    a, b, r = 2, 3, 0  # F(3), F(4)
    while b - 1 <= cap:
        a, b, r = b, a + b, r + 1
    return r


# Precondition: x is the root (full).  Destroys x and every hollow node that
# becomes a root, links the full roots (and ``extra``, a detached rank-0 node)
# by rank, then unranked, and returns the new root.  If a comparison raises, x
# (no larger than anything) takes every tree as an unranked child and stays
# the full root; ``extra`` goes hollow.
def delete_root(heap: _HollowCore, x: Node, extra: Node | None) -> Node | None:
    full: list[Node] = [] if extra is None else [extra]
    stack: list[Node] = [x]
    destroyed: int = 0
    h: int = 0  # hollow nodes destroyed, their ranked children, unranked edges gone
    hr: int = 0
    u: int = 0
    while stack:
        v = stack.pop()
        destroyed += 1
        c = v.rk
        nr: int = 0
        while c is not None:
            nr += 1
            nxt = c.nx
            _release(c, full, stack)
            c = nxt
        if v is not x:
            h += 1
            hr += nr
        c = v.uk
        while c is not None:
            u += 1
            if c.ep is v:
                c.ep = None
                break
            nxt = c.nx
            _release(c, full, stack)
            c = nxt
        v.rk = v.uk = None
    heap._h -= h
    heap._hr -= hr
    heap._u -= u
    heap._work += destroyed
    slots: list[Node | None] = []
    rest: list[Node] = []
    best: Node | None = None
    cur: Node | None = None
    links: int = 0  # links made (each a unit of work); the unranked ones add edges too
    unranked: int = 0
    i: int = 0
    n: int = len(full)
    r: int
    try:
        while i < n:
            t = full[i]
            cur = t
            i += 1
            r = t.rank
            while r < len(slots):
                d = slots[r]
                if d is None:
                    break
                if d.k < t.k:
                    t, d = d, t
                    cur = t
                slots[r] = None
                d.nx = t.rk
                t.rk = d
                r += 1
                t.rank = r
                links += 1
            while r >= len(slots):
                slots.append(None)
            slots[r] = t
            cur = None
        rest = [t for t in slots if t is not None]
        slots = []
        best = rest.pop() if rest else None
        while rest:
            t = rest[-1]
            b: Node = best  # type: ignore[assignment]  # not None: rest was not empty
            if t.k < b.k:
                b.nx = t.uk
                t.uk = b
                best = t
            else:
                t.nx = b.uk
                b.uk = t
            rest.pop()
            unranked += 1
            links += 1
    except BaseException:
        heap._u += unranked
        heap._work += links
        trees = [t for t in slots if t is not None] + full[i:] + rest
        if cur is not None and not rest:
            trees.append(cur)
        if best is not None:
            trees.append(best)
        _adopt_all(heap, x, trees, extra)
        raise
    heap._u += unranked
    heap._work += links
    return best


# Precondition: c was a child of a node being destroyed.  Restores: c keeps
# its other parent, or goes on the stack (hollow) or the list (full).
def _release(c: Node, full: list[Node], stack: list[Node]) -> None:
    c.nx = None
    if c.item is None:
        if c.ep is None:
            stack.append(c)
        else:
            c.ep = None
    else:
        full.append(c)


# Unwind: x becomes a full rank-0 root again with ``trees`` as unranked children.
def _adopt_all(heap: _HollowCore, x: Node, trees: list[Node], extra: Node | None) -> None:
    x.rank = 0
    x.rk = None
    head: Node | None = None
    for t in trees:
        t.nx = head
        head = t
    x.uk = head
    heap._u += len(trees)
    heap._ver += 1  # the trees moved: running iterations must stop
    if extra is not None:
        extra.item = None
        heap._h += 1
        heap._hr += extra.rank
