"""One module per heap structure; ``KINDS`` maps each kind's name to its class."""

from __future__ import annotations

from collections.abc import Mapping
from types import MappingProxyType

from heapkit.kinds.binary import BinaryHeap
from heapkit.kinds.binomial import BinomialHeap
from heapkit.kinds.dary import DaryHeap
from heapkit.kinds.fibonacci import FibonacciHeap
from heapkit.kinds.hollow import HollowHeap
from heapkit.kinds.lazy import LazyHeap
from heapkit.kinds.pairing import PairingHeap
from heapkit.kinds.radix import RadixHeap
from heapkit.kinds.rank_pairing import RankPairingHeap
from heapkit.kinds.weak import WeakHeap

__all__ = [
    "DEFAULT",
    "KINDS",
    "BinaryHeap",
    "BinomialHeap",
    "DaryHeap",
    "FibonacciHeap",
    "HollowHeap",
    "LazyHeap",
    "PairingHeap",
    "RadixHeap",
    "RankPairingHeap",
    "WeakHeap",
    "new",
]

KINDS: Mapping[str, type] = MappingProxyType(
    {
        cls.KIND: cls
        for cls in (
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
        )
    }
)

#: The kind the benchmark shows fastest on the decrease-key workloads.
DEFAULT: str = "pairing"


def new(name: str | None = None, /, **options: object) -> object:
    """Make an empty heap of the kind called ``name`` (``DEFAULT`` when omitted).

    >>> h = new("binary")
    >>> type(h).__name__
    'BinaryHeap'
    """
    kind = DEFAULT if name is None else name
    try:
        cls = KINDS[kind]
    except KeyError:
        raise ValueError(f"new: unknown kind {kind!r}; known kinds: {', '.join(sorted(KINDS))}") from None
    return cls(**options)
