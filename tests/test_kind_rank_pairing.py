"""Facts of the rank-pairing kind: type-2 ranks, the size bound, the rank bound,
every rule's corruption caught by ``heapkit.check``, pop order against ``heapq`` and
``sorted``, exception safety under failing comparisons, depth beyond the recursion
limit, and the audit SPI's amortized bounds.

The rank rule and the size bound are recalled from memory of B. Haeupler, S. Sen,
R. E. Tarjan, "Rank-pairing heaps", SIAM J. Comput. 40(6) (2011): in a type-2
heap every non-root node is a 1,1-, 1,2- or 0,i-node (i > 1), a root is one above
its left child, and a half-tree of rank r has at least F(r+2) >= phi**r nodes.
"""

from __future__ import annotations

import copy
import heapq
import math
import pickle
import random
import sys
from collections.abc import Callable
from typing import Any

import pytest

import heapkit
from heapkit._core import Owner
from heapkit.contracts import Report
from heapkit.kinds.rank_pairing import RankPairingHeap
from heapkit.kinds.rank_pairing.heap import _Node
from tests.fuses import MODES, Boom, Fuse, assert_unchanged

PHI = (1 + math.sqrt(5)) / 2  # golden ratio, from math.sqrt


def fib(m: int) -> int:
    """F(m) with F(1) = F(2) = 1, computed here and independent of heapkit."""
    a, b = 0, 1
    for _ in range(m):
        a, b = b, a + b
    return a


def rank_of(x: Any) -> int:
    return -1 if x is None else int(x._rank)


def roots_of(h: Any) -> list[Any]:
    out: list[Any] = []
    x = h._first
    while x is not None:
        out.append(x)
        x = x._next
        if x is h._first:
            break
    return out


def subtree(x: Any) -> list[Any]:
    out: list[Any] = []
    stack = [x]
    while stack:
        y = stack.pop()
        out.append(y)
        stack.extend(c for c in (y._left, y._right) if c is not None)
    return out


def independent_walk(h: Any) -> dict[str, int]:
    """Check the rank rules by our own walk (not the kind's checker); return figures."""
    max_rank = 0
    for root in roots_of(h):
        assert root._right is None  # half-tree
        assert root._rank == rank_of(root._left) + 1  # root rule (recalled from memory)
        nodes = subtree(root)
        # size bound: a half-tree of rank r has at least F(r+2) nodes (recalled from memory)
        assert len(nodes) >= fib(root._rank + 2), (root._rank, len(nodes))
        max_rank = max(max_rank, root._rank)
        for x in nodes[1:]:
            d = sorted((x._rank - rank_of(x._left), x._rank - rank_of(x._right)))
            # type-2: 1,1-, 1,2- or 0,i-node with i >= 2 (recalled from memory)
            assert d in ([1, 1], [1, 2]) or (d[0] == 0 and d[1] >= 2), (x.key, d)
    return {"max_rank": max_rank}


def workload(h: Any, rng: random.Random, steps: int, check_every: int = 0) -> list[Any]:
    live: list[Any] = []
    for step in range(steps):
        op = rng.random()
        if op < 0.3 or not live:
            live.append(h.push(rng.randint(0, 10**6), step))
        elif op < 0.45:
            h.pop()
            live = [x for x in live if x.alive]
        elif op < 0.85:
            x = rng.choice(live)
            h.decrease_key(x, x.key - rng.randint(0, 10**5))
        elif op < 0.92:
            x = rng.choice(live)
            h.change_key(x, rng.randint(-(10**5), 10**6))
        else:
            x = rng.choice(live)
            h.remove(x)
            live.remove(x)
        if check_every and step % check_every == 0:
            independent_walk(h)
    return live


