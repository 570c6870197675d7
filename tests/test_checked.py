"""Checked mode: history and replay, unchecked, HEAPKIT_DEBUG, the re-entrancy
guard, melds across modes, keys mutated in place, and the incremental checker
against the full one."""

from __future__ import annotations

from pathlib import Path
from typing import Any

import pytest

import heapkit
from heapkit import BinaryHeap, DaryHeap, PairingHeap, checked, unchecked
from heapkit.contracts import HistoryError
from heapkit.errors import InvariantError
from tests.kinds import NAMES, PUSH_COMPARES_NOTHING, make, monotone, run_python

ROOT = Path(__file__).resolve().parent.parent


def _ext(h: Any) -> Any:
    return h._ext["checked"]


class Careless(PairingHeap[Any, Any]):
    """A deliberately broken kind: decrease_key sets the key and moves nothing."""

    __slots__ = ()

    def decrease_key(self, handle: Any, key: Any) -> None:
        handle._key = handle._k = key
        self._ver += 1


def _break_careless(**options: Any) -> tuple[Any, HistoryError]:
    h = checked(Careless(), **options)
    handles = [h.push(k, f"v{k}") for k in (40, 10, 30, 20, 50, 60)]
    h.pop()  # pairs the children: now there is depth
    h.change_key(handles[0], 45)
    with pytest.raises(HistoryError) as info:
        for x in handles[2:]:
            h.decrease_key(x, 1)  # below the root's 20: caught at once
    return h, info.value


def test_failure_carries_history_and_names_the_rule() -> None:
    _, err = _break_careless()
    assert isinstance(err, InvariantError)
    assert err.rules[0] == "heap-order"
    assert err.history[-1][0] == "decrease_key"
    assert [e[0] for e in err.history[:3]] == ["push", "push", "push"]
    assert "after decrease_key" in str(err)


def test_history_is_cut_to_its_length_but_the_record_replays() -> None:
    _, err = _break_careless(history=3, full_every=10**6)
    assert len(err.history) == 3 and len(err.record) > 3


def test_replay_reaches_the_same_failure() -> None:
    _, err = _break_careless()
    with pytest.raises(HistoryError) as again:
        err.replay()
    assert again.value.rules == err.rules
    # The same operation with the same keys (labels are the replay's own).
    op, _, *keys = err.history[-1]
    op2, _, *keys2 = again.value.history[-1]
    assert (op2, keys2) == (op, keys)


def test_replay_on_a_sound_kind_runs_clean() -> None:
    h, err = _break_careless()
    for kind in ("pairing", "binary", DaryHeap):
        good = err.replay(kind=kind)
        assert len(good) == len(h)
        out = [good.pop()[0] for _ in range(len(good))]
        assert out == sorted(out)  # sorted(): the order a heap must give


def test_unchecked_restores_the_original_class() -> None:
    for cls in (PairingHeap, BinaryHeap, DaryHeap):
        h = cls([(2, "b")])
        assert checked(h) is h and isinstance(h, cls) and type(h) is not cls
        h.push(1, "a")
        assert unchecked(h) is h and type(h) is cls and h._ext is None
        assert unchecked(h) is h  # not checked: nothing to do


def test_modes_stack_and_come_off_in_reverse() -> None:
    # Another mode (the auditor) switches the class the same way: a marked subclass.
    h = PairingHeap([(1, "a")])
    audited = type("PairingHeap", (PairingHeap,), {"__slots__": (), "_layer": "audit"})
    h.__class__ = audited
    checked(h)
    assert type(h).__mro__[2] is audited
    unchecked(h)
    assert type(h) is audited
    checked(h)
    h.__class__ = type("PairingHeap", (type(h),), {"__slots__": (), "_layer": "audit"})
    with pytest.raises(RuntimeError, match="switch that one off first"):
        unchecked(h)


