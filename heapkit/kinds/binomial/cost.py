"""What the auditor asks of the binomial heap: cost unit, potential, bounds.

``Phi`` = the number of trees; the bounds are derived in ``heap.py``'s docstring.
"""

from __future__ import annotations

from typing import Any

from heapkit.kinds.binomial.forest import _ancestors

__all__ = ["COST_UNIT", "PHI_C", "POTENTIAL", "actual", "bound", "phi", "probe"]

COST_UNIT = "links + roots scanned + 1 (decrease_key: levels moved + 1)"
POTENTIAL = "number of trees"
PHI_C = 1.0


def _lg(n: int) -> int:
    """floor(log2 n), and 0 for n < 2."""
    return max(0, n.bit_length() - 1)


def phi(heap: Any) -> float:
    """Number of trees: O(log n)."""
    return float(sum(1 for r in heap._roots if r is not None))


def _depth_root(heap: Any, x: Any) -> tuple[int, int]:
    """(depth of x, degree of its tree's root)."""
    up = _ancestors(x, heap._n)
    return len(up), (up[-1] if up else x)._deg


def probe(heap: Any, op: str, handle: Any) -> Any:
    """Before ``op``: the tree count, and where the handle stands."""
    trees = int(phi(heap))
    if op == "pop":
        return (trees, 0 if heap._min is None else heap._min._deg)
    if op in ("decrease_key", "change_key", "remove"):
        depth, top = _depth_root(heap, handle)
        return (trees, depth, top, handle is heap._min, heap._raised)
    if op == "meld":
        return (trees, int(phi(handle)))
    return (trees,)


def actual(heap: Any, op: str, probe: Any, handle: Any) -> int:
    """After ``op``: links made and roots scanned (or levels moved), + 1."""
    after = int(phi(heap))
    before: int = probe[0]
    if op == "push":
        return (before + 1 - after) + 1  # links + 1
    if op == "pop":
        deg: int = probe[1]
        return (before - 1 + deg - after) + after + 1  # links + roots scanned + 1
    if op == "meld":
        other: int = probe[1]
        return (before + other - after) + 1
    if len(probe) < 5:
        return 1  # an operation without a cost model here (none of the six above)
    depth: int = probe[1]
    top: int = probe[2]
    was_min, raised = probe[3], probe[4]
    if op == "remove":
        links = before - 1 + top - after
        return depth + links + (after if was_min else 0) + 1
    if op == "change_key" and heap._raised != raised:
        links = before + top - after
        return depth + links + (after if was_min else 0) + 1
    return depth - _depth_root(heap, handle)[0] + 1  # levels moved + 1


def bound(op: str, n: int) -> float:
    """The amortized bounds derived in the docstring of ``heap.py``."""
    lg = _lg(n)
    return {
        "push": 2,
        "pop": 2 * lg + 1,
        "decrease_key": lg + 1,
        "change_key": 3 * lg + 2,
        "remove": 3 * lg + 1,
        "meld": lg + 2,
    }.get(op, lg + 1)