@pytest.mark.parametrize("seed", range(4))
def test_type2_rank_rule_and_size_bound_after_decrease_key_workloads(seed: int) -> None:
    rng = random.Random(seed)
    h: RankPairingHeap[int, int] = RankPairingHeap(stable=seed % 2 == 1)
    workload(h, rng, 4000, check_every=50)
    figures = independent_walk(h)
    n = len(h)
    # max rank <= log_phi n, from F(r+2) >= phi**r (recalled from memory; phi via math.sqrt)
    assert figures["max_rank"] <= math.log(max(n, 1)) / math.log(PHI) + 1e-9
    assert heapkit.check(h).max_degree == figures["max_rank"]


def test_rank_bound_after_bulk_pushes_and_one_pop() -> None:
    h: RankPairingHeap[int, None] = RankPairingHeap()
    rng = random.Random(7)
    for _ in range(5000):
        h.push(rng.randint(0, 10**9), None)
    h.pop()
    figures = independent_walk(h)
    # one-pass linking of 5000 rank-0 roots gives ranks 1; later pops climb
    for _ in range(200):
        h.pop()
        figures = independent_walk(h)
        assert figures["max_rank"] <= math.log(len(h)) / math.log(PHI)


def test_decrease_key_makes_exactly_one_cut() -> None:
    rng = random.Random(3)
    h: RankPairingHeap[int, int] = RankPairingHeap()
    live = [h.push(rng.randint(0, 10**6), i) for i in range(800)]
    h.pop()
    live = [x for x in live if x.alive]
    cuts = 0
    for x in rng.sample(live, 300):
        before = len(roots_of(h))
        was_root = x._up is None
        h.decrease_key(x, x.key - rng.randint(1, 10**6))
        # a non-root becomes exactly one new root; a root changes nothing
        assert len(roots_of(h)) == before + (0 if was_root else 1)
        cuts += not was_root
    assert cuts > 100


