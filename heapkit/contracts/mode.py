"""Checked mode: ``checked(heap)`` makes a heap verify its rules as it runs.

The heap stays the same object and an instance of its class: its ``__class__``
is switched to a cached subclass (a *layer*) that wraps every mutating
operation, and ``unchecked`` switches it back to exactly the class it replaced.
Per-heap state lives in ``heap._ext["checked"]``; other modes (the auditor)
keep theirs under their own name and switch the class the same way, so the
modes stack in either order and come off in reverse order.  The fast path of a
kind is untouched: no ``if debug`` anywhere.

After each ``every``-th operation the layer verifies only what the operation
touched, through the kind's hooks ``_touched(op, handle)`` (before) and
``_survey_local(report, touched, handle)`` (after); a full ``check`` runs every
``full_every`` operations (by default once the operations since the last full
check outnumber the entries the heap held then: O(1) amortized entries visited
per operation, and a heap that only grows is still checked in full each time
it doubles).  Kinds without the hooks get a full check each time.  An operation
that raises from a key's ``<`` is followed by a full check.

A completed operation keeps its result: if a key's ``<`` raises while the
layer verifies an operation that took effect, the result is returned and the
full check is deferred to the next operation; only a broken rule
(``HistoryError``) is raised after the fact.  The layer's own comparisons are
kept out of an audit's count.
"""

from __future__ import annotations

from collections import deque
from typing import Any, TypeVar

from heapkit._core import HeapBase
from heapkit.contracts.checked_state import NOTHING as _NOTHING
from heapkit.contracts.checked_state import State as _State
from heapkit.contracts.guard import internal, tally, untally
from heapkit.contracts.history import Entry, failure
from heapkit.contracts.report import Report, check, mode_repr
from heapkit.errors import HeapError, refuse_nan, refuse_nan_pairs
from heapkit.protocol import Heap

__all__ = ["checked", "unchecked"]

H = TypeVar("H", bound=Heap[Any, Any])  # any heap typed by the protocol; the body checks the class

MODE = "checked"

#: The checking layer made for each class, made once.
_LAYERS: dict[type, type] = {}

#: ``touched`` of an ``extend`` until its inner meld says what it touches.
_PENDING: Any = object()


def _positive(name: str, v: object, none_ok: bool = False) -> None:
    if none_ok and v is None:
        return
    if not isinstance(v, int) or isinstance(v, bool) or v < (0 if name == "history" else 1):
        lowest = 0 if name == "history" else 1
        raise ValueError(f"checked: {name} must be an integer of at least {lowest}, got {v!r}")


def checked(heap: H, *, every: int = 1, history: int = 64, full_every: int | None = None) -> H:
    """Switch ``heap`` to checked mode and return it (the same object).

    After every ``every``-th mutating operation the heap verifies what the
    operation touched (or everything, for kinds without the local hooks), and
    every ``full_every`` operations all of it (None: once the operations since
    the last full check exceed the heap's size at that check).  A broken rule
    raises :class:`HistoryError` (an ``InvariantError``) carrying the last
    ``history`` operations as ``.history`` and ``.replay(kind)``, which runs
    the operations since the last passing full check on a fresh heap of any
    kind (a name, a class or a factory), ready to paste into a test.  Copies
    and pickles of a checked heap are plain heaps.
    Checked mode also guards against re-entry: a key whose ``<``
    pushes to or pops from the heap it is being compared in gets
    ``RuntimeError``.  (The plain heap has no such guard: one was measured at
    about 23 ns per operation, over the fast path's 2% budget.)  Calling it on a
    checked heap updates the settings.  O(n) once, for the first full check.

    >>> from heapkit import PairingHeap, unchecked
    >>> h = checked(PairingHeap([(2, 'b')]))
    >>> x = h.push(1, 'a'); isinstance(h, PairingHeap), h.pop()
    (True, (1, 'a'))
    >>> type(unchecked(h)) is PairingHeap
    True
    """
    if not isinstance(heap, HeapBase):
        raise TypeError(
            f"checked: expected a heapkit heap, got {type(heap).__name__}; call heapkit.check on your own queue instead"
        )
    _positive("every", every)
    _positive("history", history)
    _positive("full_every", full_every, none_ok=True)
    h: Any = heap
    ext = h._ext
    st = None if ext is None else ext.get(MODE)
    if st is not None and _layered(h):
        st.every, st.full_every = every, full_every
        st.history = deque(st.history, maxlen=history)
        return heap
    check(heap)
    if ext is None:
        ext = h._ext = {}
    cls = type(h)
    st = _State(cls, every, history, full_every)
    st.ver = h._ver
    st.snapshot(h)
    ext[MODE] = st
    h.__class__ = _layer(cls)
    return heap