def test_checked_validates_its_arguments() -> None:
    with pytest.raises(ValueError, match="every"):
        checked(PairingHeap(), every=0)
    with pytest.raises(ValueError, match="full_every"):
        checked(PairingHeap(), full_every=0)
    with pytest.raises(TypeError, match=r"heapkit\.check"):
        checked([])  # type: ignore[type-var]


def test_checking_a_broken_heap_fails_at_once() -> None:
    h = PairingHeap([(1, "a"), (2, "b")])
    h.peek()._child._k = 0
    with pytest.raises(InvariantError):
        checked(h)
    assert type(h) is PairingHeap


# --- keys mutated in place by the user ------------------------------------------


def test_mutated_key_is_caught_at_the_next_operation_with_full_checks() -> None:
    h = checked(PairingHeap(), full_every=1)
    h.push([1], "a")
    k = [5]
    h.push(k, "five")
    k[0] = 0
    # After the failing push of [9] (hung as the root's first child), [0] is the root's child 1.
    with pytest.raises(HistoryError, match=r"heap-order' broken at root → child 1 entry \(\[0\], 'five'\)"):
        h.push([9], "nine")


def test_mutated_key_is_caught_by_the_local_check_of_an_op_that_touches_it() -> None:
    h = checked(BinaryHeap(), full_every=10**9)
    h.push([1], "a")
    three = h.push([3], "c")
    k = [5]
    h.push(k, "five")  # positions: [1] root, [3] child 0, [5] child 1
    k[0] = 0
    with pytest.raises(HistoryError, match=r"broken at root → child 1 entry \(\[0\], 'five'\)"):
        h.decrease_key(three, [2])  # re-checks the root and its children


# --- the re-entrancy guard ------------------------------------------------------


class Meddler:
    """A key whose `<` runs ``action`` once (pushing to or popping from its heap)."""

    def __init__(self, k: int, action: Any = None) -> None:
        self.k = k
        self.action = action

    def __lt__(self, other: Meddler) -> bool:
        act, self.action = self.action, None
        if act is not None:
            act()
        return self.k < other.k

    def __repr__(self) -> str:
        return f"M{self.k}"


# Kinds whose push compares: a key can only act in the middle of a push there.
PUSH_COMPARES = [n for n in NAMES if not monotone(n) and n not in PUSH_COMPARES_NOTHING]


@pytest.mark.parametrize("name", PUSH_COMPARES)
def test_a_key_pushing_mid_push_gets_runtime_error(name: str) -> None:
    h = checked(make(name, pairs=[(Meddler(5), "a"), (Meddler(7), "b")]))
    with pytest.raises(RuntimeError, match="in the middle of push"):
        h.push(Meddler(1, lambda: h.push(Meddler(0), "x")), "new")
    assert sorted(x.key.k for x in h) == [5, 7]
    heapkit.check(h)


@pytest.mark.parametrize("name", [n for n in NAMES if not monotone(n)])
def test_a_key_popping_mid_pop_gets_runtime_error(name: str) -> None:
    keys = [Meddler(k) for k in (3, 1, 4, 5, 9, 2, 6)]
    h = checked(make(name, pairs=[(k, k.k) for k in keys]))
    for k in keys:
        k.action = h.pop
    with pytest.raises(RuntimeError, match="in the middle of pop"):
        h.pop()
    for k in keys:
        k.action = None
    assert sorted(x.value for x in h) == [1, 2, 3, 4, 5, 6, 9]
    heapkit.check(h)


def test_the_kinds_own_inner_calls_pass_the_guard() -> None:
    h = checked(PairingHeap([(2, "b"), (1, "a")]))
    assert h.remove(h.peek()) == (1, "a")  # pairing's remove of the root calls pop
    assert _ext(h).history[-1][0] == "remove"
    h.extend([(0, "z"), (5, "e")])  # extend melds a heap it builds
    assert _ext(h).history[-1][0] == "extend"
    assert [k for k, _ in _ext(h).history[-1][1]] == [0, 5]


