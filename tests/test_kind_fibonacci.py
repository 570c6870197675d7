"""Facts of the Fibonacci heap, checked against sources outside heapkit.

Sources named beside each check: Fredman & Tarjan, J. ACM 34(3) 1987 (FT87);
Cormen, Leiserson, Rivest, Stein, *Introduction to Algorithms*, 3rd ed., ch. 19
(CLRS, recalled from memory); Python's ``heapq``, ``sorted`` and ``math``.
"""

from __future__ import annotations

import copy
import heapq
import math
import pickle
import random
import sys
from typing import Any

import pytest

import heapkit
from heapkit import InvariantError
from heapkit._core import Owner
from heapkit.contracts import Report
from heapkit.kinds.fibonacci import FibonacciHeap

PHI = (1 + math.sqrt(5)) / 2  # the golden ratio, from math.sqrt


def fib_binet(k: int) -> int:
    """F(k) by Binet's formula round(phi**k / sqrt 5) (exact for small k; F(1) = F(2) = 1)."""
    return round(PHI**k / math.sqrt(5))


def fib_iter(k: int) -> int:
    """F(k) by the defining recurrence, iterated."""
    a, b = 0, 1
    for _ in range(k):
        a, b = b, a + b
    return a


def popcount(n: int) -> int:
    return bin(n).count("1")


def children(x: Any) -> list[Any]:
    out: list[Any] = []
    c = x._child
    if c is not None:
        y = c
        while True:
            out.append(y)
            y = y._right
            if y is c:
                break
    return out


def nodes_with_sizes(h: Any) -> list[tuple[Any, int, int]]:
    """(node, degree counted, subtree size) for every node, iteratively."""
    roots = [] if h._min is None else [h._min, *_ring_from(h._min)]
    order: list[Any] = []
    parent: dict[int, Any] = {}
    stack = list(roots)
    while stack:
        x = stack.pop()
        order.append(x)
        for c in children(x):
            parent[id(c)] = x
            stack.append(c)
    size = {id(x): 1 for x in order}
    for x in reversed(order):
        p = parent.get(id(x))
        if p is not None:
            size[id(p)] += size[id(x)]
    return [(x, len(children(x)), size[id(x)]) for x in order]


def _ring_from(m: Any) -> list[Any]:
    out = []
    x = m._right
    while x is not m:
        out.append(x)
        x = x._right
    return out


def marked_chain(length: int, stable: bool = False) -> tuple[FibonacciHeap[int, str], list[Any]]:
    """A heap whose one tree holds a chain of ``length`` marked nodes.

    Each round pushes five keys below everything, pops the smallest (the other
    four link into a degree-2 tree that then adopts the old root), and removes
    three nodes so that the old root loses a child while it is a non-root (it
    gets marked) and the new root keeps one spare leaf.  Returns the heap and
    the chain from top (child of the root) to bottom.
    """
    h: FibonacciHeap[int, str] = FibonacciHeap(stable=stable)
    # Start: one degree-2 tree top{x, spare} whose child x lost its own child (marked).
    hs = [h.push(i, f"v{i}") for i in range(5)]
    h.pop()
    top = hs[1]
    x = next(c for c in children(top) if c._degree == 1)
    h.remove(children(x)[0])
    spare = next(c for c in children(top) if c is not x)
    chain: list[Any] = [x]
    base = 0
    for _ in range(length - 1):
        base -= 10
        hs = [h.push(base + i, f"v{base + i}") for i in range(5)]
        h.pop()  # four new nodes link into s{B1, B0}, which adopts top
        s = hs[1]
        h.remove(spare)  # top, now a non-root, loses a child: marked
        chain.insert(0, top)
        x = next(c for c in children(s) if c._degree == 1 and c is not top)
        h.remove(children(x)[0])
        h.remove(x)
        spare = next(c for c in children(s) if c is not top)
        top = s
    return h, chain


# --- counting facts ----------------------------------------------------------------


@pytest.mark.parametrize("n", [*range(2, 70), 127, 128, 129, 1000, 1023, 1024])
def test_one_pop_leaves_one_tree_per_one_bit(n: int) -> None:
    # After n pushes and one pop, consolidation leaves one tree per 1-bit of n - 1
    # (FT87; common practice: the trees are binomial trees of distinct degrees).
    h = FibonacciHeap((random.random(), i) for i in range(n))
    assert h._phi() == n  # Phi = trees + 2 marked = n singletons (CLRS 19.2, recalled)
    h.pop()
    shape = heapkit.check(h)
    assert shape.roots == popcount(n - 1)
    assert shape.potential == popcount(n - 1) == h._phi()
    assert shape.marked == 0


def test_fibonacci_numbers_agree() -> None:
    # Two independent computations of F: Binet (math.sqrt) and the recurrence.
    assert [fib_binet(k) for k in range(1, 40)] == [fib_iter(k) for k in range(1, 40)]


