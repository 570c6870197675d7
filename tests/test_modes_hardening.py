"""Modes under hostile keys (issue 12): checked mode and the audit never lose an
entry or a result, leave no heap stuck, and keep a kind's own ordering objects."""

from __future__ import annotations

from pathlib import Path
from typing import Any

import pytest

import heapkit
from heapkit import LazyHeap, PairingHeap, audit, checked
from tests.kinds import NAMES, make, monotone, run_python

ROOT = Path(__file__).resolve().parent.parent
ORDERED = [n for n in NAMES if not monotone(n)]  # radix takes ints only


class Budget:
    """A key whose ``<`` raises ``TypeError`` once ``Budget.left`` comparisons are spent
    (``None``: never)."""

    left: int | None = None
    made = 0

    def __init__(self, v: int) -> None:
        self.v = v

    def __lt__(self, other: Budget) -> bool:
        Budget.made += 1
        if Budget.left is not None:
            if Budget.left <= 0:
                raise TypeError("out of comparisons")
            Budget.left -= 1
        return self.v < other.v

    def __repr__(self) -> str:
        return f"B{self.v}"


KEYS = [7, 3, 9, 1, 8, 2, 6, 4, 5, 0]


def _comparisons_of(name: str, op: str) -> int:
    """How many ``<`` the operation makes on a plain heap of the same history."""
    h = make(name)
    for k in KEYS:
        h.push(Budget(k), k)
    h.pop()
    Budget.made = 0
    if op == "pop":
        h.pop()
    else:
        h.push(Budget(-1), -1)
    return Budget.made


@pytest.mark.parametrize("op", ["pop", "push"])
@pytest.mark.parametrize("name", ORDERED)
def test_checked_mode_returns_the_result_when_its_own_check_meets_a_raising_key(name: str, op: str) -> None:
    need = _comparisons_of(name, op)
    h = checked(make(name))
    for k in KEYS:
        h.push(Budget(k), k)
    h.pop()
    Budget.left = need  # enough for the operation, none for the check after it
    try:
        got = h.pop() if op == "pop" else h.push(Budget(-1), -1)
    finally:
        Budget.left = None
    if op == "pop":
        assert got[0].v == 1 and len(h) == 8  # source: sorted(KEYS)[1], the popped entry is returned
    else:
        assert got.alive and got in h and len(h) == 10
    rest = sorted(x.key.v for x in h)
    h.push(Budget(100), 100)  # the deferred full check runs here, and passes
    assert [h.pop()[0].v for _ in range(len(h))] == [*rest, 100]  # source: sorted


def test_a_checked_lazy_pop_interrupted_in_its_peek_leaves_no_stuck_heap() -> None:
    h = checked(LazyHeap())
    handles = [h.push(Budget(k), k) for k in KEYS]
    h.remove(handles[KEYS.index(0)])  # the top: now a stale entry on top
    Budget.left = 0
    try:
        with pytest.raises(TypeError):
            h.pop()
    finally:
        Budget.left = None
    h.push(Budget(11), 11)  # used to raise "in the middle of pop" forever
    assert [h.pop()[0].v for _ in range(len(h))] == sorted([k for k in KEYS if k != 0] + [11])  # source: sorted


class Tagged:
    """``<`` reads the priority, ``==`` the tag: a tuple comparison that trusts ``==``
    misorders these."""

    def __init__(self, prio: int, tag: str = "same") -> None:
        self.prio = prio
        self.tag = tag

    def __lt__(self, other: Tagged) -> bool:
        return self.prio < other.prio

    def __eq__(self, other: object) -> bool:
        return isinstance(other, Tagged) and self.tag == other.tag

    __hash__ = None  # type: ignore[assignment]


