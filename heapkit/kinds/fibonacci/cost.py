"""What the auditor asks of the Fibonacci heap: cost unit, potential, bounds.

``Phi = trees + 2 * marked``, charged with ``c = 2``; the bounds are derived in
``heap.py``'s docstring (Fredman and Tarjan 1987).
"""

from __future__ import annotations

import math
from typing import Any

__all__ = ["COST_UNIT", "PHI_C", "POTENTIAL", "actual", "bound", "max_degree_bound", "phi", "probe"]

COST_UNIT = "roots scanned + links + cuts + 1"
POTENTIAL = "trees + 2 * marked nodes"
PHI_C = 2.0

#: ln of the golden ratio, for D(n) = floor(log_phi n).
_LN_PHI = math.log((1 + math.sqrt(5)) / 2)


def max_degree_bound(n: int) -> int:
    """``D(n) = floor(log_phi n)``, the largest degree a heap of n nodes can hold."""
    return int(math.log(n) / _LN_PHI + 1e-9) if n > 1 else 0


def phi(heap: Any) -> float:
    """The potential now, from the kept counters: O(1)."""
    return float(heap._roots + 2 * heap._marks)


def probe(heap: Any, op: str, handle: Any) -> Any:
    """Before ``op``: the root count and the degree of the node it takes out."""
    heap._cons = -1
    x = heap._min if op == "pop" else handle
    degree = x._degree if isinstance(x, heap._NODE) else 0
    return heap._roots, degree


def actual(heap: Any, op: str, probe: Any, handle: Any) -> int:
    """After ``op``: roots scanned + links + cuts + 1."""
    roots, degree = probe
    if op in ("push", "meld"):
        return 1
    if heap._cons >= 0:  # a consolidation ran: its scans and links, plus promotions
        return 1 + int(degree) + int(heap._cons)
    if op == "remove":  # cuts = roots gained + the removed root
        return 2 + int(heap._roots) - int(roots)
    return 1 + int(heap._roots) - int(roots)  # decrease_key, change_key: one root per cut


def bound(op: str, n: int) -> float:
    """The amortized bound of ``op`` at size ``n``."""
    d = max_degree_bound(n)
    return float(
        {
            "push": 3,
            "meld": 1,
            "decrease_key": 8,
            "pop": 5 * (d + 1),
            "remove": max(5 * (d + 1), 3 * d + 6),
            "change_key": max(5 * (d + 1), 3 * d + 8),
        }.get(op, 5 * (d + 1))
    )
