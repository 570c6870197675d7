"""heapkit: addressable priority queues with handles, contracts and an auditor."""

from heapkit.audit import audit
from heapkit.contracts import HistoryError, check, checked, set_debug, to_dot, unchecked
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
    BinomialHeap,
    DaryHeap,
    FibonacciHeap,
    HollowHeap,
    LazyHeap,
    PairingHeap,
    RadixHeap,
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
    "HistoryError",
    "HollowHeap",
    "InvalidHandleError",
    "InvariantError",
    "KeyOrderError",
    "LazyHeap",
    "Locked",
    "PairingHeap",
    "RadixHeap",
    "RankPairingHeap",
    "Shape",
    "audit",
    "check",
    "checked",
    "locked",
    "new",
    "set_debug",
    "to_dot",
    "unchecked",
]

__version__ = "0.1.0"
