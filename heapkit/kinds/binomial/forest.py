"""The binomial forest: the node, and the compare-first link planner.  Compiled by mypyc
in the compiled build (with ``core.py``).

Binary addition on root arrays (index = degree): ``_plan`` and ``_plan_push``
only compare and record each link as ``(winner, loser)``; ``_apply`` then links
without comparing.  So an exception from a key's ``<`` always strikes before
anything moved.  Used by ``core.py``, ``rules.py`` and ``cost.py``; no recursion anywhere.
Rules for this module: nodes typed as their class, no ``Generic``, no ``__weakref__``, no
``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from typing import Any

from heapkit._core import HandleBase

__all__ = ["_Node", "_ancestors", "_apply", "_plan", "_plan_push", "_scan", "_up"]


class _Node(HandleBase):
    """Handle and tree node (sealed: never subclass it): ``_child`` (leftmost, highest degree), ``_next``
    (right sibling), ``_prev`` (left sibling, or the parent for a leftmost
    child, None for a root), ``_deg`` (number of children)."""

    __slots__ = ("_child", "_deg", "_next", "_prev")

    def __init__(self, key: Any, k: Any, value: Any, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._child: _Node | None = None
        self._next: _Node | None = None
        self._prev: _Node | None = None
        self._deg: int = 0


# Precondition: x is a node.  Returns (its parent or None for a root, its
# index among its siblings), walking left to the leftmost sibling, whose prev
# is the parent -- at most ``guard`` steps (a bound for corrupted links).
def _up(x: _Node, guard: int) -> tuple[_Node | None, int]:
    i = 0
    p = x._prev
    while p is not None and p._child is not x and i <= guard:
        x = p
        p = x._prev
        i += 1
    return p, i


# Precondition: x is a node of a heap of ``n`` entries.  Its ancestors,
# nearest first.  The walks telescope to O(log n) steps (see heap.py).
def _ancestors(x: _Node, n: int) -> list[_Node]:
    out: list[_Node] = []
    p = _up(x, n)[0]
    while p is not None and len(out) <= n:
        out.append(p)
        p = _up(p, n)[0]
    return out


# Precondition: roots and adds are root arrays (index = degree); slot ``skip``
# of roots counts as empty.  Compare only: simulates binary addition, appends
# each link as (winner, loser) to ``links`` and returns the resulting roots
# array (trailing None sentinel).  Nothing is mutated.
def _plan(roots: list[_Node | None], adds: list[_Node | None], skip: int, links: list[_Node]) -> list[_Node | None]:
    na = len(roots)
    nb = len(adds)
    out: list[_Node | None] = []
    carry: _Node | None = None
    d: int
    for d in range(max(na, nb)):
        a = roots[d] if d < na and d != skip else None
        b = adds[d] if d < nb else None
        if a is None:
            a, b = b, None
        if a is None:
            a, carry = carry, None
        elif b is None and carry is not None:
            b, carry = carry, None
        if b is None:
            out.append(a)
            continue
        # two trees of degree d (a, b) meet; a third, if any, stays in carry
        stay = carry
        win: _Node = a  # type: ignore[assignment]  # not None: b is set only when a is
        lose: _Node = b
        if lose._k < win._k:
            win, lose = lose, win
        links.append(win)
        links.append(lose)
        out.append(stay)
        carry = win
    if carry is not None:
        out.append(carry)
    while out and out[-1] is None:
        out.pop()
    out.append(None)
    return out


# Precondition: roots is a planned roots array, x (ordered by k) is not in it.
# Compare only: plans pushing x as a one-node tree; mutates just ``roots``
# (a fresh array from _plan).
def _plan_push(roots: list[_Node | None], x: _Node, k: Any, links: list[_Node]) -> None:
    c = x
    ck = k
    d = 0
    r = roots[0]
    while r is not None:
        if ck < r._k:
            links.append(c)
            links.append(r)
        else:
            links.append(r)
            links.append(c)
            c = r
            ck = r._k
        roots[d] = None
        d += 1
        r = roots[d]
    roots[d] = c
    if d == len(roots) - 1:
        roots.append(None)


# Compare only: the root of ``roots`` ordered first (x counts as ordered by k).
def _scan(roots: list[_Node | None], x: _Node | None = None, k: Any = None) -> _Node | None:
    best: _Node | None = None
    bk: Any = None
    for r in roots:
        if r is not None:
            rk = k if r is x else r._k
            if best is None or rk < bk:
                best = r
                bk = rk
    return best


# Precondition: links from _plan, every loser a detached root of its winner's
# degree when its turn comes.  Links without comparing; returns where the
# minimum ``mn`` ends (a loser's winner is no larger, so it is minimal too).
def _apply(links: list[_Node], mn: _Node | None) -> _Node | None:
    i: int
    for i in range(0, len(links), 2):
        w = links[i]
        lo = links[i + 1]
        c = w._child
        lo._next = c
        if c is not None:
            c._prev = lo
        lo._prev = w
        w._child = lo
        w._deg += 1
        if lo is mn:
            mn = w
    return mn
