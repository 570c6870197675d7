"""What the auditor asks of the weak heap: cost unit, potential and bounds.

Cost unit: key comparisons the operation makes, counted by the heap itself
(``heap._work``, one addition per sift or settle), so the comparisons of a
check or of any other layer do not count.

Potential: ``Phi = 2 * (pending tail positions + pending marks)``, ``c = 1``.
A settle of ``k`` tail positions costs at most ``2k + 2L`` comparisons (``L =
bit_length(n)``, derivation in ``heap.py``) and frees ``2k`` of potential, so
its amortized cost is at most ``2L``.  (Marks left by a raising comparison are
a tail cut short; each keeps its 2 units, and their ancestors may cost up to ``2L``
more once: the one case the bounds below do not cover.)  Bounds at size n, amortized:
push 2 (no comparison, Phi + 2); pop ``3L + 1`` (settle ``2L``, then one join per
level); decrease_key ``L + 1`` (the upward check, then one per d-ancestor);
change_key and remove ``3L + 2``; meld ``2n`` for the combined size (the other
heap's entries join the tail: Phi grows by at most 2 per entry, no comparison).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from heapkit.kinds.weak.heap import WeakHeap

    Weak = WeakHeap[Any, Any]

__all__ = ["COST_UNIT", "PHI_C", "POTENTIAL", "actual", "bound", "phi", "probe"]

COST_UNIT = "key comparisons"
POTENTIAL = "2 per pending position (tail or mark)"
PHI_C = 1.0


def phi(heap: Weak) -> float:
    """The potential now: O(1) (marks are empty except after a raising comparison)."""
    tail = max(0, len(heap._a) - max(heap._s, 1))
    return float(2 * (tail + len(heap._up)))


def probe(heap: Weak, op: str, handle: Any) -> int:
    """Before ``op``: the heap's comparison count."""
    return int(heap._work)


def actual(heap: Weak, op: str, before: int, handle: Any) -> int:
    """After ``op``: the comparisons it made."""
    return int(heap._work) - before


def bound(op: str, n: int) -> float:
    """The amortized bound of ``op`` at size ``n`` (see the module docstring)."""
    big_l = max(n, 1).bit_length()
    if op == "push":
        return 2.0
    if op == "pop":
        return float(3 * big_l + 1)
    if op == "decrease_key":
        return float(big_l + 1)
    if op == "meld":
        return float(2 * n)
    return float(3 * big_l + 2)
