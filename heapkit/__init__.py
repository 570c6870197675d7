"""heapkit: addressable priority queues with handles, contracts and an auditor.

The kinds, the protocol and the errors load with ``import heapkit``; the
contracts (``check``, ``checked``, ``unchecked``, ``to_dot``), the auditor
(``audit``) and the thread-safe wrappers (``locked``, ``blocking``, ``asynchronous``) load on first
use (module ``__getattr__``), so a program that only pushes and pops does not
import ``logging``, ``threading`` helpers or the auditor.  ``HEAPKIT_DEBUG``
set in the environment loads the contracts at once, as it must act on every
heap made afterwards.
"""

from __future__ import annotations

import os as _os
import sys as _sys
import types as _types
from importlib import import_module as _import_module
from typing import TYPE_CHECKING

# First: importing _compiled refuses stale in-tree .so files before any compiled module loads.
from heapkit import _compiled
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
    KindName,
    LazyHeap,
    PairingHeap,
    RadixHeap,
    RankPairingHeap,
    WeakHeap,
    new,
)
from heapkit.protocol import Handle, Heap, Shape

if TYPE_CHECKING:
    from heapkit.audit import audit
    from heapkit.concurrent import Asynchronous, Blocking, asynchronous, blocking
    from heapkit.contracts import HistoryError, check, checked, set_debug, to_dot, unchecked
    from heapkit.threads import Locked, locked

#: True when the mypyc-compiled core is running (``HEAPKIT_COMPILE=1 pip install .``).
COMPILED: bool = _compiled.running_compiled()

__all__ = [
    "COMPILED",
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
    "HistoryError",
    "HollowHeap",
    "InvalidHandleError",
    "InvariantError",
    "KeyOrderError",
    "KindName",
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
    "set_debug",
    "to_dot",
    "unchecked",
]

__version__ = "0.1.0"

#: Public names loaded on first use -> the module that holds them.
_LAZY = {
    "audit": "heapkit.audit",
    "check": "heapkit.contracts",
    "checked": "heapkit.contracts",
    "HistoryError": "heapkit.contracts",
    "set_debug": "heapkit.contracts",
    "to_dot": "heapkit.contracts",
    "unchecked": "heapkit.contracts",
    "Locked": "heapkit.threads",
    "locked": "heapkit.threads",
    "Asynchronous": "heapkit.concurrent",
    "Blocking": "heapkit.concurrent",
    "asynchronous": "heapkit.concurrent",
    "blocking": "heapkit.concurrent",
}


def __getattr__(name: str) -> object:
    """Load a lazily imported public name on first use (then it is a plain attribute)."""
    home = _LAZY.get(name)
    if home is None:
        raise AttributeError(f"module 'heapkit' has no attribute {name!r}")
    value = getattr(_import_module(home), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))


class _Package(_types.ModuleType):
    """``heapkit`` itself: keeps ``heapkit.audit`` the auditor when the submodule loads.

    Importing the submodule ``heapkit.audit`` (``from heapkit.audit import attach``)
    makes the import system set the package attribute ``audit`` to that module; the
    public name is the callable ``audit`` object it holds, so keep that instead.
    """

    def __setattr__(self, name: str, value: object) -> None:
        if name == "audit" and isinstance(value, _types.ModuleType):
            value = value.audit
        super().__setattr__(name, value)


_sys.modules[__name__].__class__ = _Package

if _os.environ.get("HEAPKIT_DEBUG"):
    _import_module("heapkit.contracts")  # reads HEAPKIT_DEBUG and hooks every new heap
