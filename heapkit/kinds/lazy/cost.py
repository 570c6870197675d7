"""What the auditor asks of the lazy heap: cost unit, potential, bounds.

Cost unit: entries moved through the C heap (pushed, popped or rebuilt).
``Phi`` = the number of stale entries, ``c = 1``; the bounds are derived in
``heap.py``'s docstring.
"""

from __future__ import annotations

from typing import Any

__all__ = ["COST_UNIT", "PHI_C", "POTENTIAL", "actual", "bound", "phi", "probe"]

COST_UNIT = "entries moved through the C heap (pushed, popped or rebuilt)"
POTENTIAL = "number of stale entries"
PHI_C = 1.0


def phi(heap: Any) -> float:
    """The potential now: the stale count, O(1)."""
    return float(heap._stale)


def probe(heap: Any, op: str, handle: Any) -> Any:
    """Before ``op``: the list's length and what a compaction would rebuild."""
    compacts = heap._stale >= heap._n > 0 and op in ("pop", "decrease_key", "change_key", "remove")
    if op == "meld":
        m = sum(1 for e in handle._a if e[1]._e is e)
        return m if heap._pushes_win(m) else heap._n + m
    return (len(heap._a), heap._n if compacts else 0)


def actual(heap: Any, op: str, probe: Any, handle: Any) -> int:
    """After ``op``: the entries it moved through the C heap."""
    if op == "meld":
        return int(probe)
    size: int = probe[0]
    rebuilt: int = probe[1]
    if op == "pop":
        # Entries popped (a compaction leaves `rebuilt` entries in the list first).
        return rebuilt + (rebuilt if rebuilt else size) - len(heap._a)
    if op in ("push", "decrease_key", "change_key"):
        return 1 + rebuilt
    return rebuilt


def bound(op: str, n: int) -> float:
    """The amortized bound of ``op`` at size ``n``."""
    return float({"push": 1, "pop": 1, "decrease_key": 2, "change_key": 2, "remove": 1}.get(op, n))
