"""The array heaps' handle: one entry of a list-backed heap (d-ary, binary, weak).

``_i`` is the entry's position in the heap's list.  Kept in a module of its own because
three kinds share it; it follows the rules for code mypyc compiles
(``docs/compiled-build.md`` section 3: not ``Generic``, sealed, no ``__weakref__``).
"""

from __future__ import annotations

from typing import Any

from heapkit._core import HandleBase

__all__ = ["_Slot"]


class _Slot(HandleBase):
    """Handle of an array heap entry; ``_i`` is its position in the list (sealed: never subclass it)."""

    __slots__ = ("_i",)

    def __init__(self, key: Any, k: Any, value: Any, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._i = -1
