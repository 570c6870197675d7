"""The pairing heap kind (``pairing``): a two-pass pairing heap with handles.

Rooms: ``heap.py`` the operations, ``links.py`` the link surgery they share with
the audit, ``rules.py`` the invariants (survey, checks, ``to_dot`` edges),
``cost.py`` what the auditor asks (cost unit, potential, bounds).
"""

from heapkit.kinds.pairing.heap import PairingHeap

__all__ = ["PairingHeap"]
