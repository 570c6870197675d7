"""The binomial heap's own facts and rules (the protocol is in test_conformance).

Facts are checked against outside sources named beside each check: Vuillemin
1978 for the shape of binomial trees and forests, ``math.comb`` for binomial
coefficients, ``heapq``/``sorted`` for pop order, ``math.lgamma`` for log2(n!).
"""

from __future__ import annotations

import copy
import heapq
import math
import pickle
import random
import re
from collections.abc import Callable
from typing import Any

import pytest

import heapkit
from heapkit._core import Owner
from heapkit.contracts import Report
from heapkit.kinds.binomial import BinomialHeap
from heapkit.kinds.binomial import rules as binomial_rules
from tests import fuses


def root_degrees(h: Any) -> list[int]:
    return [d for d, r in enumerate(h._roots) if r is not None]


def children(x: Any) -> list[Any]:
    out = []
    c = x._child
    while c is not None:
        out.append(c)
        c = c._next
    return out


def depth_counts(root: Any) -> list[int]:
    counts: list[int] = []
    level = [root]
    while level:
        counts.append(len(level))
        level = [c for x in level for c in children(x)]
    return counts


def filled(n: int, seed: int = 1, stable: bool = False) -> tuple[BinomialHeap[Any, Any], list[Any]]:
    rnd = random.Random(seed)
    h: BinomialHeap[Any, Any] = BinomialHeap(stable=stable)
    return h, [h.push(rnd.randrange(1000), i) for i in range(n)]


# --- shape facts -------------------------------------------------------------------------


def test_forest_has_one_tree_per_one_bit_of_n() -> None:
    # Vuillemin 1978: a binomial queue of n entries is a forest whose tree
    # degrees are the positions of the 1-bits of n, so it has popcount(n) trees.
    rnd = random.Random(7)
    h: BinomialHeap[int, int] = BinomialHeap()
    handles = []
    for n in range(1, 600):
        handles.append(h.push(rnd.randrange(100), n))
        bits = [i for i in range(n.bit_length()) if n >> i & 1]
        assert root_degrees(h) == bits
        assert heapkit.check(h).roots == bin(n).count("1")
    for _ in range(300):
        op = rnd.randrange(3)
        if op == 0:
            h.pop()
        elif op == 1:
            x = rnd.choice([x for x in handles if x.alive])
            h.remove(x)
        else:
            x = rnd.choice([x for x in handles if x.alive])
            h.change_key(x, rnd.randrange(-50, 150))
        n = len(h)
        assert root_degrees(h) == [i for i in range(n.bit_length()) if n >> i & 1]


@pytest.mark.parametrize("k", range(0, 11))
def test_tree_of_degree_k_has_comb_k_i_nodes_at_depth_i(k: int) -> None:
    # Vuillemin 1978: the binomial tree B_k has comb(k, i) nodes at depth i
    # (hence the name); the counts come from math.comb.
    h, handles = filled(1 << k, seed=k)
    rnd = random.Random(k)
    for x in rnd.sample(handles, min(len(handles), 20)):
        h.decrease_key(x, x.key - rnd.randrange(500))  # moves nodes, keeps the shape
    assert root_degrees(h) == [k]
    assert depth_counts(h._roots[k]) == [math.comb(k, i) for i in range(k + 1)]


@pytest.mark.parametrize("stable", [False, True])
def test_ties_never_bury_the_min(stable: bool) -> None:
    # Found by the conformance machine: five equal keys, two pops, one push
    # left the min pointer on a non-root.  All-equal keys pop in push order
    # when stable (sorted() is stable).
    h: BinomialHeap[int, int] = BinomialHeap(stable=stable)
    rnd = random.Random(4)
    pushed = []
    for i in range(300):
        if rnd.random() < 0.6 or not h:
            h.push(0, i)
            pushed.append(i)
        else:
            value = h.pop()[1]
            if stable:
                assert value == pushed.pop(0)
        heapkit.check(h)


