"""The Fibonacci heap kind (``fibonacci``): Fredman and Tarjan's heap with handles.

Rooms (the same in every kind): ``heap.py`` the public class (interpreted), ``core.py``
the operations (cascading cuts, consolidation), ``rings.py`` the node class and the
sibling rings (closing, walking, flat export/import) (compiled in the compiled build),
``rules.py`` the invariants (survey, checks, ``to_dot`` edges, loading), ``cost.py``
what the auditor asks (cost unit, potential, bounds).
"""

from heapkit.kinds.fibonacci.heap import FibonacciHeap

__all__ = ["FibonacciHeap"]
