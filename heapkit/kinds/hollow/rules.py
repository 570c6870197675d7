"""The hollow heap's rules checked: the full survey, checked mode's local survey.

The invariants are stated in ``heap.py``'s docstring; every walk is a loop with
an explicit stack.
"""

from __future__ import annotations

from typing import Any

from heapkit._core import seen_path
from heapkit.kinds.hollow.dag import children

__all__ = ["RULES", "survey", "survey_local", "touched"]

RULES: dict[str, str] = {
    "heap-order": "no node of the DAG is smaller than a parent (hollow nodes keep their key)",
    "rank": "a full node of rank r has ranked children of ranks r-1..0; a hollow one a prefix",
    "second-parent": "a second parent is only for a hollow node, the last of its unranked list",
    "root": "the root is full, has no parent or sibling, and no full node is smaller",
    "size": "the full nodes number len(heap); the hollow count matches and stays bounded",
    "ownership": "every handle's owner token resolves to this heap's",
    "handle": "a live handle and its full node point at each other with the same key",
}


def touched(heap: Any, op: str, handle: Any) -> Any:
    """The root and the handle's node: O(1)."""
    node = getattr(handle, "_node", None) if op != "meld" else None
    return [heap._root, node]


def survey_local(heap: Any, report: Any, touched: Any, handle: Any) -> None:
    """The rules around the touched nodes, the handle's node and the root."""
    _survey_nodes(heap, report, [*touched, getattr(handle, "_node", None), heap._root])


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
                    "heap-order",
                    c.item,
                    [*at(), f"child {degree}"],
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
                "second-parent",
                c.item,
                _path(c, found),
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


def _survey_nodes(heap: Any, report: Any, nodes: list[Any]) -> None:
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
                report.fail("heap-order", c.item, where, f"key {c.key!r} is smaller than its parent's {v.key!r}")
        if root is not None and v.k < root.k:
            report.fail("root", v.item, where, f"key {v.key!r} is below the root's {root.key!r}")
