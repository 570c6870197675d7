"""The array heaps' hot path, compiled by mypyc in the compiled build: the core class with
the protocol operations and the array SPI, for every arity; arity 2 (the ``binary`` kind,
and a ``dary`` heap built with ``arity=2``) takes its own shift-and-one-comparison paths in
push, pop and decrease_key.

The public classes, :class:`heapkit.DaryHeap` (``heap.py``, interpreted) and
:class:`heapkit.BinaryHeap` (its subclass, ``kinds/binary/heap.py``), subclass
:class:`_DaryCore`; nothing constructs ``_DaryCore`` itself (modes switch the public class,
see ``docs/compiled-build.md`` section 4).  The walks up and down the tree are the
module-level functions of ``paths.py``.  The algorithms, their sources and the bounds are in
``heap.py``'s docstring (d-ary) and ``kinds/binary/heap.py``'s (arity 2).
Rules for this module: entries typed ``_Slot``, keys ``Any``, no ``Generic``, no
``__weakref__``, no ``TYPE_CHECKING``/``else``, no calls on ``self`` in the hot paths.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from typing import Any, Final

from heapkit._core import HeapBase, empty_error, nan_error, upward_error
from heapkit._mypyc import mypyc_attr
from heapkit.kinds.dary.paths import climb, descend, lower_path, raise_path
from heapkit.kinds.dary.slot import _PURE, _Slot

__all__ = ["_DaryCore"]

# The pure build's fast handle construction (``slot._PURE``): object's __new__ then slot stores.
_new: Final = _Slot.__new__


@mypyc_attr(allow_interpreted_subclasses=True)
class _DaryCore(HeapBase):
    """The protocol operations and the array SPI of :class:`heapkit.DaryHeap` (any arity)."""

    __slots__ = ("_a", "_d", "_w")

    _a: list[_Slot]
    _d: int
    _w: list[int]

    def push(self, key: Any, value: Any) -> Any:
        """Insert an entry and return its handle.  O(log_d n) worst-case.

        >>> from heapkit import DaryHeap
        >>> DaryHeap().push(3, 'c').key
        3
        """
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None else w(key, None)
        x: _Slot
        if _PURE:
            x = _new(_Slot)
            x._key = key
            x._k = k
            x.value = value
            x._tok = self._tok
        else:
            x = _Slot(key, k, value, self._tok)
        # The climb and the moves written inline: push 20% faster (measured).
        a = self._a
        d = self._d
        j = t = len(a)
        if d == 2:
            while t:  # compare first (find where x lands), then move
                p = (t - 1) >> 1
                if k < a[p]._k:
                    t = p
                else:
                    break
            a.append(x)
            while j != t:
                p = (j - 1) >> 1
                q = a[p]
                a[j] = q
                q._i = j
                j = p
        elif d == 4:
            while t:  # shifts, not // d: a C division a level saved when compiled
                p = (t - 1) >> 2
                if k < a[p]._k:
                    t = p
                else:
                    break
            a.append(x)
            if j:
                # Arity 4: forget the pair verdicts of the positions that change (w
                # holds at least n // 2 entries, so a new pair is at most one past it).
                pv = self._w
                try:
                    pv[(j - 1) >> 1] = 0
                except IndexError:  # a new pair past the end: double (3.11's try costs nothing)
                    pv.extend([0] * (len(pv) + 8))
                while j != t:
                    p = (j - 1) >> 2
                    q = a[p]
                    a[j] = q
                    q._i = j
                    j = p
                    if j:
                        pv[(j - 1) >> 1] = 0
        else:
            while t:
                p = (t - 1) // d
                if k < a[p]._k:
                    t = p
                else:
                    break
            a.append(x)
            while j != t:
                p = (j - 1) // d
                q = a[p]
                a[j] = q
                q._i = j
                j = p
        a[t] = x
        x._i = t
        self._n += 1
        self._ver += 1
        return x

    def peek(self) -> Any:
        """The handle of a smallest entry.  O(1) worst-case.

        >>> from heapkit import DaryHeap
        >>> DaryHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        a = self._a
        if not a:
            raise empty_error("peek")
        return a[0]

    def pop(self) -> Any:
        """Remove and return a smallest ``(key, value)``.  O(d log_d n) worst-case.

        >>> from heapkit import DaryHeap
        >>> DaryHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        a = self._a
        m = len(a) - 1
        if m < 0:
            raise empty_error("pop")
        top = a[0]
        d = self._d
        if d == 2:
            last = a.pop()
            if m:
                # One pass, as heapq does: the smaller child moves up into the hole
                # down to a leaf, then last climbs back from there.  Moving while
                # comparing beats compare-then-move by 9% at n = 500, 3% at 1e5
                # (measured); a raising comparison is undone below.
                k = last._k
                i = 0
                c = 1
                try:
                    while c < m:
                        r = c + 1
                        if r < m and a[r]._k < a[c]._k:
                            c = r
                        q = a[c]
                        a[i] = q
                        q._i = i
                        i = c
                        c = c + c + 1
                    while i:
                        p = (i - 1) >> 1
                        q = a[p]
                        if k < q._k:
                            a[i] = q
                            q._i = i
                            i = p
                        else:
                            break
                except BaseException:
                    # Each entry above the hole came up from its child on the path.
                    while i:
                        p = (i - 1) >> 1
                        q = a[p]
                        a[i] = q
                        q._i = i
                        i = p
                    a[0] = top
                    a.append(last)
                    raise
                a[i] = last
                last._i = i
        elif m:
            last = a[m]
            t = descend(a, d, self._w, 0, last._k, m)
            a.pop()
            if d == 4:
                # raise_path(a, 4, 0, t, last) written inline: one call fewer a pop.
                carry = a[t]
                a[t] = last
                last._i = t
                while t:
                    t = (t - 1) >> 2
                    q = a[t]
                    a[t] = carry
                    carry._i = t
                    carry = q
            else:
                raise_path(a, d, 0, t, last)
        else:
            a.pop()
        self._n = m
        self._ver += 1
        top._tok = None
        return top._key, top.value

    def decrease_key(self, handle: Any, key: Any) -> None:
        """Give the entry a key that is not larger.  O(log_d n) worst-case.

        >>> from heapkit import DaryHeap
        >>> h = DaryHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        # _core.new_order written inline: in the pure build the call is ~50 ns, 5% of a pairing decrease_key (measured).
        if type(handle) is not _Slot or handle._tok is not self._tok:
            self._claim(handle, "decrease_key")
        x: _Slot = handle
        if key != key:
            raise nan_error("decrease_key", key)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        if x._k < k:
            raise upward_error(x, key)
        # The climb and the moves written inline: decrease_key 9% faster (measured).
        a = self._a
        d = self._d
        j = t = x._i
        if d == 2:
            while t:
                p = (t - 1) >> 1
                if k < a[p]._k:
                    t = p
                else:
                    break
            x._key = key
            x._k = k
            while j != t:
                p = (j - 1) >> 1
                q = a[p]
                a[j] = q
                q._i = j
                j = p
        elif d == 4:
            while t:
                p = (t - 1) >> 2
                if k < a[p]._k:
                    t = p
                else:
                    break
            x._key = key
            x._k = k
            if j:
                pv = self._w
                pv[(j - 1) >> 1] = 0  # smaller now: its pair's verdict may change
                while j != t:
                    p = (j - 1) >> 2
                    q = a[p]
                    a[j] = q
                    q._i = j
                    j = p
                    if j:
                        pv[(j - 1) >> 1] = 0
        else:
            while t:
                p = (t - 1) // d
                if k < a[p]._k:
                    t = p
                else:
                    break
            x._key = key
            x._k = k
            while j != t:
                p = (j - 1) // d
                q = a[p]
                a[j] = q
                q._i = j
                j = p
        a[t] = x
        x._i = t
        self._ver += 1

    def change_key(self, handle: Any, key: Any) -> None:
        """Give the entry any key.  O(d log_d n) worst-case.

        >>> from heapkit import DaryHeap
        >>> h = DaryHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        if type(handle) is not _Slot or handle._tok is not self._tok:
            self._claim(handle, "change_key")
        x: _Slot = handle
        if key != key:
            raise nan_error("change_key", key)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        a = self._a
        d = self._d
        i = x._i
        if x._k < k:
            t = descend(a, d, self._w, i, k, len(a))
            x._key = key
            x._k = k
            raise_path(a, d, i, t, x)
        else:
            t = climb(a, d, i, k)
            x._key = key
            x._k = k
            lower_path(a, d, self._w, i, t, x)
        self._ver += 1

    def remove(self, handle: Any) -> Any:
        """Delete the entry and return ``(key, value)``.  O(d log_d n) worst-case.

        >>> from heapkit import DaryHeap
        >>> h = DaryHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        if type(handle) is not _Slot or handle._tok is not self._tok:
            self._claim(handle, "remove")
        x: _Slot = handle
        a = self._a
        d = self._d
        m = len(a) - 1
        i = x._i
        if i == m:
            a.pop()
        else:
            last = a[m]
            lk = last._k
            if i and lk < a[(i - 1) // d]._k:
                t = climb(a, d, i, lk)
                a.pop()
                lower_path(a, d, self._w, i, t, last)
            else:
                t = descend(a, d, self._w, i, lk, m)
                a.pop()
                raise_path(a, d, i, t, last)
        self._n = m
        self._ver += 1
        x._tok = None
        return x._key, x.value

    # --- SPI (the bulk operations are in bulk.py, called from heap.py) --------
    def _reset(self) -> None:
        self._a = []
        self._w = []

    def _handles(self) -> Iterator[Any]:
        return iter(self._a)

    def _export(self) -> tuple[list[Any], Any]:
        return list(self._a), None

    def _import(self, handles: list[Any], layout: Any) -> None:
        a: list[_Slot] = handles
        self._a = a
        self._w = [0] * (len(a) >> 1)
        for i, x in enumerate(a):
            x._i = i

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for x in self._a:
            x._k = fn(x._k, x._key)
