"""The weak heap's own facts: its comparison counts against log2(n!), heapq and every
other kind, its construction and sorting counts from the published analyses, every
rule able to fail, and a raising ``<`` or ``bool()`` losing nothing."""

from __future__ import annotations

import functools
import math
import random
from collections.abc import Callable
from typing import Any, ClassVar

import pytest

import heapkit
from heapkit import WeakHeap
from heapkit._core import Owner
from heapkit.bench.measure import Counted, comparisons, dijkstra_comparisons, log2_factorial
from heapkit.bench.workloads import WORKLOADS
from heapkit.kinds.weak.heap import d_ancestor
from tests.corruption import assert_breaks

# --- comparison counts -------------------------------------------------------------


def test_push_pop_comparisons_within_1_10_log2_factorial() -> None:
    n = 100_000
    got = comparisons({"weak": WeakHeap}, n)
    # Source: log2(n!) = math.lgamma(n + 1) / math.log(2), the comparison-sorting lower
    # bound (Knuth, TAOCP vol. 3, 5.3.1); 1.10 is issue 15's target.  heapq, counted
    # with the same Counted key on the same keys, needs about 1.16 log2(n!).
    assert got["weak"] <= 1.10 * log2_factorial(n)
    assert got["weak"] < got["heapq"]


@pytest.mark.parametrize("n", [2, 3, 5, 10, 17, 100, 1000, 4096, 5000])
def test_construction_and_sort_counts_match_the_published_analysis(n: int) -> None:
    rng = random.Random(n)
    h: WeakHeap[Counted, int] = WeakHeap()
    h.extend((Counted(rng.random()), i) for i in range(n))
    Counted.count = 0
    h.peek()
    # Source: Dutton 1993 (recalled from memory): building a weak heap bottom-up joins
    # every position but the root with its distinguished ancestor, n - 1 comparisons.
    assert Counted.count == n - 1
    out = [h.pop()[0].v for _ in range(n)]
    assert out == sorted(out)  # Source: Python's sorted()
    lg = math.ceil(math.log2(n))
    # Source: weak-heapsort needs at most n*ceil(log2 n) - 2^ceil(log2 n) + n - 1
    # comparisons, construction included (Dutton 1993; Edelkamp, Elmasry, Katajainen
    # 2012; recalled from memory).
    assert Counted.count <= n * lg - 2**lg + n - 1


@functools.cache
def _dijkstra_counts(name: str) -> dict[str, int]:
    adj, src, _ = WORKLOADS[name].make(0.01)
    return dijkstra_comparisons(heapkit.KINDS, adj, src)


@pytest.mark.parametrize("name", ["dijkstra-sparse", "dijkstra-grid"])
def test_fewest_comparisons_of_any_kind_on_dijkstra(name: str) -> None:
    counts = _dijkstra_counts(name)
    # Source: every other kind and the heapq idiom of the Python docs, counted with the
    # same Counted key on the same graph (dijkstra_comparisons checks that all of them
    # reach heapq's distances).
    others = {k: c for k, c in counts.items() if k != "weak"}
    assert set(others) >= {"heapq", "binary", "pairing", "fibonacci"}
    assert counts["weak"] < min(others.values()), counts


def test_meld_compares_nothing_and_the_next_pop_settles() -> None:
    rng = random.Random(3)
    a: WeakHeap[Counted, int] = WeakHeap([(Counted(rng.random()), i) for i in range(300)])
    a.peek()
    b: WeakHeap[Counted, int] = WeakHeap([(Counted(rng.random()), -i) for i in range(200)])
    Counted.count = 0
    a.meld(b)
    # Source: common practice for array heaps (appending moves entries, compares none).
    assert Counted.count == 0
    out = [a.pop()[0].v for _ in range(len(a))]
    assert out == sorted(out) and len(out) == 500  # Source: Python's sorted()


def test_d_ancestor_follows_the_reverse_bits() -> None:
    r = bytearray(8)
    # With every bit 0 the left child of i is 2i: position 6 = 2*3 is a left child, 3 a
    # right child of 1, so 6's distinguished ancestor is 1 (Dutton 1993, recalled).
    assert d_ancestor(r, 6) == 1 and d_ancestor(r, 7) == 3 and d_ancestor(r, 1) == 0
    r[3] = 1  # now 6 is the right child of 3
    assert d_ancestor(r, 6) == 3 and d_ancestor(r, 7) == 1


# --- every rule can fail -------------------------------------------------------------


# Keys 0..9 pushed in order, then settled: no join swaps, so the array is [0..9] with every
# reverse bit 0.  Position i's children are 2i (left) and 2i + 1 (right); 5 is the right
# child of 2, the left child of 1, the right child of the root (common practice: the
# weak-heap indexing of Dutton 1993, recalled from memory).
def _tens() -> Any:
    h: WeakHeap[int, str] = WeakHeap()
    for k in range(10):
        h.push(k, f"v{k}")
    h.peek()
    return h


PATH5 = ["root", "right", "left", "right"]


def _weak_order() -> tuple[Any, str, Any, list[str]]:
    h = _tens()
    x = h._a[5]
    x._key = x._k = -1  # below its distinguished ancestor, position 2
    return h, "weak-order", x, PATH5


def _root() -> tuple[Any, str, Any, list[str]]:
    h = _tens()
    h._r[0] = 1
    return h, "root", h._a[0], ["root"]


def _bits() -> tuple[Any, str, Any, list[str]]:
    h = _tens()
    h._r[7] = 1  # 7 has no child in 10 positions
    return h, "reverse-bits", h._a[7], ["root", "right", "right", "right"]


