"""The binomial heap's rules checked: loading, the full survey, check paths,
checked mode's local survey and ``to_dot`` edges.

``heap.py``'s docstring states the invariants; every walk is a loop with an
explicit stack.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

from heapkit._core import HandleBase, seen_path
from heapkit.kinds.binomial.forest import _Node, _up

__all__ = ["RULES", "dot_edges", "layout_problem", "path_of", "survey", "survey_local", "touched"]


def layout_problem(heap: Any, handles: list[Any], layout: Any) -> str | None:
    """Loading: distinct root degrees whose trees (2**d nodes) hold every handle,
    and the min's index at a root.  O(number of roots)."""
    if type(layout) is not tuple or len(layout) != 2:
        return f"expected (root degrees, min index), got {layout!r:.80}"
    degs, at = layout
    n = len(handles)
    if type(degs) is not list or any(type(d) is not int or not 0 <= d < 64 for d in degs):
        return f"root degrees {degs!r:.80} are not ints in 0..63"
    if len(set(degs)) != len(degs) or sum(1 << d for d in degs) != n:
        return f"root degrees {degs!r:.80} do not make {n} nodes of distinct degrees"
    starts = {0}
    pos = 0
    for d in degs:
        pos += 1 << d
        starts.add(pos)
    if (n and (type(at) is not int or at == n or at not in starts)) or (not n and at != -1):
        return f"min index {at!r:.40} is not the index of a root"
    return None


RULES: dict[str, str] = {
    "heap-order": "no child is smaller than its parent",
    "binomial-shape": "a degree-k node has children of degrees k-1..0 in order; a degree-k tree has 2**k nodes",
    "root-degrees": "roots[d] is None or a root of degree d (distinct, increasing); the array ends in None",
    "links": "prev/next/child links agree; roots have no siblings; no node is reachable twice",
    "min": "the min pointer is a root and no root is smaller",
    "size": "the trees hold len(heap) nodes",
    "ownership": "every node's owner token resolves to this heap's",
}


# --- paths -------------------------------------------------------------
def path_of(heap: Any, x: Any) -> list[str]:
    """Steps from a root to x, by walking up the links (bounded)."""
    steps: list[str] = []
    guard = heap._n + 1
    while x is not None and len(steps) <= guard:
        p, i = _up(x, guard)
        steps.append(f"root of degree {x._deg}" if p is None else f"child {i}")
        x = p
    steps.reverse()
    return steps


# --- full survey ---------------------------------------------------------
def survey(heap: Any, report: Any) -> dict[str, Any]:
    """Check every rule in O(n); return the figures of :class:`heapkit.Shape`."""
    roots = heap._roots
    n = heap._n
    _survey_roots(heap, report)
    seen: dict[int, tuple[Any, str]] = {}

    def path(y: Any) -> list[str]:
        return seen_path(y, seen)

    count = trees = height = max_degree = 0
    for d, r in enumerate(roots):
        if r is None:
            continue
        trees += 1
        seen[id(r)] = (None, f"root of degree {d}")
        size = 0
        stack: list[tuple[Any, int]] = [(r, 0)]
        while stack:
            x, depth = stack.pop()
            size += 1
            height = max(height, depth)
            max_degree = max(max_degree, x._deg)
            if x not in heap:
                report.fail("ownership", x, path(x), "its owner token is not this heap's")
            for c in _family_check(heap, report, x, path, seen):
                stack.append((c, depth + 1))
        count += size
        if size != 1 << r._deg:
            report.fail(
                "binomial-shape",
                r,
                path(r),
                f"a tree of degree {r._deg} holds {size} nodes, not {1 << r._deg}",
            )
    if count != n:
        report.fail("size", None, [], f"the trees hold {count} nodes but len is {n}")
    return {
        "size": count,
        "roots": trees,
        "height": height,
        "max_degree": max_degree,
        "marked": None,
        "potential": float(trees),
    }


