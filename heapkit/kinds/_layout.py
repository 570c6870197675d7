"""Checks of ``_export`` layouts that kinds share when a heap is loaded (pickle, copy)."""

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


def bucket_problem(handles: list[Any], layout: Any, max_bits: int) -> str | None:
    """Radix heap: bucket sizes adding up to the handles, each key an int in its bucket
    ``(key ^ last).bit_length()``, at most ``max_bits + 1`` buckets.  O(n)."""
    if type(layout) is not tuple or len(layout) != 2:
        return f"expected (last, bucket sizes), got {layout!r:.80}"
    last, sizes = layout
    if type(last) is not int or last < 0 or type(sizes) is not list or len(sizes) > max_bits + 1:
        return f"expected a last key >= 0 and at most {max_bits + 1} bucket sizes, got {layout!r:.80}"
    if any(type(s) is not int or s < 0 for s in sizes) or sum(sizes) != len(handles):
        return f"bucket sizes {sizes!r:.80} do not add up to {len(handles)} handles"
    at = 0
    for b, s in enumerate(sizes):
        for x in handles[at : at + s]:
            k = x._key
            if type(k) is not int or k < last or (k ^ last).bit_length() != b:
                return f"key {k!r:.40} does not belong in bucket {b} (last popped {last})"
        at += s
    return None
