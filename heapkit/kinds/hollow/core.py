"""The hollow heap's hot path, compiled by mypyc in the compiled build: the core class
with the protocol operations and the structure SPI, and the module-level helpers of the
operations (lowering a key, hollowing a node, the rebuild, the walk over the DAG).

The public class, :class:`heapkit.HollowHeap` (``heap.py``, interpreted), subclasses
:class:`_HollowCore`; nothing constructs ``_HollowCore`` itself (modes switch the public
class, see ``docs/compiled-build.md``).  The nodes, the entries and delete-root linking are
``dag.py``'s.  Rules for this module: nodes typed as their class, helpers at module level
(direct calls when compiled), no ``Generic``, no ``__weakref__``, no ``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator
from typing import Any

from heapkit._core import HeapBase, empty_error, nan_error, new_order, upward_error
from heapkit._mypyc import mypyc_attr
from heapkit.kinds.hollow.dag import Node, _Entry, children, delete_root

__all__ = ["_HollowCore"]


# Precondition: e is live in heap and k is not above its ordering object.
# Compares k with the root once, then restructures.
def _lower(heap: _HollowCore, e: _Entry, key: Any, k: Any) -> None:
    u: Node = e._node  # type: ignore[assignment]  # not None: e is live
    root: Node = heap._root  # type: ignore[assignment]  # not None: e is live
    if u is not root:
        # The truth value first: a key's `<` may return an object whose bool() raises.
        if k < root.k:
            wins = True
        else:
            wins = False
        v = Node(k, key, e)
        e._node = v
        u.item = None
        r: int = u.rank
        if r > 2:
            # v takes the ranked children of ranks r-3..0, u keeps r-1 and r-2
            v.rank = r - 2
            second: Node = u.rk.nx  # type: ignore[union-attr,assignment]  # rank > 2: two ranked children
            v.rk = second.nx
            second.nx = None
            heap._hr += 2
        else:
            heap._hr += r
        v.uk = u
        u.ep = v
        heap._h += 1
        heap._u += 2
        heap._work += 1
        if wins:
            root.nx = v.uk
            v.uk = root
            heap._root = v
        else:
            v.nx = root.uk
            root.uk = v
    else:
        u.k = k
        u.key = key
    e._key = key
    e._k = k
    heap._ver += 1
    if heap._h > 2 * heap._n + 16:
        _rebuild(heap)


# Precondition: u is a full non-root node.  Restores: u is hollow (counted).
def _hollow(heap: _HollowCore, u: Node) -> None:
    u.item = None
    heap._h += 1
    heap._hr += u.rank


# Every node of the DAG once (depth-first, explicit stack).
def _nodes(heap: _HollowCore) -> Iterator[Node]:
    root = heap._root
    if root is None:
        return
    seen = {id(root)}
    stack = [root]
    while stack:
        v = stack.pop()
        yield v
        for c, _ in children(v):
            if id(c) not in seen:
                seen.add(id(c))
                stack.append(c)


# Every live handle, in the order of _nodes.
def _entries(heap: _HollowCore) -> Iterator[_Entry]:
    for v in _nodes(heap):
        e = v.item
        if e is not None:
            yield e


# Restores H = 0 without comparing: the root keeps the entries' minimum and
# every other full node becomes its rank-0 unranked child.  O(N).
def _rebuild(heap: _HollowCore) -> None:
    root: Node = heap._root  # type: ignore[assignment]  # not None: there are hollow nodes
    others: list[Node] = [e._node for e in _entries(heap) if e._node is not root]  # type: ignore[misc]
    heap._work += heap._h
    head: Node | None = None
    for v in others:
        v.rank = 0
        v.rk = v.uk = v.ep = None
        v.nx = head
        head = v
    root.rank = 0
    root.rk = None
    root.uk = head
    heap._h = heap._hr = 0
    heap._u = len(others)


@mypyc_attr(allow_interpreted_subclasses=True)
class _HollowCore(HeapBase):
    """The protocol operations and the structure SPI of :class:`heapkit.HollowHeap`."""

    __slots__ = ("_h", "_hr", "_root", "_u", "_work")

    def __init__(self, pairs: Iterable[tuple[Any, Any]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._root: Node | None = None
        self._h: int = 0  # hollow nodes
        self._hr: int = 0  # ranked children of hollow nodes
        self._u: int = 0  # unranked child edges
        self._work: int = 0
        self._finish_init(pairs)

    def push(self, key: Any, value: Any) -> Any:
        """Insert an entry and return its handle.  O(1) worst-case.

        >>> from heapkit import HollowHeap
        >>> HollowHeap().push(3, 'c').key
        3
        """
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None else w(key, None)
        e = _Entry(key, k, value, self._tok)
        v = Node(k, key, e)
        e._node = v
        root = self._root
        if root is None:
            self._root = v
        else:
            if k < root.k:
                v.uk = root
                self._root = v
            else:
                v.nx = root.uk
                root.uk = v
            self._u += 1
            self._work += 1
        self._n += 1
        self._ver += 1
        return e

    def peek(self) -> Any:
        """The handle of a smallest entry.  O(1) worst-case.

        >>> from heapkit import HollowHeap
        >>> HollowHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        root = self._root
        if root is None:
            raise empty_error("peek")
        return root.item

    def pop(self) -> Any:
        """Remove and return a smallest ``(key, value)``.  O(log n) amortized.

        >>> from heapkit import HollowHeap
        >>> HollowHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        root = self._root
        if root is None:
            raise empty_error("pop")
        e: _Entry = root.item  # type: ignore[assignment]  # the root is full
        self._root = delete_root(self, root, None)
        self._n -= 1
        self._ver += 1
        e._tok = None
        e._node = None
        return e._key, e.value

    def decrease_key(self, handle: Any, key: Any) -> None:
        """Give the entry a key that is not larger.  O(1) worst-case (plus a rare rebuild).

        >>> from heapkit import HollowHeap
        >>> h = HollowHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        k = new_order(self, handle, _Entry, key, "decrease_key")
        e: _Entry = handle
        if e._k < k:
            raise upward_error(e, key)
        _lower(self, e, key, k)

    def change_key(self, handle: Any, key: Any) -> None:
        """Give the entry any key.  O(log n) amortized (O(1) worst-case unless the entry
        is the minimum and its key goes up).

        >>> from heapkit import HollowHeap
        >>> h = HollowHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        k = new_order(self, handle, _Entry, key, "change_key")
        e: _Entry = handle
        if not e._k < k:
            _lower(self, e, key, k)
            return
        u: Node = e._node  # type: ignore[assignment]  # not None: e is live
        v = Node(k, key, None)
        root: Node = self._root  # type: ignore[assignment]  # not None: e is live
        if u is root:
            # the new node joins the roots of a delete-min of u (which unwinds on error)
            self._root = delete_root(self, u, v)
        else:
            # u goes hollow; the new node hangs from the root (root <= old key < key)
            _hollow(self, u)
            v.nx = root.uk
            root.uk = v
            self._u += 1
            self._work += 1
        u.item = None
        v.item = e
        e._node = v
        e._key = key
        e._k = k
        self._ver += 1
        if self._h > 2 * self._n + 16:
            _rebuild(self)

    def remove(self, handle: Any) -> Any:
        """Delete the entry and return ``(key, value)``.  O(log n) amortized.

        >>> from heapkit import HollowHeap
        >>> h = HollowHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        if type(handle) is not _Entry or handle._tok is not self._tok:
            self._claim(handle, "remove")
        e: _Entry = handle
        u: Node = e._node  # type: ignore[assignment]  # not None: e is live
        if u is self._root:
            return self.pop()  # a method call: a mode layer sees it
        _hollow(self, u)
        self._n -= 1
        self._ver += 1
        e._tok = None
        e._node = None
        if self._h > 2 * self._n + 16:
            _rebuild(self)
        return e._key, e.value

    # --- SPI ---------------------------------------------------------------
    def _meld_from(self, other: _HollowCore) -> None:
        a = self._root
        b = other._root
        if a is None:
            self._root = b
        elif b is not None:
            if b.k < a.k:
                a, b = b, a
            b.nx = a.uk
            a.uk = b
            self._root = a
            self._u += 1
            self._work += 1
        self._h += other._h
        self._hr += other._hr
        self._u += other._u

    def _reset(self) -> None:
        self._root = None
        self._h = self._hr = self._u = 0
        self._work = 0

    def _kill(self, h: Any) -> None:
        e: _Entry = h
        e._tok = None
        e._node = None

    def _nodes(self) -> Iterator[Any]:
        """Every node once (depth-first, explicit stack)."""
        return _nodes(self)

    def _handles(self) -> Iterator[Any]:
        return _entries(self)

    def _export(self) -> tuple[list[Any], None]:
        """The live handles, root first; the copy is compacted (no hollow nodes)."""
        return list(_entries(self)), None

    def _import(self, handles: list[Any], layout: None) -> None:
        self._reset()
        nodes: list[Node] = []
        for h in handles:
            e: _Entry = h
            v = Node(e._k, e._key, e)
            e._node = v
            nodes.append(v)
        if nodes:
            root = nodes[0]
            head: Node | None = None
            for v in nodes[1:]:
                v.nx = head
                head = v
            root.uk = head
            self._root = root
            self._u = len(nodes) - 1

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for v in _nodes(self):
            v.k = fn(v.k, v.key)
            e = v.item
            if e is not None:
                e._k = v.k
