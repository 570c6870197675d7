"""The incremental checker against the full one (Hypothesis).

Properties, for binary, dary and pairing heaps built by random operations:

1. no false alarms: after any operation on a healthy heap, the local survey of
   what the operation touched reports nothing, and neither does ``check``;
2. a corruption placed on what the operation touched (a node the local survey
   covers, by the kind's documented coverage) is reported by the local survey,
   under the same rule the full check reports;
3. a corruption placed anywhere is reported by the full check;
4. checked mode with only local checks runs any healthy sequence without alarm.
"""

from __future__ import annotations

from typing import Any

from hypothesis import given, settings
from hypothesis import strategies as st

import heapkit
from heapkit import checked
from heapkit._core import Owner
from heapkit.errors import InvariantError
from heapkit.kinds.dary import rules as dary_rules
from tests.corruption import local_rules
from tests.kinds import monotone

NAMES = ["binary", "dary", "pairing"]
#: Every kind whose keys need not be monotone (the driver must work with each kind's hooks).
ALL = [name for name in sorted(heapkit.KINDS) if not monotone(name)]
SMALL = st.integers(0, 60)
GROW_OPS = st.sampled_from(["push", "push", "push", "pop", "decrease_key", "change_key", "remove"])


def _grow(data: Any, h: Any) -> list[Any]:
    """Random operations on a plain heap; returns its live handles."""
    handles: list[Any] = []
    for step in range(data.draw(st.integers(0, 30), label="steps")):
        live = [x for x in handles if x.alive]
        op = data.draw(GROW_OPS)
        if op == "push" or not live:
            handles.append(h.push(data.draw(SMALL), step))
        elif op == "pop":
            h.pop()
        else:
            x = data.draw(st.sampled_from(live))
            if op == "decrease_key":
                h.decrease_key(x, data.draw(st.integers(-10, x.key)))
            elif op == "change_key":
                h.change_key(x, data.draw(SMALL))
            else:
                h.remove(x)
    return [x for x in handles if x.alive]


def _operate(data: Any, h: Any, live: list[Any]) -> tuple[Any, Any]:
    """One random operation through the hooks: returns (touched, subject)."""
    ops = ["push", "meld"] + (["pop", "decrease_key", "change_key", "remove"] if live else [])
    op = data.draw(st.sampled_from(ops), label="op")
    handle: Any = None
    if op in ("decrease_key", "change_key", "remove"):
        handle = data.draw(st.sampled_from(live))
    elif op == "meld":
        handle = h._spawn()
        for k in data.draw(st.lists(SMALL, max_size=8)):
            handle.push(k, "m")
    touched = h._touched(op, handle)
    if op == "push":
        handle = h.push(data.draw(SMALL), "p")
    elif op == "pop":
        h.pop()
    elif op == "decrease_key":
        h.decrease_key(handle, data.draw(st.integers(-10, handle.key)))
    elif op == "change_key":
        h.change_key(handle, data.draw(SMALL))
    elif op == "remove":
        h.remove(handle)
    else:
        h.meld(handle)
    return touched, handle


def _covered(h: Any, touched: Any, subject: Any) -> list[Any]:
    """What the local survey covers after the op (see kinds/dary/rules.py / kinds/pairing/rules.py)."""
    if heapkit.check(h).kind == "pairing":
        nodes = [x for x in touched if x is not None]
        if subject is not None and hasattr(subject, "_child"):
            nodes.append(subject)
        if h._root is not None:
            nodes.append(h._root)
        return [x for x in nodes if x._tok is not None]
    return [h._a[i] for i in dary_rules.stretch(h, touched, subject)]


def _corrupt(data: Any, h: Any, x: Any) -> str:
    """Break one rule at entry ``x`` through the internals; return the rule's name."""
    pairing = hasattr(x, "_child")
    child = None
    if pairing:
        child = x._child
    elif h._d * x._i + 1 < len(h._a):
        child = h._a[h._d * x._i + 1]
    menu = ["ownership", "links" if pairing else "index"] + (["heap-order"] if child is not None else [])
    if pairing and child is not None:
        menu.append("child-links")
    rule = data.draw(st.sampled_from(menu), label="corruption")
    if rule == "child-links":  # the first child no longer points back
        child._prev = child  # type: ignore[union-attr]
        return "links"
    if rule == "ownership":
        x._tok = Owner()
    elif rule == "index":
        x._i += len(h._a) + 1
    elif rule == "links":
        if x is h._root:
            x._next = type(x)(0, 0, "stray", None)
        else:
            x._prev = x
    else:
        x._key = x._k = child._k + 1  # type: ignore[union-attr]
    return rule


def _full_rules(h: Any) -> list[str]:
    try:
        heapkit.check(h)
    except InvariantError as err:
        return [p.split("'")[1] for p in err.problems if p.startswith("rule '")]
    return []


# More examples than the profile's default: at 40, a mutant local survey that skips
# the children's order or links survived; at 400 both were caught (measured).
@settings(max_examples=max(200, settings.default.max_examples))
@given(name=st.sampled_from(NAMES), data=st.data())
def test_local_survey_is_quiet_on_healthy_heaps_and_catches_what_the_op_touched(name: str, data: Any) -> None:
    h = heapkit.KINDS[name]()
    live = _grow(data, h)
    touched, subject = _operate(data, h, live)
    heapkit.check(h)
    if touched is None:  # the kind asked for a full check
        return
    assert local_rules(h, touched, subject) == []
    covered = _covered(h, touched, subject)
    if not covered:
        return
    x = data.draw(st.sampled_from(covered), label="target")
    rule = _corrupt(data, h, x)
    assert rule in local_rules(h, touched, subject)
    assert rule in _full_rules(h)


@given(name=st.sampled_from(NAMES), data=st.data())
def test_full_check_catches_a_corruption_anywhere(name: str, data: Any) -> None:
    h = heapkit.KINDS[name]()
    _grow(data, h)
    entries = list(h)
    if not entries:
        return
    rule = _corrupt(data, h, data.draw(st.sampled_from(entries), label="target"))
    assert rule in _full_rules(h)


@given(name=st.sampled_from(ALL), stable=st.booleans(), data=st.data())
def test_checked_mode_with_local_checks_runs_healthy_sequences_quietly(name: str, stable: bool, data: Any) -> None:
    h = checked(heapkit.KINDS[name](stable=stable), full_every=10**9)
    handles: list[Any] = []
    for step in range(data.draw(st.integers(0, 40))):
        live = [x for x in handles if x.alive]
        op = data.draw(
            st.sampled_from(["push", "extend", "pop", "decrease_key", "change_key", "remove", "meld", "clear"])
        )
        if op == "push" or (not live and op != "extend"):
            handles.append(h.push(data.draw(SMALL), step))
        elif op == "extend":
            handles += h.extend([(k, step) for k in data.draw(st.lists(SMALL, max_size=5))])
        elif op == "pop":
            h.pop()
        elif op == "meld":
            other = heapkit.KINDS[name](stable=stable)
            handles += [other.push(k, step) for k in data.draw(st.lists(SMALL, max_size=5))]
            h.meld(other)
        elif op == "clear":
            if data.draw(st.integers(0, 5)) == 0:
                h.clear()
        else:
            x = data.draw(st.sampled_from(live))
            if op == "decrease_key":
                h.decrease_key(x, data.draw(st.integers(-10, x.key)))
            elif op == "change_key":
                h.change_key(x, data.draw(SMALL))
            else:
                h.remove(x)
    heapkit.check(h)
