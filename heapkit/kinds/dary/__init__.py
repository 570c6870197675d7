"""The d-ary heap kind (``dary``): an array heap of any arity with handles.

Rooms: ``heap.py`` the operations, ``rules.py`` the invariants (survey, checks,
``to_dot`` edges), ``cost.py`` what the auditor asks (cost unit, potential, bounds).
"""

from heapkit.kinds.dary.heap import DaryHeap

__all__ = ["DaryHeap"]
