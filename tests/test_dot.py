"""``heapkit.to_dot``: Graphviz text of a heap's shape, capped and iterative."""

from __future__ import annotations

import random
import re
import sys
from typing import Any

import pytest

import heapkit
from heapkit import BinaryHeap, DaryHeap, FibonacciHeap, PairingHeap, RankPairingHeap, to_dot
from tests.test_contracts import _queue


def _parse(text: str) -> tuple[dict[str, str], list[tuple[str, str]]]:
    labels = dict(re.findall(r'^  (n\d+) \[label="(.*)"\];$', text, re.M))
    edges = re.findall(r"^  (n\d+) -> (n\d+);$", text, re.M)
    return labels, edges


@pytest.mark.parametrize("arity", [2, 3, 4])
def test_array_heap_edges_follow_the_parent_formula(arity: int) -> None:
    h = DaryHeap(arity=arity)
    for k in range(20):  # pushed in order: key k stands at position k
        h.push(k, None)
    labels, edges = _parse(to_dot(h))
    key = {name: int(label.split("\\n")[0]) for name, label in labels.items()}
    # Position i's parent is (i - 1) // d (Williams 1964 for d = 2; Johnson 1975 for d-ary).
    assert sorted((key[p], key[c]) for p, c in edges) == [((i - 1) // arity, i) for i in range(1, 20)]


def test_pairing_heap_shows_degrees_and_every_edge() -> None:
    h = PairingHeap([(k, None) for k in (5, 3, 8, 1)])
    h.push(9, None)
    h.pop()  # pairing makes some depth
    labels, edges = _parse(to_dot(h))
    assert len(labels) == len(h) == 4 and len(edges) == 3  # a tree on 4 nodes has 3 edges
    degree = {n: int(label.split("degree ")[1]) for n, label in labels.items()}
    out = {n: sum(1 for p, _ in edges if p == n) for n in labels}
    assert degree == out


def test_drawing_is_capped_with_a_note() -> None:
    text = to_dot(BinaryHeap([(k, None) for k in range(10)]), limit=3)
    labels, _ = _parse(text)
    assert len(labels) == 3
    assert "truncated: 3 of 10 entries drawn (limit 3)" in text
    assert "truncated" not in to_dot(BinaryHeap([(1, None)]))


def test_a_deep_chain_is_drawn_without_recursion() -> None:
    h = PairingHeap()
    for k in range(100_000, 0, -1):  # each push becomes the root: a chain
        h.push(k, None)
    labels, edges = _parse(to_dot(h, limit=5))
    assert len(labels) == 5 and len(edges) == 4


def test_keys_are_escaped_and_other_queues_drawn_loose() -> None:
    text = to_dot(PairingHeap([('say "hi"\\', None)]))
    # repr doubles the backslash, DOT escaping doubles it again and escapes the quotes.
    assert 'label="\'say \\"hi\\"\\\\\\\\\'\\ndegree 0"' in text
    loose = to_dot(_queue(2, 1))
    assert "no tree drawn" in loose and "->" not in loose and len(_parse(loose)[0]) == 2


def test_limit_is_validated() -> None:
    with pytest.raises(ValueError, match="limit"):
        to_dot(heapkit.PairingHeap(), limit=0)


# --- every kind with the hook ------------------------------------------------------

DRAWN = [name for name in sorted(heapkit.KINDS) if hasattr(heapkit.KINDS[name], "_dot_edges")]
ARRAYS = {"binary", "dary", "lazy"}  # implicit trees: the drawing is the list, slot by slot


def _worked(name: str, seed: int = 7, stable: bool = False) -> tuple[Any, list[int]]:
    """A heap of kind ``name`` after a seeded mix of every operation, and its keys
    as a plain list kept beside it (the model the drawing is checked against)."""
    rng = random.Random(seed)
    h = heapkit.KINDS[name](stable=stable)
    live: list[Any] = []
    model: list[int] = []
    for k in rng.sample(range(1000), 80):
        live.append(h.push(k, None))
        model.append(k)
    for _ in range(3):  # pops build trees in the lazy-linking kinds
        k, _v = h.pop()
        model.remove(k)
    live = [x for x in live if x.alive]
    for x in rng.sample(live, 25):  # cuts, marks, stale entries
        model.remove(x.key)
        h.decrease_key(x, x.key - rng.randrange(1, 400))
        model.append(x.key)
    for x in rng.sample([x for x in live if x.alive], 8):
        model.remove(h.remove(x)[0])
    k, _v = h.pop()
    model.remove(k)
    return h, model


def _key(label: str) -> int:
    return int(label.split("\\n")[0])


@pytest.mark.parametrize("stable", [False, True])
@pytest.mark.parametrize("name", DRAWN)
def test_every_entry_is_drawn_once_with_its_parent_first(name: str, stable: bool) -> None:
    h, model = _worked(name, stable=stable)
    text = to_dot(h, limit=10_000)
    labels, edges = _parse(text)
    assert text.startswith("digraph heap {") and text.endswith("}") and "truncated" not in text
    assert len(re.findall(r"^  n\d+ \[label=", text, re.M)) == len(labels)  # one node line per node
    live = {n: lab for n, lab in labels.items() if not lab.endswith(", stale")}
    # The keys drawn as entries are the keys kept in the plain list beside the heap.
    assert sorted(_key(lab) for lab in live.values()) == sorted(model)
    index = {n: int(n[1:]) for n in labels}
    children = [c for _, c in edges]
    assert len(children) == len(set(children))  # one parent each: a forest
    assert all(index[p] < index[c] for p, c in edges)  # parents drawn before children
    tops = len(labels) - len(edges)  # a forest on N nodes has N - roots edges
    shape = heapkit.check(h)
    assert tops == shape.roots
    if name not in ARRAYS:
        assert len(labels) == len(h) == len(model)
    # Along every heap-ordered edge the child's key is not below its parent's (rank-pairing:
    # left edges only; a right child is a sibling).  Common practice: the heap-order rule.
    ordered = [(p, c) for p, c in edges if not labels[c].endswith(", right")]
    assert ordered and all(not _key(labels[c]) < _key(labels[p]) for p, c in ordered)


@pytest.mark.parametrize("name", DRAWN)
def test_labels_agree_with_check(name: str) -> None:
    h, _model = _worked(name)
    labels, edges = _parse(to_dot(h, limit=10_000))
    shape = heapkit.check(h)
    out = {n: sum(1 for p, _ in edges if p == n) for n in labels}
    index = {n: i for i, n in enumerate(labels)}
    extras = {n: lab.split("\\n", 1)[1] for n, lab in labels.items()}
    if name in ("fibonacci", "binomial", "pairing"):
        degree = {n: int(re.match(r"degree (\d+)", e).group(1)) for n, e in extras.items()}  # type: ignore[union-attr]
        assert degree == out  # the degree is the number of children
        assert max(degree.values()) == shape.max_degree
        assert sum(e.endswith(", marked") for e in extras.values()) == (shape.marked or 0)
    elif name == "rank-pairing":
        rank = {n: int(re.match(r"rank (\d+)", e).group(1)) for n, e in extras.items()}  # type: ignore[union-attr]
        assert max(rank.values()) == shape.max_degree  # check reports the largest rank
        assert sum(e.endswith(", root") for e in extras.values()) == shape.roots
        # Type-2 ranks never grow downwards (Haeupler-Sen-Tarjan 2011, recalled from memory).
        assert all(not rank[p] < rank[c] for p, c in edges)
        assert max(out.values()) <= 2  # the binary view
        # Half-trees: a root has no right child.
        assert not any(extras[p].endswith(", root") and extras[c].endswith(", right") for p, c in edges)
    elif name in ARRAYS:  # array heaps: "[i]" is the slot
        assert [int(re.match(r"\[(\d+)\]", e).group(1)) for e in extras.values()] == list(range(len(labels)))  # type: ignore[union-attr]
        assert max(out.values()) <= (h._d if name == "dary" else 2)
        if name == "lazy":
            stale = sum(e.endswith(", stale") for e in extras.values())
            assert stale == shape.details["stale"] and stale > 0
            assert len(labels) == shape.details["entries"]
    elif name == "weak":  # "[i]": the array position
        slots = [int(re.match(r"\[(\d+)\]", e).group(1)) for e in extras.values()]  # type: ignore[union-attr]
        assert slots == list(range(len(labels)))
        assert max(out.values()) == shape.max_degree  # children of a d-ancestor
        # Each edge runs from a position's distinguished ancestor, which is above it
        # (smaller index) in the array (Dutton 1993, recalled from memory).
        assert all(slots[index[p]] < slots[index[c]] for p, c in edges)
    else:
        pytest.skip(f"no label facts for {name} yet: add its extra label's meaning here")


@pytest.mark.parametrize("name", DRAWN)
def test_truncation_note_when_the_limit_is_below_the_size(name: str) -> None:
    h, _model = _worked(name)
    whole = len(_parse(to_dot(h, limit=10_000))[0])
    text = to_dot(h, limit=whole // 2)
    labels, edges = _parse(text)
    assert len(labels) == whole // 2
    assert re.search(rf"truncated: {whole // 2} of {whole} (entries|nodes) drawn \(limit {whole // 2}\)", text)
    assert all(int(p[1:]) < int(c[1:]) for p, c in edges)
    assert "truncated" not in to_dot(h, limit=whole)


def _deep(name: str, depth: int) -> Any:
    """A heap of ``name`` at least ``depth`` levels deep, or None where the kind's
    invariants keep it shallow."""
    if name == "pairing":
        h: Any = PairingHeap()
        for k in range(depth, -1, -1):  # each push becomes the root: a chain
            h.push(k, None)
        return h
    if name == "fibonacci":
        # Each round: three pushes below the root, pop (the two survivors link, then take the
        # old tree as a child), then cut the middle one out: the chain grows by one level.
        h = FibonacciHeap([(0, None)])
        for j in range(1, depth + 1):
            h.push(-10 * j - 5, None)
            h.push(-10 * j, None)
            c = h.push(-10 * j + 5, None)
            h.pop()
            h.decrease_key(c, -10 * j - 7)
            h.pop()
        return h
    if name == "rank-pairing":
        # A root of rank 2 over a right-going path of rank-1 nodes (0,i-nodes with i = 2)
        # ending in a leaf: every rule holds (heapkit.check below), imported through the
        # flat layout that pickle uses (codes: rank * 4 + 2 * has_left + has_right).
        h = RankPairingHeap()
        handles = [h.push(k, None) for k in range(depth + 1)]
        h._import(handles, [2 * 4 + 2] + [1 * 4 + 1] * (depth - 1) + [0])
        return h
    return None  # binomial: height = max degree <= log2 n; arrays: log2 n


@pytest.mark.parametrize("name", DRAWN)
def test_a_structure_deeper_than_the_recursion_limit(name: str) -> None:
    depth = sys.getrecursionlimit() + 500
    h = _deep(name, depth)
    if h is None:
        pytest.skip(f"{name} is at most log2(n) deep by its invariants")
    shape = heapkit.check(h)  # raises if the shape breaks a rule
    assert shape.height >= depth
    labels, edges = _parse(to_dot(h, limit=depth + 10))
    assert len(labels) == len(h) and len(edges) == len(h) - shape.roots
    few, few_edges = _parse(to_dot(h, limit=5))
    assert len(few) == 5 and len(few_edges) == 4  # a chain: each node under the last


@pytest.mark.parametrize("name", DRAWN)
def test_checked_mode_draws_the_same_shape(name: str) -> None:
    h, _model = _worked(name, stable=True)
    body = to_dot(h).splitlines()[2:]
    heapkit.checked(h)  # switches the class, keeps the structure
    assert to_dot(h).splitlines()[2:] == body