def test_push_costs_at_most_2_amortized_and_links_follow_the_binary_counter() -> None:
    # Binary counter (common practice; CLRS ch. 17, recalled from memory): going
    # from i to i + 1 carries once per trailing 1-bit of i, and n increments
    # carry n - popcount(n) times in total.  A push links once per carry.
    h: BinomialHeap[int, int] = BinomialHeap()
    rnd = random.Random(3)
    total = 0
    for i in range(1, 2049):
        probe = h._cost_probe("push", None)
        before = h._phi()
        x = h.push(rnd.randrange(10**6), i)
        cost = h._cost("push", probe, x)
        amortized = cost + h.PHI_C * (h._phi() - before)
        assert amortized <= h._bound("push", i - 1) == 2
        links = cost - 1
        n = i - 1
        assert links == (n ^ (n + 1)).bit_length() - 1  # trailing 1-bits of n
        total += links
        assert total == i - bin(i).count("1")
    # Each link adds one child and nothing cuts: the degrees add up to the links.
    assert sum(x._deg for x in h) == total


def test_every_operation_keeps_its_amortized_bound_and_passes_local_checks() -> None:
    # The bounds derived in heapkit/kinds/binomial/heap.py from Vuillemin 1978; the
    # local survey (checked mode) must find nothing on a correct heap.
    rnd = random.Random(11)
    h, handles = filled(700, seed=11)
    other, more = filled(300, seed=12)
    for step in range(900):
        op = ["pop", "decrease_key", "change_key", "remove", "push"][step % 5]
        if step == 450:
            op = "meld"
        live = [x for x in handles + more if x.alive and x in h]
        arg: Any = None if op in ("pop", "push") else rnd.choice(live)
        if op == "meld":
            arg = other
        n = len(h) + (len(other) if op == "meld" else 0)
        probe = h._cost_probe(op, arg)
        touched = h._touched(op, arg)
        before = h._phi()
        if op == "pop":
            h.pop()
        elif op == "push":
            arg = h.push(rnd.randrange(1000), step)
            handles.append(arg)
        elif op == "decrease_key":
            h.decrease_key(arg, arg.key - rnd.randrange(300))
        elif op == "change_key":
            h.change_key(arg, rnd.randrange(-300, 1300))
        elif op == "remove":
            h.remove(arg)
        else:
            h.meld(other)
        actual = h._cost(op, probe, arg)
        amortized = actual + h.PHI_C * (h._phi() - before)
        report = Report()
        h._survey_local(report, touched, arg)
        assert not report.problems
        assert actual >= 1 and amortized <= h._bound(op, n), (op, actual, amortized, n)
    heapkit.check(h)


# --- every rule is checked ------------------------------------------------------------------


def _broken(h: Any, rule: str, entry: Any, where: str = "root of degree", only: bool = True) -> None:
    with pytest.raises(heapkit.InvariantError) as info:
        heapkit.check(h)
    msg = str(info.value)
    assert f"rule {rule!r} broken" in msg, msg
    if only:  # the corruption breaks exactly this rule
        assert set(re.findall(r"rule '([a-z-]+)' broken", msg)) == {rule}, msg
    if entry is not None:
        assert f"entry ({entry.key!r}, {entry.value!r})" in msg, msg
    assert where in msg, msg


def _local(h: Any, touched: list[Any], rule: str) -> None:
    report = Report()
    h._survey_local(report, touched, None)
    assert rule in report.rules, report.problems


def _deep(h: Any) -> Any:
    """A node at depth 2 or more in the largest tree."""
    top = h._roots[len(h._roots) - 2]
    return children(children(top)[0])[0]


def test_rule_heap_order() -> None:
    h, _ = filled(64)
    x = _deep(h)
    x._key = x._k = -1
    _broken(h, "heap-order", x, "child 0 → child 0")
    _local(h, [x], "heap-order")


def test_rule_binomial_shape() -> None:
    h, _ = filled(64)
    x = _deep(h)
    x._deg += 1
    _broken(h, "binomial-shape", x, "child 0 → child 0")
    _local(h, [x], "binomial-shape")


def test_rule_binomial_shape_counts_nodes() -> None:
    h, _ = filled(32)
    top = h._roots[5]
    leaf = children(top)[-1]  # degree 0, the last child: cut it, fix the degrees
    prev = leaf._prev
    prev._next = None
    top._deg -= 1
    h._roots[5], h._roots[4] = None, top
    h._roots.pop()
    h._n -= 1
    _broken(h, "binomial-shape", top, only=False)


def test_rule_root_degrees() -> None:
    h, _ = filled(9)  # roots of degree 0 and 3
    r = next(r for r in h._roots if r is not None and r is not h._min)
    d = r._deg
    h._roots[d], h._roots[1] = None, r
    _broken(h, "root-degrees", r, "root of degree 1")
    _local(h, [], "root-degrees")
    h._roots[1], h._roots[d] = None, r
    heapkit.check(h)
    h._roots.pop()  # the trailing empty slot
    _broken(h, "root-degrees", None, "the heap")


