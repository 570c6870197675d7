"""The binary heap kind (``binary``): the d-ary heap at arity 2 with its own hot paths.

``heap.py`` names the kind and its bounds; the arity-2 operations are written in the
d-ary core (``heapkit/kinds/dary/core.py``, taken whenever the arity is 2), and the rules
and the audit's accounting are the d-ary heap's (``rules.py`` and ``cost.py``), inherited.
"""

from heapkit.kinds.binary.heap import BinaryHeap

__all__ = ["BinaryHeap"]
