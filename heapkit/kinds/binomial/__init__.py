"""The binomial heap kind (``binomial``): an eager binomial heap with handles.

Rooms (the same in every kind): ``heap.py`` the public class (interpreted), ``core.py``
the operations (lowering, lifting, swaps), ``forest.py`` the node class and the tree
surgery (links, carries) they run on (compiled in the compiled build), ``rules.py`` the
invariants (survey, checks, ``to_dot`` edges, loading), ``cost.py`` what the auditor
asks (cost unit, potential, bounds).
"""

from heapkit.kinds.binomial.heap import BinomialHeap

__all__ = ["BinomialHeap"]
