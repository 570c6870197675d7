"""The pairing heap's hot path, compiled by mypyc in the compiled build: the node class,
the core class with the protocol operations and the structure SPI, and the link surgery
(link, cut, hang, the two-pass pairing of a node's children, with the unwinding that keeps
a raising comparison harmless).

Nodes are :class:`_Node`: ``_child`` (leftmost child), ``_next`` (right sibling),
``_prev`` (left sibling, or the parent for a leftmost child).  The helpers only relink;
the heap keeps its own counts.  The public class, :class:`heapkit.PairingHeap`
(``heap.py``, interpreted), subclasses :class:`_PairingCore`; nothing constructs
``_PairingCore`` itself (modes switch the public class, see ``docs/compiled-build.md``);
``rules.py`` and ``cost.py`` walk the nodes with :func:`_children`.
Rules for this module: nodes typed as their class, helpers at module level (direct calls
when compiled), no ``Generic``, no ``__weakref__``, no ``TYPE_CHECKING``/``else``.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Iterator
from typing import Any, Final

from heapkit._core import HandleBase, HeapBase, empty_error, nan_error, upward_error
from heapkit._mypyc import mypyc_attr

__all__ = ["_PairingCore", "_adopt", "_children", "_cut", "_hang", "_link", "_pair_children"]


class _Node(HandleBase):
    """Handle and tree node (sealed: never subclass it)."""

    __slots__ = ("_child", "_next", "_prev")

    def __init__(self, key: Any, k: Any, value: Any, tok: Any) -> None:
        self._key = key
        self._k = k
        self.value = value
        self._tok = tok
        self._child: _Node | None = None
        self._next: _Node | None = None
        self._prev: _Node | None = None


#: True when this module runs as Python source.  The pure build then makes nodes with
#: ``object.__new__`` and slot stores (126 -> 81 ns a node, measured); a compiled class
#: refuses ``object.__new__``, so the compiled build calls the constructor.
_PURE: Final = __file__.endswith(".py")
_new: Final = object.__new__


# Precondition: a and b are detached roots (prev and next are None).
# Restores: one detached root holding both trees; compares before it links.
def _link(a: _Node, b: _Node) -> _Node:
    if b._k < a._k:
        a, b = b, a
    c = a._child
    b._next = c
    if c is not None:
        c._prev = b
    b._prev = a
    a._child = b
    return a


# Precondition: trees are detached roots, rest is a sibling chain or None.
# Restores: all of them are parent's children again (order: trees, then rest).
def _adopt(parent: _Node, trees: list[_Node], rest: _Node | None) -> None:
    head = rest
    for t in reversed(trees):
        t._next = head
        if head is not None:
            head._prev = t
        head = t
    parent._child = head
    if head is not None:
        head._prev = parent


# The trees of a pairing pass so far, left to right: ``last`` and the trees
# before it, chained through their ``_prev`` links (see _pair_children).
def _chained(last: _Node | None) -> list[_Node]:
    trees = []
    while last is not None:
        trees.append(last)
        last = last._prev
    trees.reverse()
    return trees


# Precondition: parent is a node whose children are heap-ordered trees.
# Restores: returns those children merged into one detached tree (two-pass
# pairing) and leaves parent childless.  If a comparison raises, every tree goes
# back under parent (which is no larger than any of them) before it propagates.
# Links are written inline (no _link calls), the first pass chains its winners
# through their free _prev links instead of a list, and a winner's prev/next
# are cleared once, on the final tree: pop 17% faster on random keys (measured).
def _pair_children(parent: _Node) -> _Node | None:
    x = parent._child
    if x is None:
        return None
    last: _Node | None = None
    try:
        while x is not None:
            y = x._next
            if y is None:
                x._prev = last
                last = x
                break
            rest = y._next
            if y._k < x._k:
                c = y._child
                x._next = c
                if c is not None:
                    c._prev = x
                x._prev = y
                y._child = x
                y._prev = last
                last = y
            else:
                c = x._child
                y._next = c
                if c is not None:
                    c._prev = y
                y._prev = x
                x._child = y
                x._prev = last
                last = x
            x = rest
    except BaseException:
        _adopt(parent, _chained(last), x)
        raise
    acc: _Node = last  # type: ignore[assignment]  # not None: parent had a child
    a = acc._prev
    try:
        while a is not None:
            nxt = a._prev
            if acc._k < a._k:
                win, lose = acc, a
            else:
                win, lose = a, acc
            # lose (not smaller) becomes win's leftmost child; win is the new acc.
            c = win._child
            lose._next = c
            if c is not None:
                c._prev = lose
            lose._prev = win
            win._child = lose
            acc = win
            a = nxt
    except BaseException:
        _adopt(parent, [*_chained(a), acc], None)
        raise
    acc._prev = None
    acc._next = None
    parent._child = None
    return acc


# x's children, leftmost first (a list: callers walk them while links change).
def _children(x: _Node) -> list[_Node]:
    out = []
    c = x._child
    while c is not None:
        out.append(c)
        c = c._next
    return out


# Precondition: x is a non-root node.  Restores: x is detached (its subtree
# goes with it), its former siblings and parent linked around the gap.
def _cut(x: _Node) -> None:
    p: _Node = x._prev  # type: ignore[assignment]  # not None: x is not the root
    n = x._next
    if p._child is x:
        p._child = n
    else:
        p._next = n
    if n is not None:
        n._prev = p
    x._prev = None
    x._next = None


# Precondition: root is the root, x a detached tree no smaller than root.
# Restores: x is root's leftmost child.  No comparison.
def _hang(root: _Node, x: _Node) -> None:
    c = root._child
    x._next = c
    if c is not None:
        c._prev = x
    x._prev = root
    root._child = x


# Precondition: x is live in heap, not its root, and k is not above x's ordering object.
# Compares k with the root's first, then cuts and links.
def _lower(heap: _PairingCore, x: _Node, key: Any, k: Any) -> None:
    root: _Node = heap._root  # type: ignore[assignment]  # not None: x is live
    if x is not root:
        # The truth value first: a key's `<` may return an object whose bool() raises.
        if k < root._k:
            wins = True
        else:
            wins = False
        _cut(x)
        if wins:
            c = x._child
            x._child = root
            # x's old children stay: x keeps them and gains the old root.
            root._prev = x
            root._next = c
            if c is not None:
                c._prev = root
            heap._root = x
        else:
            _hang(root, x)
    x._key = key
    x._k = k
    heap._ver += 1


# Precondition: x is live in heap and k is above x's ordering object.
# Pairs x's children first (safe to unwind), then compares, then moves.
def _raise(heap: _PairingCore, x: _Node, key: Any, k: Any) -> None:
    heap._ver += 1  # first: if a `<` raises, the children have moved
    c = _pair_children(x)
    root: _Node = heap._root  # type: ignore[assignment]  # not None: x is live
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
                heap._root = c
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


@mypyc_attr(allow_interpreted_subclasses=True)
class _PairingCore(HeapBase):
    """The protocol operations and the structure SPI of :class:`heapkit.PairingHeap`."""

    __slots__ = ("_root",)

    def __init__(self, pairs: Iterable[tuple[Any, Any]] = (), *, stable: bool = False) -> None:
        self._setup(stable)
        self._root: _Node | None = None
        self._finish_init(pairs)

    def push(self, key: Any, value: Any) -> Any:
        """Insert an entry and return its handle.  O(1) worst-case.

        >>> from heapkit import PairingHeap
        >>> h = PairingHeap()
        >>> h.push(3, 'c').key
        3
        """
        if key != key:
            raise nan_error("push", key)
        w = self._wrap
        k = key if w is None else w(key, None)
        node: _Node
        if _PURE:
            node = _new(_Node)
            node._key = key
            node._k = k
            node.value = value
            node._tok = self._tok
            node._next = node._prev = None
        else:
            node = _Node(key, k, value, self._tok)
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

    def peek(self) -> Any:
        """The handle of a smallest entry.  O(1) worst-case.

        >>> from heapkit import PairingHeap
        >>> PairingHeap([(4, 'd'), (1, 'a')]).peek().value
        'a'
        """
        root = self._root
        if root is None:
            raise empty_error("peek")
        return root

    def pop(self) -> Any:
        """Remove and return a smallest ``(key, value)``.  O(log n) amortized.

        >>> from heapkit import PairingHeap
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

    def decrease_key(self, handle: Any, key: Any) -> None:
        """Give the entry a key that is not larger.  O(log n) amortized, O(1) actual.

        >>> from heapkit import PairingHeap
        >>> h = PairingHeap([(4, 'd'), (6, 'f')])
        >>> x = h.push(8, 'h'); h.decrease_key(x, 2); h.peek() is x
        True
        """
        # _core.new_order written inline: in the pure build the call is ~50 ns, 5% of a pairing decrease_key (measured).
        if type(handle) is not _Node or handle._tok is not self._tok:
            self._claim(handle, "decrease_key")
        x: _Node = handle
        if key != key:
            raise nan_error("decrease_key", key)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        if x._k < k:
            raise upward_error(x, key)
        # _lower, _cut and _hang written inline: decrease_key 24% faster (measured).
        root: _Node = self._root  # type: ignore[assignment]  # not None: x is live
        if x is not root:
            # The truth value first: a key's `<` may return an object whose bool() raises.
            if k < root._k:
                wins = True
            else:
                wins = False
            p: _Node = x._prev  # type: ignore[assignment]  # not None: x is not the root
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

    def change_key(self, handle: Any, key: Any) -> None:
        """Give the entry any key.  O(log n) amortized.

        >>> from heapkit import PairingHeap
        >>> h = PairingHeap([(4, 'd')])
        >>> x = h.push(1, 'a'); h.change_key(x, 9); h.pop()
        (4, 'd')
        """
        if type(handle) is not _Node or handle._tok is not self._tok:
            self._claim(handle, "change_key")
        x: _Node = handle
        if key != key:
            raise nan_error("change_key", key)
        w = self._wrap
        k = key if w is None else w(key, x._k)
        if x._k < k:
            _raise(self, x, key, k)
        else:
            _lower(self, x, key, k)

    def remove(self, handle: Any) -> Any:
        """Delete the entry and return ``(key, value)``.  O(log n) amortized.

        >>> from heapkit import PairingHeap
        >>> h = PairingHeap([(1, 'a'), (2, 'b')])
        >>> x = h.push(3, 'c'); h.remove(x), len(h)
        ((3, 'c'), 2)
        """
        if type(handle) is not _Node or handle._tok is not self._tok:
            self._claim(handle, "remove")
        x: _Node = handle
        if x is self._root:
            return self.pop()  # a method call: a mode layer sees it
        self._ver += 1  # first: if a `<` raises, the children have moved
        c = _pair_children(x)
        _cut(x)
        if c is not None:
            _hang(self._root, c)  # type: ignore[arg-type]  # not None: x is live
        self._n -= 1
        x._tok = None
        return x._key, x.value

    # --- SPI ---------------------------------------------------------------
    def _meld_from(self, other: _PairingCore) -> None:
        a = self._root
        b = other._root
        self._root = b if a is None or b is None else _link(a, b)

    def _reset(self) -> None:
        self._root = None

    def _kill(self, h: Any) -> None:
        x: _Node = h
        x._tok = x._child = x._next = x._prev = None

    def _handles(self) -> Iterator[Any]:
        stack = [] if self._root is None else [self._root]
        while stack:
            x = stack.pop()
            yield x
            if x._next is not None:
                stack.append(x._next)
            if x._child is not None:
                stack.append(x._child)

    def _export(self) -> tuple[list[Any], Any]:
        out: list[Any] = []
        counts: list[int] = []
        stack = [] if self._root is None else [self._root]
        while stack:
            x = stack.pop()
            out.append(x)
            kids = _children(x)
            counts.append(len(kids))
            kids.reverse()
            stack.extend(kids)
        return out, counts

    def _import(self, handles: list[Any], layout: Any) -> None:
        counts: list[int] = layout
        nodes: list[_Node] = handles
        for x in nodes:
            x._child = x._next = x._prev = None
        self._root = nodes[0] if nodes else None
        # open parents: (parent, children still to attach, last attached child)
        parents: list[_Node] = []
        left: list[int] = []
        lasts: list[_Node | None] = []
        for x, n in zip(nodes, counts, strict=True):
            if parents:
                top = parents[-1]
                last = lasts[-1]
                if last is None:
                    top._child = x
                    x._prev = top
                else:
                    last._next = x
                    x._prev = last
                lasts[-1] = x
                left[-1] -= 1
                if left[-1] == 0:
                    parents.pop()
                    left.pop()
                    lasts.pop()
            if n:
                parents.append(x)
                left.append(n)
                lasts.append(None)

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        for x in self._handles():
            x._k = fn(x._k, x._key)
