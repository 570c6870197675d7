"""Facts of the lazy kind: stale entries, compaction, failure repair, its rules.

The protocol itself is covered for every kind by ``test_conformance.py``.
"""

from __future__ import annotations

import copy
import heapq
import pickle
import random
import sys
from collections.abc import Callable
from fractions import Fraction
from typing import Any

import pytest

import heapkit
from heapkit.kinds.lazy import LazyHeap
from heapkit.kinds.lazy.entries import _Handle, _Ord
from tests.fuses import MODES, Boom, Poison


class Fuse:
    """Comparison budget shared by every ``Bomb`` key: ``left`` more may succeed."""

    left = -1
    count = 0
    mode = MODES[0]  # how the failing comparison fails


class Bomb:
    """A key whose ``<`` counts itself and raises when the budget runs out."""

    __slots__ = ("v",)

    def __init__(self, v: int) -> None:
        self.v = v

    def __lt__(self, other: Bomb) -> Any:
        Fuse.count += 1
        if Fuse.left == 0:
            if Fuse.mode == MODES[0]:
                raise Boom
            return Poison()
        Fuse.left -= 1
        return self.v < other.v

    def __sub__(self, d: int) -> Bomb:
        return Bomb(self.v - d)

    def __repr__(self) -> str:
        return f"Bomb({self.v})"


def _state(h: LazyHeap[Any, Any]) -> tuple[Any, ...]:
    """What a failed operation must leave as it was: the live entries, and the
    list exactly unless a compaction replaced it (then: the live entries only)."""
    live = sorted(((x.value, x.key.v) for x in h), key=repr)
    return (h._a, list(h._a), h._stale, len(h), live)


def _same(before: tuple[Any, ...], h: LazyHeap[Any, Any]) -> bool:
    after = _state(h)
    if after[0] is before[0]:
        return after[1:] == before[1:]
    live = {id(e) for e in before[1] if e[1]._e is e}
    return {id(e) for e in after[1]} == live and after[2] == 0 and after[3:] == before[3:]


# --- fault injection --------------------------------------------------------
def _setup(stale_heavy: bool, seed: int) -> tuple[LazyHeap[Any, Any], list[Any]]:
    rnd = random.Random(seed)
    h: LazyHeap[Any, Any] = LazyHeap()
    hs = [h.push(Bomb(rnd.randrange(20)), i) for i in range(13)]
    for x in hs[:3]:
        h.decrease_key(x, x.key - 3)
    h.remove(hs[5])
    if stale_heavy:  # bring stale up to len(heap): the next operation compacts
        for x in hs[6:]:
            if h._stale >= len(h) - 1:
                break
            h.change_key(x, Bomb(rnd.randrange(20)))
        while h._stale < len(h):
            h.remove(next(x for x in hs if x.alive))
    return h, [x for x in hs if x.alive]


def _ops() -> dict[str, Callable[[LazyHeap[Any, Any], list[Any]], object]]:
    def meld(h: LazyHeap[Any, Any], hs: list[Any], k: int) -> None:
        o: LazyHeap[Any, Any] = LazyHeap()
        o.extend([(Bomb(v), -v) for v in range(k)])
        Fuse.left = Fuse.budget  # type: ignore[attr-defined]
        h.meld(o)

    return {
        "push": lambda h, hs: h.push(Bomb(-1), "new"),
        "pop": lambda h, hs: h.pop(),
        "peek": lambda h, hs: h.peek(),
        "decrease_key": lambda h, hs: h.decrease_key(hs[-1], Bomb(-5)),
        "change_key": lambda h, hs: h.change_key(hs[0], Bomb(30)),
        "remove": lambda h, hs: h.remove(hs[1]),
        "extend": lambda h, hs: h.extend([(Bomb(v), v) for v in (7, -2, 4)]),
        "meld-small": lambda h, hs: meld(h, hs, 1),
        "meld-large": lambda h, hs: meld(h, hs, 9),
    }


def fault_sweep(mode: str = MODES[0]) -> int:
    """Every operation, every comparison position: the failure (as ``mode`` says) leaves
    the exact state.

    Returns how many failures were injected.
    """
    Fuse.mode = mode
    injected = 0
    for name, op in _ops().items():
        for stale_heavy in (False, True):
            for seed in range(3):
                budget = 0
                while True:
                    h, hs = _setup(stale_heavy, seed)
                    before = _state(h)
                    Fuse.left = Fuse.budget = budget  # type: ignore[attr-defined]
                    try:
                        op(h, hs)
                    except Boom:
                        Fuse.left = -1
                        injected += 1
                        where = f"{name} stale_heavy={stale_heavy} seed={seed} budget={budget}"
                        if not _same(before, h):
                            raise AssertionError(f"state changed after a failure in {where}") from None
                        if not all(x.alive and x in h for x in hs):
                            raise AssertionError(f"a handle died in {where}") from None
                        heapkit.check(h)
                        budget += 1
                        continue
                    Fuse.left = -1
                    heapkit.check(h)
                    break
    return injected


