"""The lazy heap's rules checked: loading, the full survey, checked mode's local
survey, check paths and ``to_dot`` drawing (stale entries included).

The invariants are stated in ``heap.py``'s docstring.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any

from heapkit._core import WRAPPERS, Stable
from heapkit.kinds.lazy.entries import _RAW, _Handle, _Ord, _user_key

__all__ = ["RULES", "dot_edges", "layout_problem", "slot_path", "survey", "survey_local", "touched"]

RULES: dict[str, str] = {
    "heap-order": "no entry of the list (stale ones included) is below its parent a[(i - 1) // 2]",
    "stale-count": "the stale counter equals the number of stale entries in the list",
    "entry": "no entry stands in the list twice",
    "size": "the list holds len(heap) live entries",
    "stale-bound": "stale entries number at most len(heap) + 1",
    "bare-keys": "every ordering object is an exact int/float/str or a never-equal wrapper",
    "ownership": "every entry carries this heap's owner token and every live handle is in it",
}


def layout_problem(heap: Any, handles: list[Any], layout: Any) -> str | None:
    """Loading: one ``None`` slot per handle, at most ``len + 1`` stale slots.  O(n)."""
    if type(layout) is not list:
        return f"expected a list of slots, got {layout!r:.80}"
    live = layout.count(None)
    if live != len(handles) or len(layout) - live > live + 1:
        return f"{live} live and {len(layout) - live} stale slots for {len(handles)} handles"
    return None


def slot_path(i: int) -> list[str]:
    """Steps from the root to slot ``i`` of the list (``child 0``/``child 1``)."""
    steps: list[str] = []
    while i > 0:
        steps.append(f"child {(i - 1) & 1}")
        i = (i - 1) >> 1
    steps.append("root")
    steps.reverse()
    return steps


def survey(heap: Any, report: Any) -> dict[str, Any]:
    """Check every rule in O(n); return the figures of :class:`heapkit.Shape`."""
    a = heap._a
    tok = heap._tok
    seen: set[int] = set()
    live = stale = 0
    for i, e in enumerate(a):
        h = e[1]
        if id(e) in seen:
            report.fail("entry", h, slot_path(i), "this entry stands in the list twice")
            continue
        seen.add(id(e))
        if h._e is e:
            live += 1
        else:
            stale += 1
        if e[2] is not tok:
            report.fail("ownership", h, slot_path(i), "the entry carries another owner token")
        t = type(e[0])
        if not (t in _RAW or t is _Ord or t is Stable or t in WRAPPERS):
            report.fail("bare-keys", h, slot_path(i), f"ordering object {e[0]!r} is a bare {t.__name__}")
        if i and e < a[(i - 1) >> 1]:
            report.fail(
                "heap-order",
                h,
                slot_path(i),
                f"key {_user_key(e[0])!r} is smaller than its parent's {_user_key(a[(i - 1) >> 1][0])!r}",
            )
    if stale != heap._stale:
        report.fail("stale-count", None, [], f"{stale} stale entries, the counter says {heap._stale}")
    if live != heap._n:
        report.fail("size", None, [], f"the list holds {live} live entries but len is {heap._n}")
    if heap._stale > heap._n + 1:
        report.fail("stale-bound", None, [], f"{heap._stale} stale entries for {heap._n} live ones")
    n = len(a)
    return {
        "size": live,
        "roots": 1 if live else 0,
        "height": max(0, n.bit_length() - 1),
        "max_degree": min(2, max(0, n - 1)),
        "marked": None,
        "potential": float(heap._stale),
        "details": {"entries": n, "stale": stale},
    }


def touched(heap: Any, op: str, handle: Any) -> None:
    """Nothing to name: the local survey looks at the root and the counts only."""
    return None


def survey_local(heap: Any, report: Any, touched: Any, handle: Any) -> None:
    """The root's children, the counts and the handle's owner: O(1)."""
    a = heap._a
    for i in (1, 2):
        if i < len(a) and a[i] < a[0]:
            report.fail("heap-order", a[i][1], slot_path(i), "smaller than the root")
    if len(a) - heap._stale != heap._n:
        report.fail("size", None, [], f"{len(a)} entries, {heap._stale} stale, but len is {heap._n}")
    if heap._stale > heap._n + 1:
        report.fail("stale-bound", None, [], f"{heap._stale} stale entries for {heap._n} live ones")
    if isinstance(handle, _Handle) and type(handle._e) is tuple and handle._e[2] is not heap._tok:
        report.fail("ownership", handle, [], "the handle's entry carries another owner token")


class _StaleSlot:
    """A stale entry as ``to_dot`` draws it: the key it had when it went stale."""

    __slots__ = ("key",)

    def __init__(self, key: Any) -> None:
        self.key = key


class _Drawing:
    """:func:`dot_edges`' triples, knowing how many there are in all (the list's
    length): ``to_dot`` reads ``operator.length_hint`` for its counts."""

    __slots__ = ("_it", "_n")

    def __init__(self, it: Iterator[tuple[Any, Any, str]], n: int) -> None:
        self._it = it
        self._n = n

    def __iter__(self) -> _Drawing:
        return self

    def __next__(self) -> tuple[Any, Any, str]:
        return next(self._it)

    def __length_hint__(self) -> int:
        return self._n


def dot_edges(heap: Any) -> _Drawing:
    """Every slot of the list in order with its array parent ``(i - 1) // 2``:
    ``(parent or None, handle, "[i]")`` for a live entry and ``(parent or
    None, slot, "[i], stale")`` for a stale one.  Stale entries are drawn
    because they are part of the structure: heap order spans them, they hold
    up the live entries below them (without them the tree falls apart), and
    their number is the potential a pop pays off.  Lazy, O(1) per slot."""
    return _Drawing(_slots(heap._a), len(heap._a))


def _slots(a: list[Any]) -> Iterator[tuple[Any, Any, str]]:
    drawn: list[Any] = []
    for i, e in enumerate(a):
        h = e[1]
        if h._e is e:
            node: Any = h
            extra = f"[{i}]"
        else:  # its handle may be live elsewhere in the list, dead, or the ghost
            node = _StaleSlot(_user_key(e[0]))
            extra = f"[{i}], stale"
        drawn.append(node)
        yield (drawn[(i - 1) >> 1] if i else None), node, extra
