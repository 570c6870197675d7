"""The tools find a real bug: a Fibonacci heap whose cuts never cascade.

Outside facts used as check values:
* the degree-size rule: a node of degree d in a Fibonacci heap heads at least
  F(d + 2) nodes (Fredman-Tarjan 1987, J. ACM 34(3); CLRS 3rd ed., lemma 19.4
  and corollary 19.5, recalled from memory), so degrees stay below
  D(n) = floor(log_phi n); F is computed here by its recurrence;
* k singleton trees consolidate into popcount(k) trees with k - popcount(k)
  links (each link joins two trees of equal degree: binary addition, common
  practice), and 2**k singletons into one binomial tree of degree k;
* the pop bound 5 (D(n) + 1) and the cost unit as documented in
  :mod:`heapkit.kinds.fibonacci`, recomputed here with ``math.log``.
"""

from __future__ import annotations

import contextlib
import math
from collections.abc import Iterator
from typing import Any

import pytest

import heapkit
from heapkit.audit import audit
from heapkit.errors import BoundExceededError, InvariantError
from heapkit.kinds.fibonacci import FibonacciHeap
from heapkit.kinds.fibonacci.rings import walk

K = 10  # the degree the broken heap reaches with only K + 1 nodes


class NoCascadeFibonacciHeap(FibonacciHeap[Any, Any]):
    """Deliberately broken: CLRS's CUT without CASCADING-CUT.  A cut node goes to the
    root ring and that is all: its parent is never marked (marking lives in the
    cascading cut), and a parent that has lost children is never cut in turn.  Every
    cut of the kind starts at the handle of decrease_key, remove or an upward
    change_key, so overriding those three loses every cascade; no mark is ever set.
    (The cut itself is a module-level function of the compiled hot path, not a method
    a subclass could override.)"""

    __slots__ = ()

    def decrease_key(self, handle: Any, key: Any) -> None:
        with _grandparent_hidden(handle):
            super().decrease_key(handle, key)

    def change_key(self, handle: Any, key: Any) -> None:
        with _grandparent_hidden(handle):
            super().change_key(handle, key)

    def remove(self, handle: Any) -> tuple[Any, Any]:
        with _grandparent_hidden(handle):
            return super().remove(handle)


@contextlib.contextmanager
def _grandparent_hidden(x: Any) -> Iterator[None]:
    """The kind's cut stops at a parent that looks like a root: hide x's grandparent
    while the operation runs, so a cut of x never goes further up."""
    p = getattr(x, "_parent", None)
    if p is None:
        yield
        return
    g = p._parent
    p._parent = None
    try:
        yield
    finally:
        p._parent = g


def fib(k: int) -> int:
    """F(k) by the defining recurrence (F(1) = F(2) = 1)."""
    a, b = 0, 1
    for _ in range(k):
        a, b = b, a + b
    return a


def max_degree(n: int) -> int:
    """D(n) = floor(log_phi n) (CLRS corollary 19.5, recalled from memory)."""
    return math.floor(math.log(n) / math.log((1 + math.sqrt(5)) / 2))


def ring_of(x: Any) -> list[Any]:
    out: list[Any] = []
    y = x
    while y is not None:
        out.append(y)
        y = y._right
        if y is x:
            break
    return out


def binomial_then_trim(h: Any, k: int = K) -> list[Any]:
    """Build one binomial tree of degree k, cut its depth-2 nodes by decrease_key.

    Push keys 0..2**k and pop 0: the 2**k singleton roots consolidate into one
    binomial tree B_k under key 1, whose children head B_0..B_{k-1} (keys >= 2).
    Then each depth-2 node x gets the key 1 + x.key / 2**(k+1), in (1, 1.5]: below
    its parent's key (so it is cut, with its subtree) and above the root's (so the
    root stays the min and no later step consolidates).  A correct heap cuts a child
    of the root as soon as it loses its second child; the broken one leaves the root
    with degree k and k leaf children: k + 1 nodes where F(k + 2) are needed.  The
    shape is read before any cut, when both heaps hold the same forest (push and pop
    are the kind's own).  Returns the handles of every node below depth 1, parents
    before children.
    """
    for key in range(2**k + 1):
        h.push(key, f"v{key}")
    h.pop()
    root = h.peek()
    deep = [x for c in ring_of(root._child) for x in walk(c._child)]
    for c in ring_of(root._child):
        for x in ring_of(c._child):
            h.decrease_key(x, 1 + x.key / 2 ** (k + 1))
    return deep