@pytest.mark.parametrize("mode", MODES)
def test_a_failing_comparison_leaves_every_operation_as_it_was(mode: str) -> None:
    # Every comparison position of push, pop, peek, decrease_key, change_key,
    # remove (with compaction), extend and meld (both strategies) fails once.
    try:
        assert fault_sweep(mode) > 200
    finally:
        Fuse.mode = MODES[0]


def test_the_repairs_undo_heapq_exactly() -> None:
    # heappush/heappop on a plain list with a raising key, repaired, equals the list before.
    from heapkit.kinds.lazy.entries import _unpop, _unpush

    for budget in range(12):
        base = [Bomb(v) for v in range(31)]
        a = list(base)
        x = Bomb(-1)
        Fuse.left = budget
        try:
            heapq.heappush(a, x)
        except Boom:
            _unpush(a, x)
        else:
            _unpush(a, x)  # also undoes a completed push
        Fuse.left = -1
        assert a == base
        a = list(base)
        Fuse.left = budget
        try:
            heapq.heappop(a)
            Fuse.left = -1
        except Boom:
            Fuse.left = -1
            _unpop(a, base[0], base[-1])
            assert a == base


# --- stale entries and compaction ---------------------------------------------
def test_stale_entries_are_counted_and_compacted() -> None:
    h: LazyHeap[int, str] = LazyHeap()
    xs = [h.push(10 + i, str(i)) for i in range(8)]
    for x in xs[:5]:
        h.decrease_key(x, x.key - 10)
    assert (len(h._a), h._stale) == (13, 5)
    h.remove(xs[6])
    h.remove(xs[7])
    assert (len(h), h._stale) == (6, 7)
    # stale (7) >= len (6): the next operation rebuilds the list with live entries only.
    assert h.pop() == (0, "0")
    assert (len(h._a), h._stale) == (5, 0)
    assert sorted(x.key for x in h) == [1, 2, 3, 4, 15]
    assert [h.pop()[0] for _ in range(5)] == [1, 2, 3, 4, 15]


def test_stale_entries_never_outnumber_live_ones_by_more_than_one() -> None:
    rnd = random.Random(7)
    h: LazyHeap[int, int] = LazyHeap()
    xs = [h.push(rnd.randrange(100), i) for i in range(300)]
    for _ in range(3000):
        live = [x for x in xs if x.alive]
        r = rnd.random()
        if not live or r < 0.2:
            xs.append(h.push(rnd.randrange(100), 0))
        elif r < 0.5:
            h.change_key(rnd.choice(live), rnd.randrange(100))
        elif r < 0.7:
            h.remove(rnd.choice(live))
        else:
            h.pop()
        assert h._stale <= len(h) + 1
        assert len(h._a) == len(h) + h._stale
    heapkit.check(h)


def test_dead_handles_keep_their_key_and_entries_are_three_tuples() -> None:
    h: LazyHeap[Any, str] = LazyHeap()
    x = h.push(3, "c")
    e = x._e
    assert type(e) is tuple and len(e) == 3 and e[1] is x and e[2] is h._tok
    assert h.pop() == (3, "c")
    assert not x.alive and x.key == 3 and x._e == 3
    t: LazyHeap[Any, str] = LazyHeap()
    y = t.push((1, "tuple key"), "t")
    assert type(y._e[0]) is _Ord  # bare, a tuple key would have its == called
    assert y.key == (1, "tuple key")
    assert x.__slots__ == ("_e", "value") and not hasattr(x, "__dict__")


def test_handle_and_entry_sizes() -> None:
    # CPython object sizes (recalled from memory, 64-bit builds): a tuple is 24
    # bytes + 8 per item, a slotted object 16 + 8 per slot, each plus a 16-byte
    # GC header, which sys.getsizeof includes: 48 for the handle, 64 for the entry.
    # The compiled build's handle base (a mypyc class) adds its vtable pointer: 8 more.
    h: LazyHeap[float, int] = LazyHeap()
    x = h.push(0.5, 1)
    assert sys.getsizeof(x) == 48 + (8 if heapkit.COMPILED else 0)
    assert sys.getsizeof(x._e) == 64


# --- outside checks -----------------------------------------------------------
def _sequences() -> dict[str, list[int]]:
    rnd = random.Random(3)
    n = 400
    return {
        "random": [rnd.randrange(1000) for _ in range(n)],
        "sorted": list(range(n)),
        "reversed": list(range(n, 0, -1)),
        "all-equal": [5] * n,
        "sawtooth": [i % 17 for i in range(n)],
    }


