"""One protocol suite for every kind: a Hypothesis state machine drives two heaps
of a kind beside two ``ReferenceHeap`` models (heapkit.testing) and compares every
return value, every handle's key/alive/value and the pop order after each step.

Stable heaps must pop exactly the reference's order; unstable heaps must pop an
entry whose key no other key is below (the api contract).
"""

from __future__ import annotations

from typing import Any

import pytest
from hypothesis import strategies as st
from hypothesis.stateful import RuleBasedStateMachine, invariant, precondition, rule

import heapkit
from heapkit.testing import ReferenceHeap
from tests.kinds import KEYS, VARIANTS, make, monotone


def _same(a: Any, b: Any) -> bool:
    return not (a < b) and not (b < a)


class ProtocolMachine(RuleBasedStateMachine):
    kind = "pairing"
    stable = False

    def __init__(self) -> None:
        super().__init__()
        self.heaps = [make(self.kind, self.stable), make(self.kind, self.stable)]
        self.refs = [ReferenceHeap(), ReferenceHeap()]
        self.pairs: list[tuple[Any, Any]] = []
        self.by_value: dict[int, tuple[Any, Any]] = {}
        self.counter = 0

    def _value(self) -> int:
        self.counter += 1
        return self.counter

    def _track(self, h: Any, r: Any) -> None:
        self.pairs.append((h, r))
        self.by_value[r.value] = (h, r)

    @rule(w=st.integers(0, 1), key=KEYS)
    def push(self, w: int, key: Any) -> None:
        v = self._value()
        h = self.heaps[w].push(key, v)
        r = self.refs[w].push(key, v)
        assert h.key == key and h.value == v and h.alive
        self._track(h, r)

    @rule(w=st.integers(0, 1), keys=st.lists(KEYS, max_size=6))
    def extend(self, w: int, keys: list[Any]) -> None:
        pairs = [(k, self._value()) for k in keys]
        hs = self.heaps[w].extend(pairs)
        rs = self.refs[w].extend(pairs)
        assert [h.key for h in hs] == keys
        for h, r in zip(hs, rs, strict=True):
            self._track(h, r)

    def _popped(self, w: int, key: Any, value: Any) -> None:
        ref = self.refs[w]
        if self.stable:
            assert (key, value) == ref.pop()
        else:
            assert _same(key, ref.peek().key), f"popped {key!r}, min is {ref.peek().key!r}"
            h, r = self.by_value[value]
            assert not h.alive
            assert ref.remove(r) == (key, value)

    def _pop_one(self, w: int) -> tuple[Any, Any]:
        key, value = self.heaps[w].pop()
        self._popped(w, key, value)
        return key, value

    @rule(w=st.integers(0, 1))
    def pop(self, w: int) -> None:
        heap, ref = self.heaps[w], self.refs[w]
        if not ref:
            with pytest.raises(heapkit.EmptyHeapError):
                heap.pop()
            return
        self._pop_one(w)

    @rule(w=st.integers(0, 1))
    def pop_returns_what_peek_named(self, w: int) -> None:
        # Protocol rule (/work/shared/design/api.md, round 2): with no operation
        # between them, pop() removes and returns exactly the entry peek() named.
        if not self.refs[w]:
            return
        top = self.heaps[w].peek()
        named = (top.key, top.value)
        assert self._pop_one(w) == named, f"peek named {named!r}"
        assert not top.alive

    @rule(w=st.integers(0, 1))
    def peek(self, w: int) -> None:
        heap, ref = self.heaps[w], self.refs[w]
        if not ref:
            with pytest.raises(heapkit.EmptyHeapError):
                heap.peek()
            return
        top = heap.peek()
        if self.stable:
            assert top.value == ref.peek().value
        else:
            assert _same(top.key, ref.peek().key)

    def _pick(self, data: st.DataObject) -> tuple[Any, Any]:
        return self.pairs[data.draw(st.integers(0, len(self.pairs) - 1))]

    def _owner(self, r: Any) -> int:
        return 0 if r in self.refs[0] else 1

    @precondition(lambda self: self.pairs)
    @rule(data=st.data(), drop=st.integers(0, 6))
    def decrease_key(self, data: st.DataObject, drop: int) -> None:
        h, r = self._pick(data)
        if not r.alive:
            with pytest.raises(heapkit.InvalidHandleError):
                self.heaps[0].decrease_key(h, 0)
            with pytest.raises(heapkit.InvalidHandleError):
                self.heaps[1].decrease_key(h, 0)
            return
        w = self._owner(r)
        with pytest.raises(heapkit.InvalidHandleError):
            self.heaps[1 - w].decrease_key(h, r.key)
        key = r.key - drop
        self.heaps[w].decrease_key(h, key)
        self.refs[w].decrease_key(r, key)

    @precondition(lambda self: self.pairs)
    @rule(data=st.data(), rise=st.integers(1, 6))
    def decrease_key_upward_is_refused(self, data: st.DataObject, rise: int) -> None:
        h, r = self._pick(data)
        if r.alive and r.key < r.key + rise:
            w = self._owner(r)
            before = h.key
            with pytest.raises(heapkit.KeyOrderError):
                self.heaps[w].decrease_key(h, r.key + rise)
            assert h.key == before

    @precondition(lambda self: self.pairs)
    @rule(data=st.data(), key=KEYS)
    def change_key(self, data: st.DataObject, key: Any) -> None:
        h, r = self._pick(data)
        if not r.alive:
            with pytest.raises(heapkit.InvalidHandleError):
                self.heaps[0].change_key(h, key)
            return
        w = self._owner(r)
        self.heaps[w].change_key(h, key)
        self.refs[w].change_key(r, key)

    @precondition(lambda self: self.pairs)
    @rule(data=st.data())
    def remove(self, data: st.DataObject) -> None:
        h, r = self._pick(data)
        if not r.alive:
            with pytest.raises(heapkit.InvalidHandleError):
                self.heaps[0].remove(h)
            return
        w = self._owner(r)
        with pytest.raises(heapkit.InvalidHandleError):
            self.heaps[1 - w].remove(h)
        assert self.heaps[w].remove(h) == self.refs[w].remove(r)
        assert not h.alive

    @rule(into=st.integers(0, 1))
    def meld(self, into: int) -> None:
        self.heaps[into].meld(self.heaps[1 - into])
        self.refs[into].meld(self.refs[1 - into])
        assert len(self.heaps[1 - into]) == 0

    @rule(w=st.integers(0, 1))
    def meld_self_is_refused(self, w: int) -> None:
        with pytest.raises(ValueError):
            self.heaps[w].meld(self.heaps[w])

    @rule(w=st.integers(0, 1))
    def clear(self, w: int) -> None:
        self.heaps[w].clear()
        self.refs[w].clear()

    @rule(w=st.integers(0, 1))
    def iteration_sees_every_live_handle(self, w: int) -> None:
        seen = {id(h) for h in self.heaps[w]}
        live = {id(h) for h, r in self.pairs if r in self.refs[w]}
        assert seen == live

    @invariant()
    def agrees_with_reference(self) -> None:
        for heap, ref in zip(self.heaps, self.refs, strict=True):
            assert len(heap) == len(ref)
            assert bool(heap) == bool(ref)
            heapkit.check(heap)
        for h, r in self.pairs:
            assert h.alive == r.alive
            assert (h in self.heaps[0]) == (r in self.refs[0])
            assert (h in self.heaps[1]) == (r in self.refs[1])
            if r.alive:
                assert h.key == r.key and h.value == r.value


