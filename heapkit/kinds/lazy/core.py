"""The lazy heap's operations, compiled by mypyc in the compiled build: the core class with
the protocol operations and the structure SPI, and the module-level helpers they call.

The heap work itself is the C ``heapq`` functions on the entry list (tuples
``(k, handle, owner token)``, see ``entries.py``); compiling this module removes the
interpreter's work around those calls.  The public class, :class:`heapkit.LazyHeap`
(``heap.py``, interpreted), subclasses :class:`_LazyCore`; nothing constructs
``_LazyCore`` itself (modes switch the public class, see ``docs/compiled-build.md``).
Rules for this module: handles typed as their class, entries typed ``tuple[Any, ...]``
(a fixed-length tuple type would be unboxed and re-boxed, losing the identity
``h._e is e`` relies on), helpers at module level, no ``Generic``, no ``__weakref__``, no
``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator
from heapq import heapify, heappop, heappush
from typing import Any

from heapkit._core import HeapBase, empty_error, foreign_error, nan_error, owner_root, upward_error
from heapkit._mypyc import mypyc_attr
from heapkit.errors import InvalidHandleError
from heapkit.kinds.lazy.entries import (
    _RAW,
    _fresh,
    _Handle,
    _normal,
    _Ord,
    _order,
    _unpop,
    _unpush,
    _user_key,
    flatten,
    rebuild,
)

__all__ = ["_LazyCore"]

Entry = tuple[Any, ...]


# Copy the live entries to a new list and heapify it; on failure the old
# list is untouched.  O(n).
def _compact(heap: _LazyCore) -> None:
    b = [e for e in heap._a if e[1]._e is e]
    heapify(b)
    heap._a = b
    heap._stale = 0


# Push a fresh entry for live handle x with ordering object k (the old one goes stale); compacts if stale >= n.
def _repush(heap: _LazyCore, x: _Handle, k: Any) -> None:
    if heap._stale >= heap._n:
        _compact(heap)
    a = heap._a
    e: Entry = (k, x, heap._tok)
    try:
        heappush(a, e)
    except BaseException:
        _unpush(a, e)
        raise
    x._e = e
    heap._stale += 1
    heap._ver += 1


@mypyc_attr(allow_interpreted_subclasses=True)
class _LazyCore(HeapBase):
    """The protocol operations and the structure SPI of :class:`heapkit.LazyHeap`."""

    __slots__ = ("_a", "_stale")

    def __init__(self, pairs: Iterable[tuple[Any, Any]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._a: list[Entry] = []
        self._stale: int = 0
        self._finish_init(pairs)

    # --- ownership ---------------------------------------------------------
    def __contains__(self, handle: object) -> bool:
        """True if ``handle`` is live in this heap.  O(1) amortized.

        >>> from heapkit import LazyHeap
        >>> h = LazyHeap(); x = h.push(1, 'a'); x in h, x in LazyHeap()
        (True, False)
        """
        e = getattr(handle, "_e", None) if isinstance(handle, _Handle) else None
        if type(e) is not tuple:
            return False
        tok = e[2]
        return tok is self._tok or owner_root(tok) is self._tok

    def _claim(self, h: Any, op: str) -> Any:
        """Slow path of the ownership check: the handle's entry, or raise."""
        if not isinstance(h, _Handle):
            raise foreign_error(op, h)
        e = h._e
        if type(e) is not tuple:
            raise InvalidHandleError(f"{op}: handle {h!r} is dead (its entry was popped, removed or cleared)")
        if owner_root(e[2]) is not self._tok:
            raise InvalidHandleError(f"{op}: handle {h!r} belongs to another heap")
        return e

    # --- protocol ----------------------------------------------------------
    def push(self, key: Any, value: Any) -> Any:
        """Insert an entry and return its handle.  O(log n) worst-case.

        >>> from heapkit import LazyHeap
        >>> LazyHeap().push(3, 'c').key
        3
        """
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None and type(key) in _RAW else _Ord(key) if w is None else w(key, None)
        h = _Handle()
        h.value = value
        e: Entry = (k, h, self._tok)
        h._e = e
        a = self._a
        try:
            heappush(a, e)
        except BaseException:
            _unpush(a, e)
            h._e = k
            raise
        self._n += 1
        self._ver += 1
        return h

    def peek(self) -> Any:
        """The handle of a smallest entry.  O(1) amortized (drops stale entries on top).

        >>> from heapkit import LazyHeap
        >>> LazyHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        if not self._n:
            raise empty_error("peek")
        if self._stale >= self._n:
            _compact(self)  # as pop would: a compaction may reorder tied entries
        a = self._a
        while True:
            e = a[0]
            h: _Handle = e[1]
            if h._e is e:
                return h
            last = a[-1]
            try:
                heappop(a)
            except BaseException:
                _unpop(a, e, last)
                raise
            self._stale -= 1

    def pop(self) -> Any:
        """Remove and return a smallest ``(key, value)``.  O(log n) amortized.

        >>> from heapkit import LazyHeap
        >>> LazyHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        if not self._n:
            raise empty_error("pop")
        if self._stale >= self._n:
            _compact(self)
        a = self._a
        while True:
            e = a[0]
            last = a[-1]
            try:
                heappop(a)
            except BaseException:
                _unpop(a, e, last)
                raise
            h: _Handle = e[1]
            if h._e is e:
                break
            self._stale -= 1
        k = e[0]
        h._e = k
        self._n -= 1
        self._ver += 1
        return (k if type(k) in _RAW else _user_key(k)), h.value

    def decrease_key(self, handle: Any, key: Any) -> None:
        """Give the entry a key that is not larger.  O(log n) amortized.

        >>> from heapkit import LazyHeap
        >>> h = LazyHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        # Preamble inline (its own entry tuples): a call is ~50 ns, 5% of a pairing decrease_key (measured).
        e: Any = None
        if type(handle) is _Handle:
            x: _Handle = handle
            e = x._e
        if type(e) is not tuple or e[2] is not self._tok:
            e = self._claim(handle, "decrease_key")
            x = handle
        if key != key:
            raise nan_error("decrease_key", key)
        w = self._wrap
        k = key if w is None and type(key) in _RAW else _Ord(key) if w is None else w(key, e[0])
        if e[0] < k:
            raise upward_error(x, key)
        _repush(self, x, k)

    def change_key(self, handle: Any, key: Any) -> None:
        """Give the entry any key.  O(log n) amortized.

        >>> from heapkit import LazyHeap
        >>> h = LazyHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        e: Any = None
        if type(handle) is _Handle:
            x: _Handle = handle
            e = x._e
        if type(e) is not tuple or e[2] is not self._tok:
            e = self._claim(handle, "change_key")
            x = handle
        if key != key:
            raise nan_error("change_key", key)
        w = self._wrap
        k = key if w is None and type(key) in _RAW else _Ord(key) if w is None else w(key, e[0])
        _repush(self, x, k)

    def remove(self, handle: Any) -> Any:
        """Delete the entry and return ``(key, value)``.  O(1) amortized (marks it stale).

        >>> from heapkit import LazyHeap
        >>> h = LazyHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        e: Any = None
        if type(handle) is _Handle:
            x: _Handle = handle
            e = x._e
        if type(e) is not tuple or e[2] is not self._tok:
            e = self._claim(handle, "remove")
            x = handle
        if self._stale >= self._n:
            _compact(self)
        k = e[0]
        x._e = k
        self._stale += 1
        self._n -= 1
        self._ver += 1
        return _user_key(k), x.value

    # --- SPI ---------------------------------------------------------------
    def _build(self, pairs: Iterable[tuple[Any, Any]]) -> list[Any]:
        """Heapify the new entries: O(k) for k pairs (on an empty heap)."""
        w = self._wrap
        tok = self._tok
        handles: list[Any] = []
        b: list[Entry] = []
        for key, value in pairs:
            if key != key:
                raise nan_error("extend", key)
            h = _fresh(_order(key) if w is None else w(key, None), value)
            handles.append(h)
            b.append((h._e, h, tok))
        heapify(b)
        for e in b:
            e[1]._e = e
        self._a = b
        self._n = len(b)
        return handles

    def _pushes_win(self, m: int) -> bool:
        """Meld m live entries by pushes (else by one heapify of everything)."""
        n = len(self._a)
        return m * max(1, n.bit_length()) < n + m

    def _meld_from(self, other: _LazyCore) -> None:
        tok = self._tok
        fresh: list[Entry] = [(e[0], e[1], tok) for e in other._a if e[1]._e is e]
        a = self._a
        if not a and not other._stale:
            self._a = fresh  # other's list order: already a heap (extend into an empty heap)
        elif self._pushes_win(len(fresh)):
            done = 0
            try:
                for e in fresh:
                    heappush(a, e)
                    done += 1
            except BaseException:
                for e in reversed(fresh[: done + 1]):
                    _unpush(a, e)
                raise
        else:
            b = [e for e in a if e[1]._e is e]
            b += fresh
            heapify(b)
            self._a = b
            self._stale = 0
        for e in fresh:
            e[1]._e = e

    def _reset(self) -> None:
        self._a = []
        self._stale = 0

    def _kill(self, h: Any) -> None:
        h._e = h._e[0]

    def _handles(self) -> Iterator[Any]:
        # A snapshot: peek may drop stale entries while an iteration runs.
        for e in list(self._a):
            h = e[1]
            if h._e is e:
                yield h

    def _export(self) -> tuple[list[Any], Any]:
        return flatten(self._a)

    def _import(self, handles: list[Any], layout: Any) -> None:
        self._a, self._stale = rebuild(handles, layout, self._tok, self._wrap)

    def __setstate__(self, state: tuple[list[Any], Any]) -> None:
        handles, layout = self._validate(state, _Handle)
        self._import(handles, layout)
        self._n = len(handles)

    def __copy__(self) -> Any:
        """A new heap with the same entries (keys and values shared) and new handles."""
        handles, layout = self._export()
        new = self._spawn()
        new.__setstate__(([_fresh(h._e[0], h.value) for h in handles], layout))
        return new

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        tok = self._tok
        a = self._a
        for i, e in enumerate(a):
            h = e[1]
            k = e[0]
            ne: Entry = (fn(k, _user_key(k)), h, tok)
            a[i] = ne
            if h._e is e:
                h._e = ne

    def _rewrap(self, wrap: Any) -> None:
        super()._rewrap(wrap)
        if wrap is None:
            self._map_order(lambda o, key: _normal(o))
