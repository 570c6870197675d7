"""The lazy heap kind (``lazy``): the C ``heapq`` list, invalidating entries lazily.

Rooms (the same in every kind): ``heap.py`` the public class (interpreted), ``core.py``
the operations, ``entries.py`` the entries (ordering objects, the handle, failure
repair, flat export/import) (compiled in the compiled build), ``rules.py`` the
invariants (survey, checks, ``to_dot`` edges, loading), ``cost.py`` what the auditor
asks (cost unit, potential, bounds).
"""

from heapkit.kinds.lazy.heap import LazyHeap

__all__ = ["LazyHeap"]
