"""Copies and pickles (issue 12): stable order across processes, the kind's own class,
and ``__setstate__`` refusing data that would load a heap ``check`` rejects.
"""

from __future__ import annotations

import copy
import pickle
import subprocess
import sys
from pathlib import Path
from typing import Any

import pytest

import heapkit
from heapkit.kinds.binary import BinaryHeap
from tests.kinds import NAMES, make

ROOT = Path(__file__).resolve().parent.parent

# Run in a fresh interpreter: its push-order count starts again at 0.  Loads the
# pickled heap from stdin, pushes "new" entries (key 5) into it, into a copy, a deep
# copy and a heap made after loading that then melds the loaded heap in; prints the
# pop order of each.
CHILD = """
import copy, pickle, sys
import heapkit
data = sys.stdin.buffer.read()
loaded = pickle.loads(data)
out = []
for h in (loaded, copy.copy(loaded), copy.deepcopy(loaded)):
    h.push(5, "new")
    out.append([h.pop()[1] for _ in range(len(h))])
again = pickle.loads(data)
fresh = heapkit.new(again.KIND, stable=True)
fresh.push(5, "new")
fresh.meld(again)
out.append([fresh.pop()[1] for _ in range(len(fresh))])
print(repr(out))
"""


@pytest.mark.parametrize("name", [n for n in NAMES if n != "radix"] + ["radix"])
def test_stable_order_survives_pickle_into_a_new_process(name: str) -> None:
    # Push order numbers well above 0 here, so that a new process's count starting
    # at 0 would (before the fix) put its pushes first.
    warm = make(name, True)
    warm.extend((0, i) for i in range(300))
    pairs = [(5, f"old{i}") for i in range(4)] + [(3, "low"), (7, "high")]
    h = make(name, True, pairs)
    blob = pickle.dumps(h)
    done = subprocess.run([sys.executable, "-c", CHILD], input=blob, capture_output=True, cwd=ROOT, check=True)
    orders = eval(done.stdout.decode())  # the child prints a list of lists of str
    # Outside check: Python's sort is stable (Python docs, "Sorting HOW TO"), so
    # sorting (key, value) pairs by key gives push order among equal keys.
    want = [v for _, v in sorted([*pairs, (5, "new")], key=lambda p: p[0])]
    assert orders == [want] * 4, (done.stdout, done.stderr)


def test_a_binary_heap_copies_and_pickles_as_a_binary_heap() -> None:
    h = BinaryHeap([(2, "b"), (1, "a")])
    for other in (copy.copy(h), copy.deepcopy(h), pickle.loads(pickle.dumps(h))):
        assert type(other) is BinaryHeap and other.KIND == "binary"
        assert [other.pop() for _ in range(2)] == [(1, "a"), (2, "b")]
    d = heapkit.new("dary", arity=2)
    assert type(copy.copy(d)) is heapkit.DaryHeap


def _state(h: Any) -> tuple[Any, Any, tuple[list[Any], Any]]:
    fn, args, state = h.__reduce__()
    return fn, args, state


def _refused(h: Any, handles: list[Any], layout: Any) -> None:
    fn, args, _ = _state(h)
    new = fn(*args)
    with pytest.raises(ValueError, match=r"^load "):
        new.__setstate__((handles, layout))
    assert len(new) == 0
    heapkit.check(new)


@pytest.mark.parametrize("name", NAMES)
def test_loading_refuses_repeated_or_foreign_handles_and_a_junk_layout(name: str) -> None:
    h = make(name, False, [(k, str(k)) for k in (4, 1, 7, 1, 9, 2, 6)])
    h.pop()
    _, _, (handles, layout) = _state(h)
    _refused(h, [*handles, handles[0]], layout)
    _refused(h, [object(), *handles[1:]], layout)
    _refused(h, handles, "junk")
    # the untouched data loads, and check (heapkit's own verifier) accepts it
    fn, args, state = _state(h)
    ok = fn(*args)
    ok.__setstate__(state)
    heapkit.check(ok)


@pytest.mark.parametrize("name", [n for n in NAMES if n not in ("binary", "dary", "hollow")])
def test_loading_refuses_counts_that_disagree_with_the_handles(name: str) -> None:
    # dary/binary/hollow carry no layout: any prefix of their list is a valid shape.
    h = make(name, False, [(k, str(k)) for k in (4, 1, 7, 1, 9, 2, 6, 3)])
    _, _, (handles, layout) = _state(h)
    _refused(h, handles[:-1], layout)


def test_loading_refuses_broken_links() -> None:
    h = make("pairing", False, [(k, k) for k in range(6)])
    _, _, (handles, counts) = _state(h)
    _refused(h, handles, [0, *counts[1:]])  # the root claims no children: a forest
    r = make("rank-pairing", False, [(k, k) for k in range(6)])
    r.pop()
    _, _, (handles, codes) = _state(r)
    _refused(r, handles, [codes[0] | 1, *codes[1:]])  # a root with a right child
    x = make("radix", False, [(k, k) for k in (3, 9, 12)])
    _, _, (handles, (last, sizes)) = _state(x)
    _refused(x, handles, (last, [sizes[-1], *sizes[:-1]]))  # keys in the wrong buckets
