"""The hollow heap kind (``hollow``): Hansen, Kaplan, Tarjan and Zwick's hollow heap.

Rooms: ``heap.py`` the operations, ``dag.py`` the DAG's nodes, child lists and
delete-root linking, ``rules.py`` the invariants (survey, checks), ``cost.py``
what the auditor asks.
"""

from heapkit.kinds.hollow.heap import HollowHeap

__all__ = ["HollowHeap"]