@pytest.mark.parametrize("stable", [False, True])
def test_auditing_a_lazy_heap_leaves_the_kinds_ordering_objects(stable: bool) -> None:
    h = LazyHeap([(Tagged(5), 5), (Tagged(1), 1)], stable=stable)
    with audit(h):
        for p in (4, 0, 9, 2):
            h.push(Tagged(p), p)
    h.push(Tagged(3), 3)  # first push after the audit
    heapkit.check(h)  # "bare-keys" failed here
    assert [h.pop()[1] for _ in range(len(h))] == [0, 1, 2, 3, 4, 5, 9]  # source: sorted


def test_an_audited_pairing_heap_whose_meld_failed_goes_on() -> None:
    a = PairingHeap([(Budget(k), k) for k in (4, 6, 8)])
    b = PairingHeap([(Budget(k), k) for k in (5, 7)])
    with audit(a) as led:
        a.pop()
        Budget.left = 0
        try:
            with pytest.raises(TypeError):
                a.meld(b)  # the roots' comparison raises
        finally:
            Budget.left = None
        a.push(Budget(1), 1)  # raised "potential cache missing"
        a.pop()
    assert [r.op for r in led.records] == ["pop", "push", "pop"]
    assert led.phi_end == pytest.approx(heapkit.check(a).potential)


def test_copies_and_pickles_under_heapkit_debug_audit_work_on_every_kind() -> None:
    code = (
        "import copy, pickle, heapkit\n"
        "for name in sorted(heapkit.KINDS):\n"
        "    h = heapkit.new(name)\n"
        "    for k in (5, 3, 8, 1): h.push(k, str(k))\n"
        "    h.pop(); h.push(2, '2')\n"
        "    for c in (copy.copy(h), copy.deepcopy(h), pickle.loads(pickle.dumps(h))):\n"
        "        c.push(4, 'x'); c.push(9, 'z')\n"
        "        heapkit.check(c)\n"
        "        print(name, [c.pop()[0] for _ in range(len(c))])\n"
    )
    out = run_python(code, "audit")
    assert out.returncode == 0, out.stderr
    lines = out.stdout.splitlines()
    assert len(lines) == 3 * len(NAMES)
    for line in lines:
        assert line.endswith(" [2, 3, 4, 5, 8, 9]"), line  # source: sorted([5, 3, 8, 2, 4, 9])


class Meddler:
    """A key whose ``<`` pushes onto the heap it is compared in (set ``target``)."""

    target: Any = None

    def __init__(self, v: int) -> None:
        self.v = v

    def __lt__(self, other: Meddler) -> bool:
        if Meddler.target is not None:
            t, Meddler.target = Meddler.target, None
            t.push(Meddler(-5), "sneaked in")
        return self.v < other.v


class MyPairing(PairingHeap[Any, Any]):
    """A user's subclass, defined in the same module as the meddling key."""

    __slots__ = ()


def test_the_guard_is_not_fooled_by_a_subclass_in_the_keys_module() -> None:
    h = checked(MyPairing([(Meddler(5), "a"), (Meddler(7), "b")]))
    Meddler.target = h
    with pytest.raises(RuntimeError, match="in the middle of push"):
        h.push(Meddler(1), "new")
    Meddler.target = None
    assert sorted(x.key.v for x in h) == [5, 7]
    heapkit.check(h)


@pytest.mark.parametrize("top", [0, -1, "3", 2.5, True])
def test_audit_refuses_a_bad_top_before_anything_happens(top: Any) -> None:
    h = PairingHeap([(2, "b"), (1, "a")])
    with (
        pytest.raises(ValueError, match=f"top must be an integer of at least 1, got {top!r}"),
        audit(h, keep="totals", top=top),
    ):
        h.pop()
    assert len(h) == 2 and type(h) is PairingHeap


def test_heapkit_debug_with_a_non_ascii_digit_warns_and_is_ignored() -> None:
    out = run_python("import heapkit; print(type(heapkit.new('pairing')).__name__)", "check:²")
    assert out.returncode == 0, out.stderr
    assert out.stdout.strip() == "PairingHeap"
    assert "ignoring unknown value 'check:²'" in out.stderr
