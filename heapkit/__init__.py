"""heapkit: addressable priority queues with handles, contracts and an auditor."""

from heapkit.contracts import check, checked, to_dot, unchecked
from heapkit.errors import (
    BoundExceededError,
    EmptyHeapError,
    HeapError,
    InvalidHandleError,
    InvariantError,
    KeyOrderError,
)
from heapkit.kinds import DEFAULT, KINDS, BinaryHeap, DaryHeap, PairingHeap, new
from heapkit.protocol import Handle, Heap, Shape

__all__ = [
    "DEFAULT",
    "KINDS",
    "BinaryHeap",
    "BoundExceededError",
    "DaryHeap",
    "EmptyHeapError",
    "Handle",
    "Heap",
    "HeapError",
    "InvalidHandleError",
    "InvariantError",
    "KeyOrderError",
    "PairingHeap",
    "Shape",
    "check",
    "checked",
    "new",
    "to_dot",
    "unchecked",
]

__version__ = "0.1.0"
