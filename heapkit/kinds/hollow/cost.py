"""What the auditor asks of the hollow heap: cost unit, potential, bounds.

Cost unit: links + hollow nodes destroyed + 1, counted by the heap itself
(``heap._work``).  ``Phi`` = unranked edges + ranked children of hollow nodes
+ hollow nodes, charged with ``c = 2``; the bounds are derived in ``heap.py``'s
docstring.
"""

from __future__ import annotations

from typing import Any

from heapkit.kinds.hollow.dag import max_rank

__all__ = ["COST_UNIT", "PHI_C", "POTENTIAL", "actual", "bound", "phi", "probe"]

COST_UNIT = "links + hollow nodes destroyed + 1"
POTENTIAL = "unranked edges + ranked children of hollow nodes + hollow nodes"
PHI_C = 2.0


def phi(heap: Any) -> float:
    """The potential now, from the kept counters: O(1)."""
    return float(heap._u + heap._hr + heap._h)


def probe(heap: Any, op: str, handle: Any) -> int:
    """Before ``op``: the heap's work count."""
    return int(heap._work)


def actual(heap: Any, op: str, probe: int, handle: Any) -> int:
    """After ``op``: the work it did, + 1."""
    return 1 + int(heap._work) - int(probe)


def bound(op: str, n: int) -> float:
    """Amortized bound at size n (R: the rank bound for at most 3n + 17 nodes)."""
    r = max_rank(n)
    table = {"push": 4, "meld": 4, "decrease_key": 12, "change_key": 4 * r + 10}
    return float(table.get(op, 4 * r + 6))
