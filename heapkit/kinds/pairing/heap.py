"""Pairing heap: a heap-ordered multiway tree, children in a sibling list.

Invariants
----------
* heap order: ``not (child.k < parent.k)`` for every parent/child pair;
* links: ``root.prev = root.next = None``; the first child's ``prev`` is its
  parent, every other child's ``prev`` is its left sibling, ``x.next.prev = x``;
* size: the nodes reachable from the root number ``len(heap)``, none twice;
* ownership: every node's owner token resolves to the heap's token.

Bounds (amortized unless said)
------------------------------
push, peek, meld: O(1) worst-case.  pop, remove, decrease_key, change_key:
O(log n) amortized (Fredman et al. 1986).  The standard potential is
``Phi = sum over nodes x of log2(size of x's subtree in the binary view)``,
where the binary view takes ``child`` as left and ``next`` as right.

Audit (``heapkit.audit``; hooks in ``cost.py``)
--------------------------------------------------------
Cost: links + nodes cut + 1.  ``PHI_C = 1``, ``Phi`` as above.  Recalled from
memory: FSST 1986 get O(log n) amortized for all operations from this Phi and
``log2 x + log2 y <= 2 log2(x + y) - 2``.  Constants derived here: pop
``2 log2 n + 1`` (first pass <= 2 log2(n-1) - 2 floor(r/2), second <= log2(n-1),
root -log2 n, actual r); push ``log2(n+1) + 2``; meld ``log2 N + 2``
(n1 n2 >= N - 1); decrease_key ``log2 n + 3`` (a cut only shrinks ancestors);
remove ``3 log2 n + 3``; change_key ``4 log2 n + 4`` (pair, cut, two hangs).

Source: M. L. Fredman, R. Sedgewick, D. D. Sleator, R. E. Tarjan, "The pairing
heap: a new form of self-adjusting heap", Algorithmica 1 (1986) 111-129.
Two-pass pairing: link children in pairs left to right, then fold the results
right to left.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator
from typing import Any, ClassVar, Generic, TypeVar

from heapkit._core import HandleBase, HeapBase, empty_error, nan_error, upward_error
from heapkit._face import HeapFace
from heapkit.kinds.pairing import cost as _cost
from heapkit.kinds.pairing import rules as _rules
from heapkit.kinds.pairing.links import _adopt, _cut, _hang, _link, _pair_children
from heapkit.protocol import Handle

__all__ = ["PairingHeap"]

K = TypeVar("K")
V = TypeVar("V")

class _Node(HandleBase, Generic[K, V]):
    """Handle and tree node: ``_child`` (leftmost), ``_next`` (right sibling),
    ``_prev`` (left sibling, or the parent for a leftmost child)."""

    __slots__ = ("_child", "_next", "_prev")

    def __init__(self, key: K, k: Any, value: V, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._child: Any = None
        self._next: Any = None
        self._prev: Any = None


# The node class's __new__: object's when pure; a compiled HandleBase refuses object.__new__.
_new = _Node.__new__


class PairingHeap(HeapFace[K, V], HeapBase):
    """Two-pass pairing heap with handles.

    >>> h = PairingHeap([(5, 'e'), (2, 'b')])
    >>> x = h.push(9, 'i')
    >>> h.decrease_key(x, 1)
    >>> h.pop(), h.pop(), len(h)
    ((1, 'i'), (2, 'b'), 1)
    """

    __slots__ = ("__weakref__", "_root",)

    KIND: ClassVar[str] = "pairing"
    _NODE: ClassVar[type[Any]] = _Node
    BOUNDS: ClassVar[str] = "push, meld, peek O(1) worst-case; pop, remove, decrease_key, change_key O(log n) amortized"
    RULES: ClassVar[dict[str, str]] = _rules.RULES
    COST_UNIT: ClassVar[str] = _cost.COST_UNIT
    PHI_C: ClassVar[float] = _cost.PHI_C
    POTENTIAL: ClassVar[str] = _cost.POTENTIAL

    _root: _Node[K, V] | None

    def __init__(self, pairs: Iterable[tuple[K, V]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._root = None
        self._finish_init(pairs)

    def push(self, key: K, value: V) -> Handle[K, V]:
        """Insert an entry and return its handle.  O(1) worst-case.

        >>> h = PairingHeap()
        >>> h.push(3, 'c').key
        3
        """
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None else w(key, None)
        # __new__ and slot stores instead of __init__: node creation 126 -> 81 ns (measured).
        node = _new(_Node)
        node._key = key
        node._k = k
        node.value = value
        node._tok = self._tok
        node._next = node._prev = None
        root = self._root
        if root is None:
            node._child = None
            self._root = node
        elif k < root._k:
            node._child = root
            root._prev = node
            self._root = node
        else:
            node._child = None
            c = root._child
            node._next = c
            if c is not None:
                c._prev = node
            node._prev = root
            root._child = node
        self._n += 1
        self._ver += 1
        return node

    def peek(self) -> Handle[K, V]:
        """The handle of a smallest entry.  O(1) worst-case.

        >>> PairingHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        root = self._root
        if root is None:
            raise empty_error("peek")
        return root

    def pop(self) -> tuple[K, V]:
        """Remove and return a smallest ``(key, value)``.  O(log n) amortized.

        >>> PairingHeap([(4, 'd'), (1, 'a')]).pop()
        (1, 'a')
        """
        root = self._root
        if root is None:
            raise empty_error("pop")
        self._ver += 1  # first: if a `<` raises, the children have moved
        self._root = _pair_children(root)
        self._n -= 1
        root._tok = None
        return root._key, root.value

    def decrease_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry a key that is not larger.  O(log n) amortized, O(1) actual.

        >>> h = PairingHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        x: Any = handle
        # Preamble inline, not HeapBase._new_order: a call is ~50 ns, 5% of a pairing decrease_key (measured).
        if type(x) is not _Node or x._tok is not self._tok:
            self._claim(x, "decrease_key")
        if key != key:
            raise nan_error("decrease_key", key)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        if x._k < k:
            raise upward_error(x, key)
        # _lower, _cut and _hang written inline: decrease_key 24% faster (measured).
        root: Any = self._root
        if x is not root:
            # The truth value first: a key's `<` may return an object whose bool() raises.
            if k < root._k:
                wins = True
            else:
                wins = False
            p = x._prev
            n = x._next
            if p._child is x:
                p._child = n
            else:
                p._next = n
            if n is not None:
                n._prev = p
            if wins:
                c = x._child
                root._next = c
                if c is not None:
                    c._prev = root
                root._prev = x
                x._child = root
                x._prev = x._next = None
                self._root = x
            else:
                c = root._child
                x._next = c
                if c is not None:
                    c._prev = x
                x._prev = root
                root._child = x
        x._key = key
        x._k = k
        self._ver += 1

    def change_key(self, handle: Handle[K, V], key: K) -> None:
        """Give the entry any key.  O(log n) amortized.

        >>> h = PairingHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        x: Any = handle
        # Preamble inline, not HeapBase._new_order: a call is ~50 ns, 5% of a pairing decrease_key (measured).
        if type(x) is not _Node or x._tok is not self._tok:
            self._claim(x, "change_key")
        if key != key:
            raise nan_error("change_key", key)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        if x._k < k:
            self._raise(x, key, k)
        else:
            self._lower(x, key, k)

    # Precondition: x is live here and k is not above x's ordering object.
    # Compares x with the root first, then cuts and links.
    def _lower(self, x: Any, key: Any, k: Any) -> None:
        root = self._root
        if x is not root:
            if k < root._k:  # type: ignore[union-attr]
                wins = True
            else:
                wins = False
            _cut(x)
            if wins:
                x._child, c = root, x._child
                # x's old children stay: x keeps them and gains the old root.
                root._prev = x  # type: ignore[union-attr]
                root._next = c  # type: ignore[union-attr]
                if c is not None:
                    c._prev = root
                self._root = x
            else:
                _hang(root, x)
        x._key = key
        x._k = k
        self._ver += 1

    # Precondition: x is live here and k is above x's ordering object.
    # Pairs x's children first (safe to unwind), then compares, then moves.
    def _raise(self, x: Any, key: Any, k: Any) -> None:
        self._ver += 1  # first: if a `<` raises, the children have moved
        c = _pair_children(x)
        root = self._root
        if x is root:
            if c is not None:
                try:
                    if c._k < k:
                        wins = True
                    else:
                        wins = False
                except BaseException:
                    _adopt(x, [c], None)
                    raise
                if wins:
                    _hang(c, x)
                    self._root = c
                else:
                    _hang(x, c)
        else:
            # root <= old key < new key and root <= c: both hang from the root.
            _cut(x)
            if c is not None:
                _hang(root, c)
            _hang(root, x)
        x._key = key
        x._k = k

    def remove(self, handle: Handle[K, V]) -> tuple[K, V]:
        """Delete the entry and return ``(key, value)``.  O(log n) amortized.

        >>> h = PairingHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        x: Any = handle
        if type(x) is not _Node or x._tok is not self._tok:
            self._claim(x, "remove")
        if x is self._root:
            return self.pop()
        self._ver += 1  # first: if a `<` raises, the children have moved
        c = _pair_children(x)
        _cut(x)
        if c is not None:
            _hang(self._root, c)
        self._n -= 1
        x._tok = None
        return x._key, x.value

    # --- SPI ---------------------------------------------------------------
    def _meld_from(self, other: PairingHeap[K, V]) -> None:
        a = self._root
        b = other._root
        self._root = b if a is None else _link(a, b)

    def _reset(self) -> None:
        self._root = None

    def _kill(self, h: Any) -> None:
        h._tok = h._child = h._next = h._prev = None

    def _handles(self) -> Iterator[_Node[K, V]]:
        stack = [] if self._root is None else [self._root]
        while stack:
            x = stack.pop()
            yield x
            if x._next is not None:
                stack.append(x._next)
            if x._child is not None:
                stack.append(x._child)

    def _export(self) -> tuple[list[Any], list[int]]:
        out: list[Any] = []
        counts: list[int] = []
        stack = [] if self._root is None else [self._root]
        while stack:
            x = stack.pop()
            out.append(x)
            kids = []
            c = x._child
            while c is not None:
                kids.append(c)
                c = c._next
            counts.append(len(kids))
            kids.reverse()
            stack.extend(kids)
        return out, counts

    def _import(self, handles: list[Any], counts: list[int]) -> None:
        for x in handles:
            x._child = x._next = x._prev = None
        self._root = handles[0] if handles else None
        # stack entries: [parent, children still to attach, last attached child]
        stack: list[list[Any]] = []
        for x, n in zip(handles, counts, strict=True):
            if stack:
                top = stack[-1]
                last = top[2]
                if last is None:
                    top[0]._child = x
                    x._prev = top[0]
                else:
                    last._next = x
                    x._prev = last
                top[2] = x
                top[1] -= 1
                if top[1] == 0:
                    stack.pop()
            if n:
                stack.append([x, n, None])

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for x in self._handles():
            x._k = fn(x._k, x._key)

    # Rules, checks and drawing (rules.py); audit hooks (cost.py).
    def _survey(self, report: Any) -> dict[str, Any]:
        return _rules.survey(self, report)

    def _touched(self, op: str, handle: Any) -> Any:
        return _rules.touched(self, op, handle)

    def _survey_local(self, report: Any, touched: Any, handle: Any) -> None:
        _rules.survey_local(self, report, touched, handle)

    def _dot_edges(self) -> Iterator[tuple[Any, Any, str]]:
        return _rules.dot_edges(self)

    def _layout_problem(self, handles: list[Any], layout: Any) -> str | None:
        return _rules.layout_problem(self, handles, layout)

    def _phi(self) -> float:
        return _cost.phi(self)

    def _cost_probe(self, op: str, handle: Any) -> Any:
        return _cost.probe(self, op, handle)

    def _cost(self, op: str, probe: Any, handle: Any) -> int:
        return _cost.actual(self, op, probe, handle)

    @classmethod
    def _bound(cls, op: str, n: int) -> float:
        return _cost.bound(op, n)
