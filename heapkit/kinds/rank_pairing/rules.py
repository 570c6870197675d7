"""The rules of the rank-pairing heap checked from outside the fast path.

Full survey, local survey (checked mode), loading check and ``to_dot`` edges; all
iterative.  The rules themselves are stated in ``heap.py``'s docstring and ``RULES``.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

from heapkit._core import seen_path
from heapkit.kinds.rank_pairing.trees import tally

__all__ = ["RULES", "dot_edges", "layout_problem", "survey", "survey_local", "touched", "type2_rank"]


RULES: dict[str, str] = {
    "half-order": "no node is smaller than the node whose left subtree holds it",
    "half-tree": "roots have no right child",
    "rank": "roots are one above their left child; other nodes follow the type-2 rule",
    "links": "up/left/right and root-list links agree; no node twice",
    "min-first": "the first root is not larger than any root",
    "size": "the nodes reachable from the roots number len(heap)",
    "ownership": "every node's owner token resolves to this heap's",
    "tally": "the rank-sum, root and 0,i-node counters match the structure",
}


def type2_rank(a: int, b: int) -> int:
    """The rank the type-2 rule gives a non-root node whose children have ranks a, b."""
    if a - b > 1:
        return a
    if b - a > 1:
        return b
    return (a if a > b else b) + 1


def _rank(x: Any) -> int:
    return -1 if x is None else int(x._rank)


_path = seen_path


def _rank_error(x: Any, root: bool) -> str | None:
    """What is wrong with x's rank, or None."""
    a, b = _rank(x._left), _rank(x._right)
    want = a + 1 if root else type2_rank(a, b)
    if x._rank == want:
        return None
    what = "a root is one above its left child" if root else "type-2 rule"
    return f"rank {x._rank} with children ranks ({a}, {b}); {what} gives {want}"


def survey(heap: Any, report: Any) -> dict[str, Any]:
    """Check every rule in O(n); return the figures of :class:`heapkit.Shape`."""
    figures = _survey(heap, report)
    figures["potential"] = heap._phi()
    return figures


def touched(heap: Any, op: str, handle: Any) -> tuple[Any, ...]:
    """The handle's node and its neighbours, and the first root: O(1)."""
    x = handle if isinstance(handle, heap._NODE) else None
    if x is None:
        return (heap._first,)
    return (x, x._up, x._left, x._right, heap._first)


def _survey(heap: Any, report: Any) -> dict[str, Any]:
    """Check every rule in O(n); return the figures of a Shape (but the potential)."""
    n = heap._n
    first = heap._first
    seen: dict[int, tuple[Any, str]] = {}
    roots: list[Any] = []
    x = first
    while x is not None:
        if id(x) in seen:
            report.fail("links", x, _path(x, seen), "the root list passes a root twice")
            break
        seen[id(x)] = (None, f"root {len(roots)}")
        roots.append(x)
        nxt = x._next
        if x._up is not None:
            report.fail("links", x, _path(x, seen), "a root has a parent link")
        if nxt is None or nxt._prev is not x:
            report.fail("links", x, _path(x, seen), "the root list's next/prev links disagree")
            break
        if nxt is first:
            break
        if len(roots) > n:
            report.fail("size", x, _path(x, seen), f"more than {n} roots")
            break
        x = nxt
    count = len(roots)
    height = max_rank = 0
    for root in roots:
        if root not in heap:
            report.fail("ownership", root, _path(root, seen), "its owner token is not this heap's")
        if root._right is not None:
            report.fail("half-tree", root, _path(root, seen), f"a root has a right child {root._right.key!r}")
        bad = _rank_error(root, True)
        if bad is not None:
            report.fail("rank", root, _path(root, seen), bad)
        if root._k < first._k:
            report.fail("min-first", root, _path(root, seen), f"key {root._key!r} is smaller than the first root's")
        max_rank = max(max_rank, root._rank)
        # (node, parent, the node it must not be below, step, depth)
        stack: list[tuple[Any, Any, Any, str, int]] = []
        if root._right is not None:
            stack.append((root._right, root, None, "right", 1))
        if root._left is not None:
            stack.append((root._left, root, root, "left", 1))
        while stack:
            c, parent, anc, step, depth = stack.pop()
            if id(c) in seen:
                report.fail("links", c, [*_path(parent, seen), step], "a node is reachable twice")
                continue
            seen[id(c)] = (parent, step)
            count += 1
            if count > n:
                report.fail("size", c, _path(c, seen), f"more than {n} nodes reachable")
                break
            if c._up is not parent:
                report.fail("links", c, _path(c, seen), "its parent link does not point to its parent")
            if c not in heap:
                report.fail("ownership", c, _path(c, seen), "its owner token is not this heap's")
            if anc is not None and c._k < anc._k:
                report.fail(
                    "half-order",
                    c,
                    _path(c, seen),
                    f"key {c._key!r} is smaller than {anc._key!r}, whose left subtree holds it",
                )
            bad = _rank_error(c, False)
            if bad is not None:
                report.fail("rank", c, _path(c, seen), bad)
            height = max(height, depth)
            if c._right is not None:
                stack.append((c._right, c, anc, "right", depth + 1))
            if c._left is not None:
                stack.append((c._left, c, c, "left", depth + 1))
    if count != n:
        report.fail("size", None, [], f"{count} nodes reachable but len is {n}")
    counted = tally(roots)
    if counted != (heap._rs, heap._rt, heap._zs):
        report.fail(
            "tally",
            None,
            [],
            f"counters (rank sum, roots, 0,i-nodes) are {(heap._rs, heap._rt, heap._zs)} "
            f"but the structure has {counted}",
        )
    return {
        "size": count,
        "roots": len(roots),
        "height": height,
        "max_degree": max_rank,
        "marked": None,
        "details": {"rank_sum": heap._rs, "zero_nodes": heap._zs},
    }