def _random_workout(seed: int, n: int = 600) -> FibonacciHeap[int, int]:
    rng = random.Random(seed)
    h: FibonacciHeap[int, int] = FibonacciHeap()
    live: list[Any] = []
    for i in range(n):
        r = rng.random()
        if r < 0.45 or not live:
            live.append(h.push(rng.randrange(10**6), i))
        elif r < 0.6:
            h.pop()
            live = [x for x in live if x.alive]
        elif r < 0.9:
            x = rng.choice(live)
            h.decrease_key(x, x.key - rng.randrange(1, 10**5))
        else:
            x = rng.choice(live)
            live.remove(x)
            h.remove(x)
    return h


@pytest.mark.parametrize("seed", range(6))
def test_subtree_sizes_and_degree_bound(seed: int) -> None:
    heaps = [_random_workout(seed), marked_chain(30)[0]]
    for h in heaps:
        n = len(h)
        for x, d, size in nodes_with_sizes(h):
            # A node of degree d heads >= F(d + 2) nodes (FT87 lemma; CLRS lemma 19.4, recalled).
            assert size >= fib_binet(d + 2), (x, d, size)
            # Hence degree <= floor(log_phi n) (CLRS corollary 19.5, recalled).
            assert d <= math.floor(math.log(n) / math.log(PHI) + 1e-12)
        heapkit.check(h)


def test_cascading_cut_changes_phi_by_at_most_four_minus_k() -> None:
    h, chain = marked_chain(40)
    assert all(x._mark for x in chain)
    shape = heapkit.check(h)
    assert shape.height >= 40
    before_phi, before_roots = h._phi(), h._roots
    bottom = chain[-1]
    h.decrease_key(bottom, -(10**9))
    k = h._roots - before_roots  # every cut makes one new root
    assert k == len(chain)  # the cut went through every marked ancestor
    # Phi changes by at most 4 - k for k cuts (CLRS 19.3, recalled from memory).
    assert h._phi() - before_phi <= 4 - k
    heapkit.check(h)


def test_phi_change_bound_on_random_decreases() -> None:
    rng = random.Random(7)
    h = _random_workout(11, 2000)
    cascades = 0
    for _ in range(400):
        live = list(h)
        if not live:
            break
        x = rng.choice(live)
        phi, roots = h._phi(), h._roots
        h.decrease_key(x, x.key - rng.randrange(10**6))
        k = h._roots - roots
        cascades += k > 1
        assert h._phi() - phi <= 4 - k  # CLRS 19.3, recalled from memory
        if rng.random() < 0.2:
            h.pop()
    assert cascades > 0


# --- against heapq and sorted -------------------------------------------------------

N = 400
PATTERNS = {
    "random": [random.Random(3).randrange(100) for _ in range(N)],
    "sorted": list(range(N)),
    "reversed": list(range(N, 0, -1)),
    "equal": [5] * N,
    "sawtooth": [i % 17 for i in range(N)],
}


@pytest.mark.parametrize("pattern", sorted(PATTERNS))
@pytest.mark.parametrize("stable", [False, True])
def test_pop_order_matches_heapq_and_sorted(pattern: str, stable: bool) -> None:
    keys = PATTERNS[pattern]
    h = FibonacciHeap(stable=stable)
    ref: list[tuple[int, int]] = []
    handles = []
    for i, k in enumerate(keys):
        handles.append(h.push(k, i))
        heapq.heappush(ref, (k, i))
    for x in handles[::7]:  # decrease some keys, mirrored in heapq by entry replacement
        ref.remove((x.key, x.value))
        h.decrease_key(x, x.key - 3)
        ref.append((x.key, x.value))
    heapq.heapify(ref)
    got = [h.pop() for _ in range(len(h))]
    want = [heapq.heappop(ref) for _ in range(len(ref))]
    assert [k for k, _ in got] == [k for k, _ in want]  # heapq order of keys
    if stable:
        # Stable: ties in push order (sorted is stable, Python docs).
        order = sorted(range(len(keys)), key=lambda i: handles[i].key)
        assert [v for _, v in got] == order


# --- deep trees --------------------------------------------------------------------


def test_deep_tree_survives_check_copy_pickle_iteration_clear() -> None:
    depth = sys.getrecursionlimit() + 100
    h, chain = marked_chain(depth)
    shape = heapkit.check(h)
    assert shape.height >= depth
    assert shape.marked == len(chain)
    for dup in (copy.deepcopy(h), pickle.loads(pickle.dumps(h)), copy.copy(h)):
        s2 = heapkit.check(dup)
        figures = (s2.height, s2.size, s2.marked, s2.roots)
        assert figures == (shape.height, shape.size, shape.marked, shape.roots)
        assert sorted(x.key for x in dup) == sorted(x.key for x in h)
    assert len(list(h)) == len(h)
    keys = sorted(x.key for x in h)
    dup = copy.deepcopy(h)
    assert [dup.pop()[0] for _ in range(len(dup))] == keys
    h.clear()
    assert len(h) == 0 and not chain[-1].alive
    heapkit.check(h)


