"""The potential-function auditor: numbers, bounds, comparisons, modes, reports.

Outside facts used as check values:
* the potential method's sum rule, total actual = total amortized + Phi(start)
  - Phi(end) (Tarjan 1985, "Amortized computational complexity", SIAM J. Alg.
  Disc. Meth. 6);
* the pairing heap potential, sum of log2 binary-view subtree sizes (Fredman,
  Sedgewick, Sleator, Tarjan 1986), recomputed from scratch by
  ``heapkit.check(...).potential`` and by hand below with ``math.log2``;
* comparison counts of a key class that counts its own ``__lt__``.
"""

from __future__ import annotations

import gc
import logging
import math
import sys
from collections.abc import Callable
from typing import Any

import pytest
from hypothesis import given
from hypothesis import strategies as st

import heapkit
from heapkit import _core
from heapkit.audit import Counted, attach, audit, configure, detach
from heapkit.errors import BoundExceededError
from heapkit.kinds.pairing.core import _link
from heapkit.kinds.pairing.heap import PairingHeap
from tests.kinds import NAMES, make, monotone
from tests.test_audit_broken import NoCascadeFibonacciHeap, star_then_pop
from tests.test_conformance import MonotoneMachine, ProtocolMachine

HOOKS = ("_phi", "_cost_probe", "_cost", "_bound")


def has_hooks(name: str) -> bool:
    return all(callable(getattr(heapkit.KINDS[name], h, None)) for h in HOOKS)


def lg(x: float) -> float:
    return math.log2(x)


# --- the summary against a hand computation ---------------------------------------
def test_summary_matches_hand_computed_pairing_example() -> None:
    h = PairingHeap()
    with audit(h) as led:
        h.push(3, "c")  # n=0: no link, cost 1; one node of size 1: Phi 0 -> 0
        h.push(1, "a")  # n=1: 1 link (1 becomes root), cost 2; sizes 2, 1: Phi = log2 2 = 1
        h.push(2, "b")  # n=2: 1 link (2 hangs under 1 as leftmost), cost 2; sizes 3, 2, 1: Phi = log2 3 + 1
        h.pop()  # n=3: children [2, 3], one link; cost = r = 2; sizes 2, 1: Phi = 1
    rec = list(led.records)
    assert [(r.op, r.n, r.actual, r.comparisons) for r in rec] == [
        ("push", 0, 1, 0),
        ("push", 1, 2, 1),
        ("push", 2, 2, 1),
        ("pop", 3, 2, 1),
    ]
    phis = [0.0, 1.0, lg(3) + 1, 1.0]  # by hand, from the sizes in the comments
    assert [r.phi_after for r in rec] == pytest.approx(phis)
    # amortized = actual + (after - before): 1, 3, 2 + log2 3, 2 - log2 3
    assert [r.amortized for r in rec] == pytest.approx([1, 3, 2 + lg(3), 2 - lg(3)])
    # bounds: push log2(n + 1) + 2 -> 2, 3, log2 3 + 2; pop 2 log2 n + 1 -> 2 log2 3 + 1
    assert [r.bound for r in rec] == pytest.approx([2, 3, lg(3) + 2, 2 * lg(3) + 1])
    lines = led.summary().splitlines()
    push_row = next(x.split() for x in lines if x.strip().startswith("push"))
    pop_row = next(x.split() for x in lines if x.strip().startswith("pop"))
    # push: count 3, mean 5/3, p99 2, max 2, max amortized 2 + log2 3 = 3.58, its bound 3.58,
    # comparisons 2/3 per push
    assert push_row == ["push", "3", "1.67", "2", "2", "3.58", "3.58", "0.67"]
    # pop: 1, 2.00, 2, 2, 2 - log2 3 = 0.42, 2 log2 3 + 1 = 4.17, 1.00
    assert pop_row == ["pop", "1", "2.00", "2", "2", "0.42", "4.17", "1.00"]
    # sum rule: 7 = 8 + (0 - 1)
    assert led.total_actual == 7
    assert led.total_amortized == pytest.approx(8.0)
    assert "Σ actual 7 = Σ amortized 8.00 + c·(Φ start 0.00 − Φ end 1.00)" in led.summary()