# --- pop order against heapq and sorted -----------------------------------------
def _patterns(n: int) -> dict[str, list[int]]:
    rng = random.Random(11)
    return {
        "random": [rng.randint(0, n // 3) for _ in range(n)],
        "sorted": list(range(n)),
        "reversed": list(range(n, 0, -1)),
        "all-equal": [5] * n,
        "sawtooth": [i % 17 for i in range(n)],
    }


@pytest.mark.parametrize("pattern", ["random", "sorted", "reversed", "all-equal", "sawtooth"])
def test_pop_order_matches_heapq_and_sorted(pattern: str) -> None:
    keys = _patterns(600)[pattern]
    h: RankPairingHeap[int, int] = RankPairingHeap()
    ref: list[int] = []
    rng = random.Random(2)
    got: list[int] = []
    want: list[int] = []
    for k in keys:  # interleave pops, compared with heapq (stdlib)
        h.push(k, 0)
        heapq.heappush(ref, k)
        if rng.random() < 0.3:
            got.append(h.pop()[0])
            want.append(heapq.heappop(ref))
    while h:
        got.append(h.pop()[0])
    want.extend(heapq.heappop(ref) for _ in range(len(ref)))
    assert got == want
    s: RankPairingHeap[int, int] = RankPairingHeap(stable=True)
    for i, k in enumerate(keys):
        s.push(k, i)
    # stable: equal keys pop in push order, i.e. sorted((key, index)) (stdlib sorted)
    assert [s.pop() for _ in range(len(keys))] == sorted((k, i) for i, k in enumerate(keys))


# --- corruption: one test per rule ------------------------------------------------
def _sample_heap() -> tuple[RankPairingHeap[float, str], list[Any]]:
    rng = random.Random(4)
    keys = list(range(60))
    rng.shuffle(keys)
    h: RankPairingHeap[float, str] = RankPairingHeap()
    hs = [h.push(float(k), f"v{k}") for k in keys]
    for _ in range(3):
        h.pop()
    hs = [x for x in hs if x.alive]
    for x in rng.sample(hs, 10):
        h.decrease_key(x, x.key - 0.25)
    for _ in range(3):
        h.push(100.0 + len(hs), "late")
    heapkit.check(h)
    return h, [x for x in hs if x.alive]


def _corrupt(rule: str, h: Any, hs: list[Any]) -> Any:
    roots = roots_of(h)
    inner = [x for x in hs if x._up is not None]
    if rule == "half-order":
        x = next(x for x in hs if x._left is not None and x._left._left is None)
        victim = x._left
        victim._key = victim._k = x.key - 0.125
        return victim
    if rule == "half-tree":
        single = next(r for r in roots if r is not h._first and r._left is None)
        host = next(r for r in roots if r is not single and r._right is None)
        single._prev._next = single._next
        single._next._prev = single._prev
        single._next = single._prev = None
        host._right = single
        single._up = host
        h._rt -= 1
        return host
    if rule == "rank":
        root = next(r for r in roots if r._left is not None)
        root._rank += 1
        h._rs += 1
        return root
    if rule == "links":
        x = next(x for x in inner if x._left is not None)
        x._left._up = roots[0] if x._up is not roots[0] else roots[1]
        return x._left
    if rule == "min-first":
        m = h._first
        # The least other root: m is then the one root smaller than the first (the
        # report lists a bounded number of problems, so a larger pick could hide m).
        h._first = min((r for r in roots if r is not m), key=lambda r: r._k)
        return m
    if rule == "size":
        h._n += 1
        return None
    if rule == "ownership":
        x = inner[3]
        x._tok = Owner()
        return x
    if rule == "tally":
        h._zs += 1
        return None
    raise AssertionError(f"no corruption written for {rule}")


@pytest.mark.parametrize("rule", list(RankPairingHeap.RULES))
def test_check_names_each_corrupted_rule(rule: str) -> None:
    h, hs = _sample_heap()
    entry = _corrupt(rule, h, hs)
    with pytest.raises(heapkit.InvariantError) as info:
        heapkit.check(h)
    problems = info.value.problems
    assert problems and all(p.startswith(f"rule {rule!r} broken at ") for p in problems), problems
    if entry is not None:
        assert any(f"entry ({entry.key!r}, {entry.value!r})" in p and "root" in p for p in problems)


def test_survey_local_sees_a_broken_neighbourhood() -> None:
    h, hs = _sample_heap()
    x = next(x for x in hs if x._up is not None and x._left is not None)
    report = Report()
    h._survey_local(report, h._touched("decrease_key", x), x)
    assert report.problems == []
    x._left._key = x._left._k = x.key - 0.125
    h._survey_local(report, h._touched("decrease_key", x), x)
    assert report.rules and set(report.rules) == {"half-order"}


# --- exception safety --------------------------------------------------------------
class Bomb:
    """A key whose ``<`` fails (``tests.fuses.MODES``) once the fuse's comparisons have run."""

    __slots__ = ("v",)

    def __init__(self, v: float) -> None:
        self.v = v

    def __lt__(self, other: Bomb) -> Any:
        return Fuse.result(self.v < other.v)

    def __eq__(self, other: object) -> bool:
        return isinstance(other, Bomb) and self.v == other.v

    __hash__ = None  # type: ignore[assignment]

    def __repr__(self) -> str:
        return f"Bomb({self.v})"


def _build(seed: int, stable: bool) -> tuple[Any, list[Any], Any, list[Any]]:
    rng = random.Random(seed)
    h = RankPairingHeap(stable=stable)
    hs = [h.push(Bomb(rng.randint(0, 50)), i) for i in range(40)]
    h.pop()
    h.pop()
    for x in rng.sample([x for x in hs if x.alive], 8):
        h.decrease_key(x, Bomb(x.key.v - rng.randint(0, 20)))
    o = RankPairingHeap(stable=stable)
    os_ = [o.push(Bomb(rng.randint(-10, 60)), 100 + i) for i in range(12)]
    o.pop()
    return h, [x for x in hs if x.alive], o, [x for x in os_ if x.alive]


OPS: dict[str, Callable[[Any, list[Any], Any, random.Random], Any]] = {
    "push": lambda h, hs, o, r: h.push(Bomb(r.randint(-5, 60)), "new"),
    "pop": lambda h, hs, o, r: h.pop(),
    "decrease_key": lambda h, hs, o, r: (x := r.choice(hs), h.decrease_key(x, Bomb(x.key.v - 30))),
    "change_key_up": lambda h, hs, o, r: (x := r.choice(hs), h.change_key(x, Bomb(x.key.v + 30))),
    "change_key_min": lambda h, hs, o, r: h.change_key(h.peek(), Bomb(h.peek().key.v + 25)),
    "remove": lambda h, hs, o, r: h.remove(r.choice(hs)),
    "meld": lambda h, hs, o, r: h.meld(o),
    "extend": lambda h, hs, o, r: h.extend([(Bomb(r.randint(-5, 60)), "x") for _ in range(9)]),
}


def _state(h: Any) -> list[tuple[float, Any]]:
    return sorted((x.key.v, x.value) for x in h)


@pytest.mark.parametrize("mode", MODES)
@pytest.mark.parametrize("stable", [False, True])
@pytest.mark.parametrize("op", list(OPS))
def test_a_failing_comparison_loses_nothing(op: str, stable: bool, mode: str) -> None:
    for seed in range(3):
        fails = 0
        for fuse in range(200):
            h, hs, o, os_ = _build(seed, stable)
            before, other_before = _state(h), _state(o)
            Fuse.arm(fuse, mode)
            try:
                OPS[op](h, hs, o, random.Random(seed))
            except Boom:
                fails += 1
            else:
                Fuse.disarm()
                break
            finally:
                Fuse.disarm()
            # same entries and keys, every live handle still live, every rule intact
            assert_unchanged(_state, (h, before, hs), (o, other_before, os_))
            drained = [h.pop()[0].v for _ in range(len(h))]
            assert drained == sorted(drained)
        else:
            raise AssertionError(f"{op} never finished within 200 comparisons")
        if op != "remove":
            assert fails > 0, "the bomb never went off"


# --- depth beyond the recursion limit ------------------------------------------------
def test_deeper_than_the_recursion_limit() -> None:
    depth = sys.getrecursionlimit() + 500
    # One half-tree: root (rank 2) whose left child heads a right spine of `depth`
    # nodes without left children: ranks 1, ..., 1, 0 (0,2-nodes, then a leaf).
    nodes = [_Node(0, 0, "root", None)] + [_Node(i, i, f"s{i}", None) for i in range(1, depth + 1)]
    codes = [2 * 4 + 2] + [1 * 4 + 1] * (depth - 1) + [0]
    h: RankPairingHeap[int, str] = RankPairingHeap()
    h.__setstate__((nodes, codes))
    shape = heapkit.check(h)
    assert shape.size == depth + 1 and shape.height == depth
    independent_walk(h)
    for clone in (copy.deepcopy(h), pickle.loads(pickle.dumps(h)), copy.copy(h)):
        assert heapkit.check(clone).height == depth
        assert sorted(x.key for x in clone) == list(range(depth + 1))
    assert sum(1 for _ in h) == depth + 1
    h.clear()
    assert len(h) == 0 and not nodes[-1].alive
    heapkit.check(h)


# --- audit SPI: potential and amortized bounds --------------------------------------
def independent_potential(h: Any) -> float:
    """7 * sum of non-root rank differences + 6 * #0,i-nodes + 18 * #roots (module docstring)."""
    total = 0
    roots = roots_of(h)
    for root in roots:
        for x in subtree(root)[1:]:
            da, db = x._rank - rank_of(x._left), x._rank - rank_of(x._right)
            total += 7 * (da + db) + (6 if min(da, db) == 0 else 0)
    return float(total + 18 * len(roots))


def test_potential_counters_and_amortized_bounds() -> None:
    rng = random.Random(9)
    h: RankPairingHeap[int, int] = RankPairingHeap()
    live: list[Any] = []
    worst: dict[str, float] = {}
    for step in range(3000):
        r = rng.random()
        other = None
        if r < 0.3 or not live:
            op, handle = "push", None
        elif r < 0.45:
            op, handle = "pop", None
        elif r < 0.8:
            op, handle = "decrease_key", rng.choice(live)
        elif r < 0.88:
            op, handle = "change_key", rng.choice(live)
        elif r < 0.96:
            op, handle = "remove", rng.choice(live)
        else:
            op = "meld"
            other = RankPairingHeap[int, int]()
            live += [other.push(rng.randint(0, 10**6), -i) for i in range(rng.randint(1, 20))]
            handle = other
        n = len(h) + (len(other) if other is not None else 0)
        phi = h._phi() + (other._phi() if other is not None else 0.0)
        probe = h._cost_probe(op, handle)
        if op == "push":
            handle = h.push(rng.randint(0, 10**6), step)
            live.append(handle)
        elif op == "pop":
            h.pop()
        elif op == "decrease_key":
            h.decrease_key(handle, handle.key - rng.randint(0, 10**5))
        elif op == "change_key":
            h.change_key(handle, rng.randint(0, 10**6))
        elif op == "remove":
            h.remove(handle)
        else:
            h.meld(handle)
        live = [x for x in live if x.alive]
        amortized = h._cost(op, probe, handle) + h.PHI_C * (h._phi() - phi)
        assert amortized <= h._bound(op, n) + 1e-9, (step, op, n, amortized)
        worst[op] = max(worst.get(op, -1e9), amortized)
        if step % 100 == 0:
            assert h._phi() == independent_potential(h)
    assert h._phi() == independent_potential(h) >= 0
    assert set(worst) == {"push", "pop", "decrease_key", "change_key", "remove", "meld"}


def test_comparisons_for_pushes_and_pops_against_heapq() -> None:
    class Counted:
        count = 0
        __slots__ = ("v",)

        def __init__(self, v: float) -> None:
            self.v = v

        def __lt__(self, other: Counted) -> bool:
            Counted.count += 1
            return self.v < other.v

    rng = random.Random(5)
    keys = [rng.random() for _ in range(4000)]
    q: list[Counted] = []
    for k in keys:
        heapq.heappush(q, Counted(k))
    while q:
        heapq.heappop(q)
    heapq_count, Counted.count = Counted.count, 0
    h: RankPairingHeap[Counted, None] = RankPairingHeap()
    for k in keys:
        h.push(Counted(k), None)
    while h:
        h.pop()
    # one-pass linking: within 2.5x of heapq's count (measured 1.6-1.9x at 1e3-1e5)
    assert Counted.count < 2.5 * heapq_count


def test_local_survey_passes_after_every_operation_of_a_workload() -> None:
    rng = random.Random(12)
    h: RankPairingHeap[int, int] = RankPairingHeap(stable=True)
    live: list[Any] = []
    for step in range(1500):
        r = rng.random()
        x = rng.choice(live) if live else None
        if r < 0.35 or x is None:
            touched = h._touched("push", None)
            x = h.push(rng.randint(0, 1000), step)
            live.append(x)
        elif r < 0.5:
            touched = h._touched("pop", None)
            h.pop()
        elif r < 0.8:
            touched = h._touched("decrease_key", x)
            h.decrease_key(x, x.key - rng.randint(0, 300))
        elif r < 0.9:
            touched = h._touched("change_key", x)
            h.change_key(x, rng.randint(0, 1000))
        else:
            touched = h._touched("remove", x)
            h.remove(x)
        live = [y for y in live if y.alive]
        report = Report()
        h._survey_local(report, touched, x)
        assert report.problems == [], (step, report.problems)
    heapkit.check(h)
