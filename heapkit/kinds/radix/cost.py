"""What the auditor asks of the radix heap: cost unit, potential, bounds.

``Phi`` = the sum over entries of their bucket index; the bounds are derived in
``heap.py``'s docstring.
"""

from __future__ import annotations

from typing import Any

__all__ = ["COST_UNIT", "PHI_C", "POTENTIAL", "actual", "bound", "phi", "probe"]

COST_UNIT = "entries examined + buckets skipped + 1"
POTENTIAL = "sum over entries of the bucket index (k ^ last).bit_length()"
PHI_C = 1.0


def phi(heap: Any) -> float:
    """Sum of bucket indices, O(number of buckets)."""
    return float(sum(b * len(bl) for b, bl in enumerate(heap._buckets)))


def probe(heap: Any, op: str, handle: Any) -> Any:
    """Before ``op``: a meld's incoming size, a pop's first non-empty bucket and its size."""
    if op == "meld":
        return len(handle)
    if op != "pop" or not heap._n:
        return None
    buckets = heap._buckets
    if buckets[0]:
        return (0, len(buckets[0]))
    j = next(b for b, bl in enumerate(buckets) if bl)
    return (j, len(buckets[j]))


def actual(heap: Any, op: str, probe: Any, handle: Any) -> int:
    """After ``op``: entries moved (redistributed or melded in), + 1."""
    if op == "meld":
        return 1 + (0 if probe is None else int(probe))
    if op != "pop" or probe is None:
        return 1
    j, s = int(probe[0]), int(probe[1])
    if j == 0:
        return s if heap._stable else 1
    return 1 + j + s + (s if heap._stable else 0)


def bound(heap: Any, op: str, n: int) -> float:
    """The amortized bound at size n; D = buckets in use (grows with log2 C)."""
    d = len(heap._buckets)
    extra = n + 1 if heap._stable else 0
    if op == "pop":
        return 2.0 + extra
    if op in ("decrease_key", "remove"):
        return 1.0
    if op == "meld":
        return n + 1.0
    return 1.0 + d
