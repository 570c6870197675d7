"""``heapkit.to_dot``: Graphviz text of a heap's shape, capped and iterative."""

from __future__ import annotations

import re

import pytest

import heapkit
from heapkit import BinaryHeap, DaryHeap, PairingHeap, to_dot
from tests.test_contracts import _queue


def _parse(text: str) -> tuple[dict[str, str], list[tuple[str, str]]]:
    labels = dict(re.findall(r'^  (n\d+) \[label="(.*)"\];$', text, re.M))
    edges = re.findall(r"^  (n\d+) -> (n\d+);$", text, re.M)
    return labels, edges


@pytest.mark.parametrize("arity", [2, 3, 4])
def test_array_heap_edges_follow_the_parent_formula(arity: int) -> None:
    h = DaryHeap(arity=arity)
    for k in range(20):                         # pushed in order: key k stands at position k
        h.push(k, None)
    labels, edges = _parse(to_dot(h))
    key = {name: int(label.split("\\n")[0]) for name, label in labels.items()}
    # Position i's parent is (i - 1) // d (Williams 1964 for d = 2; Johnson 1975 for d-ary).
    assert sorted((key[p], key[c]) for p, c in edges) == [((i - 1) // arity, i) for i in range(1, 20)]


def test_pairing_heap_shows_degrees_and_every_edge() -> None:
    h = PairingHeap([(k, None) for k in (5, 3, 8, 1)])
    h.push(9, None)
    h.pop()                                     # pairing makes some depth
    labels, edges = _parse(to_dot(h))
    assert len(labels) == len(h) == 4 and len(edges) == 3      # a tree on 4 nodes has 3 edges
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
    for k in range(100_000, 0, -1):             # each push becomes the root: a chain
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
