"""The lazy heap kind (``lazy``): the C ``heapq`` list, invalidating entries lazily.

Rooms: ``heap.py`` the operations, ``entries.py`` the entries (ordering objects,
the handle, failure repair, flat export/import), ``rules.py`` the invariants
(loading, survey, checks, ``to_dot`` drawing), ``cost.py`` what the auditor asks.
"""

from heapkit.kinds.lazy.heap import LazyHeap

__all__ = ["LazyHeap"]
