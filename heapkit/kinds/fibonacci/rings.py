"""The Fibonacci heap's rings: closing a ring, walking every node, and the flat
export/import behind copy and pickle.

Nodes are ``heap.py``'s ``_Node``: ``_left``/``_right`` (a circular doubly
linked ring of siblings), ``_parent``, ``_child``.  Loops with explicit stacks
and ring walks only (no recursion on depth).
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

__all__ = ["export", "import_", "ring", "walk"]


# Precondition: trees is a non-empty list of roots (ring links may be stale).
# Restores: one closed ring through them in list order.  No comparison.
def ring(trees: list[Any]) -> None:
    prev = trees[-1]
    for t in trees:
        prev._right = t
        t._left = prev
        prev = t


def walk(start: Any) -> Iterator[Any]:
    """Every node of the forest whose root ring holds ``start``, depth first."""
    if start is None:
        return
    stack = [start]
    while stack:
        s = stack.pop()
        x = s
        while True:
            yield x
            if x._child is not None:
                stack.append(x._child)
            x = x._right
            if x is s:
                break


def _ring_list(start: Any) -> list[Any]:
    out = []
    if start is not None:
        x = start
        while True:
            out.append(x)
            x = x._right
            if x is start:
                break
    return out


def export(m: Any) -> tuple[list[Any], tuple[list[int], list[bool]]]:
    """Preorder nodes (roots from the min on) with their degrees and marks."""
    out: list[Any] = []
    degrees: list[int] = []
    marks: list[bool] = []
    stack = _ring_list(m)
    stack.reverse()
    while stack:
        x = stack.pop()
        out.append(x)
        marks.append(bool(x._mark))
        kids = _ring_list(x._child)
        degrees.append(len(kids))
        kids.reverse()
        stack.extend(kids)
    return out, (degrees, marks)


def import_(handles: list[Any], layout: tuple[list[int], list[bool]]) -> tuple[list[Any], int]:
    """Relink ``handles`` into the exported shape; return the roots and the mark count."""
    degrees, marks = layout
    roots: list[Any] = []
    stack: list[list[Any]] = []  # [parent, children still to attach]
    nmarks = 0
    for x, d, mk in zip(handles, degrees, marks, strict=True):
        x._parent = x._child = None
        x._left = x._right = x
        x._degree = d
        x._mark = bool(mk)
        nmarks += x._mark
        if stack:
            top = stack[-1]
            p = top[0]
            c = p._child
            if c is None:
                p._child = x
            else:
                cl = c._left
                x._left = cl
                x._right = c
                cl._right = x
                c._left = x
            x._parent = p
            top[1] -= 1
            if top[1] == 0:
                stack.pop()
        else:
            roots.append(x)
        if d:
            stack.append([x, d])
    if roots:
        ring(roots)
    return roots, nmarks
