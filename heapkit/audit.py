"""The potential-function auditor: amortized bounds checked as the program runs.

For every operation the auditor records its name, ``n`` (the size before it),
its actual cost (the kind's ``_cost``), the potential before and after
(``_phi``), the amortized cost ``actual + PHI_C * (after - before)``, the
kind's bound ``_bound(op, n)`` and the key comparisons made; the records go
into a :class:`heapkit.ledger.Ledger`.  It holds no structure-specific logic:
each kind keeps its cost unit, potential and bounds beside its code.

How it costs nothing when off: while a heap is audited its ``__class__`` is a
cached subclass of the class it had (no new slots); per-heap state lives in
``heap._ext["audit"]``; the class it replaced is restored on exit, so this
mode stacks with the checked mode in either order.  Comparisons are counted
by :class:`Counted`, an ordering wrapper registered in ``_core.WRAPPERS``:
entries are wrapped on entry and unwrapped on exit, and ``heap._wrap`` wraps
new keys.

Conventions for kinds (beyond the SPI in the brief): a kind may cache what its
``_phi`` needs in ``heap._ext["phi"]``; the auditor drops that cache when the
audit ends and after an operation raised.  ``extend`` is recorded as one
operation: actual = k (one unit per entry built) + the kind's cost of melding
them in; bound = ``k * _bound("push", n + k) + _bound("meld", n + k)``.
``clear`` costs ``n + 1`` against the bound ``n + 1`` (the shared O(n) clear).
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from heapkit import _core
from heapkit._core import HeapBase, Wrap
from heapkit.audit_reports import Collector, attach, configure, detach, flush
from heapkit.contracts.report import kind_name, mode_repr
from heapkit.ledger import OPS, Ledger

__all__ = ["Collector", "Counted", "attach", "audit", "configure", "detach", "flush"]

#: Comparisons made by every :class:`Counted` so far (read before and after an operation).
_COUNT = 0

_HOOKS = ("_phi", "_cost_probe", "_cost", "_bound")
_CODE = {name: i for i, name in enumerate(OPS)}


class Counted:
    """Ordering object of an audited heap: counts each ``<`` and compares the inner objects.

    >>> a, b = Counted(1), Counted(2)
    >>> a < b, b < a, a == a
    (True, False, False)
    """

    __slots__ = ("inner",)

    def __init__(self, inner: Any) -> None:
        self.inner = inner

    def __lt__(self, other: Counted) -> Any:
        global _COUNT
        _COUNT += 1
        return self.inner < other.inner

    def __eq__(self, other: object) -> bool:
        return False

    __hash__ = None  # type: ignore[assignment]

    def __repr__(self) -> str:
        return f"counted({self.inner!r})"


_core.WRAPPERS.add(Counted)


def _count_bare(key: Any, old: Any) -> Counted:
    return Counted(key)


_WRAPS: dict[Any, Wrap] = {None: _count_bare}


def _counting(inner: Wrap | None) -> Wrap:
    """The counting wrap over ``inner`` (one function per inner wrap, so audited heaps meld unwrapped)."""
    w = _WRAPS.get(inner)
    if w is None:
        fn: Wrap = inner  # type: ignore[assignment]

        def w(key: Any, old: Any) -> Counted:
            return Counted(fn(key, old))

        _WRAPS[inner] = w
    return w


class _State:
    """Per-heap audit state, in ``heap._ext["audit"]``."""

    __slots__ = ("base", "busy", "last_phi", "last_ver", "ledgers", "saved_wrap", "wrap")

    def __init__(self, base: type, saved_wrap: Wrap | None) -> None:
        self.base = base
        self.busy = False
        self.ledgers: tuple[Ledger, ...] = ()
        self.saved_wrap = saved_wrap
        self.wrap = _counting(saved_wrap)
        # The potential after the last recorded operation, valid while _ver is last_ver:
        # saves one _phi call per operation.
        self.last_phi = 0.0
        self.last_ver = -1


def _state(heap: Any) -> _State | None:
    ext = heap._ext
    st: _State | None = None if ext is None else ext.get("audit")
    return st


def _live(heap: Any) -> _State | None:
    """The audit state of a heap whose class is an auditing one; None if the layer is dormant.

    A dormant layer (its audit ended while another mode was stacked above it)
    removes itself as soon as it is the outermost class again.
    """
    ext = heap._ext
    st: _State | None = None if ext is None else ext.get("audit")
    if st is None:
        cls = type(heap)
        if cls in _AUDITED:
            heap.__class__ = cls.__bases__[0]
    return st


def _drop_cache(heap: Any) -> None:
    ext = heap._ext
    if ext is not None:
        ext.pop("phi", None)


def _failed(heap: Any, st: _State) -> None:
    """An operation raised: forget the cached potential and the one remembered from the last record."""
    _drop_cache(heap)
    st.last_ver = -1


def _record(heap: Any, st: _State, code: int, n: int, actual: int, phi0: float, bound: float, c0: int) -> None:
    phi1 = heap._phi()
    cmp = _COUNT - c0
    for led in st.ledgers:
        led.add(code, n, actual, phi0, phi1, bound, cmp)


# One audited operation on a handle (or none): measure around the base call.
def _measured(heap: Any, st: _State, op: str, target: Any, call: Callable[..., Any], *args: Any) -> Any:
    n = heap._n
    phi0 = st.last_phi if heap._ver == st.last_ver else heap._phi()
    probe = heap._cost_probe(op, target)
    c0 = _COUNT
    st.busy = True
    try:
        out = call(heap, *args)
    except BaseException:
        _failed(heap, st)
        raise
    finally:
        st.busy = False
    actual = heap._cost(op, probe, out if op == "push" else target)
    bound = heap._bound(op, n)
    phi1 = st.last_phi = heap._phi()
    st.last_ver = heap._ver
    cmp = _COUNT - c0
    code = _CODE[op]
    for led in st.ledgers:
        led.add(code, n, actual, phi0, phi1, bound, cmp)
    return out


def _meldable(heap: Any, other: Any) -> bool:
    """Would the shared ``meld`` accept ``other``?  (If not, it raises; nothing to record.)"""
    return (
        isinstance(other, HeapBase)
        and other is not heap
        and other._family() is heap._family()
        and other._stable == heap._stable
        and other._options() == heap._options()
    )


def _make_methods(base: type) -> dict[str, Any]:
    b_push, b_pop, b_extend = base.push, base.pop, base.extend  # type: ignore[attr-defined]
    b_dec, b_chg, b_rem = base.decrease_key, base.change_key, base.remove  # type: ignore[attr-defined]
    b_meld, b_clear, b_reset, b_copy = base.meld, base.clear, base._reset, base.__copy__  # type: ignore[attr-defined]
    b_setstate: Any = base.__setstate__  # type: ignore[attr-defined]
    b_repr: Any = base.__repr__

    def push(self: Any, key: Any, value: Any) -> Any:
        st = _live(self)
        if st is None or st.busy:
            return b_push(self, key, value)
        return _measured(self, st, "push", None, b_push, key, value)

    def pop(self: Any) -> Any:
        st = _live(self)
        if st is None or st.busy or not self._n:
            return b_pop(self)
        return _measured(self, st, "pop", None, b_pop)

    def _handle_op(op: str, call: Callable[..., Any]) -> Callable[..., Any]:
        def method(self: Any, handle: Any, *key: Any) -> Any:
            st = _live(self)
            if st is None or st.busy or handle not in self:
                return call(self, handle, *key)
            return _measured(self, st, op, handle, call, handle, *key)

        method.__name__ = op
        method.__doc__ = call.__doc__
        return method

    def meld(self: Any, other: Any) -> None:
        st = _live(self)
        if st is None or st.busy or not _meldable(self, other):
            return b_meld(self, other)  # type: ignore[no-any-return]
        n = self._n + other._n
        phi0 = self._phi() + other._phi()
        probe = self._cost_probe("meld", other)
        c0 = _COUNT
        st.busy = True
        try:
            b_meld(self, other)
        except BaseException:
            _failed(self, st)
            _drop_cache(other)
            raise
        finally:
            st.busy = False
        actual = self._cost("meld", probe, other)
        _record(self, st, _CODE["meld"], n, actual, phi0, self._bound("meld", n), c0)
        return None

    def extend(self: Any, pairs: Any) -> list[Any]:
        st = _live(self)
        if st is None or st.busy:
            return b_extend(self, pairs)  # type: ignore[no-any-return]
        n = self._n
        phi0 = self._phi()
        c0 = _COUNT
        tmp = self._spawn()
        tmp._wrap = self._wrap  # its comparisons count too, and meld need not re-wrap
        handles: list[Any] = tmp._build(pairs)
        k = len(handles)
        actual = k
        if k:
            probe = self._cost_probe("meld", tmp)
            st.busy = True
            try:
                b_meld(self, tmp)
            except BaseException:
                _failed(self, st)
                raise
            finally:
                st.busy = False
            actual += self._cost("meld", probe, tmp)
        bound = k * self._bound("push", n + k) + self._bound("meld", n + k) if k else 1.0
        _record(self, st, _CODE["extend"], n, max(actual, 1), phi0, bound, c0)
        return handles

    def clear(self: Any) -> None:
        st = _live(self)
        if st is None or st.busy:
            return b_clear(self)  # type: ignore[no-any-return]
        n = self._n
        phi0 = self._phi()
        c0 = _COUNT
        b_clear(self)
        _drop_cache(self)
        _record(self, st, _CODE["clear"], n, n + 1, phi0, float(n + 1), c0)
        return None

    # After the shared meld moved this heap's entries into a plain heap (re-wrapped
    # bare), the emptied heap wraps new keys for counting again.
    def _reset(self: Any) -> None:
        b_reset(self)
        st = _live(self)
        if st is not None:
            self._wrap = st.wrap

    # A copy is a new heap: plain, or audited by HEAPKIT_DEBUG (then this class's
    # __setstate__ counted its entries).  A plain one gets its kind's own ordering objects.
    def __copy__(self: Any) -> Any:
        new = b_copy(self)
        if _state(new) is None:
            new._rewrap(new._wrap)
        return new

    # Unpickling, deepcopy and copy fill an audited heap (HEAPKIT_DEBUG=audit) behind the
    # auditor's back: count the entries' comparisons and measure the potential afresh.
    def __setstate__(self: Any, state: Any) -> None:
        b_setstate(self, state)
        st = _state(self)
        if st is not None:
            wrap = st.wrap
            self._map_order(lambda o, key: o if type(o) is Counted else wrap(key, o))
            _failed(self, st)

    def __repr__(self: Any) -> str:
        text = b_repr(self)
        name = type(self).__name__
        if text.startswith(f"<{name}") and name.startswith("Audited"):
            text = f"<{name[7:]}{text[len(name) + 1 :]}"
        return text if _state(self) is None else mode_repr(text, "audited")

    return {
        "__repr__": __repr__,
        "push": push,
        "pop": pop,
        "extend": extend,
        "meld": meld,
        "clear": clear,
        "decrease_key": _handle_op("decrease_key", b_dec),
        "change_key": _handle_op("change_key", b_chg),
        "remove": _handle_op("remove", b_rem),
        "_reset": _reset,
        "__copy__": __copy__,
        "__setstate__": __setstate__,
    }


_CLASSES: dict[type, type] = {}
_AUDITED: set[type] = set()


def _audited_class(base: type) -> type:
    """The cached auditing subclass of ``base`` (no new slots)."""
    cls = _CLASSES.get(base)
    if cls is None:
        ns: dict[str, Any] = {"__slots__": (), "_layer": "audit", "__module__": __name__, "__doc__": base.__doc__}
        for name, fn in _make_methods(base).items():
            if getattr(base, name).__doc__ and not fn.__doc__:
                fn.__doc__ = getattr(base, name).__doc__
            ns[name] = fn
        cls = type(f"Audited{base.__name__}", (base,), ns)
        _CLASSES[base] = cls
        _AUDITED.add(cls)
    return cls


def _validate(where: str, keep: object, top: object) -> None:
    """Refuse a bad option before anything happens (not at the first audited operation)."""
    if keep not in ("all", "totals"):
        raise ValueError(f"{where}: keep must be 'all' or 'totals', got {keep!r}")
    if not isinstance(top, int) or isinstance(top, bool) or top < 1:
        raise ValueError(f"{where}: top must be an integer of at least 1, got {top!r}")


def _begin(heap: Any, keep: str, top: int) -> Ledger:
    _validate("audit", keep, top)
    if not isinstance(heap, HeapBase):
        raise TypeError(f"audit: expected a heapkit heap, got {type(heap).__name__}")
    return _begin_on(heap, keep, top)


def _begin_on(heap: Any, keep: str, top: int) -> Ledger:
    cls = type(heap)
    missing = [h for h in _HOOKS if not callable(getattr(cls, h, None))]
    if missing:
        raise TypeError(f"audit: kind {kind_name(heap)!r} lacks the audit hooks {', '.join(missing)}")
    led = Ledger(kind_name(heap), cls.COST_UNIT, cls.PHI_C, keep=keep, top=top)
    st = _state(heap)
    if st is None:
        st = _State(cls, heap._wrap)
        if heap._ext is None:
            heap._ext = {}
        heap._ext.pop("phi", None)
        heap._ext["audit"] = st
        heap._wrap = wrap = st.wrap
        # As a push under the audit makes them (so lazy holds no bare key beside an _Ord).
        heap._map_order(lambda o, key: wrap(key, o))
        heap.__class__ = _audited_class(cls)
    led.start(heap._phi())
    st.ledgers = (*st.ledgers, led)
    return led


def _end(heap: Any, led: Ledger) -> None:
    st = _state(heap)
    if st is None or led not in st.ledgers:
        return
    led.finish(heap._phi())
    st.ledgers = tuple(x for x in st.ledgers if x is not led)
    if st.ledgers:
        return
    ext = heap._ext
    del ext["audit"]
    ext.pop("phi", None)
    if not ext:
        heap._ext = None
    heap._rewrap(st.saved_wrap)  # the kind's own ordering objects (lazy wraps non-native keys)
    if type(heap) is _CLASSES.get(st.base):
        heap.__class__ = st.base
    # Otherwise another mode switched the class after this one: the auditing layer
    # stays below it and passes every call through (it finds no audit state).


class _Session:
    """``with heapkit.audit(heap) as ledger:`` — audit while the block runs."""

    def __init__(self, heap: Any, keep: str, top: int) -> None:
        self.heap = heap
        self.keep = keep
        self.top = top
        self.ledger: Ledger | None = None

    def __enter__(self) -> Ledger:
        self.ledger = _begin(self.heap, self.keep, self.top)
        return self.ledger

    def __exit__(self, *exc: object) -> None:
        if self.ledger is not None:
            _end(self.heap, self.ledger)


class Auditor:
    """``heapkit.audit``: call it on a heap for a context manager; ``attach`` and ``configure`` too.

    >>> from heapkit import PairingHeap
    >>> h = PairingHeap([(3, 'c'), (1, 'a')])
    >>> with audit(h) as led:
    ...     _ = h.pop()
    >>> led.records[0].op, led.records[0].actual, type(h).__name__
    ('pop', 1, 'PairingHeap')
    """

    attach = staticmethod(attach)
    detach = staticmethod(detach)
    configure = staticmethod(configure)
    flush = staticmethod(flush)
    Collector = Collector

    def __call__(self, heap: Any, *, keep: str = "all", top: int = 16) -> _Session:
        """Audit ``heap`` in a ``with`` block (``keep="totals"`` for long runs).  O(n) to enter, leave."""
        _validate("audit", keep, top)
        return _Session(heap, keep, top)


audit = Auditor()
