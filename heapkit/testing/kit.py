"""Property-test any priority queue against :class:`ReferenceHeap`.

``assert_conforms(factory)`` drives queues made by ``factory()`` beside the
reference model through a Hypothesis state machine; when the queue misbehaves it
raises ``AssertionError`` showing the shortest failing sequence Hypothesis found,
as runnable Python lines, and what was expected versus what came.

``machine(factory)`` is the state machine class itself, for pytest collection:
``TestMyQueue = machine(MyQueue).TestCase``.  ``adapt(obj, push="add", ...)``
maps a queue with other method names onto the protocol.

What the kit requires of a queue (each failure names the ``adapt`` argument or
the flag that fixes it): ``push(key, value)``; ``pop()`` returning a
``(key, value)`` pair and raising ``IndexError`` when empty; ``len()``; ``peek()``
returning a handle with ``.key`` or a ``(key, value)`` pair and raising
``IndexError`` when empty (``peek=False`` leaves it out); ``decrease_key``,
``change_key``, ``remove`` (a dead handle raises ``ValueError``) and ``meld``, each
left out with its flag set to False.  Handles may have ``.key`` and ``.alive``;
the kit compares them when present.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from typing import Any

from hypothesis import HealthCheck, Phase, settings
from hypothesis import strategies as st
from hypothesis.stateful import (
    RuleBasedStateMachine,
    invariant,
    precondition,
    rule,
    run_state_machine_as_test,
)

from heapkit.testing.reference import ReferenceHeap
from heapkit.testing.strategies import keys as default_keys

__all__ = ["Adapted", "adapt", "assert_conforms", "machine"]


def _same(a: Any, b: Any) -> bool:
    return not (a < b) and not (b < a)


#: What to write to fix a missing requirement, per operation.
_FIX = {
    "pop": "adapt(q, pop=lambda q: ...) returning a (key, value) pair and raising IndexError when empty",
    "peek": "adapt(q, peek=lambda q: ...) returning a handle with .key or a (key, value) pair, "
    "raising IndexError when empty; or leave peek out with peek=False",
    "remove": "adapt(q, remove=lambda q, handle: ...) raising ValueError for a dead handle; "
    "or leave remove out with remove=False",
}


def _key_of(item: Any) -> Any:
    """The key of what ``peek`` returned: a handle, or a ``(key, value)`` pair; else None."""
    if isinstance(item, tuple) and len(item) == 2:
        return item[0]
    return getattr(item, "key", _NO_KEY)


_NO_KEY = object()


class _Base(RuleBasedStateMachine):
    """Shared state of the generated machines (configured by :func:`machine`)."""

    factory: Callable[[], Any]
    stable: bool
    melds: bool
    peeks: bool

    def __init__(self) -> None:
        super().__init__()
        self.queues = [type(self).factory()]
        self.refs: list[ReferenceHeap[Any, Any]] = [ReferenceHeap()]
        self.lines = ["h = factory()"]
        if self.melds:
            self.queues.append(type(self).factory())
            self.refs.append(ReferenceHeap())
            self.lines.append("g = factory()")
        self.entries: list[tuple[str, Any, Any]] = []  # (name, their handle, model handle)
        self.by_value: dict[str, tuple[str, Any, Any]] = {}
        self.count = 0

    # --- reporting -----------------------------------------------------------
    def _say(self, line: str) -> None:
        self.lines.append(line)

    def fail(self, what: str) -> None:
        steps = len(self.lines) - (2 if self.melds else 1)
        body = "\n".join(f"    {line}" for line in self.lines)
        raise AssertionError(
            f"the queue does not behave like a priority queue: {what}\n"
            f"shortest failing sequence found ({steps} operations):\n{body}"
        )

    def _call(self, line: str, fn: Callable[[], Any]) -> Any:
        self._say(line)
        try:
            return fn()
        except Exception as exc:  # the user's queue raised where the model did not
            self.fail(f"`{line}` raised {type(exc).__name__}: {exc}")

    def _expect_error(self, line: str, fn: Callable[[], Any], kind: type[Exception]) -> None:
        self._say(line + f"  # must raise {kind.__name__}")
        try:
            fn()
        except kind:
            return
        except Exception as exc:
            self.fail(f"`{line}` raised {type(exc).__name__}, expected {kind.__name__}{self._fix(line)}")
        self.fail(f"`{line}` returned normally, expected {kind.__name__}{self._fix(line)}")

    @staticmethod
    def _fix(line: str) -> str:
        op = line.split(".", 1)[-1].split("(", 1)[0]
        return f"; to fix: {_FIX[op]}" if op in _FIX else ""

    @staticmethod
    def qname(w: int) -> str:
        return "hg"[w]

    # --- operations every queue has -----------------------------------------
    def _push(self, w: int, key: Any) -> None:
        self.count += 1
        value = f"v{self.count}"
        name = f"x{self.count}"
        handle = self._call(
            f"{name} = {self.qname(w)}.push({key!r}, {value!r})", lambda: self.queues[w].push(key, value)
        )
        entry = (name, handle, self.refs[w].push(key, value))
        self.entries.append(entry)
        self.by_value[value] = entry

    def _pop(self, w: int, named: tuple[Any, Any] | None = None) -> None:
        q, ref = self.queues[w], self.refs[w]
        if not ref:
            self._expect_error(f"{self.qname(w)}.pop()", q.pop, IndexError)
            return
        got = self._call(f"{self.qname(w)}.pop()", q.pop)
        if named is not None and got != named:
            self.fail(f"pop returned {got!r}, but the peek just before it named {named!r}")
        want = ref.peek()
        if not isinstance(got, tuple) or len(got) != 2:
            self.fail(
                f"pop returned {got!r}, expected a (key, value) pair like {(want.key, want.value)!r}; "
                f"to fix: {_FIX['pop']}"
            )
        key, value = got
        if self.stable:
            if (key, value) != (want.key, want.value):
                self.fail(
                    f"pop returned {got!r}, expected {(want.key, want.value)!r} "
                    "(the stable order: smallest key, earliest push among ties)"
                )
            ref.pop()
            return
        if value not in self.by_value or self.by_value[value][2] not in ref:
            self.fail(f"pop returned {got!r}, which is not an entry of this queue")
        if not _same(key, want.key):
            self.fail(f"pop returned key {key!r}, but {want.key!r} is the smallest key in the queue")
        ref.remove(self.by_value[value][2])

    def _peek(self, w: int) -> None:
        q, ref = self.queues[w], self.refs[w]
        if not ref:
            self._expect_error(f"{self.qname(w)}.peek()", q.peek, IndexError)
            return
        got = self._call(f"{self.qname(w)}.peek()", q.peek)
        key = _key_of(got)
        if key is _NO_KEY:
            self.fail(
                f"peek returned {got!r}, which has no .key and is not a (key, value) pair; to fix: {_FIX['peek']}"
            )
        if not _same(key, ref.peek().key):
            self.fail(f"peek gave key {key!r}, but {ref.peek().key!r} is the smallest")

    def _peek_pop(self, w: int) -> None:
        """Protocol rule: with no operation between, pop returns the entry peek named."""
        if not self.refs[w]:
            return
        got = self._call(f"{self.qname(w)}.peek()", self.queues[w].peek)
        if not isinstance(got, tuple) and _key_of(got) is _NO_KEY:
            self.fail(
                f"peek returned {got!r}, which has no .key and is not a (key, value) pair; to fix: {_FIX['peek']}"
            )
        self._pop(w, got if isinstance(got, tuple) else (got.key, getattr(got, "value", None)))

    def _live(self, data: st.DataObject) -> tuple[int, tuple[str, Any, Any]] | None:
        live = [e for e in self.entries if e[2].alive]
        if not live:
            return None
        e = live[data.draw(st.integers(0, len(live) - 1), label="entry")]
        return (0 if e[2] in self.refs[0] else 1), e

    def _dead(self, data: st.DataObject) -> tuple[str, Any, Any] | None:
        dead = [e for e in self.entries if not e[2].alive]
        return dead[data.draw(st.integers(0, len(dead) - 1), label="dead")] if dead else None

    @invariant()
    def sizes_agree(self) -> None:
        for w, (q, ref) in enumerate(zip(self.queues, self.refs, strict=True)):
            n = len(q)
            if n != len(ref):
                self.fail(f"len({self.qname(w)}) is {n}, expected {len(ref)}")
        for name, handle, model in self.entries:
            if hasattr(handle, "alive") and bool(handle.alive) != model.alive:
                self.fail(f"{name}.alive is {handle.alive!r}, expected {model.alive!r}")
            if model.alive and hasattr(handle, "key") and not _same(handle.key, model.key):
                self.fail(f"{name}.key is {handle.key!r}, expected {model.key!r}")


def machine(
    factory: Callable[[], Any],
    *,
    decrease_key: bool = True,
    change_key: bool = True,
    remove: bool = True,
    meld: bool = True,
    stable: bool = False,
    keys: st.SearchStrategy[Any] | None = None,
    peek: bool = True,
    max_examples: int | None = None,
    settings: settings | None = None,
) -> type[RuleBasedStateMachine]:
    """The Hypothesis state machine behind :func:`assert_conforms`.  O(1) to build.

    Capability flags leave out operations the queue lacks.  For pytest:
    ``TestMyQueue = machine(MyQueue, max_examples=50).TestCase``; ``settings``
    (a ``hypothesis.settings``) replaces the kit's defaults, ``max_examples``
    overrides the count in either.

    >>> from heapkit import PairingHeap
    >>> issubclass(machine(PairingHeap), RuleBasedStateMachine)
    True
    """
    k = default_keys() if keys is None else keys
    sides = st.integers(0, 1) if meld else st.just(0)
    # The class body defines methods with these names, so read the flags under others.
    has = {"decrease": decrease_key, "change": change_key, "remove": remove, "meld": meld, "peek": peek}

    class QueueMachine(_Base):
        @rule(w=sides, key=k)
        def push(self, w: int, key: Any) -> None:
            self._push(w, key)

        @rule(w=sides, batch=st.lists(k, min_size=2, max_size=8))
        def push_several(self, w: int, batch: list[Any]) -> None:
            for key in batch:  # reaches larger sizes in fewer steps
                self._push(w, key)

        @rule(w=sides)
        def pop(self, w: int) -> None:
            self._pop(w)

        if has["peek"]:

            @rule(w=sides)
            def peek(self, w: int) -> None:
                self._peek(w)

            @rule(w=sides)
            def pop_returns_what_peek_named(self, w: int) -> None:
                self._peek_pop(w)

        if has["decrease"]:

            @precondition(lambda self: self.entries)
            @rule(data=st.data(), key=k)
            def decrease_key(self, data: st.DataObject, key: Any) -> None:
                picked = self._live(data)
                if picked is None:
                    return
                w, (name, handle, model) = picked
                if model.key < key:
                    key = model.key  # a decrease to an equal key is legal and must be kept
                self._call(
                    f"{self.qname(w)}.decrease_key({name}, {key!r})", lambda: self.queues[w].decrease_key(handle, key)
                )
                self.refs[w].decrease_key(model, key)

        if has["change"]:

            @precondition(lambda self: self.entries)
            @rule(data=st.data(), key=k)
            def change_key(self, data: st.DataObject, key: Any) -> None:
                picked = self._live(data)
                if picked is None:
                    return
                w, (name, handle, model) = picked
                self._call(
                    f"{self.qname(w)}.change_key({name}, {key!r})", lambda: self.queues[w].change_key(handle, key)
                )
                self.refs[w].change_key(model, key)

        if has["remove"]:

            @precondition(lambda self: self.entries)
            @rule(data=st.data())
            def remove(self, data: st.DataObject) -> None:
                picked = self._live(data)
                if picked is None:
                    return
                w, (name, handle, model) = picked
                got = self._call(f"{self.qname(w)}.remove({name})", lambda: self.queues[w].remove(handle))
                want = self.refs[w].remove(model)
                if got is not None and tuple(got) != want:
                    self.fail(f"remove({name}) returned {got!r}, expected {want!r}")

            @precondition(lambda self: self.entries)
            @rule(data=st.data())
            def remove_dead(self, data: st.DataObject) -> None:
                dead = self._dead(data)
                if dead is not None:
                    name, handle, _ = dead
                    self._expect_error(f"h.remove({name})", lambda: self.queues[0].remove(handle), ValueError)

        if has["meld"]:

            @rule(into=st.integers(0, 1))
            def meld(self, into: int) -> None:
                src = 1 - into
                self._call(
                    f"{self.qname(into)}.meld({self.qname(src)})", lambda: self.queues[into].meld(self.queues[src])
                )
                self.refs[into].meld(self.refs[src])

    QueueMachine.factory = staticmethod(factory)
    QueueMachine.stable = stable
    QueueMachine.melds = meld
    QueueMachine.peeks = peek
    chosen = _settings() if settings is None else settings
    if max_examples is not None:
        chosen = _settings_cls(chosen, max_examples=max_examples)
    QueueMachine.TestCase.settings = chosen
    QueueMachine.__name__ = QueueMachine.__qualname__ = f"Conformance_{getattr(factory, '__name__', 'queue')}"
    return QueueMachine


def assert_conforms(
    factory: Callable[[], Any],
    *,
    decrease_key: bool = True,
    change_key: bool = True,
    remove: bool = True,
    meld: bool = True,
    stable: bool = False,
    max_examples: int = 200,
    keys: st.SearchStrategy[Any] | None = None,
    peek: bool = True,
    settings: settings | None = None,
) -> None:
    """Drive queues from ``factory()`` beside the reference; raise on the first misbehaviour.

    The ``AssertionError`` shows the shortest failing sequence as runnable lines
    and what was expected versus what came.  Cost: ``max_examples`` runs of up to
    Hypothesis's step count each.

    >>> from heapkit import BinaryHeap
    >>> assert_conforms(BinaryHeap, max_examples=5)
    """
    cls = machine(
        factory,
        decrease_key=decrease_key,
        change_key=change_key,
        remove=remove,
        meld=meld,
        stable=stable,
        keys=keys,
        peek=peek,
        max_examples=max_examples,
        settings=settings,
    )
    try:
        run_state_machine_as_test(cls, settings=cls.TestCase.settings)
    except AssertionError as exc:
        # One report: the kit's message alone, without Hypothesis's notes (its own
        # step listing and explanation) or the chained traceback through its engine.
        raise AssertionError(str(exc)) from None


_settings_cls = settings


def _settings() -> settings:
    """The kit's defaults: no deadline (user queues may be slow), no explain phase."""
    return _settings_cls(
        max_examples=200,
        deadline=None,
        print_blob=False,
        phases=[p for p in Phase if p is not Phase.explain],
        suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much],
    )