def _pending() -> tuple[Any, str, Any, list[str]]:
    h = _tens()
    h._s = 99
    return h, "pending", None, []


def _index() -> tuple[Any, str, Any, list[str]]:
    h = _tens()
    x = h._a[5]
    x._i = 7
    return h, "index", x, PATH5


def _size() -> tuple[Any, str, Any, list[str]]:
    h = _tens()
    h._n = 11
    return h, "size", None, []


def _ownership() -> tuple[Any, str, Any, list[str]]:
    h = _tens()
    x = h._a[5]
    x._tok = Owner()
    return h, "ownership", x, PATH5


CORRUPTIONS: dict[str, Callable[[], tuple[Any, str, Any, list[str]]]] = {
    "weak-order": _weak_order,
    "root": _root,
    "reverse-bits": _bits,
    "pending": _pending,
    "index": _index,
    "size": _size,
    "ownership": _ownership,
}


def test_every_rule_has_a_corruption_test() -> None:
    assert set(CORRUPTIONS) == set(WeakHeap.RULES)


@pytest.mark.parametrize("rule", sorted(CORRUPTIONS))
def test_each_rule_can_fail(rule: str) -> None:
    heap, name, handle, path = CORRUPTIONS[rule]()
    heapkit.check(_tens())  # the uncorrupted heap passes
    assert_breaks(heap, name, handle, path)


def test_pending_positions_are_exempt_until_settled() -> None:
    h: WeakHeap[int, int] = WeakHeap([(5, 0)])
    h.peek()
    h.push(1, 1)  # below the root, but pending
    assert heapkit.check(h).details["pending"] == 1
    assert h.peek().key == 1  # settles; Source: min() of the keys
    assert heapkit.check(h).details["pending"] == 0


# --- a raising < or bool() -----------------------------------------------------------


class Boom(Exception):
    pass


class Verdict:
    """A comparison result whose truth value raises."""

    def __bool__(self) -> bool:
        raise Boom


class Touchy:
    """An int key: after ``budget`` comparisons its ``<`` raises, or returns a result
    whose ``bool()`` raises (``mode``)."""

    __slots__ = ("v",)
    budget: ClassVar[int | None] = None
    mode: ClassVar[str] = "lt"

    def __init__(self, v: int) -> None:
        self.v = v

    def __lt__(self, other: Touchy) -> Any:
        if Touchy.budget is not None:
            if Touchy.budget == 0:
                if Touchy.mode == "lt":
                    raise Boom
                return Verdict()
            Touchy.budget -= 1
        return self.v < other.v


def _op(name: str, h: Any, hs: list[Any]) -> Callable[[], Any]:
    other = h._spawn()
    for i in range(5):
        other.push(Touchy(i * 7), 100 + i)
    return {
        "push": lambda: h.push(Touchy(3), -1),
        "peek": h.peek,
        "pop": h.pop,
        "decrease_key": lambda: h.decrease_key(hs[4], Touchy(hs[4].key.v - 30)),
        "change_key up": lambda: h.change_key(hs[6], Touchy(hs[6].key.v + 30)),
        "change_key down": lambda: h.change_key(hs[8], Touchy(hs[8].key.v - 30)),
        "remove": lambda: h.remove(hs[10]),
        "meld": lambda: h.meld(other),
        "extend": lambda: h.extend([(Touchy(v), 200 + v) for v in range(9, 0, -1)]),
    }[name]


OPS = ["push", "peek", "pop", "decrease_key", "change_key up", "change_key down", "remove", "meld", "extend"]


@pytest.mark.parametrize("mode", ["lt", "bool"])
@pytest.mark.parametrize("stable", [False, True])
@pytest.mark.parametrize("op", OPS)
def test_a_raising_comparison_or_truth_value_loses_nothing(op: str, stable: bool, mode: str) -> None:
    Touchy.mode = mode
    for pending in (False, True):  # with and without pushes left to settle
        budget = 0
        while True:
            rng = random.Random(budget)
            h: WeakHeap[Touchy, int] = WeakHeap(stable=stable)
            hs = [h.push(Touchy(rng.randrange(40)), i) for i in range(40)]
            if not pending:
                h.peek()
            before = sorted((x.key.v, x.value) for x in h)
            live = list(h)
            Touchy.budget = budget
            try:
                _op(op, h, hs)()
            except Boom:
                Touchy.budget = None
                heapkit.check(h)
                assert sorted((x.key.v, x.value) for x in h) == before, (op, budget)
                assert all(x.alive and x in h for x in live)
            else:
                Touchy.budget = None
                heapkit.check(h)
                break
            finally:
                Touchy.budget = None
            out = [h.pop()[0].v for _ in range(len(h))]
            assert out == sorted(out)  # Source: Python's sorted()
            budget += 1


def test_the_audit_unit_is_the_comparisons_made() -> None:
    rng = random.Random(8)
    h: WeakHeap[Counted, int] = WeakHeap()
    hs = []
    for step in range(3000):
        before, Counted.count = h._work, 0
        r = rng.random()
        if r < 0.4 or len(h) < 3:
            hs.append(h.push(Counted(rng.random()), step))
        elif r < 0.6:
            h.pop()
        else:
            x = rng.choice([x for x in hs[-50:] if x.alive] or [h.peek()])
            if r < 0.75:
                h.decrease_key(x, Counted(x.key.v - rng.random() / 4))
            elif r < 0.9:
                h.change_key(x, Counted(rng.random()))
            else:
                h.remove(x)
        # Source: the Counted key itself (heapkit.bench.measure), counting every `<`.
        assert h._work - before == Counted.count, step
