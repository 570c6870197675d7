"""The array heaps' path walks, compiled by mypyc in the compiled build: where an entry
belongs up or down the implicit d-ary tree (compare only), and the moves along that path
(move only), with the arity-4 pair verdicts ``w`` forgotten where entries change.

Every function takes the heap's list ``a``, its arity ``d`` and (at arity 4) its verdict
list ``w``, not the heap: the core (``core.py``) and the bulk operations (``bulk.py``) call
them directly, as C calls when compiled.  The verdicts are described in ``heap.py``'s
docstring.  Rules for this module (``docs/compiled-build.md`` section 3): entries typed
``_Slot``, keys ``Any``, no ``Generic``, no ``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from typing import Any

from heapkit.kinds.dary.slot import _Slot

__all__ = ["climb", "descend", "forget", "lower_path", "raise_path"]


def climb(a: list[_Slot], d: int, j: int, k: Any) -> int:
    """Compare only: the position, at or above j, where an entry ordered by k belongs if
    every ancestor of j that is larger than k moves down a level.  O(log_d n)."""
    while j:
        p = (j - 1) // d
        if k < a[p]._k:
            j = p
        else:
            break
    return j


def descend(a: list[_Slot], d: int, w: list[int], s: int, k: Any, m: int) -> int:
    """Compare only: the position in the subtree of s where an entry ordered by k belongs if
    the smaller child moves up a level along the way (positions below m only).  Bottom-up:
    down to a leaf, then back up.  O(d log_d n)."""
    i = s
    c: int
    if d == 4:
        # Pair verdicts w: the least of four children costs 1 comparison when both
        # pairs are known, 2 with one, 3 with none.
        if i:
            w[(i - 1) >> 1] = 0
        c = 4 * i + 1
        while c + 3 < m:
            p = c >> 1
            u = w[p]
            if not u:
                u = 2 if a[c + 1]._k < a[c]._k else 1
                w[p] = u
            v = w[p + 1]
            if not v:
                v = 2 if a[c + 3]._k < a[c + 2]._k else 1
                w[p + 1] = v
            i = c + v + 1
            if a[i]._k < a[c + u - 1]._k:
                w[p + 1] = 0  # its winner moves up: that pair changes
            else:
                i = c + u - 1
                w[p] = 0
            c = 4 * i + 1
    while True:
        c = d * i + 1
        if c >= m:
            break
        best = c
        bk = a[c]._k
        e = c + d
        if e > m:
            e = m
        for j in range(c + 1, e):
            jk = a[j]._k
            if jk < bk:
                best = j
                bk = jk
        i = best
        if d == 4:
            w[(i - 1) >> 1] = 0
    while i != s and k < a[i]._k:
        i = (i - 1) // d
    return i


def lower_path(a: list[_Slot], d: int, w: list[int], j: int, t: int, x: _Slot) -> None:
    """Move: the ancestors of j up to (not including) t each go down a level along the
    path; x lands at t.  No comparison."""
    if d == 4:
        forget(w, j, t)
    while j != t:
        p = (j - 1) // d
        q = a[p]
        a[j] = q
        q._i = j
        j = p
    a[t] = x
    x._i = t


def raise_path(a: list[_Slot], d: int, s: int, t: int, x: _Slot) -> None:
    """Move: the entries on the path from below s down to t each go up a level; x lands
    at t; what stood at s is dropped from the array.  No comparison."""
    carry = a[t]
    a[t] = x
    x._i = t
    while t != s:
        t = (t - 1) // d
        q = a[t]
        a[t] = carry
        carry._i = t
        carry = q


def forget(w: list[int], j: int, t: int) -> None:
    """Forget the pair verdicts of the positions from j up to its ancestor t (arity 4)."""
    while j > t:
        w[(j - 1) >> 1] = 0
        j = (j - 1) >> 2
    if t:
        w[(t - 1) >> 1] = 0
