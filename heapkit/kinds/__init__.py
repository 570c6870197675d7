"""One module per heap structure; ``KINDS`` maps each kind's name to its class."""

from __future__ import annotations

from collections.abc import Mapping
from types import MappingProxyType

from heapkit.kinds.dary import BinaryHeap, DaryHeap
from heapkit.kinds.hollow import HollowHeap
from heapkit.kinds.pairing import PairingHeap
from heapkit.kinds.radix import RadixHeap

__all__ = ["DEFAULT", "KINDS", "BinaryHeap", "DaryHeap", "HollowHeap", "PairingHeap", "RadixHeap", "new"]

KINDS: Mapping[str, type] = MappingProxyType(
    {
        BinaryHeap.KIND: BinaryHeap,
        DaryHeap.KIND: DaryHeap,
        HollowHeap.KIND: HollowHeap,
        PairingHeap.KIND: PairingHeap,
        RadixHeap.KIND: RadixHeap,
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
