"""Hollow heap (one-tree variant): a heap-ordered DAG whose nodes hold an entry or are hollow.

Invariants
----------
Each node ``x`` has an ordering object ``x.k`` (kept when it goes hollow), a rank,
a ranked child list ``x.rk`` and an unranked child list ``x.uk`` (both linked by
``nx``), and at most a second parent ``x.ep``.  ``h`` is the one root.

* heap order: ``not (c.k < p.k)`` for every DAG edge ``p -> c`` (hollow nodes too);
* rank: the ranked children of a full node of rank ``r`` have ranks ``r-1, r-2, ..., 0``
  in list order; a hollow node's ranked children are a prefix of that list;
* second parent: ``c.ep = p`` only for a hollow ``c`` that is the last node of
  ``p.uk`` and also a child of one other (first) parent; so every non-root node
  has exactly ``1 + (ep is not None)`` parents;
* root: ``h`` is full, has no parent, and ``not (f.k < h.k)`` for every full ``f``;
* size: the full nodes number ``len(heap)``; the hollow nodes number ``H`` and
  ``H <= 2 len(heap) + 16`` after every operation (rebuild keeps memory O(n));
* ownership, handle: every handle's owner token resolves to this heap's; a live
  handle ``e`` points at a full node ``e._node`` with ``e._node.item is e`` and
  the same key and ordering object.

Consequence (Hansen et al., recalled from memory): a node of rank ``r`` has at
least ``F(r+3) - 1`` descendants (it keeps ranked children of ranks ``r-1`` and
``r-2``), so ranks are at most ``log_phi N`` for ``N`` nodes.

Bounds
------
push, meld, peek: O(1) worst-case.  decrease_key: O(1) worst-case (one
comparison with the root, one link) plus a rebuild, O(n) without comparisons,
once per Theta(n) hollow nodes: O(1) amortized.  pop, remove, change_key: O(log n)
amortized.

decrease_key on a full non-root node ``u`` of rank ``r`` makes a new node ``v``
of rank ``max(0, r-2)`` holding the entry; ``v`` takes ``u``'s ranked children of
ranks ``r-3 .. 0`` (a tail of ``u.rk``, moved in O(1)) and ``u`` itself as its
last unranked child (``u.ep = v``); ``u`` goes hollow, keeping ranks ``r-1, r-2``.

Audit: cost unit = links + hollow nodes destroyed + 1.  Potential
``Phi = U + HR + H`` with ``c = 2``: U = unranked child edges (second-parent
edges included), HR = ranked children of hollow nodes, H = hollow nodes.  A
pop destroying D nodes frees at least as many edges as it makes roots T, links
T - 1 times (at most R + 1 of them unranked, R the rank bound), so its amortized
cost is at most 4R + 6; push and meld 4; decrease_key 12; remove 2R + 3 (the
hollow node pays for its ranked children); change_key 4R + 10.

Source: T. D. Hansen, H. Kaplan, R. E. Tarjan, U. Zwick, "Hollow heaps",
ICALP 2015, and ACM Transactions on Algorithms 13(3) (2017).  The potential and
constants above are this module's own accounting in the paper's style.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator
from typing import Any, ClassVar, Generic, TypeVar

from heapkit._core import HandleBase, HeapBase, empty_error, nan_error, upward_error
from heapkit._face import HeapFace
from heapkit.kinds.hollow import cost as _cost
from heapkit.kinds.hollow import rules as _rules
from heapkit.kinds.hollow.dag import Node, children, delete_root
from heapkit.protocol import Handle

__all__ = ["HollowHeap"]

K = TypeVar("K")
V = TypeVar("V")


class _Entry(HandleBase, Generic[K, V]):
    """Handle of a hollow heap entry; ``_node`` is the full node holding it now."""

    __slots__ = ("_node",)

    def __init__(self, key: K, k: Any, value: V, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._node: Any = None


class HollowHeap(HeapFace[K, V], HeapBase):
    """Hollow heap with handles: O(1) push, meld and decrease_key.

    >>> h = HollowHeap([(5, 'e'), (2, 'b')])
    >>> x = h.push(9, 'i')
    >>> h.decrease_key(x, 1)
    >>> [h.pop() for _ in range(len(h))]
    [(1, 'i'), (2, 'b'), (5, 'e')]
    """

    __slots__ = ("__weakref__", "_h", "_hr", "_root", "_u", "_work")

    KIND: ClassVar[str] = "hollow"
    BOUNDS: ClassVar[str] = "push, meld, decrease_key O(1) worst-case; pop, remove, change_key O(log n) amortized"
    _NODE: ClassVar[type[Any]] = _Entry
    RULES: ClassVar[dict[str, str]] = _rules.RULES
    COST_UNIT: ClassVar[str] = _cost.COST_UNIT
    POTENTIAL: ClassVar[str] = _cost.POTENTIAL
    PHI_C: ClassVar[float] = _cost.PHI_C

    _root: Node | None
    _h: int
    _hr: int
    _u: int
    _work: int

    def __init__(self, pairs: Iterable[tuple[K, V]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._reset()
        self._finish_init(pairs)

    def push(self, key: K, value: V) -> Handle[K, V]:
        """Insert an entry and return its handle.  O(1) worst-case.

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

    def peek(self) -> Handle[K, V]:
        """The handle of a smallest entry.  O(1) worst-case.

        >>> HollowHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        root = self._root
        if root is None:
            raise empty_error("peek")
        top: _Entry[K, V] = root.item
        return top

    def pop(self) -> tuple[K, V]:
        """Remove and return a smallest ``(key, value)``.  O(log n) amortized.

        >>> HollowHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        root = self._root
        if root is None:
            raise empty_error("pop")
        e = root.item
        self._root = delete_root(self, root, None)
        self._n -= 1
        self._ver += 1
        e._tok = None
        e._node = None
        return e._key, e.value

    def decrease_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry a key that is not larger.  O(1) worst-case (plus a rare rebuild).

        >>> h = HollowHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        e: Any = handle
        k = self._new_order(e, key, "decrease_key")
        if e._k < k:
            raise upward_error(e, key)
        self._lower(e, key, k)

    # Precondition: e is live here and k is not above its ordering object.
    # Compares k with the root once, then restructures.
    def _lower(self, e: Any, key: Any, k: Any) -> None:
        u = e._node
        root: Any = self._root
        if u is not root:
            # The truth value first: a key's `<` may return an object whose bool() raises.
            if k < root.k:
                wins = True
            else:
                wins = False
            v = Node(k, key, e)
            e._node = v
            u.item = None
            r = u.rank
            if r > 2:
                # v takes the ranked children of ranks r-3..0, u keeps r-1 and r-2
                v.rank = r - 2
                second = u.rk.nx
                v.rk = second.nx
                second.nx = None
                self._hr += 2
            else:
                self._hr += r
            v.uk = u
            u.ep = v
            self._h += 1
            self._u += 2
            self._work += 1
            if wins:
                root.nx = v.uk
                v.uk = root
                self._root = v
            else:
                v.nx = root.uk
                root.uk = v
        else:
            u.k = k
            u.key = key
        e._key = key
        e._k = k
        self._ver += 1
        if self._h > 2 * self._n + 16:
            self._rebuild()

    def change_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry any key.  O(log n) amortized (O(1) worst-case unless the entry
        is the minimum and its key goes up).

        >>> h = HollowHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        e: Any = handle
        k = self._new_order(e, key, "change_key")
        if not e._k < k:
            self._lower(e, key, k)
            return
        u = e._node
        v = Node(k, key, None)
        root: Any = self._root
        if u is root:
            # the new node joins the roots of a delete-min of u (which unwinds on error)
            self._root = delete_root(self, u, v)
        else:
            # u goes hollow; the new node hangs from the root (root <= old key < key)
            self._hollow(u)
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
            self._rebuild()

    # Precondition: u is a full non-root node.  Restores: u is hollow (counted).
    def _hollow(self, u: Any) -> None:
        u.item = None
        self._h += 1
        self._hr += u.rank

    def remove(self, handle: Handle[K, V]) -> tuple[K, V]:
        """Delete the entry and return ``(key, value)``.  O(log n) amortized.

        >>> h = HollowHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        e: Any = handle
        if type(e) is not _Entry or e._tok is not self._tok:
            self._claim(e, "remove")
        u = e._node
        if u is self._root:
            return self.pop()
        self._hollow(u)
        self._n -= 1
        self._ver += 1
        e._tok = None
        e._node = None
        if self._h > 2 * self._n + 16:
            self._rebuild()
        return e._key, e.value

    # Restores H = 0 without comparing: the root keeps the entries' minimum and
    # every other full node becomes its rank-0 unranked child.  O(N).
    def _rebuild(self) -> None:
        root: Any = self._root
        others = [e._node for e in self._handles() if e._node is not root]
        self._work += self._h
        head = None
        for v in others:
            v.rank = 0
            v.rk = v.uk = v.ep = None
            v.nx = head
            head = v
        root.rank = 0
        root.rk = None
        root.uk = head
        self._h = self._hr = 0
        self._u = len(others)

    # --- SPI ---------------------------------------------------------------
    def _meld_from(self, other: HollowHeap[K, V]) -> None:
        a: Any = self._root
        b: Any = other._root
        if a is None:
            self._root = b
        else:
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
        h._tok = None
        h._node = None

    def _nodes(self) -> Iterator[Any]:
        """Every node once (depth-first, explicit stack)."""
        root = self._root
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

    def _handles(self) -> Iterator[_Entry[K, V]]:
        for v in self._nodes():
            if v.item is not None:
                yield v.item

    def _export(self) -> tuple[list[Any], None]:
        """The live handles, root first; the copy is compacted (no hollow nodes)."""
        return list(self._handles()), None

    def _import(self, handles: list[Any], layout: None) -> None:
        self._reset()
        nodes = []
        for e in handles:
            v = Node(e._k, e._key, e)
            e._node = v
            nodes.append(v)
        if nodes:
            root = nodes[0]
            head = None
            for v in nodes[1:]:
                v.nx = head
                head = v
            root.uk = head
            self._root = root
            self._u = len(nodes) - 1

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for v in self._nodes():
            v.k = fn(v.k, v.key)
            if v.item is not None:
                v.item._k = v.k

    # Rules, checks and drawing (rules.py); audit hooks (cost.py).
    def _survey(self, report: Any) -> dict[str, Any]:
        return _rules.survey(self, report)

    def _touched(self, op: str, handle: Any) -> Any:
        return _rules.touched(self, op, handle)

    def _survey_local(self, report: Any, touched: Any, handle: Any) -> None:
        _rules.survey_local(self, report, touched, handle)

    def _phi(self) -> float:
        return _cost.phi(self)

    def _cost_probe(self, op: str, handle: Any) -> Any:
        return _cost.probe(self, op, handle)

    def _cost(self, op: str, probe: Any, handle: Any) -> int:
        return _cost.actual(self, op, probe, handle)

    @classmethod
    def _bound(cls, op: str, n: int) -> float:
        return _cost.bound(op, n)