@pytest.mark.parametrize("name", list(_sequences()))
def test_pop_order_matches_heapq(name: str) -> None:
    keys = _sequences()[name]
    h: LazyHeap[int, int] = LazyHeap()
    xs = [h.push(k, i) for i, k in enumerate(keys)]
    for x in xs[::7]:
        h.decrease_key(x, x.key - 3)
    for x in xs[3::11]:
        h.remove(x)
    # Source: the heapq module on the same final keys.
    ref = [x.key for x in xs if x.alive]
    heapq.heapify(ref)
    expect = [heapq.heappop(ref) for _ in range(len(ref))]
    assert [h.pop()[0] for _ in range(len(h))] == expect


@pytest.mark.parametrize("name", list(_sequences()))
def test_comparisons_match_heapq(name: str) -> None:
    # n pushes then n pops run the same C algorithm as heapq (source: heapq on
    # the same keys), so the counts of the user's < agree exactly.
    keys = _sequences()[name]
    Fuse.count = 0
    ref: list[Bomb] = []
    for k in keys:
        heapq.heappush(ref, Bomb(k))
    while ref:
        heapq.heappop(ref)
    expect = Fuse.count
    Fuse.count = 0
    h: LazyHeap[Bomb, None] = LazyHeap()
    for k in keys:
        h.push(Bomb(k), None)
    while h:
        h.pop()
    assert Fuse.count == expect


def test_copy_deepcopy_and_pickle_keep_the_exact_list() -> None:
    h: LazyHeap[Any, str] = LazyHeap(stable=False)
    xs = [h.push(k, str(k)) for k in (5, 3, 8, 1, 9, 2)]
    h.decrease_key(xs[2], 0)
    h.remove(xs[4])
    for twin in (copy.copy(h), copy.deepcopy(h), pickle.loads(pickle.dumps(h))):
        assert [e[0] for e in twin._a] == [e[0] for e in h._a]
        assert twin._stale == h._stale == 2
        heapkit.check(twin)
        assert [twin.pop() for _ in range(len(twin))] == [(0, "8"), (1, "1"), (2, "2"), (3, "3"), (5, "5")]


# --- every rule, corrupted ------------------------------------------------------
def _heap() -> tuple[LazyHeap[int, str], list[Any]]:
    h: LazyHeap[int, str] = LazyHeap()
    xs = [h.push(k, f"v{k}") for k in (1, 4, 2, 7, 5, 6, 3)]
    h.decrease_key(xs[3], 0)  # one stale entry: (7, xs[3]) stays in the list
    return h, xs


def _corrupt_heap_order(h: LazyHeap[int, str], xs: list[Any]) -> str:
    i = next(i for i, e in enumerate(h._a) if e[1] is xs[0])
    j = len(h._a) - 1
    h._a[i], h._a[j] = h._a[j], h._a[i]
    return "v1"


def _corrupt_stale_count(h: LazyHeap[int, str], xs: list[Any]) -> str:
    h._stale += 1
    return "stale entries"


def _corrupt_entry(h: LazyHeap[int, str], xs: list[Any]) -> str:
    # Duplicate the largest live entry at the end, where heap order still holds,
    # and drop the stale entry so the counters stay right.
    stale = next(e for e in h._a if e[1]._e is not e)
    h._a.remove(stale)
    h._stale -= 1
    heapq.heapify(h._a)
    h._a.append(xs[5]._e)
    return "v6"


def _corrupt_size(h: LazyHeap[int, str], xs: list[Any]) -> str:
    h._n += 1
    return "live entries"


def _corrupt_stale_bound(h: LazyHeap[int, str], xs: list[Any]) -> str:
    for x in xs[1:]:
        x._e = x._e[0]
    h._stale += 6
    h._n = 1
    return "stale entries for 1"


def _corrupt_bare_keys(h: LazyHeap[int, str], xs: list[Any]) -> str:
    i = h._a.index(xs[2]._e)
    e = (Fraction(2), xs[2], h._tok)  # bare: its == would be called by tuple comparison
    h._a[i] = e
    xs[2]._e = e
    return "Fraction(2, 1)"


def _corrupt_ownership(h: LazyHeap[int, str], xs: list[Any]) -> str:
    i = h._a.index(xs[4]._e)
    e = (xs[4]._e[0], xs[4], heapkit.KINDS["lazy"]()._tok)
    h._a[i] = e
    xs[4]._e = e
    return "v5"


