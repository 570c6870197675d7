"""Entries of the lazy heap: ordering objects, the handle, and failure repair.

An entry is a tuple ``(k, handle, owner token)`` compared by the C ``heapq``
functions.  ``k`` is an exact int/float/str key (their ``==`` and ``<`` are
unobservable) or a wrapper that is never equal, so tuple comparison calls no
user ``==``; tied bare keys compare the handles, and no handle is smaller.

Compiled by mypyc in the compiled build (with ``core.py``, the operations): no ``Generic``,
no ``__weakref__``, no ``TYPE_CHECKING``/``else``; the handle class is sealed.
"""

from __future__ import annotations

import operator
from typing import Any, Final

from heapkit._core import WRAPPERS, LeafHandle, Stable, seq_of

#: Key types whose ``==`` and ``<`` are unobservable: they sit bare in entries
#: (Dijkstra, 10^5 nodes, float keys: 4.0 s bare, 6.0 s with every key wrapped).
_RAW: Final = frozenset((int, float, str))


class _Ord:
    """Ordering object of a key that is not an exact int/float/str.

    Calls only the user's ``<``; never equal, so tuple comparison stops here.
    ``__gt__`` serves a bare native key on the left (``3 < _Ord(x)``).
    """

    __slots__ = ("key",)

    def __init__(self, key: Any) -> None:
        self.key = key

    def __lt__(self, other: Any) -> Any:
        if type(other) is _Ord:
            return self.key < other.key
        return self.key < other

    def __gt__(self, other: Any) -> Any:
        return other < self.key

    def __eq__(self, other: object) -> bool:
        return False

    __hash__ = None  # type: ignore[assignment]

    def __repr__(self) -> str:
        return f"_Ord({self.key!r})"

    # Explicit: compiled, the default (``_Ord.__new__`` without arguments) fails.
    def __reduce__(self) -> tuple[Any, ...]:
        return (_Ord, (self.key,))


def _order(key: Any) -> Any:
    """The ordering object of ``key`` in a heap that compares keys bare."""
    return key if type(key) in _RAW else _Ord(key)


def _user_key(k: Any) -> Any:
    """The user's key inside an ordering object."""
    while True:
        t = type(k)
        if t is _Ord or t is Stable:
            return k.key
        if t not in WRAPPERS:
            return k
        k = k.inner


def _normal(o: Any) -> Any:
    """``o`` as an ordering object of a bare-key heap (wrap a bare non-native key)."""
    t = type(o)
    if t in _RAW or t is _Ord or t is Stable or t in WRAPPERS:
        return o
    return _Ord(o)


class _Handle(LeafHandle):
    """Handle: ``_e`` is the current entry while alive, the last ordering object once dead.

    Two slots keep it at 48 bytes.  Handles only meet in a comparison when two
    entries have equal bare keys; then neither is smaller.  Sealed: never subclass it.
    """

    __slots__ = ("_e", "value")
    _e: Any
    value: Any

    # False as handles are truthy.  The pure build replaces both with operator.not_ below.
    def __lt__(self, other: object) -> bool:
        return not other

    def __gt__(self, other: object) -> bool:
        return not other

    @property
    def key(self) -> Any:
        """The entry's key (read-only; change it through the heap)."""
        e = self._e
        if type(e) is tuple:
            e = e[0]
        return _user_key(e)

    @property
    def alive(self) -> bool:
        """True while the entry is in a heap."""
        return type(self._e) is tuple

    def __repr__(self) -> str:
        state = "" if type(self._e) is tuple else ", dead"
        return f"<handle key={self.key!r} value={self.value!r}{state}>"

    def __reduce__(self) -> tuple[Any, ...]:
        e = self._e
        k = e[0] if type(e) is tuple else e
        return (_revive, (_user_key(k), self.value, seq_of(k)))


