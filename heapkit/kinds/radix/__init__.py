"""The radix heap kind (``radix``): a monotone radix heap on int keys with handles.

Rooms (the same in every kind): ``heap.py`` the public class (interpreted), ``core.py``
the operations, the item class and the bucket moves (compiled in the compiled build),
``rules.py`` the invariants (survey, checks, ``to_dot`` edges, loading), ``cost.py``
what the auditor asks (cost unit, potential, bounds).
"""

from heapkit.kinds.radix.heap import RadixHeap

__all__ = ["RadixHeap"]