CORRUPTIONS = {
    "heap-order": _corrupt_heap_order,
    "stale-count": _corrupt_stale_count,
    "entry": _corrupt_entry,
    "size": _corrupt_size,
    "stale-bound": _corrupt_stale_bound,
    "bare-keys": _corrupt_bare_keys,
    "ownership": _corrupt_ownership,
}


def test_every_rule_has_a_corruption() -> None:
    assert set(CORRUPTIONS) == set(LazyHeap.RULES)


@pytest.mark.parametrize("rule", sorted(CORRUPTIONS))
def test_check_names_the_broken_rule(rule: str) -> None:
    h, xs = _heap()
    heapkit.check(h)
    mark = CORRUPTIONS[rule](h, xs)
    with pytest.raises(heapkit.InvariantError) as info:
        heapkit.check(h)
    text = str(info.value)
    assert f"rule {rule!r}" in text and mark in text, text
    broken = {p.split("'")[1] for p in info.value.problems}
    assert broken == {rule}, text


def test_handles_are_not_ordered() -> None:
    a: _Handle[int, int] = LazyHeap().push(1, 1)
    b: _Handle[int, int] = LazyHeap().push(1, 1)
    assert not (a < b) and not (b < a)


def test_stable_and_wrapped_keys_survive_copy_and_pickle() -> None:
    for stable in (False, True):
        h: LazyHeap[Any, int] = LazyHeap(stable=stable)
        xs = [h.push(Fraction(k, 3), i) for i, k in enumerate((4, 1, 4, 2, 4, 1))]
        h.change_key(xs[1], Fraction(4, 3))
        h.remove(xs[3])
        # Source: sorted() on (key, push order) gives the stable pop order.
        expect = sorted(((x.key, i) for i, x in enumerate(xs) if x.alive), key=lambda p: p)
        for twin in (copy.copy(h), copy.deepcopy(h), pickle.loads(pickle.dumps(h))):
            heapkit.check(twin)
            got = [twin.pop() for _ in range(len(twin))]
            if stable:
                assert got == expect
            else:
                assert sorted(got) == expect


def test_audit_hooks_keep_the_documented_amortized_bounds() -> None:
    # amortized = actual + PHI_C * (phi after - phi before), as the auditor computes it.
    rnd = random.Random(11)
    h: LazyHeap[int, int] = LazyHeap()
    xs: list[Any] = []
    seen: set[str] = set()
    for step in range(4000):
        live = [x for x in xs if x.alive]
        r = rnd.random()
        if not live or r < 0.25:
            op, target = "push", None
        elif r < 0.45:
            op, target = "decrease_key", rnd.choice(live)
        elif r < 0.6:
            op, target = "change_key", rnd.choice(live)
        elif r < 0.75:
            op, target = "remove", rnd.choice(live)
        elif r < 0.97:
            op, target = "pop", None
        else:
            op = "meld"
            target = LazyHeap([(rnd.randrange(50), -1) for _ in range(rnd.choice((1, 40)))])
        n = len(h) + (len(target) if op == "meld" else 0)
        phi = h._phi()
        probe = h._cost_probe(op, target)
        if op == "push":
            target = h.push(rnd.randrange(100), step)
            xs.append(target)
        elif op == "decrease_key":
            h.decrease_key(target, target.key - rnd.randrange(5))
        elif op == "change_key":
            h.change_key(target, rnd.randrange(100))
        elif op == "remove":
            h.remove(target)
        elif op == "pop":
            h.pop()
        else:
            xs.extend(target)
            h.meld(target)
        actual = h._cost(op, probe, None if op == "pop" else target)
        assert actual >= 0
        assert actual + h.PHI_C * (h._phi() - phi) <= h._bound(op, n), (op, step)
        seen.add(op)
    assert len(seen) == 6


def test_local_survey_passes_after_operations_and_sees_a_bad_root() -> None:
    from heapkit.contracts import Report

    h: LazyHeap[int, str] = LazyHeap([(k, str(k)) for k in (4, 2, 6, 1)])
    x = h.push(0, "0")
    report = Report()
    h._survey_local(report, h._touched("push", None), x)
    assert report.problems == []
    h._a[0], h._a[1] = h._a[1], h._a[0]
    h._survey_local(report, None, x)
    assert report.rules == ["heap-order"]


def test_map_order_rebuilds_entries_without_comparing() -> None:
    h: LazyHeap[Any, int] = LazyHeap([(Bomb(v), v) for v in (3, 1, 2)])
    x = h.peek()
    h.decrease_key(x, Bomb(0))
    Fuse.count = 0
    h._map_order(lambda o, key: o)
    assert Fuse.count == 0
    heapkit.check(h)
    assert [h.pop()[1] for _ in range(3)] == [1, 2, 3]
