"""heapkit: addressable priority queues with handles, contracts and an auditor."""

# First: importing _compiled refuses stale in-tree .so files before any compiled module loads.
from heapkit import _compiled
from heapkit.audit import audit
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

#: True when the mypyc-compiled core is running (``HEAPKIT_COMPILE=1 pip install .``).
COMPILED: bool = _compiled.running_compiled()

__all__ = [
    "COMPILED",
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
    "to_dot",
    "unchecked",
]

__version__ = "0.1.0"