def unchecked(heap: H) -> H:
    """Switch checked mode off and return ``heap``; a heap not checked is returned as is.

    Restores exactly the class that ``checked`` replaced.  If another mode was
    switched on after checked mode, switch that off first (``RuntimeError``
    otherwise).  O(1).

    >>> from heapkit import DaryHeap
    >>> h = checked(DaryHeap())
    >>> type(unchecked(h)).__mro__[0] is DaryHeap
    True
    """
    h: Any = heap
    ext = h._ext
    st = None if ext is None else ext.get(MODE)
    if st is None:
        return heap
    cls = type(h)
    if cls.__dict__.get("_layer") == MODE:
        h.__class__ = st.replaced
    elif _layered(h):
        raise RuntimeError(
            f"unchecked: {cls.__name__} has another mode ({cls.__dict__.get('_layer', cls.__name__)!r}) "
            "switched on after checked mode; switch that one off first"
        )
    del ext[MODE]
    if not ext:
        h._ext = None
    return heap


def _layered(h: Any) -> bool:
    return any(c.__dict__.get("_layer") == MODE for c in type(h).__mro__)


def _layer(cls: type) -> type:
    sub = _LAYERS.get(cls)
    if sub is None:
        sub = type(
            cls.__name__,
            (_Checking, cls),
            {
                "__slots__": (),
                "_layer": MODE,
                "__module__": cls.__module__,
                "__qualname__": cls.__qualname__,
                "__doc__": cls.__doc__,
            },
        )
        _LAYERS[cls] = sub
    return sub


def _begin(h: Any, op: str, handle: Any, depth: int = 2) -> _State | None:
    """Start a wrapped operation; None means: an internal call, pass it through.

    ``depth``: frames between ``_begin`` and the wrapped operation's caller.
    """
    st: _State = h._ext[MODE]
    if st.busy is not None:
        if internal(h, depth):
            return None
        raise RuntimeError(
            f"{op}: {type(h).__name__} is in the middle of {st.busy}; a key's `<` must not "
            f"change the heap it is compared in (the {st.busy} is abandoned, the heap keeps its entries)"
        )
    if h._ver != st.ver:
        _outside(h, st)
    st.count += 1
    st.since_full += 1
    st.due = due = st.count % st.every == 0
    fe = st.full_every
    since = st.since_full
    st.full = st.force or (since >= fe if fe is not None else since > st.size_at_full)
    st.touched = _NOTHING
    if due and not st.full:
        if not st.local or op == "clear":
            st.full = True
        elif op == "extend":
            st.touched = _PENDING
        elif _valid(h, op, handle):
            st.touched = h._touched(op, handle)
    st.busy = op
    st.ver_before = h._ver
    return st


def _valid(h: Any, op: str, handle: Any) -> bool:
    if handle is None:
        return True
    if op == "meld":
        return isinstance(handle, HeapBase) and handle is not h and handle._family() is h._family()
    return handle in h


def _outside(h: Any, st: _State) -> None:
    """The heap changed while not in checked mode: note it and check it all."""
    st.history.append(("outside",))
    st.record.append(("outside",))
    st.labels = {i: p for i, p in st.labels.items() if p[0] in h}
    st.force = True
    st.full = True


def _end(h: Any, st: _State, subject: Any, entry: Entry, also: Any = None, popped: Any = _NOTHING) -> None:
    """Finish a wrapped operation: record it, then verify what is due.

    The guard stays up while the checks compare keys.  The operation has taken
    effect: if a key's ``<`` raises in the checks, a full check is due at the
    next operation and the caller still gets the result.
    """
    st.history.append(entry)
    st.record.append(entry)
    c0 = tally()
    try:
        _verify(h, st, subject, also, popped)
    except HeapError:
        raise
    except Exception:
        st.force = True  # the next operation checks everything
    finally:
        untally(c0)
        st.busy = None
        st.ver = h._ver


def _verify(h: Any, st: _State, subject: Any, also: Any, popped: Any) -> None:
    report = Report()
    touched, st.touched = st.touched, _NOTHING
    if popped is not _NOTHING and st.due and h._n:
        # One comparison: what pop returned is no larger than what is left on top.
        # It catches a key mutated in place that the pop itself tidied away.
        report.run(_popped_minimum, h, popped)
    if st.full:
        st.since_full = 0
        st.force = False
        report.run(h._survey)
        if not report.problems:
            st.snapshot(h)
    elif touched is not _NOTHING and touched is not _PENDING:
        report.run(h._survey_local, touched, subject)
    if also is not None and not report.problems:
        report.run(also._survey)
    if report.problems:
        raise failure(h, st, report, checked)


def _popped_minimum(report: Report, h: Any, popped: Any) -> None:
    top = h.peek()
    if top.key < popped:
        report.fail("minimum", top, [], f"pop returned key {popped!r}, yet this smaller entry stays")


def _abort(h: Any, st: _State, exc: BaseException) -> None:
    """An operation raised: heapkit's own errors must leave the heap as it was,
    any other exception must leave every rule intact (a full check; if the key's
    ``<`` raises again there, the full check is deferred to the next operation)."""
    op = st.busy
    st.touched = _NOTHING
    report = Report()
    c0 = tally()
    try:
        if isinstance(exc, HeapError):
            if h._ver != st.ver_before:
                report.fail("unchanged", None, [], f"{op} raised {type(exc).__name__} yet changed the heap")
        else:
            st.since_full = 0
            try:
                report.run(h._survey)
            except HeapError:
                raise
            except Exception:
                st.force = True
    finally:
        untally(c0)
        st.busy = None
        st.ver = h._ver
    if report.problems:
        raise failure(h, st, report, checked) from exc


