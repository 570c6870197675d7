"""A check of ``_export`` layouts that kinds share when a heap is loaded (pickle, copy):
the preorder child counts of a forest (pairing, Fibonacci)."""

from __future__ import annotations

from typing import Any


def forest_problem(counts: list[Any], n: int, one_tree: bool) -> str | None:
    """What is wrong with a preorder listing of ``n`` nodes' child counts, or None: the
    counts must close each tree exactly (one tree only if ``one_tree``).  O(n)."""
    if type(counts) is not list or len(counts) != n:
        return f"expected a list of {n} child counts, got {counts!r:.80}"
    open_ = 0  # children announced and not yet listed
    for i, c in enumerate(counts):
        if type(c) is not int or c < 0:
            return f"child count {c!r:.40} at {i} is not a non-negative int"
        if open_:
            open_ -= 1
        elif i and one_tree:
            return f"node {i} is outside the one tree"
        open_ += c
    if open_:
        return f"{open_} announced child(ren) missing"
    return None
