"""Hostile keys and handles (issue 12): NaN inside tuple keys, huge radix keys,
peek naming what pop returns, handles of another kind, values kept alive.
"""

from __future__ import annotations

import gc
import math
import random
import weakref
from typing import Any

import pytest

import heapkit
from heapkit.errors import nan_inside
from heapkit.kinds.radix import heap as radix
from tests.kinds import NAMES, make

NAN = float("nan")
ORDERED = [n for n in NAMES if n != "radix"]  # radix takes only ints

#: NaN at the top, inside, and deep inside a tuple; math.isnan is the outside truth.
HOSTILE = [(NAN, 0), (0, NAN), (1, (2, (NAN,))), ((((NAN,),),),)]


def test_nan_inside_finds_nan_at_any_depth_without_recursion() -> None:
    for key in HOSTILE:
        assert nan_inside(key)
    assert not nan_inside((1, "a", (2.5, ())))
    deep: Any = (NAN,)
    for _ in range(100_000):  # deeper than the recursion limit
        deep = (deep,)
    assert nan_inside(deep)
    # outside check: math.isnan agrees on the flat values
    assert all(nan_inside(x) == math.isnan(x) for x in (NAN, 0.0, math.inf, -math.inf))


@pytest.mark.parametrize("name", ORDERED)
def test_checked_mode_refuses_nan_inside_a_tuple_key(name: str) -> None:
    for stable in (False, True):
        h = heapkit.checked(make(name, stable, [((k, 0), k) for k in (3, 1, 2)]))
        x = h.peek()
        before = sorted((y.key, y.value) for y in h)
        for key in HOSTILE:
            with pytest.raises(heapkit.KeyOrderError, match="push"):
                h.push(key, "bad")
            with pytest.raises(heapkit.KeyOrderError, match="extend"):
                h.extend(iter([((0, 0), "ok"), (key, "bad")]))
            with pytest.raises(heapkit.KeyOrderError, match="change_key"):
                h.change_key(x, key)
            with pytest.raises(heapkit.KeyOrderError, match="decrease_key"):
                h.decrease_key(x, key)
        assert sorted((y.key, y.value) for y in h) == before
        h.extend(iter([((0, 0), "ok")]))  # a generator of good pairs still works
        heapkit.check(h)


@pytest.mark.parametrize("name", ORDERED)
def test_check_flags_a_key_holding_nan(name: str) -> None:
    # A bare heap tests only key != key on the way in (README: what is refused where).
    h = make(name, False, [((k, 0), k) for k in (3, 1, 2)])
    h.push((NAN, 0), "bad")
    with pytest.raises(heapkit.InvariantError, match="rule 'key'"):
        heapkit.check(h)


@pytest.mark.parametrize("name", NAMES)
def test_peek_names_the_entry_pop_returns(name: str) -> None:
    # Protocol rule (/work/shared/design/api.md, round 2), on many ties.
    rng = random.Random(12)
    h = make(name)
    handles = []
    for step in range(3000):
        r = rng.random()
        live = [x for x in handles if x.alive]
        if r < 0.5 or not h:
            base = getattr(h, "last", 0)
            handles.append(h.push(base + rng.randrange(4), step))
        elif r < 0.65 and live:
            h.remove(rng.choice(live))
        else:
            top = h.peek()
            named = (top.key, top.value)
            assert h.pop() == named
    assert len(h) == sum(x.alive for x in handles)


def test_lazy_peek_after_stale_entries_the_issue_repro() -> None:
    h = make("lazy")
    hs = [h.push(k, v) for k, v in ((0, 0), (0, 1), (1, 2), (1, 3))]
    h.pop()
    h.remove(hs[3])
    h.push(0, 6)
    h.remove(hs[2])
    top = h.peek()
    assert h.pop() == (top.key, top.value)


def test_radix_refuses_a_huge_key_cheaply_and_trims_buckets() -> None:
    h = make("radix")
    with pytest.raises(heapkit.KeyOrderError, match="too large"):
        h.push(1 << 4_000_000, "huge")
    assert len(h) == 0 and len(h._buckets) == 1  # type: ignore[attr-defined]
    big = (1 << radix.MAX_BITS) - 1
    x = h.push(big, "big")
    h.push(3, "small")
    with pytest.raises(heapkit.KeyOrderError, match="change_key"):
        h.change_key(x, 1 << radix.MAX_BITS)
    assert x.key == big
    assert h.pop() == (3, "small") and h.pop() == (big, "big")
    # every bucket above the last popped key's is gone again
    assert len(h._buckets) == 1  # type: ignore[attr-defined]
    heapkit.check(h)


@pytest.mark.parametrize("name", NAMES)
def test_a_live_handle_of_another_kind_is_an_invalid_handle(name: str) -> None:
    here = make(name, False, [(1, "a")])
    for other in NAMES:
        if other == name:
            continue
        x = make(other, False, [(2, "b")]).peek()
        for op in ("decrease_key", "change_key"):
            with pytest.raises(heapkit.InvalidHandleError, match=r"belongs to (a heap of )?another"):
                getattr(here, op)(x, 0 if name != "radix" else 1)
        with pytest.raises(heapkit.InvalidHandleError, match=r"belongs to (a heap of )?another"):
            here.remove(x)
    assert len(here) == 1
    with pytest.raises(TypeError):
        here.remove(object())


class Payload:
    """A value we can watch with weakref."""


def test_rank_pairing_lets_go_of_popped_and_removed_values() -> None:
    rng = random.Random(3)
    h = heapkit.new("rank-pairing")
    refs = []
    handles = []
    for _ in range(300):
        p = Payload()
        refs.append(weakref.ref(p))
        handles.append(h.push(rng.randrange(40), p))
    del p
    for _ in range(80):
        h.pop()
    for x in handles[::3]:
        if x.alive:
            h.remove(x)
    for x in handles[1::3]:
        if x.alive:
            h.decrease_key(x, x.key - 5)
    for _ in range(30):
        h.pop()
    live = sum(x.alive for x in handles)
    del handles, x
    gc.collect()
    assert sum(r() is not None for r in refs) == live == len(h)