def _up_path(x: Any, limit: int) -> list[str]:
    steps: list[str] = []
    while x._up is not None and len(steps) <= limit:
        p = x._up
        steps.append("left" if p._left is x else "right")
        x = p
    steps.append("root")
    steps.reverse()
    return steps


def survey_local(heap: Any, report: Any, touched: Any) -> None:
    """Check the rules around the touched nodes that are still live here."""
    n = heap._n
    first = heap._first
    if (first is None) != (n == 0):
        report.fail("size", None, [], f"first root {first!r} but len is {n}")
    if first is not None and first._up is not None:
        report.fail("links", first, _up_path(first, n), "the first root has a parent link")
    for x in (*touched, first):
        if x is None or x._tok is None or x not in heap:
            continue
        _survey_node(report, x, first, n)


def _survey_node(report: Any, x: Any, first: Any, n: int) -> None:
    """Links, shape, ranks (x and its parent), half-order and min-first around x."""
    p = x._up
    if p is None:
        if x._next is None or x._next._prev is not x or x._prev._next is not x:
            report.fail("links", x, _up_path(x, n), "the root list's next/prev links disagree")
        if x._right is not None:
            report.fail("half-tree", x, _up_path(x, n), "a root has a right child")
    elif p._left is not x and p._right is not x:
        report.fail("links", x, _up_path(x, n), "its parent does not hold it as a child")
    for c in (x._left, x._right):
        if c is not None and c._up is not x:
            report.fail("links", c, [*_up_path(x, n), "child"], "its parent link does not point back")
    for y in (x, p):
        bad = None if y is None else _rank_error(y, y._up is None)
        if bad is not None:
            report.fail("rank", y, _up_path(y, n), bad)
    if x._left is not None and x._left._k < x._k:
        report.fail("half-order", x._left, [*_up_path(x, n), "left"], "smaller than its parent")
    a, steps = x, 0
    while a._up is not None and a._up._right is a and steps <= n:
        a, steps = a._up, steps + 1
    if a._up is not None and x._k < a._up._k:
        report.fail("half-order", x, _up_path(x, n), "smaller than the node whose left subtree holds it")
    if first is not None and x._k < first._k:
        report.fail("min-first", x, _up_path(x, n), f"key {x._key!r} is smaller than the first root's")


def layout_problem(heap: Any, handles: list[Any], layout: Any) -> str | None:
    """Loading: :func:`export_trees`' codes must close every half-tree, and a root
    has no right child.  O(n)."""
    if type(layout) is not list or len(layout) != len(handles):
        return f"expected a list of {len(handles)} codes, got {layout!r:.80}"
    open_ = 0
    for i, c in enumerate(layout):
        if type(c) is not int or c < 0:
            return f"code {c!r:.40} at {i} is not a non-negative int"
        if open_:
            open_ -= 1
        elif c & 1:
            return f"root {i} has a right child"
        open_ += (c & 1) + (c >> 1 & 1)
    return f"{open_} announced child(ren) missing" if open_ else None


def dot_edges(heap: Any) -> Iterator[tuple[Any, Any, str]]:
    """The half-trees' binary edges, root by root from the first, each in
    preorder: ``(parent or None, node, "rank r, root" | "rank r, left" |
    "rank r, right")``.  Only a left edge is heap-ordered; a right child is a
    sibling in the multiway view.  Lazy, O(1) per node (the root list is walked,
    not gathered), so ``to_dot``'s limit bounds the work."""
    first = heap._first
    root = first
    while root is not None:
        yield None, root, f"rank {root._rank}, root"
        stack: list[tuple[Any, Any, str]] = [] if root._left is None else [(root, root._left, "left")]
        while stack:
            parent, x, side = stack.pop()
            yield parent, x, f"rank {x._rank}, {side}"
            if x._right is not None:
                stack.append((x, x._right, "right"))
            if x._left is not None:
                stack.append((x, x._left, "left"))
        root = root._next
        if root is first:
            break
