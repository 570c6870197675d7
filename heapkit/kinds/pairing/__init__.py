"""The pairing heap kind (``pairing``): a two-pass pairing heap with handles.

Rooms (the same in every kind): ``heap.py`` the public class (interpreted), ``core.py``
the operations and the link surgery (the node, link, cut, two-pass pairing) (compiled in
the compiled build), ``rules.py`` the invariants (survey, checks, ``to_dot`` edges,
loading), ``cost.py`` what the auditor asks (cost unit, potential, bounds).
"""

from heapkit.kinds.pairing.heap import PairingHeap

__all__ = ["PairingHeap"]
