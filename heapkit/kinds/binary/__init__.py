"""The binary heap kind (``binary``): the d-ary heap at arity 2 with its own hot paths.

``heap.py`` holds the arity-2 operations; the rules and the audit's accounting are
the d-ary heap's (``heapkit/kinds/dary/rules.py`` and ``cost.py``), inherited.
"""

from heapkit.kinds.binary.heap import BinaryHeap

__all__ = ["BinaryHeap"]
