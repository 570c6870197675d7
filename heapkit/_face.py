"""The typed face of :class:`heapkit._core.HeapBase`'s shared members, for the public classes.

``HeapBase`` is compiled by mypyc in the compiled build, so it cannot be ``Generic``
(a compiled generic class never clears its weak references; see
``docs/compiled-build.md``): its members take and return ``Any`` keys and values.  A
kind's public class lists ``HeapFace[K, V]`` *before* ``HeapBase`` in its bases::

    class PairingHeap(HeapFace[K, V], HeapBase):
        __slots__ = ("__weakref__", ...)

so that mypy sees ``extend``, ``meld`` and iteration typed with the heap's ``K`` and
``V``.  At run time the class is empty (``__slots__ = ()``, no methods): the members
are ``HeapBase``'s.  This module is never compiled (``if TYPE_CHECKING`` blocks are
for interpreted modules only).

>>> from heapkit import PairingHeap
>>> HeapFace in PairingHeap.__mro__, [n for n in vars(HeapFace) if not n.startswith('__')]
(True, [])
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator
from typing import TYPE_CHECKING, Generic, TypeVar

from heapkit.protocol import Handle, Heap

__all__ = ["HeapFace"]

K = TypeVar("K")
V = TypeVar("V")


class HeapFace(Generic[K, V]):
    """Typed signatures of the members every kind inherits from ``HeapBase`` (none at run time)."""

    __slots__ = ()

    if TYPE_CHECKING:
        from heapkit._core import HeapBase

        def extend(self, pairs: Iterable[tuple[K, V]]) -> list[Handle[K, V]]: ...

        def meld(self, other: Heap[K, V] | HeapBase) -> None: ...

        def __iter__(self) -> Iterator[Handle[K, V]]: ...
