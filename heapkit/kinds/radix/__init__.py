"""The radix heap kind (``radix``): a monotone radix heap on int keys with handles.

Rooms: ``heap.py`` the operations, ``rules.py`` the invariants (loading, survey,
checks), ``cost.py`` what the auditor asks (cost unit, potential, bounds).
"""

from heapkit.kinds.radix.heap import RadixHeap

__all__ = ["RadixHeap"]
