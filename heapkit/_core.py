"""What every kind shares: handle ownership, stable ordering, meld, copy, pickle.

The kind SPI
============
A kind subclasses :class:`HeapBase` and keeps, in its own module, beside its code:

* the protocol operations ``push, peek, pop, decrease_key, change_key, remove,
  clear`` (the base class supplies ``extend, meld, __len__, __bool__, __iter__,
  __contains__, __repr__``, copy and pickle);
* ``_meld_from(other)``: move every entry of ``other`` (same class, same
  options) into ``self``, atomically; the base then fixes sizes, ownership and
  empties ``other`` with ``other._reset()``;
* ``_reset()``: forget the structure (no unlinking; the base or ``clear`` kills
  handles);
* ``_handles()``: every live handle, iteratively;
* ``_export() -> (handles, layout)`` and ``_import(handles, layout)``: the exact
  shape as flat data (no recursion), for copy, deepcopy and pickle; ``_NODE`` (the
  handle class) and ``_layout_problem(handles, layout)`` (what is wrong with such
  data, or None; no key compared), which ``_validate`` runs before ``_import``;
* ``_map_order(fn)``: replace every stored ordering object ``o`` of a handle
  ``h`` by ``fn(o, h.key)`` without comparing anything (the auditor uses it);
* ``_survey(report) -> dict``: check every rule in ``RULES`` in O(n),
  iteratively, calling ``report.fail(rule, handle, path, detail)``; return the
  figures of :class:`heapkit.Shape` (``size, roots, height, max_degree, marked,
  potential, details``);
* optional, for checked mode's incremental checks (else every check is a full
  ``_survey``): ``_touched(op, handle)``, called just before ``op`` (handle:
  None for push/pop, the live handle, or the other heap for meld/extend), cheap,
  returns what the op may change; ``_survey_local(report, touched, handle)``,
  called just after, checks the rules around ``touched`` and the root/min
  pointer; whatever it can miss, the next full ``_survey`` must find;
* optional, for ``heapkit.to_dot``: ``_dot_edges()`` lazily yields ``(parent or
  None, node, extra label)`` for every entry, parents first (an iterator with
  ``__length_hint__`` when it draws more nodes than entries, as lazy's stale slots);
* modes (checked, audit) switch ``heap.__class__`` to a cached subclass marked
  ``_layer = "<mode>"``, keep state in ``heap._ext[<mode>]`` and restore exactly
  the class they replaced;
* class attributes ``KIND`` (its name in ``heapkit.KINDS``), ``RULES`` (rule
  name -> what it demands), ``WORST_CASE``, ``BOUNDS`` (one line), ``COST_UNIT``,
  ``POTENTIAL`` (text) and ``PHI_C``; the audit hooks ``_phi``, ``_cost_probe``,
  ``_cost``, ``_bound`` (see ``DEVELOPERS.md``).

Ordering objects
================
Every kind compares ``node._k``, never the user's key directly.  ``_k`` is the
key itself unless the heap wraps it: ``stable=True`` wraps it in
:class:`Stable` (push order breaks ties with one ``<`` per comparison) and an
audit adds a counting layer.  ``self._wrap(key, old)`` makes the object
(``old``: the entry's previous ordering object, whose push order it keeps), or
is None when keys are compared bare.

Failure rules
=============
Kinds compare before they mutate, or keep the old shape until the new one is
complete, so an exception from a key's ``<`` leaves the same entries, the same
live handles and every rule intact.
"""

from __future__ import annotations

import threading
from collections.abc import Callable, Iterable, Iterator
from typing import Any, ClassVar, Self

from heapkit._mypyc import mypyc_attr
from heapkit._order import WRAPPERS as WRAPPERS
from heapkit._order import Stable as Stable
from heapkit._order import seq_after
from heapkit._order import seq_of as seq_of
from heapkit._order import stable_wrap as stable_wrap
from heapkit.errors import InvalidHandleError
from heapkit.errors import empty_error as empty_error
from heapkit.errors import nan_error as nan_error
from heapkit.errors import upward_error as upward_error
from heapkit.protocol import Handle, Heap