def prune(h: Any, deep: list[Any]) -> list[Any]:
    """Remove the nodes below depth 1, children first (each is a leaf when removed:
    no consolidation, and the min, the root of degree k, stays put)."""
    return [h.remove(x) for x in reversed(deep)]


def star_then_pop(h: Any) -> None:
    """The whole adversarial sequence: trim, prune, then pop the root of degree K at n = K + 1."""
    prune(h, binomial_then_trim(h))
    h.pop()


def test_no_cascade_fibonacci_is_flagged_by_checker_and_auditor() -> None:
    broken, real = NoCascadeFibonacciHeap(), FibonacciHeap()
    with audit(broken) as bad, audit(real) as good:
        deep = [binomial_then_trim(h) for h in (broken, real)]
        assert [x.value for x in deep[0]] == [x.value for x in deep[1]]  # one sequence for both heaps
        m = len(deep[0])
        assert m == 2**K - 1 - K  # B_K minus its root and the root's K children

        # The checker, right after the decrease_keys: the root of degree K heads
        # K + 1 nodes, fewer than F(K + 2).
        assert fib(K + 2) > K + 1
        with pytest.raises(InvariantError) as err:
            heapkit.check(broken)
        assert len(err.value.problems) == 1, err.value.problems
        line = err.value.problems[0]
        assert line.startswith("rule 'degree-size' broken at root")
        assert "entry (1, 'v1')" in line
        assert f"degree {K} but only {K + 1} nodes in its subtree (needs F({K + 2}) = {fib(K + 2)})" in line
        shape = heapkit.check(real)  # the real heap cut the children in turn
        assert shape.max_degree <= max_degree(len(real))

        # Both still answer correctly (the bug costs time, not results).
        assert prune(broken, deep[0]) == prune(real, deep[1])
        assert len(broken) == len(real) == K + 1
        with pytest.raises(InvariantError, match="'degree-size'"):
            heapkit.check(broken)  # the star alone: n = K + 1, degree K > D(n)
        heapkit.check(real)
        last = len(bad.records)
        assert broken.pop() == real.pop() == (1, "v1")

    # The root's children: keys 2..2**K less the ones pruned, in order (against sorted()).
    rest = sorted(set(range(2, 2**K + 1)) - {int(x.value[1:]) for x in deep[0]})
    assert [broken.pop()[0] for _ in range(K)] == [real.pop()[0] for _ in range(K)] == rest

    # The auditor: only the last pop is over its bound.  The root of degree K is the
    # only tree (t = 1, no marks, Phi = 1): cost 1 + K promoted + K scanned
    # + (K - popcount K) links + popcount K trees; Phi after = popcount K.
    pc = bin(K).count("1")
    n = K + 1
    assert [(r.step, r.op, r.n) for r in bad.violations] == [(last, "pop", n)], bad.summary()
    r = bad.violations[0]
    assert r.actual == 1 + 3 * K
    assert r.amortized == pytest.approx(1 + 3 * K + 2 * (pc - 1))  # c = 2 (the kind's PHI_C)
    assert r.bound == 5 * (max_degree(n) + 1)
    assert r.amortized > r.bound
    with pytest.raises(BoundExceededError, match=rf"operation #{last} \(pop at n={n}\)"):
        bad.assert_bounds()
    assert good.violations == [], good.summary()
    good.assert_bounds()
