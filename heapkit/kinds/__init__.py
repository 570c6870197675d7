"""One package per heap structure (``heapkit/kinds/<kind>/``: ``heap.py``, ``rules.py``,
``cost.py``); ``KINDS`` maps each kind's name to its class."""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from types import MappingProxyType
from typing import Any, Literal, TypeAlias, TypeVar, overload

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
from heapkit.protocol import Heap

__all__ = [
    "DEFAULT",
    "KINDS",
    "BinaryHeap",
    "BinomialHeap",
    "DaryHeap",
    "FibonacciHeap",
    "HollowHeap",
    "KindName",
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

#: Every name ``new`` knows, for annotating a kind name checked by the type checker.
KindName = Literal[
    "binary", "binomial", "dary", "fibonacci", "hollow", "lazy", "pairing", "radix", "rank-pairing", "weak"
]

K = TypeVar("K")
V = TypeVar("V")
RK = TypeVar("RK", bound=int)
Pairs: TypeAlias = Iterable[tuple[K, V]]


# One overload per kind: a literal name gives the concrete class (adding a kind: one line here,
# its name in ``KindName`` and its class in ``KINDS``); the last overload takes any str.
# fmt: off
@overload
def new(kind: Literal["binary"], pairs: Pairs[K, V] = (), *, stable: bool = False) -> BinaryHeap[K, V]: ...
@overload
def new(kind: Literal["binomial"], pairs: Pairs[K, V] = (), *, stable: bool = False) -> BinomialHeap[K, V]: ...
@overload
def new(kind: Literal["dary"], pairs: Pairs[K, V] = (), *, stable: bool = False, arity: int | None = None) -> DaryHeap[K, V]: ...  # noqa: E501
@overload
def new(kind: Literal["fibonacci"], pairs: Pairs[K, V] = (), *, stable: bool = False) -> FibonacciHeap[K, V]: ...
@overload
def new(kind: Literal["hollow"], pairs: Pairs[K, V] = (), *, stable: bool = False) -> HollowHeap[K, V]: ...
@overload
def new(kind: Literal["lazy"], pairs: Pairs[K, V] = (), *, stable: bool = False) -> LazyHeap[K, V]: ...
@overload
def new(kind: Literal["pairing"], pairs: Pairs[K, V] = (), *, stable: bool = False) -> PairingHeap[K, V]: ...
@overload
def new(kind: Literal["radix"], pairs: Pairs[RK, V] = (), *, stable: bool = False) -> RadixHeap[RK, V]: ...  # type: ignore[overload-overlap]
@overload
def new(kind: Literal["rank-pairing"], pairs: Pairs[K, V] = (), *, stable: bool = False) -> RankPairingHeap[K, V]: ...
@overload
def new(kind: Literal["weak"], pairs: Pairs[K, V] = (), *, stable: bool = False) -> WeakHeap[K, V]: ...
@overload
def new(kind: str = ..., pairs: Pairs[K, V] = (), *, stable: bool = False, **options: object) -> Heap[K, V]: ...
# fmt: on


def new(
    kind: str | None = None, pairs: Iterable[tuple[Any, Any]] = (), *, stable: bool = False, **options: object
) -> Heap[Any, Any]:
    """Make a heap of the kind called ``kind`` (``DEFAULT`` when omitted) holding ``pairs``.  O(len(pairs)).

    Kinds (``KINDS``): ``binary``, ``binomial``, ``dary``, ``fibonacci``, ``hollow``,
    ``lazy``, ``pairing``, ``radix``, ``rank-pairing``, ``weak``.  Options: ``stable=True``
    (equal keys pop in push order) for every kind; ``arity=d`` (default 4) for
    ``dary``.  A literal kind name gives the type checker the concrete class; a
    ``str`` known only at run time gives ``Heap[K, V]``.  ``ValueError`` for an
    unknown name, ``TypeError`` for an option the kind does not take.

    >>> h = new("binary", [(2, 'b'), (1, 'a')])
    >>> type(h).__name__, h.pop()
    ('BinaryHeap', (1, 'a'))
    >>> new("dary", arity=3)
    <DaryHeap empty, arity=3>
    >>> new("pairng")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    ValueError: new: unknown kind 'pairng'; known kinds: binary, binomial, dary, ...
    """
    name = DEFAULT if kind is None else kind
    try:
        cls = KINDS[name]
    except KeyError:
        raise ValueError(f"new: unknown kind {name!r}; known kinds: {', '.join(sorted(KINDS))}") from None
    heap: Heap[Any, Any] = cls(pairs, stable=stable, **options)
    return heap