Wrap = Callable[[Any, Any], Any]

#: Called with every heap constructed while ``HEAPKIT_DEBUG`` asks for it, except the
#: heaps heapkit builds for its own use (``_spawn``, flagged in ``_internal``).
_internal = threading.local()
on_new: Callable[[HeapBase], None] | None = None


class Owner:
    """Ownership token.  A heap holds one; a handle points at its heap's token.

    ``meld`` forwards the absorbed heap's token to the absorbing heap's
    (``up``), so a meld is O(1) and ownership is found by following ``up`` with
    path halving: near-constant amortized (Tarjan 1975, union-find).
    """

    __slots__ = ("up",)

    def __init__(self) -> None:
        self.up: Owner | None = None


def owner_root(tok: Owner) -> Owner:
    """The token that ``tok`` forwards to, halving the path on the way."""
    up = tok.up
    while up is not None:
        nxt = up.up
        if nxt is None:
            return up
        tok.up = nxt
        tok = nxt
        up = tok.up
    return tok


@mypyc_attr(allow_interpreted_subclasses=True)
class HandleBase:
    """A handle that is also the kind's node: ``key``, ``value``, ``alive``.

    Slots: ``_key`` (the user's key), ``_k`` (the ordering object compared),
    ``value``, ``_tok`` (the owner token, None once dead).  Not ``Generic`` (a
    compiled generic class never clears its weak references, see
    ``docs/compiled-build.md``): a kind's node class adds ``Generic[K, V]``.
    """

    __slots__ = ("_k", "_key", "_tok", "value")
    _key: Any
    _k: Any
    _tok: Any
    value: Any

    @property
    def key(self) -> Any:
        """The entry's key (read-only; change it through the heap)."""
        return self._key

    @property
    def alive(self) -> bool:
        """True while the entry is in a heap."""
        return self._tok is not None

    def __repr__(self) -> str:
        state = "" if self._tok is not None else ", dead"
        return f"<handle key={self._key!r} value={self.value!r}{state}>"

    def __reduce__(self) -> tuple[Any, ...]:
        return (revive, (type(self), self._key, self.value, seq_of(self._k)))


def revive(cls: type[Any], key: Any, value: Any, seq: int | None) -> Any:
    """Rebuild a detached, dead handle of ``cls`` (its heap relinks it)."""
    return cls(key, key if seq is None else Stable(key, seq), value, None)


def seen_path(x: Any, seen: dict[int, tuple[Any, str]], missing: str = "?") -> list[str]:
    """Steps from a root to ``x`` as a survey recorded them (``id(node) -> (parent, step)``);
    an unrecorded node reads ``missing``.  At most ``len(seen) + 1`` steps (cycles end)."""
    steps: list[str] = []
    while x is not None and len(steps) <= len(seen):
        x, step = seen.get(id(x), (None, missing))
        steps.append(step)
    steps.reverse()
    return steps


def new_order(heap: HeapBase, h: Any, node: type[Any], key: Any, op: str) -> Any:
    """Start of ``decrease_key``/``change_key``: claim ``h`` (a ``node`` of ``heap``), refuse
    NaN, return the new ordering object.  A module function, not a method: compiled, it is a
    direct C call (a method on ``self`` would be a Python call on the interpreted public
    class).  Fibonacci, binomial, rank-pairing, hollow; the hottest kinds inline it."""
    if type(h) is not node or h._tok is not heap._tok:
        heap._claim(h, op)
    if key != key:
        raise nan_error(op, key)
    w = heap._wrap
    return key if w is None else w(key, h._k)


