"""The hollow heap's DAG: its nodes, child lists and delete-root linking.

Split from ``heap.py`` (which holds the operations, invariants and bounds) to
keep both modules small; ``rules.py`` surveys the DAG.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any


class Node:
    """DAG node: ``item`` (the handle, None when hollow), ``k``/``key`` (kept when
    hollow), ``rank``, ``rk``/``uk`` (first ranked/unranked child), ``nx`` (next
    sibling in the first parent's list), ``ep`` (second parent)."""

    __slots__ = ("ep", "item", "k", "key", "nx", "rank", "rk", "uk")

    def __init__(self, k: Any, key: Any, item: Any) -> None:
        self.k = k
        self.key = key
        self.item = item
        self.rank = 0
        self.rk: Any = None
        self.uk: Any = None
        self.nx: Any = None
        self.ep: Any = None


def children(v: Any) -> Iterator[tuple[Any, bool]]:
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
def delete_root(heap: Any, x: Any, extra: Any) -> Any:
    full: list[Any] = [] if extra is None else [extra]
    stack = [x]
    release = _release
    destroyed = 0
    while stack:
        v = stack.pop()
        destroyed += 1
        c = v.rk
        nr = 0
        while c is not None:
            nr += 1
            nxt = c.nx
            release(c, full, stack)
            c = nxt
        if v is not x:
            heap._h -= 1
            heap._hr -= nr
        c = v.uk
        while c is not None:
            heap._u -= 1
            if c.ep is v:
                c.ep = None
                break
            nxt = c.nx
            release(c, full, stack)
            c = nxt
        v.rk = v.uk = None
    heap._work += destroyed
    slots: list[Any] = []
    rest: list[Any] = []
    best: Any = None
    c = None
    i = 0
    try:
        while i < len(full):
            c = full[i]
            i += 1
            r = c.rank
            while r < len(slots) and slots[r] is not None:
                d = slots[r]
                if d.k < c.k:
                    c, d = d, c
                slots[r] = None
                d.nx = c.rk
                c.rk = d
                r += 1
                c.rank = r
                heap._work += 1
            while r >= len(slots):
                slots.append(None)
            slots[r] = c
            c = None
        rest = [t for t in slots if t is not None]
        slots = []
        best = rest.pop() if rest else None
        while rest:
            c = rest[-1]
            if c.k < best.k:
                best.nx = c.uk
                c.uk = best
                best = c
            else:
                c.nx = best.uk
                best.uk = c
            rest.pop()
            c = None
            heap._u += 1
            heap._work += 1
    except BaseException:
        trees = [t for t in slots if t is not None] + full[i:] + rest
        if c is not None and not rest:
            trees.append(c)
        if best is not None:
            trees.append(best)
        _adopt_all(heap, x, trees, extra)
        raise
    return best


# Precondition: c was a child of a node being destroyed.  Restores: c keeps
# its other parent, or goes on the stack (hollow) or the list (full).
def _release(c: Any, full: list[Any], stack: list[Any]) -> None:
    c.nx = None
    if c.item is None:
        if c.ep is None:
            stack.append(c)
        else:
            c.ep = None
    else:
        full.append(c)


# Unwind: x becomes a full rank-0 root again with ``trees`` as unranked children.
def _adopt_all(heap: Any, x: Any, trees: list[Any], extra: Any) -> None:
    x.rank = 0
    x.rk = None
    head = None
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
