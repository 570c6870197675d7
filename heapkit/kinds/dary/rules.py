"""The rules of a d-ary heap checked: the full survey, check paths, and what
checked mode and ``to_dot`` ask (kept beside ``heap.py``).

The full survey (``survey``) visits every position once and checks
``index``, ``ownership`` and ``heap-order`` against the parent, and at arity 4
the kept ``pair-verdicts`` of each sibling pair: O(n).

Incremental checking: an operation (other than meld) moves entries along one
path of the implicit tree, between the positions it starts from and the
positions its moving entries land on.  The local survey re-checks that stretch
of the path and the parent just above it, each position with its children
(``index``, ``ownership``, ``heap-order``, ``pair-verdicts``): O(d * levels moved), the cost of
the operation itself.

* push: from the new last position (``len`` before the push) to where the
  entry lands;
* pop: from the root to where the old last entry lands;
* decrease_key, change_key: between the entry's old and new positions;
* remove: between the removed entry's position and where the old last lands;
* meld by pushes: every new position up to the root; meld by heapify: all.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

__all__ = ["RULES", "dot_edges", "path", "stretch", "survey", "survey_local", "touched", "verdicts"]

RULES: dict[str, str] = {
    "heap-order": "no entry is smaller than its parent a[(i - 1) // d]",
    "index": "every handle's position is where it stands in the array",
    "size": "the array holds len(heap) entries",
    "ownership": "every handle's owner token resolves to this heap's",
    "pair-verdicts": "arity 4: every kept verdict on a sibling pair agrees with their keys",
}


def touched(heap: Any, op: str, handle: Any) -> Any:
    """``(positions, movers, to_root)``: the stretch to re-check runs between
    these positions and wherever these entries stand afterwards (up to the
    root if ``to_root``).  None: the op may move anything; survey it all."""
    a = heap._a
    if op == "push":
        return [len(a)], [], False
    if op == "pop":
        return [0], a[-1:], False
    if op in ("decrease_key", "change_key"):
        return [handle._i], [], False
    if op == "remove":
        return [handle._i], a[-1:], False
    if op == "meld":
        n, m = len(a), len(handle._a)
        if heap._pushes(n, m):
            return list(range(n, n + m)), [], True
        return None
    return None


def stretch(heap: Any, spots: Any, handle: Any, report: Any = None) -> list[int]:
    """The positions the local survey re-checks, lowest start first up to the
    parent above the highest changed position (see the module docstring)."""
    a = heap._a
    n = len(a)
    d = heap._d
    positions, movers, to_root = spots
    starts = [p for p in positions if p < n]
    if handle is not None and hasattr(handle, "_i"):
        movers = [*movers, handle]
    for x in movers:
        if x._tok is None:
            continue  # popped or removed
        i = x._i
        if 0 <= i < n and a[i] is x:
            starts.append(i)
        elif report is not None:
            report.fail("index", x, [], f"handle says position {i}, but it does not stand there")
    top = 0 if to_root or not starts else min(starts)
    out: list[int] = []
    done: set[int] = set()
    for i in starts:
        while i not in done:
            done.add(i)
            out.append(i)
            if i == 0 or i < top:
                break
            i = (i - 1) // d
    return out


def survey_local(heap: Any, report: Any, spots: Any, handle: Any) -> None:
    """Check the stretch named by :func:`touched` after the operation."""
    a = heap._a
    d = heap._d
    n = len(a)
    if spots is None:
        heap._survey(report)
        return
    if n != heap._n:
        report.fail("size", None, [], f"the array holds {n} entries but len is {heap._n}")
    for i in stretch(heap, spots, handle, report):
        _at(heap, report, a, d, i)


def _at(heap: Any, report: Any, a: Any, d: int, i: int) -> None:
    """Check position ``i``: its index, owner, and order against its children."""
    x = a[i]
    if x._i != i:
        report.fail("index", x, path(heap, i), f"handle says position {x._i}, stands at {i}")
    if x._tok is not heap._tok and x not in heap:
        report.fail("ownership", x, path(heap, i), "its owner token is not this heap's")
    xk = x._k
    lo = d * i + 1
    if d == 4:
        verdicts(heap, report, lo, lo + 4)
    for c in range(lo, min(lo + d, len(a))):
        y = a[c]
        if y._k < xk:
            report.fail("heap-order", y, path(heap, c), f"key {y._key!r} is smaller than its parent's {x._key!r}")


def dot_edges(heap: Any) -> Iterator[tuple[Any, Any, str]]:
    """``(parent or None, entry, "[i]")`` in array order."""
    a = heap._a
    d = heap._d
    for i, x in enumerate(a):
        yield (a[(i - 1) // d] if i else None), x, f"[{i}]"


def verdicts(heap: Any, report: Any, lo: int, hi: int) -> None:
    """Arity 4: the kept verdict of every sibling pair at odd ``lo <= c < hi`` (both
    in the array) agrees with their keys (``pair-verdicts``)."""
    a = heap._a
    w = heap._w
    for c in range(lo, min(hi, len(a) - 1), 2):
        v = w[c >> 1] if c >> 1 < len(w) else 0
        if v and (2 if a[c + 1]._k < a[c]._k else 1) != v:
            report.fail("pair-verdicts", a[c], path(heap, c), f"kept verdict {v} is wrong")


def path(heap: Any, i: int) -> list[str]:
    """Steps from the root to position ``i`` (``child j`` at each level)."""
    d = heap._d
    steps: list[str] = []
    while i > 0:
        p = (i - 1) // d
        steps.append(f"child {i - (d * p + 1)}")
        i = p
    steps.append("root")
    steps.reverse()
    return steps


def survey(heap: Any, report: Any) -> dict[str, Any]:
    """Check every rule in O(n d); return the figures of :class:`heapkit.Shape`."""
    a = heap._a
    d = heap._d
    for i, x in enumerate(a):
        if x._i != i:
            report.fail("index", x, path(heap, i), f"handle says position {x._i}, stands at {i}")
        if x not in heap:
            report.fail("ownership", x, path(heap, i), "its owner token is not this heap's")
        if i:
            p = a[(i - 1) // d]
            if x._k < p._k:
                report.fail(
                    "heap-order",
                    x,
                    path(heap, i),
                    f"key {x._key!r} is smaller than its parent's {p._key!r}",
                )
    if d == 4:
        verdicts(heap, report, 1, len(a))
    if len(a) != heap._n:
        report.fail("size", None, [], f"the array holds {len(a)} entries but len is {heap._n}")
    n = len(a)
    # span: how many entries levels 0..height hold; stop once they hold n.
    height = 0
    span = 1
    while span < n:
        span = span * d + 1
        height += 1
    return {
        "size": n,
        "roots": 1 if n else 0,
        "height": height,
        "max_degree": min(d, max(0, n - 1)),
        "marked": None,
        "potential": None,
        "details": {"arity": d},
    }