# --- every rule, broken on purpose ---------------------------------------------------


def _sample() -> tuple[FibonacciHeap[int, str], list[Any]]:
    h, chain = marked_chain(3)
    for i in range(6):
        h.push(100 + i, f"w{i}")
    h.push(-1000, "min")
    h.pop()  # consolidates the extra roots into trees
    heapkit.check(h)
    return h, chain


def _adopt(h: Any, parent: Any, child: Any) -> None:
    """Move root ``child`` into ``parent``'s child ring (links kept consistent)."""
    child._left._right = child._right
    child._right._left = child._left
    c = parent._child
    if c is None:
        parent._child = child
        child._left = child._right = child
    else:
        child._left = c._left
        child._right = c
        c._left._right = child
        c._left = child
    child._parent = parent
    parent._degree += 1
    h._roots -= 1


def _broken(h: Any, rule: str, entry: Any) -> None:
    with pytest.raises(InvariantError) as info:
        heapkit.check(h)
    msg = str(info.value)
    assert f"rule {rule!r}" in msg, msg
    line = next(p for p in info.value.problems if f"rule {rule!r}" in p)
    assert f"entry ({entry.key!r}, {entry.value!r})" in line, line
    assert " at " in line and ("root" in line or "the heap" in line), line


def test_rule_heap_order() -> None:
    h, chain = _sample()
    x = chain[-1]
    x._key = x._k = x._parent._key - 1
    _broken(h, "heap-order", x)


def test_rule_links_degree() -> None:
    h, chain = _sample()
    x = chain[0]
    x._degree += 1
    _broken(h, "links", x)


def test_rule_links_symmetry() -> None:
    h, chain = _sample()
    x = chain[1]
    x._left = chain[0]  # chain[1] is an only child: its left must be itself
    _broken(h, "links", x)


def test_rule_links_parent() -> None:
    h, chain = _sample()
    x = chain[1]
    x._parent = chain[2]
    _broken(h, "links", x)


def test_rule_roots_unmarked() -> None:
    h, _ = _sample()
    r = h._min._right
    r._mark = True
    h._marks += 1
    _broken(h, "roots-unmarked", r)


def test_rule_min() -> None:
    h, _ = _sample()
    m = h._min
    assert h._roots >= 2
    h._min = m._right
    _broken(h, "min", m)


def test_rule_degree_size() -> None:
    h: FibonacciHeap[int, str] = FibonacciHeap()
    hs = [h.push(i, f"n{i}") for i in range(4)]
    for c in hs[1:]:
        _adopt(h, hs[0], c)  # degree 3 over 4 nodes, F(5) = 5 needed (Binet)
    assert fib_binet(5) == 5
    _broken(h, "degree-size", hs[0])


def test_rule_size() -> None:
    h, _ = _sample()
    h._n += 1
    _broken(h, "size", h._min)


def test_rule_ownership() -> None:
    h, chain = _sample()
    chain[1]._tok = Owner()
    _broken(h, "ownership", chain[1])


def test_rule_counters() -> None:
    h, _ = _sample()
    h._marks += 1
    _broken(h, "counters", h._min)


def test_every_rule_has_a_test() -> None:
    tested = {
        "heap-order",
        "links",
        "roots-unmarked",
        "min",
        "degree-size",
        "size",
        "ownership",
        "counters",
    }
    assert tested == set(FibonacciHeap.RULES)
    for rule in tested:
        assert f"test_rule_{rule.replace('-', '_')}" in globals() or rule == "links"


# --- local survey (checked mode) ------------------------------------------------------


def test_local_survey_agrees_and_catches() -> None:
    rng = random.Random(5)
    h = _random_workout(3, 300)
    for _ in range(300):
        live = list(h)
        op = rng.choice(["push", "pop", "decrease_key", "change_key", "remove"]) if live else "push"
        x = rng.choice(live) if op not in ("push", "pop") else None
        touched = h._touched(op, x)
        if op == "push":
            x = h.push(rng.randrange(1000), 0)
        elif op == "pop":
            h.pop()
        elif op == "decrease_key":
            h.decrease_key(x, x.key - rng.randrange(100))
        elif op == "change_key":
            h.change_key(x, rng.randrange(-500, 10**6))
        else:
            h.remove(x)
        report = Report()
        h._survey_local(report, touched, x)
        assert report.problems == []
    h = FibonacciHeap((i, i) for i in range(9))
    h.pop()
    y = next(x for x, d, _ in nodes_with_sizes(h) if d > 0)
    c = y._child
    c._key = c._k = y._key - 1
    report = Report()
    h._survey_local(report, [y], None)
    assert "heap-order" in report.rules
