"""The Fibonacci heap's node and rings: the node class, closing a ring, walking every
node, and the flat export/import behind copy and pickle.  Compiled by mypyc in the
compiled build (with ``core.py``).

Nodes are :class:`_Node`: ``_left``/``_right`` (a circular doubly linked ring of
siblings; a dead node's ring is itself), ``_parent``, ``_child``.  Loops with explicit
stacks and ring walks only (no recursion on depth).  Rules for this module: nodes typed
as their class, no ``Generic``, no ``__weakref__``, no ``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

from heapkit._core import HandleBase

__all__ = ["_Node", "export", "import_", "ring", "walk"]


class _Node(HandleBase):
    """Handle and tree node (sealed: never subclass it): ring links ``_left``/``_right``,
    ``_parent``, one ``_child`` of the child ring, ``_degree`` (children) and ``_mark``."""

    __slots__ = ("_child", "_degree", "_left", "_mark", "_parent", "_right")

    def __init__(self, key: Any, k: Any, value: Any, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._left: _Node = self
        self._right: _Node = self
        self._parent: _Node | None = None
        self._child: _Node | None = None
        self._degree: int = 0
        self._mark: bool = False


# Precondition: trees is a non-empty list of roots (ring links may be stale).
# Restores: one closed ring through them in list order.  No comparison.
def ring(trees: list[_Node]) -> None:
    prev = trees[-1]
    for t in trees:
        prev._right = t
        t._left = prev
        prev = t


def walk(start: _Node | None) -> Iterator[_Node]:
    """Every node of the forest whose root ring holds ``start``, depth first."""
    if start is None:
        return
    stack = [start]
    while stack:
        s = stack.pop()
        x = s
        while True:
            yield x
            c = x._child
            if c is not None:
                stack.append(c)
            x = x._right
            if x is s:
                break


def _ring_list(start: _Node | None) -> list[_Node]:
    out: list[_Node] = []
    if start is not None:
        x = start
        while True:
            out.append(x)
            x = x._right
            if x is start:
                break
    return out


def export(m: _Node | None) -> tuple[list[Any], Any]:
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


def import_(handles: list[Any], layout: Any) -> tuple[list[_Node], int]:
    """Relink ``handles`` into the exported shape; return the roots and the mark count."""
    degrees: list[int] = layout[0]
    marks: list[Any] = layout[1]
    nodes: list[_Node] = handles
    roots: list[_Node] = []
    parents: list[_Node] = []  # open parents, with their children still to attach in `left`
    left: list[int] = []
    nmarks = 0
    for x, d, mk in zip(nodes, degrees, marks, strict=True):
        x._parent = x._child = None
        x._left = x._right = x
        x._degree = d
        x._mark = bool(mk)
        if x._mark:
            nmarks += 1
        if parents:
            p = parents[-1]
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
            left[-1] -= 1
            if left[-1] == 0:
                parents.pop()
                left.pop()
        else:
            roots.append(x)
        if d:
            parents.append(x)
            left.append(d)
    if roots:
        ring(roots)
    return roots, nmarks
