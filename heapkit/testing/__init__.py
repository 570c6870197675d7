"""Testing kit: the reference model (and, with the ``testing`` extra, property tests)."""

from heapkit.testing.reference import ReferenceHeap, RefHandle

__all__ = ["RefHandle", "ReferenceHeap"]
