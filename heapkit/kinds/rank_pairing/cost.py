"""What the auditor asks of the rank-pairing heap: cost unit, potential, bounds.

Cost unit: links + cuts + ranks written + roots scanned + 1, counted by the heap
itself (``heap._work``).  The potential and the bounds are derived in
``heap.py``'s docstring; ``Phi`` is kept O(1) from the heap's counters.
"""

from __future__ import annotations

import math
from typing import Any

__all__ = ["COST_UNIT", "PHI_C", "POTENTIAL", "actual", "bound", "phi", "probe"]

COST_UNIT = "links + cuts + ranks written + roots scanned + 1"
POTENTIAL = "7*sum of non-root rank differences + 6*#0,i-nodes + 18*#roots"
PHI_C = 1.0

_LOG_PHI = math.log((1 + math.sqrt(5)) / 2)


def phi(heap: Any) -> float:
    """The potential (see ``heap.py``'s docstring).  O(1)."""
    return float(7 * heap._rs + 7 * heap._n + 11 * heap._rt + 6 * heap._zs)


def probe(heap: Any, op: str, handle: Any) -> int:
    """Before ``op``: the heap's work count."""
    return int(heap._work)


def actual(heap: Any, op: str, probe: Any, handle: Any) -> int:
    """After ``op``: the work it did, + 1."""
    return int(heap._work - probe + 1)


def bound(op: str, n: int) -> float:
    """The amortized bound of ``op`` at size ``n`` (log base the golden ratio)."""
    lg = math.log(n) / _LOG_PHI if n > 1 else 0.0
    return {
        "push": 19.0,
        "meld": 1.0,
        "decrease_key": 28.0,
        "pop": 8 * lg,
        "remove": 8 * lg + 16,
        "change_key": 8 * lg + 35,
    }.get(op, 8 * lg + 35)
