"""The Fibonacci heap kind (``fibonacci``): Fredman and Tarjan's heap with handles.

Rooms: ``heap.py`` the operations, ``rings.py`` the sibling rings (closing,
walking, flat export/import), ``rules.py`` the invariants (survey, checks,
``to_dot`` edges, loading), ``cost.py`` what the auditor asks.
"""

from heapkit.kinds.fibonacci.heap import FibonacciHeap

__all__ = ["FibonacciHeap"]
