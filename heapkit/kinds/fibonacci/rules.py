"""The Fibonacci heap's rules, checked: the full survey behind ``heapkit.check``,
the local survey behind checked mode, ``to_dot`` edges and the loading check.

Everything here loops with explicit stacks and ring walks (no recursion on
depth).  The invariants themselves are stated in ``heap.py``'s docstring.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

from heapkit._core import HandleBase
from heapkit.kinds._shared_layout import forest_problem
from heapkit.kinds.fibonacci.cost import max_degree_bound
from heapkit.kinds.fibonacci.rings import _ring_list

RULES: dict[str, str] = {
    "heap-order": "no child's key is smaller than its parent's",
    "links": "rings closed and symmetric, child.parent is the parent, degree counts the children, no node twice",
    "roots-unmarked": "no root carries a mark",
    "min": "the min pointer is a root and no root is smaller",
    "degree-size": "a node of degree d heads a subtree of at least F(d + 2) nodes",
    "size": "the reachable nodes number len(heap)",
    "ownership": "every node's owner token resolves to this heap's",
    "counters": "the kept counts of roots and marked nodes match the forest",
}


def _is_node(x: Any) -> bool:
    return isinstance(x, HandleBase) and hasattr(x, "_right")


def _short(steps: list[str]) -> list[str]:
    if len(steps) > 12:
        return [*steps[:5], f"… {len(steps) - 10} steps …", *steps[-5:]]
    return steps


def _linked(x: Any) -> bool:
    r = getattr(x, "_right", None)
    left = getattr(x, "_left", None)
    return getattr(r, "_left", None) is x and getattr(left, "_right", None) is x


def survey(heap: Any, report: Any) -> dict[str, Any]:
    """Check every rule in O(n), iteratively; return the figures of ``Shape``."""
    n = heap._n
    m = heap._min
    order: list[Any] = []
    up: list[int] = []  # index of the parent in order, -1 for a root
    pos: list[int] = []  # place in its ring, counted from the ring's entry node
    seen: dict[int, int] = {}

    def path(i: int) -> list[str]:
        steps: list[str] = []
        while i >= 0 and len(steps) <= len(order):
            steps.append(f"{'root' if up[i] < 0 else 'child'} {pos[i]}")
            i = up[i]
        steps.reverse()
        return _short(steps)

    if m is not None and m._parent is not None:
        report.fail("min", m, [], "the min pointer is not a root")
    roots = marked = height = max_degree = 0
    kids: list[int] = []
    stack: list[tuple[Any, int, int]] = [] if m is None else [(m, -1, 0)]
    while stack:
        start, pi, depth = stack.pop()
        parent: Any = order[pi] if pi >= 0 else None
        x: Any = start
        j = 0
        while True:
            if not _is_node(x):
                where = parent if parent is not None else m
                report.fail("links", where, [] if pi < 0 else path(pi), f"a ring link is {x!r}")
                break
            if id(x) in seen:
                report.fail("links", x, path(seen[id(x)]), "a ring is not closed: a node is reached twice")
                break
            i = len(order)
            seen[id(x)] = i
            order.append(x)
            up.append(pi)
            pos.append(j)
            kids.append(0)
            if len(order) > n:
                report.fail("size", x, path(i), f"more than {n} nodes reachable")
                stack.clear()
                break
            height = max(height, depth)
            if not _linked(x):
                report.fail("links", x, path(i), "left/right links are not symmetric")
            if x._parent is not parent:
                report.fail("links", x, path(i), f"its parent link is {x._parent!r}, not the ring's owner")
            if x not in heap:
                report.fail("ownership", x, path(i), "its owner token is not this heap's")
            if x._mark:
                marked += 1
            if parent is None:
                roots += 1
                if x._mark:
                    report.fail("roots-unmarked", x, path(i), "a root is marked")
                if m is not None and x._k < m._k:
                    report.fail("min", x, path(i), f"root key {x._key!r} is smaller than the min {m._key!r}")
            elif x._k < parent._k:
                report.fail("heap-order", x, path(i), f"key {x._key!r} is smaller than its parent's {parent._key!r}")
            if x._child is not None:
                stack.append((x._child, i, depth + 1))
            elif x._degree != 0:
                report.fail("links", x, path(i), f"degree {x._degree} but no children")
            j += 1
            x = x._right
            if x is start:
                break
        if pi >= 0:
            kids[pi] = j
            if parent._degree != j:
                report.fail("links", parent, path(pi), f"degree {parent._degree} but {j} children")
    count = len(order)
    if count != n:
        report.fail("size", m, [], f"{count} nodes reachable but len is {n}")
    if heap._roots != roots or heap._marks != marked:
        report.fail(
            "counters", m, [], f"kept roots={heap._roots}, marks={heap._marks}; found roots={roots}, marks={marked}"
        )
    # degree-size: subtree sizes bottom-up, F by iteration F(1) = F(2) = 1.
    size = [1] * count
    for i in range(count - 1, -1, -1):
        if up[i] >= 0:
            size[up[i]] += size[i]
    fib = [0, 1]
    for i in range(count):
        d = kids[i]
        max_degree = max(max_degree, d)
        while len(fib) < d + 3:
            fib.append(fib[-1] + fib[-2])
        if size[i] < fib[d + 2]:
            need = f"F({d + 2}) = {fib[d + 2]}"
            report.fail(
                "degree-size", order[i], path(i), f"degree {d} but only {size[i]} nodes in its subtree (needs {need})"
            )
    return {
        "size": count,
        "roots": roots,
        "height": height,
        "max_degree": max_degree,
        "marked": marked,
        "potential": float(roots + 2 * marked),
    }


def touched(heap: Any, op: str, handle: Any) -> list[Any]:
    """Nodes an operation may disturb: the min, the handle, its ring neighbours
    and the ancestors a cascading cut may reach.  O(the op's work)."""
    out: list[Any] = []
    if heap._min is not None:
        out.append(heap._min)
    if op == "meld":
        other = getattr(handle, "_min", None)
        if other is not None:
            out.append(other)
    elif isinstance(handle, HandleBase) and handle._tok is not None and hasattr(handle, "_parent"):
        x: Any = handle
        out.extend(n for n in (x, x._left, x._right) if n is not None)
        p = x._parent
        while p is not None:
            out.append(p)
            if not p._mark:
                break
            p = p._parent
    return out


def _local_path(x: Any, limit: int) -> list[str]:
    steps: list[str] = []
    while x is not None and len(steps) <= limit:
        p = getattr(x, "_parent", None)
        start = p._child if p is not None else None
        j = 0
        if start is not None:
            y = start
            while y is not x and j <= limit:
                y = y._right
                j += 1
        steps.append("root" if p is None else f"child {j}")
        x = p
    steps.reverse()
    return _short(steps)


def survey_local(heap: Any, report: Any, nodes: list[Any], handle: Any) -> None:
    """Check the rules around ``nodes`` (and a pushed handle) and the min pointer."""
    n = heap._n
    m = heap._min
    if n == 0:
        if m is not None:
            report.fail("min", m, [], "the heap is empty but the min pointer is set")
        return
    if m is None:
        report.fail("min", None, [], f"{n} entries but no min pointer")
        return
    if m._parent is not None:
        report.fail("min", m, _local_path(m, n), "the min pointer is not a root")
    d = max_degree_bound(n)
    todo = [*nodes, handle] if isinstance(handle, HandleBase) else list(nodes)
    if heap._roots <= 4 * (d + 2):  # after a pop the root ring is short: walk it
        todo.extend(_ring_list(m) if _linked(m) else [m])
    done: set[int] = set()
    for x in todo:
        if id(x) in done or not hasattr(x, "_parent") or x._tok is None:
            continue
        done.add(id(x))
        if x not in heap:
            report.fail("ownership", x, _local_path(x, n), "its owner token is not this heap's")
        if not _linked(x):
            report.fail("links", x, _local_path(x, n), "left/right links are not symmetric")
        p = x._parent
        if p is None:
            if x._mark:
                report.fail("roots-unmarked", x, _local_path(x, n), "a root is marked")
            if x._k < m._k:
                report.fail("min", x, _local_path(x, n), f"root key {x._key!r} is smaller than the min")
        elif x._k < p._k:
            report.fail("heap-order", x, _local_path(x, n), f"key {x._key!r} is smaller than its parent's {p._key!r}")
        c = x._child
        count = 0
        if c is not None:
            y = c
            while count <= x._degree:
                count += 1
                if y._parent is not x:
                    report.fail("links", y, [*_local_path(x, n), "child"], "its parent link is wrong")
                if y._k < x._k:
                    report.fail(
                        "heap-order", y, _local_path(y, n), f"key {y._key!r} is smaller than its parent's {x._key!r}"
                    )
                y = y._right
                if y is c:
                    break
        if count != x._degree:
            report.fail("links", x, _local_path(x, n), f"degree {x._degree} but {count}+ children")


def dot_edges(heap: Any) -> Iterator[tuple[Any, Any, str]]:
    """``(parent or None, node, "degree d[, marked]")`` in preorder, the min's
    ring first.  Lazy, O(1) per node: the stack holds one ring position per
    level (no child ring is gathered), so ``to_dot``'s limit bounds the work.
    The degree is the one the node keeps; the drawn edges show its children."""
    m = heap._min
    stack: list[tuple[Any, Any, Any]] = [] if m is None else [(None, m, m)]  # (parent, node, ring entry)
    while stack:
        parent, x, start = stack.pop()
        yield parent, x, f"degree {x._degree}, marked" if x._mark else f"degree {x._degree}"
        nxt = x._right
        if nxt is not start:
            stack.append((parent, nxt, start))
        c = x._child
        if c is not None:
            stack.append((x, c, c))


def layout_problem(heap: Any, handles: list[Any], layout: Any) -> str | None:
    """Loading: degrees in preorder make a forest of the handles; one mark each.  O(n)."""
    if type(layout) is not tuple or len(layout) != 2:
        return f"expected (degrees, marks), got {layout!r:.80}"
    degrees, marks = layout
    if type(marks) is not list or len(marks) != len(handles):
        return f"expected a list of {len(handles)} marks, got {marks!r:.80}"
    return forest_problem(degrees, len(handles), False)