def test_binary_heap_costs_are_levels_moved() -> None:
    h = heapkit.BinaryHeap()
    with audit(h) as led:
        for k in (8, 7, 6, 5, 4, 3, 2):  # each new key is the minimum: it climbs to the root
            h.push(k, None)
    # position j has depth floor(log2(j + 1)): pushes climb 0, 1, 1, 2, 2, 2, 2 levels
    assert [r.actual for r in led.records] == [1, 2, 2, 3, 3, 3, 3]
    # the bound is the number of levels after the push: floor(log2(n + 1)) + 1
    assert [r.bound for r in led.records] == [1, 2, 2, 3, 3, 3, 3]
    assert led.violations == []


# --- no violation on long random workloads ------------------------------------------
OPS = st.lists(st.tuples(st.integers(0, 9), st.integers(-50, 50), st.integers(0, 10**6)), min_size=1, max_size=600)


def drive(h: Any, ops: list[tuple[int, int, int]], mono: bool, spare: Callable[[], Any]) -> list[Any]:
    """Run a random workload (every protocol operation) on ``h``; return the handles made."""
    handles: list[Any] = []
    low = 0
    for code, key, pick in ops:
        x = handles[pick % len(handles)] if handles else None
        live = x is not None and x in h
        if mono:
            low = h.last  # radix: keys never below the last popped key
            key = abs(key) + low
        if code <= 2 or not len(h):
            handles.append(h.push(key, pick))
        elif code == 3:
            k, _ = h.pop()
            low = k if mono else low
        elif code == 4 and live:
            new = x.key - abs(key) % 7
            h.decrease_key(x, max(low, new) if mono else new)
        elif code == 5 and live:
            h.change_key(x, key)
        elif code == 6 and live:
            h.remove(x)
        elif code == 7:
            o = spare()
            if mono and low:  # radix melds only at the same last popped key
                o.push(low, -1)
                o.pop()
            handles += o.extend([(key + i, i) for i in range(pick % 9)])
            h.meld(o)
        elif code == 8:
            handles += h.extend([(key - i if not mono else key + i, i) for i in range(pick % 6)])
        elif pick % 50 == 0:
            h.clear()
    return handles


@pytest.mark.parametrize("name", NAMES)
@pytest.mark.parametrize("stable", [False, True])
@given(ops=OPS)
def test_no_violation_on_random_workloads(name: str, stable: bool, ops: list[tuple[int, int, int]]) -> None:
    if not has_hooks(name):
        pytest.skip(f"kind {name!r} does not implement the audit hooks {HOOKS} yet")
    h = make(name, stable)
    with audit(h) as led:
        drive(h, ops, monotone(name), lambda: make(name, stable))
        phi_end = h._phi()
    assert led.violations == [], led.summary()
    led.assert_bounds()
    # sum rule (Tarjan 1985): exact, with the potential brought in by melds counted
    c = h.PHI_C
    rhs = led.total_amortized + c * (led.phi_start - led.phi_end) + c * led.outside
    assert led.total_actual == pytest.approx(rhs, rel=1e-9, abs=1e-6)
    assert led.phi_end == pytest.approx(phi_end)
    shape = heapkit.check(h)
    if shape.potential is not None:  # the kind's from-scratch potential agrees with the kept one
        assert phi_end == pytest.approx(shape.potential, rel=1e-9, abs=1e-6)


def sorting_run(h: Any, n: int) -> None:
    """n pushes (ascending, then descending keys), then n pops: the heapsort pattern."""
    for i in range(n):
        h.push(i if i % 2 else n - i, i)
    for _ in range(n):
        h.pop()