class MonotoneMachine(ProtocolMachine):
    """The same machine for monotone kinds (radix): keys at or above each heap's
    last popped key (tracked here, 0 at the start and after clear or being melded
    away), decrease_key never below it, meld refused while the last keys differ."""

    def __init__(self) -> None:
        super().__init__()
        self.last = [0, 0]

    @rule(w=st.integers(0, 1), up=st.integers(0, 12))
    def push(self, w: int, up: int) -> None:
        ProtocolMachine.push(self, w, self.last[w] + up)

    @rule(w=st.integers(0, 1), ups=st.lists(st.integers(0, 12), max_size=6))
    def extend(self, w: int, ups: list[int]) -> None:
        ProtocolMachine.extend(self, w, [self.last[w] + u for u in ups])

    def _pop_one(self, w: int) -> tuple[Any, Any]:
        self.last[w] = self.refs[w].peek().key
        return ProtocolMachine._pop_one(self, w)

    @precondition(lambda self: self.pairs)
    @rule(data=st.data(), drop=st.integers(0, 6))
    def decrease_key(self, data: st.DataObject, drop: int) -> None:
        h, r = self._pick(data)
        if not r.alive:
            with pytest.raises(heapkit.InvalidHandleError):
                self.heaps[0].decrease_key(h, h.key)
            return
        w = self._owner(r)
        with pytest.raises(heapkit.InvalidHandleError):
            self.heaps[1 - w].decrease_key(h, r.key)
        key = max(r.key - drop, self.last[w])
        self.heaps[w].decrease_key(h, key)
        self.refs[w].decrease_key(r, key)

    @precondition(lambda self: self.pairs)
    @rule(data=st.data(), up=st.integers(0, 12))
    def change_key(self, data: st.DataObject, up: int) -> None:
        h, r = self._pick(data)
        if not r.alive:
            with pytest.raises(heapkit.InvalidHandleError):
                self.heaps[0].change_key(h, up)
            return
        w = self._owner(r)
        self.heaps[w].change_key(h, self.last[w] + up)
        self.refs[w].change_key(r, self.last[w] + up)

    @rule(into=st.integers(0, 1))
    def meld(self, into: int) -> None:
        if self.refs[1 - into] and self.last[0] != self.last[1]:
            with pytest.raises(heapkit.KeyOrderError):
                self.heaps[into].meld(self.heaps[1 - into])
            return
        ProtocolMachine.meld(self, into)
        self.last[1 - into] = 0

    @rule(w=st.integers(0, 1))
    def clear(self, w: int) -> None:
        ProtocolMachine.clear(self, w)
        self.last[w] = 0


for _name, _stable in VARIANTS:
    _cls = type(
        f"Machine_{_name}_{'stable' if _stable else 'unstable'}",
        (MonotoneMachine if monotone(_name) else ProtocolMachine,),
        {"kind": _name, "stable": _stable},
    )
    globals()[f"Test{_cls.__name__}"] = _cls.TestCase
