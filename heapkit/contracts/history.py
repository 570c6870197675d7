"""The operation history of a checked heap, and its replay on a fresh heap.

A history is a list of tuples, one per mutating operation, oldest first.
Handles are named by small integers (labels) that a heap gives them the first
time an operation names them; keys are recorded by reference:

=========================================  ====================================
``("push", key, label)``                   ``extend`` records ``(key, label)`` pairs
``("extend", ((key, label), ...))``        in order
``("pop", label, key)``                    label None if peek named another entry
``("decrease_key", label, old_key, key)``  ``old_key``: its key before the call
``("change_key", label, old_key, key)``
``("remove", label, old_key)``
``("meld", ((key, label), ...))``          the other heap's entries, now here
``("clear",)``
``("melded_away",)``                       this heap was melded into another
``("outside",)``                           the heap changed outside checked mode
=========================================  ====================================

Replay rebuilds the situation: the ``start`` entries (the heap's content when
the record began) are pushed first, then entries that the record names but did
not push (a window cut from a longer record) with their recorded keys, then
each operation runs on a heap checked after every operation, so a failure in
the kind shows up at the same operation.  A checked heap keeps the complete
record since its last passing full check (at most ``full_every`` operations,
or the heap's size at that check by default) with a snapshot of its entries at that
check, so ``HistoryError.replay`` is faithful to the entries and the
operations; the shape built by the replay may still differ from the
original's.  Replay starts after the last
``outside`` mark.  A key object mutated in place after the fact replays with
its current value (keys are not copied): a failure caused by such a key does
not replay, and the error says so.
"""

from __future__ import annotations

import warnings
from collections.abc import Callable
from typing import Any

from heapkit._core import HeapBase
from heapkit.contracts.report import Report
from heapkit.errors import InvariantError

__all__ = ["MUTATED_HINT", "Entry", "HistoryError", "failure", "kind_class", "run"]

Entry = tuple[Any, ...]

#: Where a replay may start: a kind name, a heap class, or a factory of empty heaps.
Target = str | type | Callable[[], Any]


def _opening(history: list[Entry], known: set[int]) -> tuple[list[Entry], list[tuple[Any, int]]]:
    """The faithful tail of ``history`` and the entries to push before it."""
    start = 0
    for i, e in enumerate(history):
        if e[0] == "outside":
            start = i + 1
    tail = history[start:]
    first: list[tuple[Any, int]] = []
    for e in tail:
        op = e[0]
        if op == "push":
            known.add(e[2])
        elif op in ("extend", "meld"):
            known.update(lab for _, lab in e[1])
        elif op in ("clear", "melded_away"):
            known.clear()  # later labels are new ones; none refers to the past
        elif op == "pop":
            if e[1] is not None and e[1] not in known:
                first.append((e[2], e[1]))
                known.add(e[1])
        elif e[1] not in known:  # decrease_key, change_key, remove
            first.append((e[2], e[1]))
            known.add(e[1])
    return tail, first


def run(
    history: list[Entry],
    target: Target,
    check: Callable[..., Any],
    *,
    start: tuple[tuple[Any, int], ...] = (),
    every: int = 1,
) -> Any:
    """Run ``history`` on a fresh heap from ``target`` put in checked mode by ``check``
    (``heapkit.checked``, handed in by its caller so this module never imports the
    mode); return the heap.  ``heapkit.contracts.replaying.replay`` documents it.

    >>> from heapkit import checked
    >>> len(run([("push", 3, 0), ("push", 1, 1), ("pop", 1, 1)], "binary", checked))
    1
    """
    from heapkit.kinds import KINDS

    if isinstance(target, str):
        heap = KINDS[target]()
    else:
        heap = target()
    handles: dict[int, Any] = {}
    for key, lab in start:
        handles[lab] = heap.push(key, lab)
    tail, first = _opening(history, set(handles))
    for key, lab in first:
        handles[lab] = heap.push(key, lab)
    check(heap, every=every, full_every=1)
    for e in tail:
        op = e[0]
        if op == "push":
            handles[e[2]] = heap.push(e[1], e[2])
        elif op in ("extend", "meld"):
            pairs = [(k, lab) for k, lab in e[1]]
            if op == "extend":
                got = heap.extend(pairs)
            else:
                other = heap._spawn()
                got = [other.push(k, v) for k, v in pairs]
                heap.meld(other)
            handles.update(zip((lab for _, lab in pairs), got, strict=True))
        elif op == "pop":
            heap.pop()
        elif op in ("clear", "melded_away"):
            heap.clear()
        elif op == "remove":
            heap.remove(handles[e[1]])
        else:
            getattr(heap, op)(handles[e[1]], e[3])
    return heap


