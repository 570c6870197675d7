"""The radix heap's hot path, compiled by mypyc in the compiled build: the handle class,
the core class with the protocol operations and the structure SPI, and the bucket moves.

The public class, :class:`heapkit.RadixHeap` (``heap.py``, interpreted), subclasses
:class:`_RadixCore`; nothing constructs ``_RadixCore`` itself (modes switch the public
class, see ``docs/compiled-build.md``).  Keys stay ``Any`` in the fields (an ``int``
subclass keeps its type); bucket numbers are computed on ``int`` locals, which mypyc
keeps as C integers while they are small.
Rules for this module: nodes typed as their class, helpers at module level (direct calls
when compiled), no ``Generic``, no ``__weakref__``, no ``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator
from operator import attrgetter
from typing import Any, Final

from heapkit._core import HandleBase, HeapBase, empty_error, upward_error
from heapkit._mypyc import mypyc_attr
from heapkit.errors import KeyOrderError

__all__ = ["MAX_BITS", "_Item", "_RadixCore"]

_order: Final = attrgetter("_k")

#: Keys are below ``2 ** MAX_BITS``: at most ``MAX_BITS + 1`` buckets ever exist.
MAX_BITS: Final = 4096


class _Item(HandleBase):
    """Handle of a radix heap entry: ``_i`` is its place in its bucket (sealed: never subclass it)."""

    __slots__ = ("_i",)

    def __init__(self, key: Any, k: Any, value: Any, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._i: int = 0


#: True when this module runs as Python source.  The pure build then makes handles with
#: ``object.__new__`` and slot stores (push 13% faster, 100k pushes, min of 9); a compiled
#: class refuses ``object.__new__``, so the compiled build calls the constructor.
_PURE: Final = __file__.endswith(".py")
_new: Final = object.__new__


def _key_error(op: str, key: object, last: int) -> KeyOrderError:
    if isinstance(key, bool) or not isinstance(key, int):
        why = f"is a {type(key).__name__}"
    elif key < 0:
        why = "is negative"
    elif key >= last:
        return KeyOrderError(
            f"{op}: key of {key.bit_length()} bits is too large: radix heap keys are below 2**{MAX_BITS}"
        )
    else:
        why = "is too low"
    return KeyOrderError(
        f"{op}: key {key!r} {why}: radix heap keys are non-negative ints, "
        f"never below the last popped key, which is {last!r}"
    )


# Precondition: x is not in any bucket, b <= MAX_BITS.  Restores: x is at the end of bucket b.
def _put(buckets: list[list[_Item]], x: _Item, b: int) -> None:
    while b >= len(buckets):
        buckets.append([])
    bl = buckets[b]
    x._i = len(bl)
    bl.append(x)


# Precondition: x is in bucket bl.  Restores: it is not; the bucket's last entry fills its
# place (swap-remove, O(1)).
def _take(bl: list[_Item], x: _Item) -> None:
    y = bl.pop()
    if y is not x:
        i = x._i
        bl[i] = y
        y._i = i


# Precondition: the heap is not empty.  Restores: bucket 0 is not empty (moves the first
# non-empty bucket down around its minimum).  Compares before it moves anything.
def _settle(heap: _RadixCore) -> list[_Item]:
    buckets = heap._buckets
    b0 = buckets[0]
    if b0:
        return b0
    src: list[_Item]
    if _PURE:
        # next(filter(None, ...)) finds the first non-empty bucket in C: 22% faster than a loop
        src = next(filter(None, buckets))
    else:
        i = 1
        while not buckets[i]:
            i += 1
        src = buckets[i]
    m: _Item
    if _PURE:
        m = min(src, key=_order)
    else:
        # min()'s comparisons, in its order, without a key-function call per entry
        m = src[0]
        least = m._k
        for j in range(1, len(src)):
            y = src[j]
            if y._k < least:
                m = y
                least = y._k
    mk = m._key
    heap._last = mk
    last: int = mk
    for x in src:
        if x is not m:
            ik: int = x._key
            bl = buckets[(ik ^ last).bit_length()]
            x._i = len(bl)
            bl.append(x)
    m._i = len(b0)
    b0.append(m)  # last in bucket 0: pop takes the entry peek named
    src.clear()
    while not buckets[-1] and len(buckets) > 1:  # each bucket trimmed once per append
        buckets.pop()
    heap._ver += 1  # entries moved: running iterations must stop even if a later `<` raises
    return b0


@mypyc_attr(allow_interpreted_subclasses=True)
class _RadixCore(HeapBase):
    """The protocol operations and the structure SPI of :class:`heapkit.RadixHeap`."""

    __slots__ = ("_buckets", "_last")

    def __init__(self, pairs: Iterable[tuple[Any, Any]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._buckets: list[list[_Item]] = [[]]
        self._last: Any = 0
        self._finish_init(pairs)

    @property
    def last(self) -> Any:
        """The last popped key (0 before the first pop): no key may go below it.  O(1) worst-case.

        >>> from heapkit import RadixHeap
        >>> h = RadixHeap([(4, 'd')]); h.pop(); h.last
        (4, 'd')
        4
        """
        return self._last

    def push(self, key: Any, value: Any) -> Any:
        """Insert an entry and return its handle.  O(1) worst-case.

        >>> from heapkit import RadixHeap
        >>> RadixHeap().push(3, 'c').key
        3
        """
        last = self._last
        t = type(key)  # not isinstance(key, int): compiled, key would become a C int (an int subclass's `<` skipped)
        if (t is not int and (t is bool or not issubclass(t, int))) or key < last:
            raise _key_error("push", key, last)
        ik: int = key  # C integers in the compiled build (a small int needs no object)
        il: int = last
        w = self._wrap
        k = key if w is None else w(key, None)
        x: _Item
        if _PURE:
            # fields set without an __init__ frame: push 13% faster (100k pushes, min of 9)
            x = _new(_Item)
            x._key = key
            x._k = k
            x.value = value
            x._tok = self._tok
        else:
            x = _Item(key, k, value, self._tok)
        b = (ik ^ il).bit_length()
        buckets = self._buckets
        if b < len(buckets):
            # inlined _put: push 12% faster (100k pushes, min of 9)
            bl = buckets[b]
            x._i = len(bl)
            bl.append(x)
        elif b > MAX_BITS:
            raise _key_error("push", key, last)
        else:
            _put(buckets, x, b)
        self._n += 1
        self._ver += 1
        return x

    def peek(self) -> Any:
        """The handle of a smallest entry.  O(s) worst-case for the s entries of the first
        non-empty bucket; it moves nothing, so the keys a push accepts stay the same.

        >>> from heapkit import RadixHeap
        >>> RadixHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        if not self._n:
            raise empty_error("peek")
        b0 = self._buckets[0]
        if b0:
            return min(b0, key=_order) if self._stable else b0[-1]
        return min(next(filter(None, self._buckets)), key=_order)

    def pop(self) -> Any:
        """Remove and return a smallest ``(key, value)``.  O(log C) amortized.

        >>> from heapkit import RadixHeap
        >>> RadixHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        if not self._n:
            raise empty_error("pop")
        b0 = self._buckets[0]
        if not b0:
            b0 = _settle(self)
        x: _Item
        if self._stable:
            x = min(b0, key=_order)
            _take(b0, x)
        else:
            x = b0.pop()
        self._n -= 1
        self._ver += 1
        x._tok = None
        return x._key, x.value

    def decrease_key(self, handle: Any, key: Any) -> None:
        """Give the entry a key that is not larger (nor below ``last``).  O(1) worst-case.

        >>> from heapkit import RadixHeap
        >>> h = RadixHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        if type(handle) is not _Item:
            self._claim(handle, "decrease_key")  # raises: not a handle of this heap
        x: _Item = handle
        if x._tok is not self._tok:
            self._claim(x, "decrease_key")
        last = self._last
        t = type(key)  # as in push
        if (t is not int and (t is bool or not issubclass(t, int))) or key < last:
            raise _key_error("decrease_key", key, last)
        ik: int = key  # C integers in the compiled build (a small int needs no object)
        il: int = last
        w = self._wrap
        k = key if w is None else w(key, x._k)
        if x._k < k:
            raise upward_error(x, key)
        b = (ik ^ il).bit_length()
        ok: int = x._key
        ob = (ok ^ il).bit_length()
        if b != ob:
            # inlined _take/_put: 55% faster when the bucket changes (100k decrease_keys, min of 9)
            buckets = self._buckets
            bl = buckets[ob]
            y = bl.pop()
            if y is not x:
                i = x._i
                bl[i] = y
                y._i = i
            bl = buckets[b]
            x._i = len(bl)
            bl.append(x)
        x._key = key
        x._k = k
        self._ver += 1

    def change_key(self, handle: Any, key: Any) -> None:
        """Give the entry any key not below ``last``.  O(1) worst-case.

        >>> from heapkit import RadixHeap
        >>> h = RadixHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        if type(handle) is not _Item:
            self._claim(handle, "change_key")  # raises: not a handle of this heap
        x: _Item = handle
        if x._tok is not self._tok:
            self._claim(x, "change_key")
        last = self._last
        t = type(key)  # as in push
        if (t is not int and (t is bool or not issubclass(t, int))) or key < last:
            raise _key_error("change_key", key, last)
        ik: int = key  # C integers in the compiled build (a small int needs no object)
        il: int = last
        w = self._wrap
        k = key if w is None else w(key, x._k)
        b = (ik ^ il).bit_length()
        if b > MAX_BITS:
            raise _key_error("change_key", key, last)
        ok: int = x._key
        ob = (ok ^ il).bit_length()
        if b != ob:
            _take(self._buckets[ob], x)
            _put(self._buckets, x, b)
        x._key = key
        x._k = k
        self._ver += 1

    def remove(self, handle: Any) -> Any:
        """Delete the entry and return ``(key, value)``.  O(1) worst-case.

        >>> from heapkit import RadixHeap
        >>> h = RadixHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        if type(handle) is not _Item:
            self._claim(handle, "remove")  # raises: not a handle of this heap
        x: _Item = handle
        if x._tok is not self._tok:
            self._claim(x, "remove")
        ik: int = x._key
        il: int = self._last
        _take(self._buckets[(ik ^ il).bit_length()], x)
        self._n -= 1
        self._ver += 1
        x._tok = None
        return x._key, x.value

    # The bucket moves as methods (the operations call the module functions).
    def _put(self, x: _Item, b: int) -> None:
        _put(self._buckets, x, b)

    def _take(self, x: _Item) -> None:
        ik: int = x._key
        il: int = self._last
        _take(self._buckets[(ik ^ il).bit_length()], x)

    # --- SPI ---------------------------------------------------------------
    def _meld_from(self, other: _RadixCore) -> None:
        if other._last != self._last:
            raise KeyOrderError(
                f"meld: the other heap's last popped key {other._last!r} differs from this "
                f"heap's {self._last!r}; radix heaps meld only at the same last popped key"
            )
        tok = self._tok
        buckets = self._buckets
        il: int = self._last
        for bl in other._buckets:
            for x in bl:
                ik: int = x._key
                _put(buckets, x, (ik ^ il).bit_length())
                x._tok = tok

    def _reset(self) -> None:
        self._buckets = [[]]
        self._last = 0

    def _handles(self) -> Iterator[Any]:
        for bl in self._buckets:
            yield from bl

    def _export(self) -> tuple[list[Any], Any]:
        out: list[Any] = [x for bl in self._buckets for x in bl]
        return out, (self._last, [len(bl) for bl in self._buckets])

    def _import(self, handles: list[Any], layout: Any) -> None:
        last, sizes = layout
        self._last = last
        buckets: list[list[_Item]] = []
        at = 0
        for s in sizes:
            bl: list[_Item] = handles[at : at + s]
            at += s
            for i, x in enumerate(bl):
                x._i = i
            buckets.append(bl)
        if not buckets:
            buckets.append([])
        self._buckets = buckets

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for bl in self._buckets:
            for x in bl:
                x._k = fn(x._k, x._key)