@pytest.mark.parametrize("name", NAMES)
def test_inner_calls_pass_the_guard_with_the_audit_stacked_above(name: str) -> None:
    # The audit's layer sits between checked mode and the kind: a kind's remove that
    # calls its own pop (hollow, pairing) must still count as internal.
    keys = [5, 3, 9, 1, 7, 2, 8]
    h = checked(make(name, pairs=[(k, k) for k in keys]))
    with heapkit.audit(h) as led:
        assert h.remove(h.peek()) == (1, 1)
        h.extend([(4, 4), (6, 6)])
        other = checked(make(name, pairs=[(10, 10)]))
        h.meld(other)
        out = [h.pop()[0] for _ in range(len(h))]
    assert out == sorted([*keys, 4, 6, 10])[1:]  # source: sorted
    assert led.violation_count == 0 and [r.op for r in led.records][:3] == ["remove", "extend", "meld"]


@pytest.mark.parametrize("name", PUSH_COMPARES)
def test_the_guard_still_stops_a_meddling_key_under_the_audit(name: str) -> None:
    h = checked(make(name, pairs=[(Meddler(5), "a"), (Meddler(7), "b")]))
    with heapkit.audit(h), pytest.raises(RuntimeError, match="in the middle of push"):
        h.push(Meddler(1, lambda: h.push(Meddler(0), "x")), "new")
    assert sorted(x.key.k for x in h) == [5, 7]
    heapkit.check(h)


def test_a_raising_key_leaves_a_checked_heap_whole() -> None:
    h = checked(PairingHeap([(1, "a"), (2, "b")]))
    with pytest.raises(TypeError):
        h.push("x", "str")  # str < int raises TypeError
    assert len(h) == 2
    heapkit.check(h)


# --- melds across modes -----------------------------------------------------------


@pytest.mark.parametrize("cls", [PairingHeap, BinaryHeap])
def test_checked_and_plain_heaps_meld_both_ways(cls: type) -> None:
    a = checked(cls([(5, "e"), (1, "a")]))
    b = cls([(3, "c")])
    three = b.peek()
    a.meld(b)
    assert three in a and len(b) == 0
    assert _ext(a).history[-1][0] == "meld"
    c = cls([(0, "z")])
    c.meld(a)  # a plain heap absorbs the checked one
    a.push(7, "g")  # a notices it changed outside checked mode
    assert ("outside",) in _ext(a).history
    assert [c.pop()[0] for _ in range(len(c))] == [0, 1, 3, 5]
    d = checked(cls([(4, "d")]))
    a.meld(d)
    assert _ext(d).history[-1] == ("melded_away",)
    assert [a.pop()[0] for _ in range(len(a))] == [4, 7]


# --- HEAPKIT_DEBUG ------------------------------------------------------------------


def test_heapkit_debug_makes_new_heaps_checked() -> None:
    code = (
        "import heapkit\n"
        "h = heapkit.PairingHeap([([2], 'b')])\n"
        "d = heapkit.new('dary')\n"
        "st = h._ext['checked']\n"
        "layers = [c.__dict__['_layer'] for c in type(d).__mro__ if '_layer' in c.__dict__]\n"
        "print(st.every, isinstance(h, heapkit.PairingHeap), *layers)\n"
        "k = [5]; x = h.push(k, 'five'); k[0] = 0\n"
        "try:\n"
        "    [h.push([9], 'n') for _ in range(3)]\n"
        "except heapkit.InvariantError as e:\n"
        "    print('caught', e.rules)\n"
    )
    out = run_python(code, "check:3, audit")
    assert out.returncode == 0, out.stderr
    # both modes stack: the audit (attached second) sits above checked mode
    assert out.stdout.split("\n")[:2] == ["3 True audit checked", "caught ('heap-order',)"]


def test_heapkit_debug_warns_about_unknown_values_and_ignores_them() -> None:
    # Issue 13: a typo in the environment must not stop the host program at import.
    for bad in ("chek", "check:0", "audit:2", "1", "CHECK"):
        out = run_python("import heapkit; print(type(heapkit.new('pairing')).__name__)", f"{bad}, check:2")
        assert out.returncode == 0, out.stderr
        assert f"ignoring unknown value {bad!r}" in out.stderr and "accepted: check, check:N" in out.stderr
        assert "checked mode (every 2nd operation) is on" in out.stderr
        assert out.stdout.strip() == "PairingHeap"
    out = run_python("import heapkit", "CHECK")
    assert "did you mean 'check'?" in out.stderr