class Adapted:
    """A queue seen through the protocol's method names (see :func:`adapt`)."""

    def __init__(self, inner: Any, names: dict[str, str | Callable[..., Any]]) -> None:
        self.inner = inner
        self._names = names

    def _fn(self, op: str) -> Callable[..., Any]:
        target = self._names.get(op, op)
        if callable(target):
            inner = self.inner
            return lambda *args: target(inner, *args)
        fn: Callable[..., Any] = getattr(self.inner, target)
        return fn

    def push(self, key: Any, value: Any) -> Any:
        return self._fn("push")(key, value)

    def pop(self) -> Any:
        return self._fn("pop")()

    def peek(self) -> Any:
        return self._fn("peek")()

    def decrease_key(self, handle: Any, key: Any) -> None:
        self._fn("decrease_key")(handle, key)

    def change_key(self, handle: Any, key: Any) -> None:
        self._fn("change_key")(handle, key)

    def remove(self, handle: Any) -> Any:
        return self._fn("remove")(handle)

    def meld(self, other: Adapted) -> None:
        self._fn("meld")(other.inner if isinstance(other, Adapted) else other)

    def __len__(self) -> int:
        fn = self._names.get("__len__")
        return int(fn(self.inner)) if callable(fn) else len(self.inner)

    def __bool__(self) -> bool:
        return len(self) > 0

    def __iter__(self) -> Iterator[Any]:
        """The inner queue's handles (``adapt(q, __iter__=...)`` maps another name)."""
        target = self._names.get("__iter__", "__iter__")
        if callable(target):
            return iter(target(self.inner))
        if not hasattr(self.inner, target):
            raise TypeError(
                f"{type(self.inner).__name__} is not iterable; give adapt(q, __iter__=lambda q: ...) "
                "the live handles to let heapkit.check inspect every entry"
            )
        return iter(getattr(self.inner, target)())

    def __contains__(self, handle: object) -> bool:
        target = self._names.get("__contains__")
        if callable(target):
            return bool(target(self.inner, handle))
        if hasattr(self.inner, "__contains__"):
            return handle in self.inner
        return bool(getattr(handle, "alive", True))

    def __repr__(self) -> str:
        return f"adapt({self.inner!r})"


def adapt(obj: Any, **names: str | Callable[..., Any]) -> Adapted:
    """Map a queue with other method names onto the protocol.  O(1).

    Each keyword names a protocol operation (``push, pop, peek, decrease_key,
    change_key, remove, meld, __len__, __iter__, __contains__``) and gives the queue's method name, or a
    function ``f(queue, *args)``.  Unnamed operations keep their names.

    >>> class Jobs:
    ...     def __init__(self): self.items = []
    ...     def add(self, k, v): self.items.append((k, v)); return (k, v)
    ...     def take(self): self.items.sort(key=lambda p: p[0]); return self.items.pop(0)
    ...     def __len__(self): return len(self.items)
    >>> q = adapt(Jobs(), push="add", pop="take")
    >>> _ = q.push(2, 'b'); _ = q.push(1, 'a'); q.pop()
    (1, 'a')
    """
    return Adapted(obj, dict(names))