@mypyc_attr(allow_interpreted_subclasses=True)
class HeapBase:
    """Shared machinery of every kind (see the module docstring for the SPI).

    Ready for mypyc: not ``Generic`` and no ``__weakref__`` slot (each kind's public
    class adds ``"__weakref__"`` to its ``__slots__`` and ``HeapFace[K, V]`` to its
    bases for the typed signatures of the members below; see ``heapkit/_face.py``).
    """

    __slots__ = ("_ext", "_n", "_stable", "_tok", "_ver", "_wrap")

    KIND: ClassVar[str] = ""
    RULES: ClassVar[dict[str, str]] = {}
    WORST_CASE: ClassVar[bool] = False
    BOUNDS: ClassVar[str] = ""  # one line for `python -m heapkit kinds`
    COST_UNIT: ClassVar[str] = ""
    POTENTIAL: ClassVar[str] = ""
    PHI_C: ClassVar[float] = 1.0

    _tok: Owner
    _n: int
    _ver: int
    _wrap: Wrap | None
    _stable: bool
    _ext: Any

    def _setup(self, stable: bool) -> None:
        """Initialise the shared fields; kinds call it first in ``__init__``."""
        if not isinstance(stable, bool):
            raise TypeError(f"stable must be True or False, got {stable!r}")
        self._tok = Owner()
        self._n = 0
        self._ver = 0
        self._stable = stable
        self._wrap = stable_wrap if stable else None
        self._ext = None

    def _finish_init(self, pairs: Iterable[tuple[Any, Any]]) -> None:
        """Load the constructor's pairs and honour ``HEAPKIT_DEBUG``; kinds call it last."""
        if pairs:
            self.extend(pairs)
        if on_new is not None and not getattr(_internal, "on", False):
            on_new(self)

    # --- what the kind supplies -------------------------------------------------
    def _options(self) -> dict[str, object]:
        """Constructor options besides ``stable`` (they must match for ``meld``)."""
        return {}

    def _kind_class(self) -> type:
        """The kind's own class under any mode subclass (what a copy or pickle rebuilds)."""
        for c in type(self).__mro__:
            if "KIND" in c.__dict__:
                return c
        return type(self)  # pragma: no cover - every kind sets KIND

    def _family(self) -> type:
        """The class whose structure this heap has (checked/audited modes share it)."""
        return self._kind_class()

    def _layout_problem(self, handles: list[Any], layout: Any) -> str | None:
        """What is wrong with ``_export`` data for this kind, without comparing keys, or None."""
        return None if layout is None else f"expected no layout, got {layout!r:.80}"

    def _meld_from(self, other: Self) -> None:
        raise NotImplementedError

    def _reset(self) -> None:
        raise NotImplementedError

    def _handles(self) -> Iterator[Any]:
        raise NotImplementedError

    def _export(self) -> tuple[list[Any], Any]:
        raise NotImplementedError

    def _import(self, handles: list[Any], layout: Any) -> None:
        raise NotImplementedError

    def _map_order(self, fn: Callable[[Any, Any], Any]) -> None:
        raise NotImplementedError

    def _survey(self, report: Any) -> dict[str, Any]:
        raise NotImplementedError

    _NODE: ClassVar[type[Any]] = HandleBase  # the kind's handle class

    def _kill(self, h: Any) -> None:
        """Make a handle dead and drop its links (kinds with more links extend it)."""
        h._tok = None

    # --- shared protocol members ------------------------------------------------
    def __len__(self) -> int:
        """Number of entries.  O(1) worst-case.

        >>> from heapkit import PairingHeap; len(PairingHeap([(2, 'b'), (1, 'a')]))
        2
        """
        return self._n

    def __bool__(self) -> bool:
        return self._n != 0

    def __iter__(self) -> Iterator[Handle[Any, Any]]:
        """Every live handle, no order promised.  O(n) for the whole iteration.

        Raises ``RuntimeError`` if the heap changes while it runs.

        >>> from heapkit import PairingHeap; sorted(x.key for x in PairingHeap([(2, 'b'), (1, 'a')]))
        [1, 2]
        """
        ver = self._ver
        for h in self._handles():
            if self._ver != ver:
                raise RuntimeError(f"{type(self).__name__} changed during iteration")
            yield h
        if self._ver != ver:
            raise RuntimeError(f"{type(self).__name__} changed during iteration")

    def __contains__(self, handle: object) -> bool:
        """True if ``handle`` is live in this heap.  O(1) amortized.

        >>> from heapkit import PairingHeap
        >>> h = PairingHeap(); x = h.push(1, 'a')
        >>> x in h, x in PairingHeap()
        (True, False)
        """
        tok = getattr(handle, "_tok", None)
        if not isinstance(tok, Owner):
            return False
        return tok is self._tok or owner_root(tok) is self._tok

    def _claim(self, h: Any, op: str) -> None:
        """Slow path of the ownership check: raise unless ``h`` is live here.

        The fast path in each kind is ``h._tok is self._tok``; this runs when it
        fails, follows meld forwarding, and shortens the handle's path.
        """
        tok = getattr(h, "_tok", None)
        if not isinstance(tok, Owner):
            raise foreign_error(op, h)
        if owner_root(tok) is not self._tok:
            raise InvalidHandleError(f"{op}: handle {h!r} belongs to another heap")
        h._tok = self._tok

    def extend(self, pairs: Iterable[tuple[Any, Any]]) -> list[Handle[Any, Any]]:
        """Insert every ``(key, value)`` pair; all or nothing.  O(k) + one meld for most kinds.

        Builds a separate heap of the new entries, then melds it in, so a bad
        pair or a failing comparison leaves this heap as it was.  Cost: the
        kind's build (O(k) for most kinds) plus one ``meld``.

        >>> from heapkit import PairingHeap
        >>> h = PairingHeap()
        >>> [x.key for x in h.extend([(3, 'c'), (1, 'a')])]
        [3, 1]
        >>> h.pop()
        (1, 'a')
        """
        tmp = self._spawn()
        handles = tmp._build(pairs)
        if handles:
            self.meld(tmp)
        return handles

    def _build(self, pairs: Iterable[tuple[Any, Any]]) -> list[Any]:
        """Fill an empty heap from pairs (kinds may override with an O(n) build)."""
        push = self.push  # type: ignore[attr-defined]
        return [push(k, v) for k, v in pairs]

    def _spawn(self) -> Self:
        """An empty heap of the same class and options, for heapkit's own use (no debug hook)."""
        _internal.on = True
        try:
            return self._family()(stable=self._stable, **self._options())  # type: ignore[no-any-return]
        finally:
            _internal.on = False

    def meld(self, other: Heap[Any, Any] | HeapBase) -> None:
        """Move every entry of ``other`` into this heap, emptying it.  The kind's meld bound.

        Handles from ``other`` stay valid and now belong to this heap.  Cost: the
        kind's meld bound (O(1) for pairing and Fibonacci heaps).

        >>> from heapkit import PairingHeap
        >>> a, b = PairingHeap(), PairingHeap()
        >>> h = b.push(1, 'x')
        >>> a.meld(b)
        >>> h in a, len(b)
        (True, 0)
        """
        if other is self:
            raise ValueError(f"meld: cannot meld a {type(self).__name__} into itself")
        if not isinstance(other, HeapBase) or other._family() is not self._family():
            raise TypeError(f"meld: expected another {self._family().__name__}, got {type(other).__name__}")
        if other._stable != self._stable or other._options() != self._options():
            mine = {"stable": self._stable, **self._options()}
            theirs = {"stable": other._stable, **other._options()}
            raise TypeError(f"meld: options differ: {mine!r} here, {theirs!r} there")
        if other._wrap is not self._wrap:
            other._rewrap(self._wrap)
        if other._n:
            self._meld_from(other)
            self._n += other._n
        old = other._tok
        old.up = self._tok
        other._tok = Owner()
        other._n = 0
        other._reset()
        self._ver += 1
        other._ver += 1

    def _rewrap(self, wrap: Wrap | None) -> None:
        """Re-make every ordering object with ``wrap``, keeping push order."""

        def fn(o: Any, key: Any) -> Any:
            seq = seq_of(o)
            if wrap is None:
                return key
            return wrap(key, None if seq is None else Stable(key, seq))

        self._map_order(fn)
        self._wrap = wrap

    def clear(self) -> None:
        """Remove every entry; every handle becomes dead.  O(n) worst-case.

        >>> from heapkit import PairingHeap
        >>> h = PairingHeap([(2, 'b')])
        >>> x = h.peek(); h.clear()
        >>> len(h), x.alive
        (0, False)
        """
        kill = self._kill
        for h in list(self._handles()):
            kill(h)
        self._reset()
        self._n = 0
        self._tok = Owner()
        self._ver += 1

    def __repr__(self) -> str:
        name = type(self).__name__
        opts = "".join(f", {k}={v!r}" for k, v in self._options().items())
        if self._stable:
            opts += ", stable=True"
        if not self._n:
            return f"<{name} empty{opts}>"
        top = self.peek()  # type: ignore[attr-defined]
        return f"<{name} n={self._n} min=({top.key!r}, {top.value!r}){opts}>"

    # --- copy and pickle: flat data, never recursion --------------------------
    def __reduce__(self) -> tuple[Any, ...]:
        handles, layout = self._export()
        return (_restore, (self._kind_class(), self._stable, self._options()), (handles, layout))

    def _validate(self, state: Any, node: type) -> tuple[list[Any], Any]:
        """Refuse ``__setstate__`` data that would load a heap ``check`` rejects: handles of
        another class or repeated, a layout whose counts or links disagree (no key is
        compared: O(n)).  A stable heap's later pushes come after every loaded entry."""
        name = type(self).__name__
        if type(state) is not tuple or len(state) != 2 or type(state[0]) is not list:
            raise ValueError(f"load {name}: expected (handles, layout), got {state!r:.80}")
        handles, layout = state
        seen: set[int] = set()
        top = -1
        h: Any
        for h in handles:
            if type(h) is not node or id(h) in seen:
                what = "repeated" if id(h) in seen else f"not a {node.__name__}"
                raise ValueError(f"load {name}: handle {h!r:.80} is {what}")
            seen.add(id(h))
            if self._stable:
                seq = seq_of(h._k if isinstance(h, HandleBase) else getattr(h, "_e", None))
                if seq is None:
                    raise ValueError(f"load {name}: handle {h!r:.80} has no push order")
                top = max(top, seq)
        why = self._layout_problem(handles, layout)
        if why is not None:
            raise ValueError(f"load {name}: {why}")
        seq_after(top)
        return handles, layout

    def __setstate__(self, state: tuple[list[Any], Any]) -> None:
        handles, layout = self._validate(state, self._NODE)
        tok = self._tok
        for h in handles:
            h._tok = tok
        self._import(handles, layout)
        self._n = len(handles)

    def __copy__(self) -> Self:
        """A new heap with the same entries (keys and values shared) and new handles."""
        handles, layout = self._export()
        new = _restore(self._kind_class(), self._stable, self._options())
        fresh = [type(h)(h._key, h._k, h.value, None) for h in handles]
        new.__setstate__((fresh, layout))
        return new  # type: ignore[no-any-return]


@mypyc_attr(allow_interpreted_subclasses=True)
class LeafHandle:
    """Base of handles that are not the kind's node (they point at it); a kind's handle
    class adds ``Generic[K, V]``."""

    __slots__ = ()


def foreign_error(op: str, h: Any) -> Exception:
    """The error for ``h`` given to a kind whose handles it is not: a dead handle, a live
    handle of another kind (both :class:`InvalidHandleError`), or not a handle (TypeError)."""
    if isinstance(h, HandleBase | LeafHandle):
        if h.alive:  # type: ignore[union-attr]
            return InvalidHandleError(f"{op}: handle {h!r} belongs to a heap of another kind")
        if isinstance(h, LeafHandle) or h._tok is None:
            return InvalidHandleError(f"{op}: handle {h!r} is dead (its entry was popped, removed or cleared)")
    return TypeError(f"{op}: expected a handle returned by push, got {h!r}")


def _restore(cls: type[Any], stable: bool, options: dict[str, object]) -> Any:
    return cls(stable=stable, **options)