# Checks x's child list (links, degrees, heap order) and returns the
# children; ``seen`` (when given) records each child once and refuses twice.
def _family_check(heap: Any, report: Any, x: Any, path: Any, seen: dict[int, tuple[Any, str]] | None) -> list[Any]:
    kids: list[Any] = []
    deg = x._deg
    prev = x
    c = x._child
    while c is not None:
        i = len(kids)
        if seen is not None:
            if id(c) in seen:
                report.fail("links", c, path(x), f"child {i} is reachable twice")
                break
            seen[id(c)] = (x, f"child {i}")
        if i >= deg:
            report.fail("binomial-shape", x, path(x), f"more children than its degree {deg}")
            break
        if c._prev is not prev:
            report.fail("links", c, path(c), "prev does not point back to its left sibling or parent")
        if c._deg != deg - 1 - i:
            report.fail(
                "binomial-shape",
                c,
                path(c),
                f"child {i} of a degree-{deg} node has degree {c._deg}, not {deg - 1 - i}",
            )
        if c._k < x._k:
            report.fail("heap-order", c, path(c), f"key {c._key!r} is smaller than its parent's {x._key!r}")
        kids.append(c)
        prev = c
        c = c._next
    if len(kids) < deg and (c is None):
        report.fail("binomial-shape", x, path(x), f"{len(kids)} children but degree {deg}")
    return kids


# The root array, the min pointer and the size count: O(log n).
def _survey_roots(heap: Any, report: Any) -> None:
    roots = heap._roots
    if not roots or roots[-1] is not None:
        report.fail("root-degrees", None, [], "the root array does not end in an empty slot")
    total = 0
    for d, r in enumerate(roots):
        if r is None:
            continue
        total += 1 << r._deg
        where = [f"root of degree {d}"]
        if r._deg != d:
            report.fail("root-degrees", r, where, f"the root in slot {d} has degree {r._deg}")
        if r._prev is not None or r._next is not None:
            report.fail("links", r, where, "a root has a sibling or parent link")
    if total != heap._n:
        report.fail("size", None, [], f"the root degrees add up to {total} nodes but len is {heap._n}")
    mn = heap._min
    if mn is None:
        if heap._n:
            report.fail("min", None, [], "the heap is not empty but has no min pointer")
        return
    d = mn._deg
    if not (0 <= d < len(roots) and roots[d] is mn):
        report.fail("min", mn, path_of(heap, mn), "the min pointer is not a root")
        return
    for r in roots:
        if r is not None and r._k < mn._k:
            report.fail(
                "min",
                r,
                [f"root of degree {r._deg}"],
                f"key {r._key!r} is smaller than the min pointer's {mn._key!r}",
            )


# --- incremental checking --------------------------------------------------
def touched(heap: Any, op: str, handle: Any) -> list[Any]:
    """The handle (for key changes and removals) and the min: cheap, O(1)."""
    out = [] if heap._min is None else [heap._min]
    if isinstance(handle, HandleBase) and handle._tok is not None and handle in heap:
        out.append(handle)
    return out


def survey_local(heap: Any, report: Any, touched: Any, handle: Any) -> None:
    """Roots, min and size (O(log n)), then the child lists along the root
    path of each touched node still here and of the new handle: O(log^2 n)."""
    _survey_roots(heap, report)
    nodes = [r for r in heap._roots if r is not None]
    for x in [*touched, handle]:
        if not isinstance(x, _Node) or x._tok is None:
            continue  # dead (popped, removed), or not a node (meld's other heap)
        _link_check(heap, report, x)
        guard = heap._n + 1
        while x is not None and guard:
            nodes.append(x)
            x = _up(x, guard)[0]
            guard -= 1
    done: set[int] = set()
    for x in nodes:
        if id(x) in done:
            continue
        done.add(id(x))
        if x not in heap:
            report.fail("ownership", x, path_of(heap, x), "its owner token is not this heap's")
        _family_check(heap, report, x, lambda y: path_of(heap, y), None)


def _link_check(heap: Any, report: Any, x: Any) -> None:
    """Every link of x has its partner pointing back."""
    p, n, c = x._prev, x._next, x._child
    if p is not None and p._child is not x and p._next is not x:
        report.fail("links", x, path_of(heap, x), "its prev does not point back to it")
    if n is not None and n._prev is not x:
        report.fail("links", x, path_of(heap, x), "its right sibling's prev does not point back")
    if c is not None and c._prev is not x:
        report.fail("links", x, path_of(heap, x), "its leftmost child's prev does not point back")


# --- to_dot ------------------------------------------------------------------
def dot_edges(heap: Any) -> Iterator[tuple[Any, Any, str]]:
    """``(parent or None, node, "degree d")``: each tree in preorder, roots
    by increasing degree.  Lazy, O(1) per node (a stack of sibling
    positions), so ``to_dot``'s limit bounds the work."""
    stack: list[tuple[Any, Any]] = [(None, r) for r in reversed(heap._roots) if r is not None]
    while stack:
        parent, x = stack.pop()
        yield parent, x, f"degree {x._deg}"
        if parent is not None and x._next is not None:
            stack.append((parent, x._next))
        if x._child is not None:
            stack.append((x, x._child))
