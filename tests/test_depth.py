"""No recursion on structure depth: a pairing heap shaped as a chain of 10^6 nodes goes
through check, copy, deepcopy, pickle, iteration, repr, meld and clear with the default
recursion limit (api.md, "Failure rules")."""

from __future__ import annotations

import copy
import pickle
import sys

import heapkit


def test_a_million_node_chain() -> None:
    assert sys.getrecursionlimit() <= 10_000
    n = 1_000_000
    heap: heapkit.PairingHeap[int, None] = heapkit.PairingHeap()
    for i in range(n, 0, -1):  # each push becomes the new root: one long parent chain
        heap.push(i, None)
    shape = heapkit.check(heap)
    assert shape.height == n - 1 and shape.size == n
    assert "n=1000000" in repr(heap)
    assert sum(1 for _ in heap) == n
    dup = copy.copy(heap)
    assert len(dup) == n
    del dup
    back = pickle.loads(pickle.dumps(heap, protocol=pickle.HIGHEST_PROTOCOL))
    assert heapkit.check(back).height == n - 1
    deep = copy.deepcopy(back)
    assert len(deep) == n
    other: heapkit.PairingHeap[int, None] = heapkit.PairingHeap([(0, None)])
    other.meld(back)
    assert len(other) == n + 1 and other.pop() == (0, None)
    assert heap.pop() == (1, None)
    for h in (heap, other, deep):
        h.clear()
    assert len(heap) == len(other) == len(deep) == 0
