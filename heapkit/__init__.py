"""heapkit: addressable priority queues with handles, contracts and an auditor."""

from heapkit.audit import audit
from heapkit.concurrent import Asynchronous, Blocking, asynchronous, blocking
from heapkit.contracts import check, checked, to_dot, unchecked
from heapkit.errors import (
    BoundExceededError,
    ClosedError,
    EmptyHeapError,
    FullHeapError,
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
    WeakHeap,
    new,
)
from heapkit.protocol import Handle, Heap, Shape
from heapkit.threads import Locked, locked

__all__ = [
    "DEFAULT",
    "KINDS",
    "Asynchronous",
    "BinaryHeap",
    "BinomialHeap",
    "Blocking",
    "BoundExceededError",
    "ClosedError",
    "DaryHeap",
    "EmptyHeapError",
    "FibonacciHeap",
    "FullHeapError",
    "Handle",
    "Heap",
    "HeapError",
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
    "WeakHeap",
    "asynchronous",
    "audit",
    "blocking",
    "check",
    "checked",
    "locked",
    "new",
    "to_dot",
    "unchecked",
]

__version__ = "0.1.0"