class _Checking:
    """The checking layer: wraps each mutating operation of the class below it."""

    __slots__ = ()

    def __repr__(self) -> str:
        st: Any = _state_of(self)
        tag = "checked" if st is None or st.every == 1 else f"checked every {st.every}"
        return mode_repr(super().__repr__(), tag)

    def push(self, key: Any, value: Any) -> Any:
        sup: Any = super()
        refuse_nan("push", key)
        st = _begin(self, "push", None)
        if st is None:
            return sup.push(key, value)
        try:
            x = sup.push(key, value)
        except BaseException as exc:
            _abort(self, st, exc)
            raise
        _end(self, st, x, ("push", key, st.label(x)))
        return x

    def extend(self, pairs: Any) -> Any:
        sup: Any = super()
        pairs = refuse_nan_pairs("extend", pairs)
        st = _begin(self, "extend", None)
        if st is None:
            return sup.extend(pairs)
        try:
            got = sup.extend(pairs)
        except BaseException as exc:
            _abort(self, st, exc)
            raise
        subject, st.subject = st.subject, None
        _end(self, st, subject, ("extend", tuple((x.key, st.label(x)) for x in got)))
        return got

    def pop(self) -> Any:
        sup: Any = super()
        st = _begin(self, "pop", None)
        if st is None:
            return sup.pop()
        h: Any = self
        top = None
        try:
            if h._n:
                c0 = tally()
                try:
                    top = h.peek()  # which entry the pop takes, for the history (not counted)
                finally:
                    untally(c0)
            kv = sup.pop()
        except BaseException as exc:
            _abort(self, st, exc)
            raise
        lab = None
        if top is not None and not top.alive:
            lab = st.label(top)
            st.labels.pop(id(top), None)
        _end(self, st, None, ("pop", lab, kv[0]), popped=kv[0])
        return kv

    def decrease_key(self, handle: Any, key: Any) -> None:
        self._rekey("decrease_key", handle, key)

    def change_key(self, handle: Any, key: Any) -> None:
        self._rekey("change_key", handle, key)

    def _rekey(self, op: str, handle: Any, key: Any) -> None:
        run = getattr(super(), op)
        refuse_nan(op, key)
        st = _begin(self, op, handle, depth=3)
        if st is None:
            run(handle, key)
            return
        old = getattr(handle, "key", None)
        try:
            run(handle, key)
        except BaseException as exc:
            _abort(self, st, exc)
            raise
        _end(self, st, handle, (op, st.label(handle), old, key))

    def remove(self, handle: Any) -> Any:
        sup: Any = super()
        st = _begin(self, "remove", handle)
        if st is None:
            return sup.remove(handle)
        old = getattr(handle, "key", None)
        try:
            kv = sup.remove(handle)
        except BaseException as exc:
            _abort(self, st, exc)
            raise
        lab = st.label(handle)
        st.labels.pop(id(handle), None)
        _end(self, st, handle, ("remove", lab, old))
        return kv

    def meld(self, other: Any) -> None:
        sup: Any = super()
        st = _begin(self, "meld", other)
        if st is None:
            _inner_meld(self, other)
            sup.meld(other)
            return
        theirs = _state_of(other)
        moving = list(other) if _valid(self, "meld", other) else []
        if theirs is not None:
            theirs.busy = "meld"
        try:
            sup.meld(other)
        except BaseException as exc:
            if theirs is not None:
                theirs.busy = None
            _abort(self, st, exc)
            raise
        if theirs is not None:
            theirs.busy = None
            theirs.labels.clear()
            theirs.history.append(("melded_away",))
            theirs.base, theirs.record = (), []
            theirs.ver = other._ver
            theirs.since_full = 0
        entry = ("meld", tuple((x.key, st.label(x)) for x in moving))
        _end(self, st, other, entry, also=other)

    def clear(self) -> None:
        sup: Any = super()
        st = _begin(self, "clear", None)
        if st is None:
            sup.clear()
            return
        try:
            sup.clear()
        except BaseException as exc:
            _abort(self, st, exc)
            raise
        st.labels.clear()
        _end(self, st, None, ("clear",))


def _state_of(heap: Any) -> _State | None:
    ext = getattr(heap, "_ext", None)
    return None if not isinstance(ext, dict) else ext.get(MODE)


def _inner_meld(h: Any, other: Any) -> None:
    """The meld inside an ``extend``: check the new entries in full (O(k), the
    cost of building them), then ask the kind what the meld touches."""
    st: _State = h._ext[MODE]
    if st.busy != "extend" or st.touched is not _PENDING:
        return
    report = Report()
    c0 = tally()
    try:
        report.run(other._survey)
    finally:
        untally(c0)
    if report.problems:
        raise failure(h, st, report, checked)
    st.touched = h._touched("meld", other) if _valid(h, "meld", other) else _NOTHING
    st.subject = other
