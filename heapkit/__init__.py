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
from heapkit.kinds import (
    DEFAULT,
    KINDS,
    BinaryHeap,
    DaryHeap,
    FibonacciHeap,
    LazyHeap,
    PairingHeap,
    RankPairingHeap,
    new,
)
from heapkit.protocol import Handle, Heap, Shape
from heapkit.threads import Locked, locked

__all__ = [
    "DEFAULT",
    "KINDS",
    "BinaryHeap",
    "BinomialHeap",
    "BoundExceededError",
    "DaryHeap",
    "EmptyHeapError",
    "FibonacciHeap",
    "Handle",
    "Heap",
    "HeapError",
    "InvalidHandleError",
    "InvariantError",
    "KeyOrderError",
    "LazyHeap",
    "Locked",
    "PairingHeap",
    "RankPairingHeap",
    "Shape",
    "check",
    "checked",
    "locked",
    "new",
    "to_dot",
    "unchecked",
]

__version__ = "0.1.0"
