"""The d-ary heap's audit hooks: actual costs in levels an entry moves + 1.

A worst-case kind: ``Phi = 0``.  The cost unit and the bounds, with their
derivation, are in ``dary.py``.
"""

from __future__ import annotations

from typing import Any

__all__ = ["DaryAudit"]


def _depth(i: int, d: int) -> int:
    """Depth of position i in a d-ary array heap (the root is 0).  O(log_d i)."""
    if d == 2:
        return (i + 1).bit_length() - 1
    k = 0
    while i:
        i = (i - 1) // d
        k += 1
    return k


class DaryAudit:
    """Mixin of :class:`heapkit.DaryHeap`: ``_phi``, ``_cost_probe``, ``_cost``."""

    __slots__ = ()
    _a: list[Any]
    _d: int

    @staticmethod
    def _pushes(n: int, m: int) -> bool:
        raise NotImplementedError

    def _phi(self) -> float:
        return 0.0

    def _cost_probe(self, op: str, handle: Any) -> Any:
        a = self._a
        if op == "push":
            return len(a)
        if op == "pop":
            return (len(a) - 1, a[-1])
        if op == "remove":
            return (handle._i, a[-1])
        if op == "meld":
            return self._meld_probe(handle)
        return handle._i

    def _cost(self, op: str, probe: Any, handle: Any) -> int:
        d = self._d
        if op == "push":
            return _depth(probe, d) - _depth(handle._i, d) + 1
        if op == "pop" or op == "remove":
            start, last = probe
            if last._tok is None:  # the last entry itself left (it was the one removed)
                return 1
            if op == "pop":
                start = 0
            return abs(_depth(start, d) - _depth(last._i, d)) + 1
        if op == "meld":
            moved: int = sum(abs(_depth(x._i, d) - dep) for x, dep in probe)
            return (moved + 1) // 2 + 1
        return abs(_depth(probe, d) - _depth(handle._i, d)) + 1

    # The entries a meld may move, with their depth before it (other's entries
    # at the positions they are appended to): every entry when heapifying
    # (O(n + m) work anyway), else the ancestors of the appended positions.
    def _meld_probe(self, other: Any) -> list[tuple[Any, int]]:
        a, b, d = self._a, other._a, self._d
        n, m = len(a), len(b)
        out = [(x, _depth(n + j, d)) for j, x in enumerate(b)]
        if not self._pushes(n, m):
            out.extend((x, _depth(i, d)) for i, x in enumerate(a))
            return out
        seen: set[int] = set()
        for j in range(n, n + m):
            while j:
                j = (j - 1) // d
                if j in seen:
                    break
                seen.add(j)
        out.extend((a[i], _depth(i, d)) for i in seen if i < n)
        return out
