"""What checked mode and ``to_dot`` ask of a pairing heap (kept beside ``pairing.py``).

Incremental checking: an operation changes the links of a few nodes only.

* push: the new node and the old root (one becomes the other's first child);
* pop: the old root's children (two-pass pairing relinks each of them);
* decrease_key: the node, its old left neighbour (``prev``), its old right
  sibling (``next``) and the root;
* change_key, remove: those, plus the node's children (they are paired);
* meld: both roots.

The handle whose key changed is also checked against its parent, found by
walking ``prev`` links (O(1) when the operation left it where it should).

Around each touched node ``x`` the local survey checks ``x``'s own links
(``x.prev`` points at a node whose ``child`` or ``next`` is ``x``; ``x.next.prev
is x``; the root has neither), the order against ``x.prev`` where that is its
parent, and walks ``x``'s children from the first while they are touched nodes
(new first children are added at the front), one further child included:
their ``prev`` links, their order against ``x`` and their ownership.  Pop's
cost is O(degree of the old root), which is what pop itself spends.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

from heapkit._core import seen_path
from heapkit.kinds._shared_layout import forest_problem
from heapkit.kinds.pairing.core import _children
from heapkit.kinds.pairing.cost import Sizes

__all__ = ["dot_edges", "path_up", "survey_local", "touched"]


RULES: dict[str, str] = {
    "heap-order": "no child is smaller than its parent",
    "links": "prev/next/child links agree; the root has no siblings; no node twice",
    "size": "the nodes reachable from the root number len(heap)",
    "ownership": "every node's owner token resolves to this heap's",
}


def touched(heap: Any, op: str, handle: Any) -> Any:
    """The nodes whose neighbourhood ``op`` may change (None: survey it all)."""
    root = heap._root
    if op == "push":
        return [root]
    if op == "pop":
        return [] if root is None else [root, *_children(root)]
    if op == "meld":
        return [root, handle._root]
    if op in ("decrease_key", "change_key", "remove"):
        x = handle
        nodes = [x, x._prev, x._next, root]
        if op != "decrease_key":
            nodes += _children(x)
        return nodes
    return None


def path_up(heap: Any, x: Any) -> list[str]:
    """Steps from the root to ``x`` found by walking ``prev`` links upward.

    Bounded by ``len(heap) + 2`` steps, so broken links cannot loop it; a node
    that does not reach the root gets a path starting ``(detached)``.
    """
    steps: list[str] = []
    budget = heap._n + 2
    root = heap._root
    while x is not root:
        i = 0
        c = x
        while True:
            p = c._prev
            budget -= 1
            if p is None or budget < 0:
                steps.append("(no path to the root)")
                steps.reverse()
                return steps
            if p._child is c:
                break
            c = p
            i += 1
        steps.append(f"child {i}")
        x = p
    steps.append("root")
    steps.reverse()
    return steps


def survey_local(heap: Any, report: Any, nodes: Any, handle: Any) -> None:
    """Check the rules around ``nodes`` (from :func:`touched`) after the operation."""
    if nodes is None:
        heap._survey(report)
        return
    root = heap._root
    n = heap._n
    tok = heap._tok
    if (root is None) != (n == 0):
        report.fail("size", root, [], f"len is {n} but the root is {'missing' if root is None else 'set'}")
    if root is not None:
        if root._prev is not None or root._next is not None:
            report.fail("links", root, ["root"], "the root has a sibling link")
        if root._tok is not tok and root not in heap:
            report.fail("ownership", root, ["root"], "its owner token is not this heap's")
    todo = {id(x): x for x in nodes if x is not None}
    node_handle = handle is not None and hasattr(handle, "_child")
    if node_handle:
        todo[id(handle)] = handle
    if root is not None:
        todo[id(root)] = root
    # The healthy path tests each relation once; the reporting helpers run only
    # on a failure (checked mode on Dijkstra, n = 1e5: 6.6x -> see the report).
    for x in todo.values():
        if x._tok is None:  # dead: popped or removed; its old neighbours are checked
            continue
        xk = x._k
        if x is not root:
            p = x._prev
            if p is None or (p._child is x and xk < p._k) or (p._child is not x and p._next is not x):
                _report_self(heap, report, x)
        if x._tok is not tok and x not in heap:
            report.fail("ownership", x, path_up(heap, x), "its owner token is not this heap's")
        nx = x._next
        if nx is not None and nx._prev is not x:
            report.fail("links", nx, _sibling_path(path_up(heap, x)), "prev does not point back")
        prev = x
        c = x._child
        i = 0
        while c is not None:
            if c._prev is not prev or c._k < xk or (c._tok is not tok and c not in heap):
                _report_child(heap, report, x, c, prev, i)
            i += 1
            if id(c) not in todo or i > n:
                break
            prev = c
            c = c._next
    if node_handle and handle._tok is not None:
        _against_parent(heap, report, handle)


def _report_self(heap: Any, report: Any, x: Any) -> None:
    """Say what is wrong between ``x`` and its ``prev`` node."""
    p = x._prev
    if p is None:
        report.fail("links", x, path_up(heap, x), "a node below the root has no prev link")
    elif p._child is x:
        detail = f"key {x._key!r} is smaller than its parent's {p._key!r}"
        report.fail("heap-order", x, path_up(heap, x), detail)
    else:
        report.fail("links", x, path_up(heap, x), "its prev node does not link back to it")


def _report_child(heap: Any, report: Any, x: Any, c: Any, prev: Any, i: int) -> None:
    """Say what is wrong with ``x``'s child number ``i``."""
    at = [*path_up(heap, x), f"child {i}"]
    if c._prev is not prev:
        report.fail("links", c, at, "prev does not point back")
    if c._k < x._k:
        report.fail("heap-order", c, at, f"key {c._key!r} is smaller than its parent's {x._key!r}")
    if c not in heap:
        report.fail("ownership", c, at, "its owner token is not this heap's")


