"""The weak heap kind (``weak``): an array weak heap with reverse bits and handles."""

from heapkit.kinds.weak.heap import WeakHeap

__all__ = ["WeakHeap"]
