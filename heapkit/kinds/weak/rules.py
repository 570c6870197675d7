"""The weak heap's rules checked: the full survey, check paths and ``to_dot`` edges.

The survey visits every position once (O(n)): its index and owner, its reverse
bit, and, unless it is pending, the weak-heap order against its distinguished
ancestor, ``not a[j] < a[da(j)]``.  By transitivity along the d-ancestor chain
this is the same as "the entry at ``i`` is not above anything in ``i``'s right
subtree" (Dutton 1993; recalled from memory).
"""

from __future__ import annotations

from collections.abc import Iterator, Sequence
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from heapkit.kinds.weak.heap import WeakHeap

    Weak = WeakHeap[Any, Any]

__all__ = ["RULES", "dot_edges", "path", "survey"]

RULES: dict[str, str] = {
    "weak-order": "no settled entry is smaller than the entry at its distinguished ancestor",
    "root": "the root has no left child: its reverse bit is 0",
    "reverse-bits": "one bit per position, each 0 or 1, and 0 where a position has no child",
    "pending": "the pending positions are a tail [s, n) and marks below s",
    "index": "every handle's position is where it stands in the array",
    "size": "the array holds len(heap) entries",
    "ownership": "every handle's owner token resolves to this heap's",
}


def _da(r: Sequence[int], j: int) -> int:
    """Distinguished ancestor of ``j >= 1`` (tolerates a corrupt root bit: stops at 0)."""
    while j > 1 and (j & 1) == r[j >> 1]:
        j >>= 1
    return j >> 1


def path(heap: Weak, i: int) -> list[str]:
    """Steps from the root to position ``i``: ``left``/``right`` by the reverse bits."""
    r = heap._r
    steps: list[str] = []
    while i > 0:
        p = i >> 1
        left = p > 0 and p < len(r) and (i & 1) == r[p]
        steps.append("left" if left else "right")
        i = p
    steps.append("root")
    steps.reverse()
    return steps


def _pending(heap: Weak) -> set[int]:
    n = len(heap._a)
    return set(range(max(heap._s, 1), n)) | {-q for q in heap._up}


def survey(heap: Weak, report: Any) -> dict[str, Any]:
    """Check every rule in O(n); return the figures of :class:`heapkit.Shape`."""
    a = heap._a
    r = heap._r
    n = len(a)
    if len(a) != heap._n:
        report.fail("size", None, [], f"the array holds {n} entries but len is {heap._n}")
    if len(r) != n:
        report.fail("reverse-bits", None, [], f"{len(r)} reverse bits for {n} positions")
    if r and r[0] != 0:
        report.fail("root", a[0] if a else None, ["root"], f"root reverse bit is {r[0]!r}, so it has a left child")
    s = heap._s
    bad = [-q for q in heap._up if not 0 < -q < s]
    if not 0 <= s <= n or bad:
        report.fail("pending", None, [], f"tail start {s!r} of {n} positions, marks out of range {bad!r}")
    pend = _pending(heap)
    bits_ok = len(r) == n
    degree = [0] * n
    for i, x in enumerate(a):
        if x._i != i:
            report.fail("index", x, path(heap, i), f"handle says position {x._i}, stands at {i}")
        if x not in heap:
            report.fail("ownership", x, path(heap, i), "its owner token is not this heap's")
        if bits_ok and (r[i] not in (0, 1) or (r[i] and 2 * i >= n)):
            report.fail("reverse-bits", x, path(heap, i), f"reverse bit {r[i]!r} at a position with no child")
        if i and bits_ok:
            p = _da(r, i)
            degree[p] += 1
            y = a[p]
            if i not in pend and x._k < y._k:
                report.fail(
                    "weak-order",
                    x,
                    path(heap, i),
                    f"key {x._key!r} is smaller than its distinguished ancestor's {y._key!r}",
                )
    return {
        "size": n,
        "roots": 1 if n else 0,
        "height": (n - 1).bit_length() if n else 0,
        "max_degree": max(degree, default=0),
        "marked": None,
        "potential": heap._phi(),
        "details": {"pending": len(pend)},
    }


def layout_problem(handles: list[Any], layout: Any) -> str | None:
    """Loading: one reverse bit per position, the settled prefix within the array and the
    waiting positions distinct, sorted and inside it (no key compared).  O(n)."""
    n = len(handles)
    if type(layout) is not tuple or len(layout) != 3:
        return f"expected (reverse bits, settled prefix, waiting positions), got {layout!r:.80}"
    bits, s, up = layout
    if type(bits) is not bytes or len(bits) != n or any(b > 1 for b in bits):
        return f"expected {n} reverse bits of 0 or 1, got {bits!r:.80}"
    if type(s) is not int or not 0 <= s <= n:
        return f"settled prefix {s!r:.40} is not an int in 0..{n}"
    if type(up) is not list or any(type(i) is not int or not 0 <= i < n for i in up) or up != sorted(set(up)):
        return f"waiting positions {up!r:.80} are not distinct sorted positions below {n}"
    return None


def dot_edges(heap: Weak) -> Iterator[tuple[Any, Any, str]]:
    """``(entry at the distinguished ancestor or None, entry, "[i]")`` in array order:
    the heap-ordered multiway tree a weak heap stands for (pending entries marked)."""
    a = heap._a
    r = heap._r
    pend = _pending(heap)
    for i, x in enumerate(a):
        tag = f"[{i}], pending" if i in pend else f"[{i}]"
        yield (a[_da(r, i)] if i else None), x, tag