def test_rule_links() -> None:
    h, _ = filled(64)
    x = _deep(h)
    sib = x._next
    sib._prev = x._prev  # sib's prev no longer points at its left sibling
    _broken(h, "links", sib, "root of degree 6 → child 0 → child 1")
    _local(h, [sib], "links")


def test_rule_links_node_twice() -> None:
    h, _ = filled(16)
    top = h._roots[4]
    kids = children(top)
    kids[-1]._next = kids[0]  # a cycle through the sibling list
    _broken(h, "links", kids[0], "root of degree 4", only=False)


def test_rule_min() -> None:
    h, _ = filled(21)
    wrong = next(r for r in h._roots if r is not None and r is not h._min)
    h._min = wrong
    _broken(h, "min", None, "root of degree")
    _local(h, [], "min")
    h._min = _deep(h)
    _broken(h, "min", h._min, "child 0")


def test_rule_size() -> None:
    h, _ = filled(21)
    h._n += 1
    _broken(h, "size", None, "len is 22")
    _local(h, [], "size")


def test_rule_ownership() -> None:
    h, _ = filled(64)
    x = _deep(h)
    x._tok = Owner()
    _broken(h, "ownership", x, "child 0 → child 0")
    _local(h, [x], "ownership")


def test_every_rule_has_a_test() -> None:
    tested = {"heap-order", "binomial-shape", "root-degrees", "links", "min", "size", "ownership"}
    assert set(BinomialHeap.RULES) == tested


# --- pop order against heapq and sorted ---------------------------------------------------

SHAPES: dict[str, Callable[[int], list[int]]] = {
    "random": lambda n: [random.Random(n).randrange(n) for _ in range(n)],
    "sorted": lambda n: list(range(n)),
    "reversed": lambda n: list(range(n, 0, -1)),
    "all-equal": lambda n: [5] * n,
    "sawtooth": lambda n: [i % 17 for i in range(n)],
}


@pytest.mark.parametrize("shape", sorted(SHAPES))
@pytest.mark.parametrize("stable", [False, True])
def test_pop_order_matches_heapq_and_sorted(shape: str, stable: bool) -> None:
    keys = SHAPES[shape](1000)
    h: BinomialHeap[int, int] = BinomialHeap(stable=stable)
    for i, k in enumerate(keys):
        h.push(k, i)
    out = [h.pop() for _ in range(len(keys))]
    q = list(keys)
    heapq.heapify(q)
    assert [k for k, _ in out] == [heapq.heappop(q) for _ in range(len(keys))]  # heapq
    if stable:
        # sorted() is stable: equal keys keep push order, as a stable heap must.
        assert out == sorted(((k, i) for i, k in enumerate(keys)), key=lambda p: p[0])


# --- large: no recursion on depth ------------------------------------------------------------


def test_large_heap_survives_check_copy_pickle_iteration_clear() -> None:
    n = 10**5
    h, handles = filled(n, seed=5)
    shape = heapkit.check(h)
    assert shape.roots == bin(n).count("1") and shape.height == n.bit_length() - 1  # Vuillemin 1978
    for other in (copy.deepcopy(h), pickle.loads(pickle.dumps(h)), copy.copy(h)):
        assert heapkit.check(other) == shape
        assert len(other) == n and not any(x in h for x in other)
        assert sorted((x.key, x.value) for x in other) == sorted((x.key, x.value) for x in handles)
        assert [other.pop()[0] for _ in range(50)] == sorted(x.key for x in handles)[:50]  # sorted
    assert {id(x) for x in h} == {id(x) for x in handles}
    h.clear()
    assert len(h) == 0 and not any(x.alive for x in handles)
    heapkit.check(h)


# --- comparisons ---------------------------------------------------------------------------


class Counted:
    """A key that counts its ``<`` calls."""

    __slots__ = ("v",)
    calls = 0

    def __init__(self, v: int) -> None:
        self.v = v

    def __lt__(self, other: Counted) -> bool:
        Counted.calls += 1
        return self.v < other.v


