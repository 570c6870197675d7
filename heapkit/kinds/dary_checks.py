"""What checked mode and ``to_dot`` ask of a d-ary heap (kept beside ``dary.py``).

Incremental checking: every operation moves entries along one or two paths of
the implicit tree, so the local survey re-checks those paths up to the root,
each position with its children (``index``, ``ownership``, ``heap-order``):
O(d log_d n) per path, the cost of the operation itself.

* push: the path from the new last position (``len`` before the push);
* pop: the path from where the old last entry lands;
* decrease_key: the path from the entry's old position;
* change_key: the paths from its old and its new position;
* remove: the path from the removed entry's position and from where the old
  last entry lands;
* meld by pushes: the path from every new position; meld by heapify: all.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

__all__ = ["dot_edges", "survey_local", "touched"]


def touched(heap: Any, op: str, handle: Any) -> Any:
    """``(positions, movers)``: paths to re-check start at these positions and
    at wherever these entries stand afterwards.  None: check everything."""
    a = heap._a
    if op == "push":
        return [len(a)], []
    if op == "pop":
        return [0], a[-1:]
    if op in ("decrease_key", "change_key"):
        return [handle._i], []
    if op == "remove":
        return [handle._i], a[-1:]
    if op == "meld":
        n, m = len(a), len(handle._a)
        if heap._meld_by_pushes(n, m):
            return list(range(n, n + m)), []
        return None
    return None


def survey_local(heap: Any, report: Any, spots: Any, handle: Any) -> None:
    """Check the paths named by :func:`touched` after the operation."""
    a = heap._a
    d = heap._d
    n = len(a)
    if n != heap._n:
        report.fail("size", None, [], f"the array holds {n} entries but len is {heap._n}")
    positions, movers = spots
    starts = [p for p in positions if p < n]
    if handle is not None and hasattr(handle, "_i"):
        movers = [*movers, handle]
    for x in movers:
        if x._tok is None:
            continue  # popped or removed
        i = x._i
        if not (0 <= i < n and a[i] is x):
            report.fail("index", x, [], f"handle says position {i}, but it does not stand there")
        else:
            starts.append(i)
    done: set[int] = set()
    for i in starts:
        while i not in done:
            done.add(i)
            _at(heap, report, a, d, i)
            if i == 0:
                break
            i = (i - 1) // d


def _at(heap: Any, report: Any, a: Any, d: int, i: int) -> None:
    """Check position ``i``: its index, owner, and order against its children."""
    x = a[i]
    if x._i != i:
        report.fail("index", x, heap._path(i), f"handle says position {x._i}, stands at {i}")
    if x._tok is not heap._tok and x not in heap:
        report.fail("ownership", x, heap._path(i), "its owner token is not this heap's")
    xk = x._k
    lo = d * i + 1
    for c in range(lo, min(lo + d, len(a))):
        y = a[c]
        if y._k < xk:
            report.fail(
                "heap-order", y, heap._path(c), f"key {y._key!r} is smaller than its parent's {x._key!r}"
            )


def dot_edges(heap: Any) -> Iterator[tuple[Any, Any, str]]:
    """``(parent or None, entry, "[i]")`` in array order."""
    a = heap._a
    d = heap._d
    for i, x in enumerate(a):
        yield (a[(i - 1) // d] if i else None), x, f"[{i}]"