class HistoryError(InvariantError):
    """A checked heap broke a rule; carries the operations that led there.

    ``history``: the last operations (see :mod:`heapkit.contracts.history`),
    the failing one last; ``start`` and ``record``: the heap's entries at its
    last passing full check and every operation since.  ``replay()``
    runs that record again on a fresh heap (by default of the same class and
    options) and raises the failure again: hand it to a test.
    ``replay(kind="pairing")`` runs it on another kind.

    >>> from heapkit import BinaryHeap, checked
    >>> class Sloppy(BinaryHeap):          # decrease_key forgets to sift up
    ...     __slots__ = ()
    ...     def decrease_key(self, handle, key):
    ...         handle._key = handle._k = key
    >>> h = checked(Sloppy([(1, 'a'), (2, 'b')]))
    >>> x = h.push(3, 'c')
    >>> try:
    ...     h.decrease_key(x, 0)
    ... except HistoryError as err:
    ...     print(err.history[-1], err.rules)
    ...     again = err
    ('decrease_key', 2, 3, 0) ('heap-order',)
    >>> again.replay()  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    heapkit.contracts.history.HistoryError: ...
    """

    def __init__(
        self,
        message: str,
        problems: tuple[str, ...],
        rules: tuple[str, ...],
        history: list[Entry],
        factory: Callable[[], Any],
        start: tuple[tuple[Any, int], ...] = (),
        record: list[Entry] | None = None,
    ) -> None:
        super().__init__(message, problems)
        self.rules: tuple[str, ...] = rules
        self.history: list[tuple[object, ...]] = history
        self.start = start
        self.record: list[Entry] = history if record is None else record
        self._factory = factory
        #: The checked-mode switch the replay runs under (``failure`` hands it in).
        self._check: Callable[..., Any] | None = None
        #: True when the broken rule is one that heapkit's own kind keeps: a key changed in place.
        self.likely_mutated = False

    def replay(self, kind: Target | None = None) -> Any:
        """Run the record again on a fresh heap of ``kind`` (a ``KINDS`` name, a
        class or a factory; None: the failing heap's class and options).

        Returns the heap if no rule breaks; when the failure was likely a key
        changed in place, that is expected and a ``RuntimeWarning`` says so.
        O(length of the record * n).
        """
        if self._check is None:
            raise RuntimeError(f"replay: {type(self).__name__!r} was not raised by checked mode (no checker)")
        heap = run(self.record, self._factory if kind is None else kind, self._check, start=self.start)
        if self.likely_mutated:
            warnings.warn(
                "the replay ran clean: the failure was likely caused by a key changed in place, "
                "and the record holds the key objects as they are now, so it cannot reproduce it",
                RuntimeWarning,
                stacklevel=2,
            )
        return heap


def kind_class(h: Any) -> type:
    """The class to rebuild ``h`` from (below every mode layer)."""
    for c in type(h).__mro__:
        if issubclass(c, HeapBase) and "_layer" not in c.__dict__:
            return c
    return type(h)  # pragma: no cover - a heap always has its kind below


#: Rules that compare keys: a stock kind breaks them only when a key changed under it.
_ORDER_RULES = frozenset(("heap-order", "half-order", "minimum", "min", "min-first", "monotone", "bucket"))

MUTATED_HINT = (
    "\n  likely cause: a key changed in place after it was pushed (a list, or an object whose "
    "fields `<` reads), or a `<` that is not a consistent order: heapkit's own kinds keep "
    "this rule.  Give an entry a new key with change_key and a new key object.  err.history "
    "lists the last operations; err.replay() reruns the record with the key objects as they "
    "are now (keys are recorded by reference), so a failure caused by a key changed in place "
    "cannot be reproduced by it: the replay builds a healthy heap"
)


def failure(h: Any, st: Any, report: Report, check: Callable[..., Any]) -> HistoryError:
    """The :class:`HistoryError` for checked heap ``h`` (state ``st``) whose check found
    ``report``; ``check`` (``heapkit.checked``) is what its ``replay()`` runs under."""
    cls, stable, opts = kind_class(h), h._stable, h._options()
    text = str(report.error(h, f" after {st.history[-1][0] if st.history else 'enabling'}"))
    stock = cls.__module__.startswith("heapkit.kinds")  # not a user's subclass
    mutated = stock and any(r in _ORDER_RULES for r in report.rules)
    if mutated:
        text += MUTATED_HINT
    err = HistoryError(
        text,
        tuple(report.problems),
        tuple(report.rules),
        list(st.history),
        lambda: cls(stable=stable, **opts),
        st.base,
        list(st.record),
    )
    err.likely_mutated = mutated
    err._check = check
    return err
