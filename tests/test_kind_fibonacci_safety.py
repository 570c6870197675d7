"""Fibonacci heap: exception safety under failing comparisons, and the audit SPI
against the bounds derived in the module docstring (Fredman & Tarjan, J. ACM
34(3) 1987; CLRS 3rd ed. ch. 19, recalled from memory).
"""

from __future__ import annotations

import random
from collections.abc import Callable
from typing import Any

import pytest

import heapkit
from heapkit._core import Stable
from heapkit.kinds.fibonacci import FibonacciHeap
from tests.fuses import MODES, Boom, Fuse
from tests.test_kind_fibonacci import marked_chain


class Fused:
    """A key whose ``<`` fails (``tests.fuses.MODES``) once the fuse burns down."""

    __slots__ = ("v",)

    def __init__(self, v: float) -> None:
        self.v = v

    def __lt__(self, other: Fused) -> Any:
        return Fuse.result(self.v < other.v)

    def __repr__(self) -> str:
        return f"F({self.v})"


def _scenario(seed: int, stable: bool) -> tuple[Any, Any, dict[str, Any]]:
    """A heap with a marked chain, loose roots, marks, ties; another heap to meld."""
    rng = random.Random(seed)
    h2, chain2 = marked_chain(5, stable=stable)
    for x in h2:  # the same shape, keys now Fused
        x._key = Fused(x._key)
        x._k = Stable(x._key, x._k.seq) if stable else x._key
    extra = [h2.push(Fused(rng.randrange(-100, 100)), f"e{i}") for i in range(12)]
    h2.push(Fused(-1000), "gone")
    h2.pop()
    for x in extra[::3]:
        if x.alive:
            h2.decrease_key(x, Fused(x.key.v - rng.randrange(50)))
    for i in range(12):
        h2.push(Fused(rng.randrange(-100, 100)), f"r{i}")
    other: Any = FibonacciHeap(stable=stable)
    for i in range(6):
        other.push(Fused(rng.randrange(-300, 100)), f"o{i}")
    other.push(Fused(-2000), "o-gone")
    other.pop()
    heapkit.check(h2)
    names = {"deep": chain2[-1], "mid": chain2[len(chain2) // 2]}
    roots = [r for r in _roots(h2) if r is not h2._min]
    names["root"] = max(roots, key=lambda r: r.key.v)
    return h2, other, names


def _roots(h: Any) -> list[Any]:
    out = [h._min]
    x = h._min._right
    while x is not h._min:
        out.append(x)
        x = x._right
    return out


def _snapshot(h: Any) -> dict[int, tuple[Any, Any, Any]]:
    return {id(x): (x, x.key, x.value) for x in h}


OPS: dict[str, Callable[[Any, Any, dict[str, Any]], Any]] = {
    "push-min": lambda h, o, n: h.push(Fused(-(10**6)), "new"),
    "push": lambda h, o, n: h.push(Fused(50), "new"),
    "pop": lambda h, o, n: h.pop(),
    "decrease_key-cascade": lambda h, o, n: h.decrease_key(n["deep"], Fused(-(10**6))),
    "decrease_key-mid": lambda h, o, n: h.decrease_key(n["mid"], Fused(n["mid"].key.v - 1)),
    "decrease_key-root": lambda h, o, n: h.decrease_key(n["root"], Fused(-(10**6))),
    "change_key-min-up": lambda h, o, n: h.change_key(h.peek(), Fused(10**6)),
    "change_key-up": lambda h, o, n: h.change_key(n["mid"], Fused(10**6)),
    "change_key-down": lambda h, o, n: h.change_key(n["deep"], Fused(-(10**6))),
    "remove-min": lambda h, o, n: h.remove(h.peek()),
    "remove": lambda h, o, n: h.remove(n["mid"]),
    "meld": lambda h, o, n: h.meld(o),
    "extend": lambda h, o, n: h.extend([(Fused(v), v) for v in (5, -7000, 3, 9)]),
}


@pytest.mark.parametrize("mode", MODES)
@pytest.mark.parametrize("stable", [False, True])
@pytest.mark.parametrize("op", sorted(OPS))
def test_failing_comparison_keeps_every_entry(op: str, stable: bool, mode: str) -> None:
    failures = 0
    budget = 0
    while True:
        h, other, names = _scenario(budget % 3, stable)
        before, before_other = _snapshot(h), _snapshot(other)
        Fuse.arm(budget, mode)
        try:
            OPS[op](h, other, names)
        except Boom:
            failed = True
        else:
            failed = False
        finally:
            Fuse.disarm()
        if not failed:
            break
        failures += 1
        for heap, snap in ((h, before), (other, before_other)):
            heapkit.check(heap)  # every rule holds
            after = _snapshot(heap)
            assert after.keys() == snap.keys()  # the same entries, every handle still live here
            for _k, (x, key, value) in snap.items():
                assert x.alive and x in heap and x.key is key and x.value is value
            popped = [heap.pop()[0].v for _ in range(len(heap))]
            assert popped == sorted(popped)  # still a heap: sorted() order
        budget += 1
        assert budget < 500
    heapkit.check(h)
    if op not in ("remove",):
        assert failures > 0  # the operation compares, so some fuse made it fail


# --- the audit SPI against the documented bounds -------------------------------------


def _audited(h: Any, op: str, handle: Any, run: Callable[[], Any], other: Any = None) -> None:
    n = len(h) + (len(other) if other is not None else 0)
    phi0 = h._phi() + (other._phi() if other is not None else 0.0)  # meld: Phi of both heaps
    probe = h._cost_probe(op, other if op == "meld" else handle)
    result = run()
    after = result if op == "push" else (other if op == "meld" else handle)
    cost = h._cost(op, probe, after)
    assert cost >= 1
    amortized = cost + h.PHI_C * (h._phi() - phi0)
    assert amortized <= h._bound(op, n) + 1e-9, (op, n, cost, amortized)


@pytest.mark.parametrize("seed", range(4))
def test_amortized_costs_stay_within_bounds(seed: int) -> None:
    rng = random.Random(seed)
    h, _chain = marked_chain(12)
    seen: set[str] = set()
    for _ in range(1500):
        live = list(h)
        op = rng.choice(["push", "push", "pop", "decrease_key", "change_key", "remove", "meld"])
        if not live and op != "push":
            op = "push"
        seen.add(op)
        if op == "push":
            _audited(h, op, None, lambda: h.push(rng.randrange(-(10**6), 10**6), 0))
        elif op == "pop":
            _audited(h, op, None, h.pop)
        elif op == "meld":
            o: Any = FibonacciHeap((rng.randrange(10**6), 0) for _ in range(rng.randrange(5)))
            _audited(h, op, None, lambda o=o: h.meld(o), other=o)
        else:
            x = rng.choice(live) if rng.random() < 0.7 else h.peek()
            if op == "decrease_key":
                _audited(h, op, x, lambda x=x: h.decrease_key(x, x.key - rng.randrange(10**5)))
            elif op == "change_key":
                _audited(h, op, x, lambda x=x: h.change_key(x, rng.randrange(-(10**6), 10**6)))
            else:
                _audited(h, op, x, lambda x=x: h.remove(x))
    assert seen == {"push", "pop", "decrease_key", "change_key", "remove", "meld"}
    heapkit.check(h)


def test_cascade_cost_is_one_plus_cuts() -> None:
    h, chain = marked_chain(30)
    probe = h._cost_probe("decrease_key", chain[-1])
    h.decrease_key(chain[-1], -(10**9))
    assert h._cost("decrease_key", probe, chain[-1]) == 1 + len(chain)  # 1 + cuts
