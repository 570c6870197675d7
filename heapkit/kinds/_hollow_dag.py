"""The hollow heap's DAG: its nodes, child lists, delete-root linking and rule survey.

Split from :mod:`heapkit.kinds.hollow` (which holds the operations, invariants
and bounds) to keep both modules small.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

from heapkit._core import seen_path


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


def _path(v: Any, found: dict[int, tuple[Any, str]]) -> list[str]:
    return seen_path(v, found, "root")


def _check_node(heap: Any, report: Any, v: Any, at: Any) -> None:
    """The rules that hold at one node: its own rank list and its handle (``at()``: its path)."""
    e: Any = v.item
    want = v.rank - 1
    count = 0
    c = v.rk
    while c is not None and count <= v.rank:
        if c.rank != want:
            report.fail("rank", e, at(), f"ranked child {count} has rank {c.rank}, expected {want}")
            break
        want -= 1
        count += 1
        c = c.nx
    if count > v.rank or (e is not None and count != v.rank):
        report.fail("rank", e, at(), f"rank {v.rank} but {count} ranked children")
    if e is not None:
        if e._key is not v.key or e._k is not v.k or e._node is not v:
            report.fail("handle", e, at(), "the handle and its node disagree")
        if e not in heap:
            report.fail("ownership", e, at(), "its owner token is not this heap's")
        if v.ep is not None:
            report.fail("second-parent", e, at(), "a full node has a second parent")


def _check_root(heap: Any, report: Any, root: Any) -> None:
    if root.item is None or root.ep is not None or root.nx is not None:
        report.fail("root", root.item, ["root"], "the root is hollow or has a parent or sibling")


def survey(heap: Any, report: Any) -> dict[str, Any]:
    """Check every rule of a :class:`HollowHeap` in O(N), iteratively."""
    root = heap._root
    cap = heap._n + heap._h + 2
    found: dict[int, tuple[Any, str]] = {}
    parents: dict[int, int] = {}
    full = hollow = height = max_degree = 0
    fulls: list[Any] = []
    byid: dict[int, Any] = {}
    if root is not None:
        found[id(root)] = (None, "root")
        _check_root(heap, report, root)
    stack: list[tuple[Any, int]] = [] if root is None else [(root, 0)]
    while stack:
        v, depth = stack.pop()
        height = max(height, depth)
        def at(v: Any = v) -> list[str]:
            return _path(v, found)

        if v.item is None:
            hollow += 1
        else:
            full += 1
            fulls.append(v)
        if full + hollow > cap:
            report.fail("size", v.item, at(), f"more than {cap} nodes reachable")
            break
        _check_node(heap, report, v, at)
        degree = 0
        for c, _ranked in children(v):
            if degree > cap:
                report.fail("size", v.item, at(), "a child list does not end")
                break
            if c.k < v.k:
                report.fail(
                    "heap-order", c.item, [*at(), f"child {degree}"],
                    f"key {c.key!r} is smaller than its parent's {v.key!r}",
                )
            parents[id(c)] = parents.get(id(c), 0) + 1
            if id(c) not in found:
                found[id(c)] = (v, f"child {degree}")
                byid[id(c)] = c
                stack.append((c, depth + 1))
            degree += 1
        max_degree = max(max_degree, degree)
    for i, c in byid.items():
        want = 1 + (c.ep is not None)
        if parents.get(i, 0) != want:
            report.fail(
                "second-parent", c.item, _path(c, found),
                f"{parents.get(i, 0)} parents reach it but it should have {want}",
            )
    if root is not None and id(root) in parents:
        report.fail("root", root.item, ["root"], "the root is a child of another node")
    for f in fulls:
        if root is not None and f.k < root.k:
            report.fail("root", f.item, _path(f, found), f"key {f.key!r} is below the root's {root.key!r}")
    if full != heap._n:
        report.fail("size", None, [], f"{full} full nodes but len is {heap._n}")
    if hollow != heap._h or heap._h > 2 * heap._n + 16:
        report.fail("size", None, [], f"{hollow} hollow nodes, counted {heap._h}, allowed {2 * heap._n + 16}")
    return {
        "size": full,
        "roots": 0 if root is None else 1,
        "height": height,
        "max_degree": max_degree,
        "marked": None,
        "potential": heap._phi(),
        "details": {"hollow": hollow, "max_rank": max((f.rank for f in fulls), default=0)},
    }


def survey_local(heap: Any, report: Any, nodes: list[Any]) -> None:
    """The rules around the nodes an operation touched (the live ones)."""
    root = heap._root
    if root is not None:
        _check_root(heap, report, root)
    for v in nodes:
        if v is None or v.item is None or v.item._node is not v:
            continue
        where = ["root"] if v is root else ["…"]
        _check_node(heap, report, v, lambda where=where: where)
        for c, _ in children(v):
            if c.k < v.k:
                report.fail(
                    "heap-order", c.item, where, f"key {c.key!r} is smaller than its parent's {v.key!r}"
                )
        if root is not None and v.k < root.k:
            report.fail("root", v.item, where, f"key {v.key!r} is below the root's {root.key!r}")
