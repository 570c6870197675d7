"""The binomial heap kind (``binomial``): an eager binomial heap with handles.

Rooms: ``heap.py`` the operations, ``forest.py`` the node class and the tree
surgery (links, carries) they run on, ``rules.py`` the invariants (loading,
survey, checks, ``to_dot`` edges), ``cost.py`` what the auditor asks.
"""

from heapkit.kinds.binomial.heap import BinomialHeap

__all__ = ["BinomialHeap"]
