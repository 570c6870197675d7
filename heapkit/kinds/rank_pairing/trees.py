"""The rank-pairing heap's trees walked and flattened: the roots, every node,
the kept counters recounted, and the flat export/import behind copy and pickle.

Nodes are ``heap.py``'s ``_Node``; all walks are iterative.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

__all__ = ["export_trees", "import_trees", "nodes_of", "roots_of", "tally"]


def export_trees(roots: list[Any]) -> tuple[list[Any], list[int]]:
    """Preorder of every half-tree (first root first) and one code per node:
    ``rank * 4 + 2 * has_left + has_right``."""
    out: list[Any] = []
    codes: list[int] = []
    for root in roots:
        stack = [root]
        while stack:
            x = stack.pop()
            out.append(x)
            codes.append(x._rank * 4 + (2 if x._left is not None else 0) + (x._right is not None))
            if x._right is not None:
                stack.append(x._right)
            if x._left is not None:
                stack.append(x._left)
    return out, codes


def import_trees(handles: list[Any], codes: list[int]) -> list[Any]:
    """Relink nodes from :func:`export_trees`' data; return the roots in order."""
    roots: list[Any] = []
    slots: list[tuple[Any, bool]] = []
    for x, code in zip(handles, codes, strict=True):
        x._left = x._right = x._up = x._next = x._prev = None
        x._rank = code >> 2
        if slots:
            p, is_left = slots.pop()
            if is_left:
                p._left = x
            else:
                p._right = x
            x._up = p
        else:
            roots.append(x)
        if code & 1:
            slots.append((x, False))
        if code & 2:
            slots.append((x, True))
    return roots


def roots_of(heap: Any) -> list[Any]:
    """The roots in list order, first root first (stops on a broken list)."""
    first = heap._first
    out: list[Any] = []
    x = first
    while x is not None and len(out) <= heap._n:
        out.append(x)
        x = x._next
        if x is first:
            break
    return out


def nodes_of(heap: Any) -> Iterator[Any]:
    """Every node, root by root, each half-tree in preorder; iteratively."""
    for root in roots_of(heap):
        stack = [root]
        while stack:
            x = stack.pop()
            yield x
            if x._right is not None:
                stack.append(x._right)
            if x._left is not None:
                stack.append(x._left)


def tally(roots: list[Any]) -> tuple[int, int, int]:
    """(rank sum, roots, non-root 0,i-nodes) from scratch, iteratively.  O(n)."""
    rs = zs = 0
    for root in roots:
        rs += root._rank
        stack = [] if root._left is None else [root._left]
        while stack:
            x = stack.pop()
            rs += x._rank
            left, right = x._left, x._right
            a = -1 if left is None else left._rank
            b = -1 if right is None else right._rank
            if a - b > 1 or b - a > 1:
                zs += 1
            if left is not None:
                stack.append(left)
            if right is not None:
                stack.append(right)
    return rs, len(roots), zs
