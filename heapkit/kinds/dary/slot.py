"""The array heaps' handle: one entry of a list-backed heap (d-ary, binary, weak).

``_i`` is the entry's position in the heap's list.  Kept in a module of its own because
three kinds share it; it follows the rules for code mypyc compiles
(``docs/compiled-build.md`` section 3: not ``Generic``, sealed, no ``__weakref__``).
"""

from __future__ import annotations

from typing import Any, Final

from heapkit._core import HandleBase

__all__ = ["_PURE", "_Slot"]


class _Slot(HandleBase):
    """Handle of an array heap entry; ``_i`` is its position in the list (sealed: never subclass it)."""

    __slots__ = ("_i",)

    def __init__(self, key: Any, k: Any, value: Any, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._i = -1


#: True when this module runs as Python source: ``_Slot`` is then a plain class, and the
#: kinds make handles with ``_Slot.__new__`` (object's) and slot stores (122 -> 89 ns a
#: handle, measured in the d-ary push).  Compiled, ``_Slot.__new__(_Slot)`` runs
#: ``__init__`` (and fails without its arguments): the kinds call the constructor.
_PURE: Final = __file__.endswith(".py")