#: True when this module runs as Python source (a compiled module's file is the extension).
_PURE: Final = __file__.endswith(".py")
if _PURE:
    # A builtin does not bind: called as not_(other).  A tied tuple comparison takes
    # 250 ns with it, 285 ns with ``def __lt__`` (pure build; compiled, the methods are C).
    setattr(_Handle, "__lt__", operator.not_)  # noqa: B010 - mypy refuses assigning a method
    setattr(_Handle, "__gt__", operator.not_)  # noqa: B010
else:
    # mypyc drops ``__slots__`` from a compiled class (its fields are C members, no
    # ``__dict__`` either); name them again so the handle reads the same on both builds.
    setattr(_Handle, "__slots__", ("_e", "value"))  # noqa: B010


def _fresh(k: Any, value: Any) -> _Handle:
    h = _Handle()
    h._e = k
    h.value = value
    return h


def _revive(key: Any, value: Any, seq: int | None) -> _Handle:
    """Rebuild a detached, dead handle (its heap relinks it)."""
    return _fresh(key if seq is None else Stable(key, seq), value)


#: Stands in the stale entries a copy or unpickle rebuilds (never live).
_GHOST: Final = _fresh(None, None)


# Precondition: x was appended by heappush (now done or failed part-way) and
# nothing moved since.  Restores: the list as before that push.  No comparison.
# heappush swaps x up the path from the last leaf, each ancestor it passes
# going down one level (CPython 3.11-3.13, Modules/_heapqmodule.c).
def _unpush(a: list[Any], x: Any) -> None:
    path: list[int] = []
    p = len(a) - 1
    while p >= 0:
        path.append(p)
        if a[p] is x:
            break
        p = (p - 1) >> 1 if p else -1
    else:
        return  # never appended
    for i in range(len(path) - 1, 0, -1):
        a[path[i]] = a[path[i - 1]]
    a.pop()


# Precondition: heappop failed on a list whose root was top and last item
# last.  heappop moved last to the root and down a root-to-leaf path, the items
# it passed each going up one level.  Restores the list exactly.  No comparison.
def _unpop(a: list[Any], top: Any, last: Any) -> None:
    p = next(i for i, e in enumerate(a) if e is last)
    path = [p]
    while p:
        p = (p - 1) >> 1
        path.append(p)
    for i in range(len(path) - 1):
        a[path[i]] = a[path[i + 1]]
    a[0] = top
    a.append(last)


def flatten(a: list[Any]) -> tuple[list[Any], list[Any]]:
    """The list as flat data: live handles in list order, and per slot None (live)
    or the stale entry's ordering object."""
    handles: list[Any] = []
    layout: list[Any] = []
    for e in a:
        h = e[1]
        if h._e is e:
            handles.append(h)
            layout.append(None)
        else:
            layout.append(e[0])
    return handles, layout


def rebuild(handles: list[Any], layout: list[Any], tok: Any, wrap: Any) -> tuple[list[Any], int]:
    """The exact list from ``flatten``'s data (handles hold their ordering object
    in ``_e``); stale slots get the ghost handle.  No comparison.  Returns the
    list and its stale count."""
    a: list[Any] = []
    it = iter(handles)
    stale = 0
    # The handle takes its entry back from the list: compiled, a tuple put in a local is
    # narrowed to its fixed-length type (a C struct, even under a ``tuple[Any, ...]``
    # declaration) and boxed anew at each use, so ``h._e is e`` failed.
    for o in layout:
        if o is None:
            h = next(it)
            a.append((_remade(h._e, wrap), h, tok))
            h._e = a[-1]
        else:
            a.append((_remade(o, wrap), _GHOST, tok))
            stale += 1
    return a, stale


def _remade(k: Any, wrap: Any) -> Any:
    """Ordering object ``k`` remade for a fresh heap (other layers dropped, push order kept)."""
    if wrap is None:
        return k if type(k) in _RAW or type(k) is _Ord else _order(_user_key(k))
    return k if type(k) is Stable else wrap(_user_key(k), k)