def test_without_heapkit_debug_heaps_are_plain() -> None:
    out = run_python("import heapkit; print(type(heapkit.PairingHeap()) is heapkit.PairingHeap)", "")
    assert out.stdout.strip() == "True", out.stderr


# --- the local checks alone catch a kind's own mistakes ------------------------------


class Lazybones(BinaryHeap[Any, Any]):
    """A broken binary heap: push appends and never climbs."""

    __slots__ = ()

    def push(self, key: Any, value: Any) -> Any:
        x = super().push(key, value) if not self._a else None
        if x is None:
            x = type(self._a[0])(key, key, value, self._tok)
            x._i = len(self._a)
            self._a.append(x)
            self._n += 1
            self._ver += 1
        return x


@pytest.mark.parametrize("make", [Lazybones, Careless])
def test_local_checks_alone_catch_a_broken_operation(make: type) -> None:
    h = checked(make(), full_every=10**9)
    for k in (10, 20, 30, 40, 50):
        h.push(k, k)
    with pytest.raises(HistoryError) as info:
        if make is Careless:
            h.pop()
            h.decrease_key(next(x for x in h if x.key == 50), 1)
        else:
            h.push(1, 1)
    assert info.value.rules[0] == "heap-order"


def test_copies_and_pickles_of_a_checked_heap_are_plain() -> None:
    import copy
    import pickle

    h = checked(PairingHeap([(3, "c"), (1, "a")]))
    for twin in (copy.copy(h), pickle.loads(pickle.dumps(h))):
        assert type(twin) is PairingHeap
        assert [twin.pop() for _ in range(2)] == [(1, "a"), (3, "c")]
    assert len(h) == 2 and len(_ext(h).history) == 0


class NoHooks(PairingHeap[Any, Any]):
    """A kind without the local hooks: checked mode must survey it in full."""

    __slots__ = ()
    _touched = None  # type: ignore[assignment]
    surveys = 0

    def _survey(self, report: Any) -> dict[str, Any]:
        NoHooks.surveys += 1
        return super()._survey(report)


def test_kinds_without_local_hooks_get_a_full_check_after_each_due_operation() -> None:
    h = checked(NoHooks(), every=2, full_every=10**9)
    NoHooks.surveys = 0
    for k in range(6):
        h.push(k, k)
    assert NoHooks.surveys == 3  # operations 2, 4 and 6


def test_a_mutated_key_that_the_next_pop_tidies_away_is_still_caught() -> None:
    h = checked(PairingHeap(), full_every=1)
    for k in ([3], [1], [4]):
        h.push(k, str(k))
    k = [5]
    h.push(k, "five")
    k[0] = 0  # now the smallest, but not at the root
    with pytest.raises(HistoryError, match=r"'minimum' broken at the heap entry \(\[0\], 'five'\)"):
        h.pop()  # returns [1]; the pairing puts [0] on top


def test_heaps_heapkit_builds_for_its_own_use_are_left_plain() -> None:
    # extend builds its entries in a temporary heap; HEAPKIT_DEBUG must not audit that one
    code = (
        "import gc, heapkit\n"
        "got = []\n"
        "heapkit.audit.configure(report=got.append)\n"
        "h = heapkit.new('pairing')\n"
        "h.extend([(2, 'b'), (1, 'a')])\n"
        "gc.collect()\n"
        "layers = [c.__dict__['_layer'] for c in type(h).__mro__ if '_layer' in c.__dict__]\n"
        "print(len(got), *layers, h.pop())\n"
    )
    out = run_python(code, "check,audit")
    assert out.returncode == 0, out.stderr
    assert out.stdout.strip() == "0 audit checked (1, 'a')"
