"""The weak heap kind (``weak``): an array weak heap with reverse bits and handles.

Rooms (the same in every kind): ``heap.py`` the public class (interpreted), ``core.py``
the operations and the joins (settle, climb, sink), on the array heaps' shared handle
``heapkit/kinds/dary/slot.py`` (compiled in the compiled build), ``rules.py`` the
invariants (survey, checks, ``to_dot`` edges, loading), ``cost.py`` what the auditor
asks (cost unit, potential, bounds).
"""

from heapkit.kinds.weak.heap import WeakHeap

__all__ = ["WeakHeap"]
