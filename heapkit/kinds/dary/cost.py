"""What the auditor asks of the d-ary heap: actual costs in levels an entry moves + 1.

A worst-case kind: ``Phi = 0``, so amortized = actual.  Cost unit: the levels
the moving entry travels + 1 (the pushed, changed or re-seated last entry).
Bounds, with ``L(s)`` the number of levels of a complete d-ary tree of ``s``
entries (``L(s) = depth(s - 1) + 1``): push ``L(n + 1)``, pop, remove,
decrease_key, change_key ``L(n)``: an entry moves at most between the root and
the deepest level.  Meld: the cost is half the total level displacement of the
entries it moves + 1; Floyd's heapify moves entries at most the sum of the
heights, < N levels (O(N) in CLRS, 3rd ed., 6.3; "< N" recalled from memory:
N - popcount(N) for d = 2, less for larger d), and the pushes branch is
taken only when ``m * bitlength(N) < N``, so the bound is ``N + 1`` for the
combined size N.  The ``d`` factor of pop shows in the comparisons column
(``d - 1`` a level down, bottom-up), not in this unit.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from heapkit.kinds.dary.heap import DaryHeap

    Dary = DaryHeap[Any, Any]

__all__ = ["COST_UNIT", "PHI_C", "POTENTIAL", "actual", "bound", "depth", "phi", "probe"]

COST_UNIT = "levels an entry moves + 1"
POTENTIAL = "none (worst-case bounds)"
PHI_C = 1.0


def depth(i: int, d: int) -> int:
    """Depth of position i in a d-ary array heap (the root is 0).  O(log_d i)."""
    if d == 2:
        return (i + 1).bit_length() - 1
    k = 0
    while i:
        i = (i - 1) // d
        k += 1
    return k


def phi(heap: Dary) -> float:
    """No potential: the bounds are worst-case."""
    return 0.0


def probe(heap: Dary, op: str, handle: Any) -> Any:
    """Before ``op``: the positions (and last entry) its moves start from."""
    a = heap._a
    if op == "push":
        return len(a)
    if op == "pop":
        return (len(a) - 1, a[-1])
    if op == "remove":
        return (handle._i, a[-1])
    if op == "meld":
        return _meld_probe(heap, handle)
    return handle._i


def actual(heap: Dary, op: str, probe: Any, handle: Any) -> int:
    """After ``op``: the levels its moving entry went (+ 1)."""
    d = heap._d
    if op == "push":
        return depth(probe, d) - depth(handle._i, d) + 1
    if op == "pop" or op == "remove":
        start, last = probe
        if last._tok is None:  # the last entry itself left (it was the one removed)
            return 1
        if op == "pop":
            start = 0
        return abs(depth(start, d) - depth(last._i, d)) + 1
    if op == "meld":
        moved: int = sum(abs(depth(x._i, d) - dep) for x, dep in probe)
        return (moved + 1) // 2 + 1
    return abs(depth(probe, d) - depth(handle._i, d)) + 1


# The entries a meld may move, with their depth before it (other's entries
# at the positions they are appended to): every entry when heapifying
# (O(n + m) work anyway), else the ancestors of the appended positions.
def _meld_probe(heap: Dary, other: Any) -> list[tuple[Any, int]]:
    a, b, d = heap._a, other._a, heap._d
    n, m = len(a), len(b)
    out = [(x, depth(n + j, d)) for j, x in enumerate(b)]
    if not heap._pushes(n, m):
        out.extend((x, depth(i, d)) for i, x in enumerate(a))
        return out
    seen: set[int] = set()
    for j in range(n, n + m):
        while j:
            j = (j - 1) // d
            if j in seen:
                break
            seen.add(j)
    out.extend((a[i], depth(i, d)) for i in seen if i < n)
    return out


def bound(heap: Dary, op: str, n: int) -> float:
    """The worst-case bound of ``op`` at size ``n``: it depends on the arity."""
    if op == "meld":
        return float(n + 1)
    d = heap._d
    size = n + 1 if op == "push" else n
    return float(depth(max(size - 1, 0), d) + 1)
