"""The hollow heap kind (``hollow``): Hansen, Kaplan, Tarjan and Zwick's hollow heap.

Rooms: ``heap.py`` the public class (interpreted), ``core.py`` the operations and
``dag.py`` the DAG's nodes, entries, child lists and delete-root linking (both
compiled in the compiled build), ``rules.py`` the invariants (survey, checks), ``cost.py``
what the auditor asks.
"""

from heapkit.kinds.hollow.heap import HollowHeap

__all__ = ["HollowHeap"]