def test_sorting_comparisons_lie_between_log2_n_factorial_and_the_bound() -> None:
    n = 4096
    rnd = random.Random(2)
    keys = [Counted(rnd.randrange(10**9)) for _ in range(n)]
    Counted.calls = 0
    h: BinomialHeap[Counted, None] = BinomialHeap()
    for k in keys:
        h.push(k, None)
    pushes = Counted.calls
    out = [h.pop()[0].v for _ in range(n)]
    assert out == sorted(k.v for k in keys)  # sorted
    # Each push compares once with the min and once per link: n - popcount(n)
    # links in all (binary counter, common practice).
    assert pushes <= n + (n - bin(n).count("1"))
    # A comparison sort needs log2(n!) comparisons on average (information
    # theory; Knuth TAOCP vol. 3, 5.3.1, recalled from memory); math.lgamma
    # gives ln(n!).  Pops: at most 2 floor(log2 m) + 1 each (our derivation).
    lower = math.lgamma(n + 1) / math.log(2)
    upper = pushes + sum(2 * (m.bit_length() - 1) + 1 for m in range(1, n + 1))
    assert lower <= Counted.calls <= upper


# --- exception safety: a `<` that raises after a chosen number of calls -------------------------


class Fuse:
    """A key whose ``<`` fails (``tests.fuses.MODES``) once the shared budget runs out."""

    __slots__ = ("v",)

    def __init__(self, v: int) -> None:
        self.v = v

    def __lt__(self, other: Fuse) -> Any:
        return fuses.Fuse.result(self.v < other.v)

    def __repr__(self) -> str:
        return f"Fuse({self.v})"


def _deepest(h: Any) -> Any:
    return max(h, key=lambda x: len(binomial_rules.path_of(h, x)) * 10**6 + x.value)


OPS: dict[str, Callable[[Any, Any], None]] = {
    "push-min": lambda h, o: h.push(Fuse(-5), -1),
    "push": lambda h, o: h.push(Fuse(60), -1),
    "pop": lambda h, o: h.pop(),
    "decrease_key": lambda h, o: h.decrease_key(_deepest(h), Fuse(-3)),
    "change_key-down": lambda h, o: h.change_key(_deepest(h), Fuse(1)),
    "change_key-up": lambda h, o: h.change_key(_deepest(h), Fuse(70)),
    "change_key-up-min": lambda h, o: h.change_key(h.peek(), Fuse(45)),
    "remove": lambda h, o: h.remove(_deepest(h)),
    "remove-min": lambda h, o: h.remove(h.peek()),
    "meld": lambda h, o: h.meld(o),
    "extend": lambda h, o: h.extend([(Fuse(v), -2) for v in (50, 2, 33, 7, 7, 90, 0)]),
}


def _setup(stable: bool) -> tuple[Any, Any]:
    rnd = random.Random(17)
    h: BinomialHeap[Fuse, int] = BinomialHeap(stable=stable)
    o: BinomialHeap[Fuse, int] = BinomialHeap(stable=stable)
    for i in range(47):
        h.push(Fuse(rnd.randrange(40)), i)
    for _ in range(5):
        h.pop()
    for i in range(100, 123):
        o.push(Fuse(rnd.randrange(40)), i)
    return h, o


def _snapshot(h: Any) -> dict[int, tuple[Any, Any, Any]]:
    return {id(x): (x, x.key, x.value) for x in h}


@pytest.mark.parametrize("mode", fuses.MODES)
@pytest.mark.parametrize("stable", [False, True])
@pytest.mark.parametrize("op", sorted(OPS))
def test_a_failing_comparison_changes_nothing(op: str, stable: bool, mode: str) -> None:
    blown = 0
    for budget in range(400):
        h, o = _setup(stable)
        before = [_snapshot(h), _snapshot(o)]
        fuses.Fuse.arm(budget, mode)
        try:
            OPS[op](h, o)
        except fuses.Boom:
            blown += 1
            fuses.Fuse.disarm()
            for heap, snap in zip((h, o), before, strict=True):
                assert _snapshot(heap) == snap  # same entries, same keys and values
                assert all(x.alive and x in heap for x, _, _ in snap.values())
                heapkit.check(heap)
                keys = [heap.pop()[0].v for _ in range(len(heap))]
                assert keys == sorted(v.v for _, v, _ in snap.values())  # sorted
            continue
        finally:
            fuses.Fuse.disarm()
        heapkit.check(h)
        break
    else:
        pytest.fail(f"{op} never completed")
    assert blown >= 1, f"{op} made no comparison to fail"
