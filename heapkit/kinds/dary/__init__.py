"""The d-ary heap kind (``dary``): an array heap of any arity with handles.

Rooms: ``heap.py`` the public class, ``core.py`` the operations and ``paths.py`` the
walks along the tree (both compiled in the compiled build, with ``slot.py``, the handle the
array heaps share), ``bulk.py`` build and meld, ``rules.py`` the invariants (survey, checks,
``to_dot`` edges), ``cost.py`` what the auditor asks (cost unit, potential, bounds).
"""

from heapkit.kinds.dary.heap import DaryHeap

__all__ = ["DaryHeap"]