# The handle's key changed, so its order against its parent must be checked even
# where it is not the first child; a correct operation leaves it the root or the
# root's first child, so the walk to the parent is O(1) unless the kind is wrong.
def _against_parent(heap: Any, report: Any, x: Any) -> None:
    c = x
    budget = heap._n + 1
    while c is not heap._root and c._prev is not None and budget > 0:
        p = c._prev
        if p._child is c:
            if c is not x and x._k < p._k:
                detail = f"key {x._key!r} is smaller than its parent's {p._key!r}"
                report.fail("heap-order", x, path_up(heap, x), detail)
            return
        c = p
        budget -= 1


def _sibling_path(path: list[str]) -> list[str]:
    """The path of the right sibling of the node at ``path``."""
    last = path[-1] if path else ""
    if last.startswith("child ") and last[6:].isdigit():
        return [*path[:-1], f"child {int(last[6:]) + 1}"]
    return [*path, "(next)"]


def dot_edges(heap: Any) -> Iterator[tuple[Any, Any, str]]:
    """``(parent or None, node, "degree d")`` in preorder, iteratively."""
    stack: list[tuple[Any, Any]] = [] if heap._root is None else [(None, heap._root)]
    while stack:
        parent, x = stack.pop()
        kids = _children(x)
        yield parent, x, f"degree {len(kids)}"
        stack.extend((x, c) for c in reversed(kids))


def layout_problem(heap: Any, handles: list[Any], layout: Any) -> str | None:
    """Loading: the child counts in preorder must make one tree of the handles.  O(n)."""
    return forest_problem(layout, len(handles), True)


def survey(heap: Any, report: Any) -> dict[str, Any]:
    """Check every rule in O(n); return the figures of :class:`heapkit.Shape`."""
    root = heap._root
    seen: dict[int, tuple[Any, str]] = {}
    if root is not None:
        seen[id(root)] = (None, "root")
        if root._prev is not None or root._next is not None:
            report.fail("links", root, seen_path(root, seen, "root"), "the root has a sibling link")
    count = 0
    height = 0
    max_degree = 0
    stack: list[tuple[Any, int]] = [] if root is None else [(root, 0)]
    while stack:
        x, depth = stack.pop()
        count += 1
        if count > heap._n + 1:
            report.fail("size", x, seen_path(x, seen, "root"), f"more than {heap._n} nodes reachable")
            break
        height = max(height, depth)
        if x not in heap:
            report.fail("ownership", x, seen_path(x, seen, "root"), "its owner token is not this heap's")
        degree = 0
        prev = x
        c = x._child
        while c is not None:
            if id(c) in seen:
                report.fail("links", c, seen_path(x, seen, "root"), "a node is reachable twice")
                break
            seen[id(c)] = (x, f"child {degree}")
            if c._prev is not prev:
                report.fail("links", c, seen_path(c, seen, "root"), "prev does not point back")
            if c._k < x._k:
                report.fail(
                    "heap-order",
                    c,
                    seen_path(c, seen, "root"),
                    f"key {c._key!r} is smaller than its parent's {x._key!r}",
                )
            stack.append((c, depth + 1))
            degree += 1
            prev = c
            c = c._next
        max_degree = max(max_degree, degree)
    if count != heap._n:
        report.fail("size", None, [], f"{count} nodes reachable but len is {heap._n}")
    return {
        "size": count,
        "roots": 0 if root is None else 1,
        "height": height,
        "max_degree": max_degree,
        "marked": None,
        "potential": Sizes(heap).phi,
    }