def decrease_heavy_run(h: Any, n: int) -> None:
    """Dijkstra's pattern: many decrease_key between pops (keys from a fixed LCG)."""
    x = 12345
    handles = [h.push(10**6 + i, i) for i in range(n)]
    for _ in range(n // 2):
        for _ in range(4):
            x = (x * 1103515245 + 12345) % 2**31
            y = handles[x % n]
            if y.alive:
                floor = getattr(h, "last", 0)  # radix: never below the last popped key
                h.decrease_key(y, max(floor, y.key - x % 1000))
        h.pop()


@pytest.mark.parametrize("name", NAMES)
def test_no_violation_on_long_workloads(name: str) -> None:
    if not has_hooks(name):
        pytest.skip(f"kind {name!r} does not implement the audit hooks {HOOKS} yet")
    for run in (sorting_run, decrease_heavy_run):
        h = make(name)
        with audit(h, keep="totals") as led:
            run(h, 3000)
        assert led.violation_count == 0, led.summary()
    h = make(name)
    ops = [((i * 7919) % 10, (i * 104729) % 101 - 50, i * 2654435761 % 10**6) for i in range(10000)]
    with audit(h, keep="totals") as led:
        drive(h, ops, monotone(name), lambda: make(name))
    assert led.violation_count == 0, led.summary()


# --- the auditor finds real bugs --------------------------------------------------
class OnePassPairingHeap(PairingHeap[Any, Any]):
    """Deliberately broken: pop links the root's children in one left-to-right pass
    (``acc = link(acc, next)``); the second, right-to-left pass is missing."""

    __slots__ = ()

    def pop(self) -> tuple[Any, Any]:
        root = self._root
        if root is None:
            raise heapkit.EmptyHeapError("pop: the heap is empty")
        acc = None
        x = root._child
        while x is not None:
            nxt = x._next
            x._prev = x._next = None
            acc = x if acc is None else _link(acc, x)
            x = nxt
        root._child = None
        self._root = acc
        self._n -= 1
        self._ver += 1
        root._tok = None
        return root._key, root.value


def ascending_then_pop(h: Any, n: int = 300) -> None:
    """Push 0..n: every key hangs under the root, children left to right n, ..., 1; pop.
    One left-to-right pass turns them into a path of n links while Phi (log2 n! before,
    log2 n! after) barely drops: amortized ~ n, far above 2 log2 n + 1."""
    for k in range(n + 1):
        h.push(k, None)
    h.pop()
    h.pop()


#: (broken variant factory, correct kind, adversarial scenario).  The Fibonacci heap
#: without cascading cuts is explained, and checked in detail, in test_audit_broken.py.
BROKEN: list[tuple[str, Callable[[], Any], str, Callable[[Any], None]]] = [
    ("pairing-one-pass", OnePassPairingHeap, "pairing", ascending_then_pop),
    ("fibonacci-no-cascade", NoCascadeFibonacciHeap, "fibonacci", star_then_pop),
]


@pytest.mark.parametrize(("label", "broken", "correct", "scenario"), BROKEN, ids=[b[0] for b in BROKEN])
def test_broken_variant_is_flagged(
    label: str, broken: Callable[[], Any], correct: str, scenario: Callable[[Any], None]
) -> None:
    h = broken()
    with audit(h) as led:
        scenario(h)
    assert led.violations, f"{label}: the auditor missed the broken variant"
    with pytest.raises(BoundExceededError, match=r"operation #\d+ \(pop"):
        led.assert_bounds()
    assert led.phi_end == pytest.approx(heapkit.check(h).potential)
    good = make(correct)
    with audit(good) as ok:
        scenario(good)
    assert ok.violations == [], ok.summary()


# --- comparisons ------------------------------------------------------------------
class CountingKey:
    """An int key that counts every ``<`` made on it (the outside count)."""

    calls = 0

    def __init__(self, v: int) -> None:
        self.v = v

    def __lt__(self, other: CountingKey) -> bool:
        CountingKey.calls += 1
        return self.v < other.v


@pytest.mark.parametrize("name", NAMES)
@pytest.mark.parametrize("stable", [False, True])
def test_comparison_counts_match_a_counting_key(name: str, stable: bool) -> None:
    if not has_hooks(name) or monotone(name):
        pytest.skip(f"kind {name!r}: no audit hooks yet, or integer keys only")
    ops = [((i * 7919) % 10, (i * 104729) % 61 - 30, i * 31) for i in range(400)]

    def run(audited: bool) -> tuple[int, int]:
        h = make(name, stable)
        CountingKey.calls = 0
        if not audited:
            _drive_keys(h, ops)
            return CountingKey.calls, -1
        with audit(h) as led:
            _drive_keys(h, ops)
        return CountingKey.calls, sum(r.comparisons for r in led.records)

    plain, _ = run(False)
    keys, recorded = run(True)
    assert recorded == keys == plain


def _drive_keys(h: Any, ops: list[tuple[int, int, int]]) -> None:
    live: list[Any] = []
    for code, key, pick in ops:
        live = [x for x in live if x.alive]
        if code <= 3 or not len(h):
            live.append(h.push(CountingKey(key), None))
        elif code <= 5:
            h.pop()
        elif code == 6 and live:
            x = live[pick % len(live)]
            h.decrease_key(x, CountingKey(x.key.v - 3))
        elif code == 7 and live:
            h.change_key(live[pick % len(live)], CountingKey(key))
        elif code == 8 and live:
            h.remove(live[pick % len(live)])
        else:
            live += h.extend([(CountingKey(key + i), None) for i in range(pick % 5)])


# --- modes: class, keys, meld, stacking, copy ---------------------------------------
def bare(h: Any) -> bool:
    return all(type(x._k) is not Counted for x in h)


@pytest.mark.parametrize("stable", [False, True])
def test_leaving_restores_class_and_bare_keys(stable: bool) -> None:
    h = PairingHeap([(5, "e"), (2, "b")], stable=stable)
    wrap = h._wrap
    with audit(h):
        assert type(h) is not PairingHeap and isinstance(h, PairingHeap)
        assert all(type(x._k) is Counted for x in h)
        h.push(1, "a")
    assert type(h) is PairingHeap and h._ext is None and h._wrap is wrap
    assert bare(h)
    assert [h.pop() for _ in range(3)] == [(1, "a"), (2, "b"), (5, "e")]


@pytest.mark.parametrize("audited_into", [True, False])
def test_audited_and_plain_heaps_meld_both_ways(audited_into: bool) -> None:
    a = PairingHeap([(4, "d"), (1, "a")])
    p = PairingHeap([(3, "c"), (2, "b")])
    with audit(a) as led:
        if audited_into:
            a.meld(p)
            assert all(type(x._k) is Counted for x in a) and len(a) == 4
            assert led.records[-1].op == "meld"
            assert led.records[-1].phi_before == pytest.approx(lg(2) + lg(2))  # two 2-node trees
        else:
            p.meld(a)
            assert bare(p) and len(a) == 0 and len(p) == 4
            assert a._wrap is not None  # new keys of the audited heap are counted again
            a.push(7, "g")
            a.push(6, "f")
            assert led.records[-1].comparisons == 1
    target = a if audited_into else p
    assert bare(target) and bare(a)
    assert [target.pop()[0] for _ in range(4)] == [1, 2, 3, 4]
    assert led.violations == []


def test_two_audited_heaps_meld_without_rewrapping() -> None:
    a, b = PairingHeap([(2, "b")]), PairingHeap([(1, "a")])
    with audit(a) as la, audit(b):
        k = b.peek()._k
        a.meld(b)
        assert a.peek()._k is k  # the same counting wrapper: no re-wrap
        b.push(3, "c")
    assert la.outside == 0.0 and bare(a) and bare(b)
    assert type(a) is PairingHeap and type(b) is PairingHeap


class _Other:
    """A stand-in for another class-switching mode (the checked mode's pattern)."""

    def __init__(self, h: Any) -> None:
        self.h = h
        self.replaced = type(h)
        sub = type("Other" + self.replaced.__name__, (self.replaced,), {"__slots__": ()})
        if h._ext is None:
            h._ext = {}
        h._ext["other"] = True
        h.__class__ = sub

    def leave(self) -> None:
        del self.h._ext["other"]
        self.h.__class__ = self.replaced


def test_modes_stack_in_either_order() -> None:
    h = PairingHeap([(2, "b")])
    with audit(h):  # audit below the other mode
        other = _Other(h)
        h.push(1, "a")
        other.leave()
        assert type(h).__name__ == "AuditedPairingHeap"
    assert type(h) is PairingHeap
    other = _Other(h)  # the other mode below the audit
    above = type(h)
    with audit(h) as led:
        h.push(0, "z")
    assert type(h) is above
    other.leave()
    assert type(h) is PairingHeap and led.count == 1
    with audit(h) as led:  # out of order: the audit ends while the other mode is above it
        other = _Other(h)
    assert type(h).__name__ == "OtherAuditedPairingHeap" and bare(h)
    h.push(5, "f")  # the dormant auditing layer passes calls through, recording nothing
    assert led.count == 0
    other.leave()
    assert h.pop() == (0, "z")  # ... and removes itself once it is outermost again
    assert type(h) is PairingHeap and bare(h)


def test_copy_of_an_audited_heap_is_plain() -> None:
    import copy

    h = heapkit.BinaryHeap([(3, "c"), (1, "a")])
    with audit(h):
        c = copy.copy(h)
        d = copy.deepcopy(h)
    assert type(c) is heapkit.BinaryHeap and bare(c) and bare(d)  # its own kind (issue 12)
    assert c.pop() == (1, "a") and d.pop() == (1, "a")


class Touchy:
    """A key whose ``<`` raises once armed."""

    armed = False

    def __init__(self, v: int) -> None:
        self.v = v

    def __lt__(self, other: Touchy) -> bool:
        if Touchy.armed:
            raise TypeError("no order today")
        return self.v < other.v


def test_failed_operation_leaves_a_correct_potential() -> None:
    h = PairingHeap([(Touchy(i), i) for i in range(20)])
    for _ in range(3):
        h.pop()  # a tree with many links
    with audit(h) as led:
        h.push(Touchy(50), 50)
        Touchy.armed = True
        with pytest.raises(TypeError):
            h.pop()
        Touchy.armed = False
        before = heapkit.check(h).potential  # the unwound shape differs from the one before the failed pop
        h.pop()
    assert led.count == 2  # the failed pop is not recorded
    assert led.records[1].phi_before == pytest.approx(before)
    assert led.phi_end == pytest.approx(heapkit.check(h).potential)


# --- the result object --------------------------------------------------------------
def test_worst_and_totals_mode_agree_with_full_records() -> None:
    def run(keep: str) -> Any:
        h = PairingHeap()
        with audit(h, keep=keep) as led:
            for i in range(200):
                h.push((i * 37) % 101, i)
                if i % 3 == 0:
                    h.pop()
        return led

    full, totals = run("all"), run("totals")
    assert full.summary() == totals.summary()
    spikes = full.worst(3)
    assert [r.actual for r in spikes] == sorted((r.actual for r in full.records), reverse=True)[:3]
    assert full.records[spikes[0].step] == spikes[0]
    assert totals.worst(3) == spikes
    assert len(totals.records) == 0 and totals.count == full.count


def test_assert_bounds_names_the_operation() -> None:
    h = OnePassPairingHeap()
    with audit(h) as led:
        ascending_then_pop(h, 50)
    first = led.violations[0]
    with pytest.raises(BoundExceededError, match=rf"#{first.step} \(pop at n={first.n}\)"):
        led.assert_bounds()
    assert "OVER BOUND" in led.summary()


def test_plot_names_the_extra_when_matplotlib_is_missing(monkeypatch: pytest.MonkeyPatch, tmp_path: Any) -> None:
    h = PairingHeap()
    with audit(h) as led:
        h.push(1, None)
    monkeypatch.setitem(sys.modules, "matplotlib", None)
    with pytest.raises(ImportError, match=r"heapkit\[plot\]"):
        led.plot(tmp_path / "a.png")


def test_plot_writes_a_png(tmp_path: Any) -> None:
    pytest.importorskip("matplotlib")
    h = PairingHeap()
    with audit(h) as led:
        for i in range(50):
            h.push(-i, i)
        h.pop()
    led.plot(tmp_path / "a.png")
    assert (tmp_path / "a.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"  # the PNG signature


def test_audit_refuses_what_it_cannot_audit() -> None:
    with pytest.raises(TypeError, match="heapkit heap"), audit([1, 2]):  # type: ignore[arg-type]
        pass


# --- attach: the HEAPKIT_DEBUG=audit path -----------------------------------------
def test_attach_reports_through_the_callback_when_the_heap_goes() -> None:
    seen: list[Any] = []
    configure(report=seen.append)
    try:
        h = PairingHeap()
        led = attach(h)
        assert Counted in _core.WRAPPERS
        for i in range(10):
            h.push(i, None)
        h.pop()
        del h
        gc.collect()
    finally:
        configure(report=None)
    assert seen == [led] and led.count == 11 and led.keep == "totals"


def test_attach_logs_the_summary_by_default(caplog: pytest.LogCaptureFixture) -> None:
    configure(report=None, keep="all")
    try:
        h = heapkit.BinaryHeap()
        led = attach(h)
        h.push(1, None)
        with caplog.at_level(logging.INFO, logger="heapkit.audit"):
            detach(h, led)
            assert type(h) is heapkit.BinaryHeap
            del h
            gc.collect()
    finally:
        configure(report=None)
    assert any("audit of binary: 1 operation(s)" in r.getMessage() for r in caplog.records)


def test_pairing_potential_is_kept_exactly_after_every_operation() -> None:
    # the kept potential against the from-scratch sum of log2 binary-view sizes (FSST 1986)
    h = PairingHeap()
    ops = [((i * 7919) % 10, (i * 104729) % 101 - 50, i * 2654435761 % 10**6) for i in range(1500)]
    with audit(h):
        for step in range(0, len(ops), 3):
            drive_handles = drive(h, ops[step : step + 3], False, PairingHeap)
            assert h._phi() == pytest.approx(heapkit.check(h).potential, rel=1e-9, abs=1e-9), step
            for x in drive_handles[:1]:
                if x in h and step % 2:
                    h.decrease_key(x, x.key - 5)
                    assert h._phi() == pytest.approx(heapkit.check(h).potential, rel=1e-9, abs=1e-9), step


# --- the protocol suite, run on audited heaps --------------------------------------


class AuditedMachine:
    """Mixin for the conformance machines: both heaps audited, same answers, bounds kept."""

    heaps: list[Any]

    def __init__(self) -> None:
        super().__init__()
        self.ledgers = [audit(h).__enter__() for h in self.heaps]

    def teardown(self) -> None:
        for led in self.ledgers:
            assert led.violations == [], led.summary()


for _name in NAMES:
    if has_hooks(_name):
        for _stable in (False, True):
            _cls = type(
                f"Audited_{_name}_{'stable' if _stable else 'unstable'}",
                (AuditedMachine, MonotoneMachine if monotone(_name) else ProtocolMachine),
                {"kind": _name, "stable": _stable},
            )
            globals()[f"Test{_cls.__name__}"] = _cls.TestCase
