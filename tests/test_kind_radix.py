"""The radix kind's own facts: Dijkstra against scipy, its key rules, its invariants."""

from __future__ import annotations

import random
from typing import Any

import numpy as np
import pytest
from scipy.sparse import csr_matrix
from scipy.sparse.csgraph import dijkstra as scipy_dijkstra

import heapkit
from heapkit.kinds.radix import RadixHeap


def _graph(rng: random.Random, n: int, m: int, wmax: int) -> list[list[tuple[int, int]]]:
    adj: list[list[tuple[int, int]]] = [[] for _ in range(n)]
    for _ in range(m):
        adj[rng.randrange(n)].append((rng.randrange(n), rng.randint(0, wmax)))
    return adj


def _radix_dijkstra(adj: list[list[tuple[int, int]]], src: int, stable: bool) -> list[float]:
    heap: RadixHeap[int, int] = RadixHeap(stable=stable)
    handles: dict[int, Any] = {src: heap.push(0, src)}
    done: dict[int, int] = {}
    while heap:
        d, u = heap.pop()
        done[u] = d
        for v, w in adj[u]:
            if v in done:
                continue
            h = handles.get(v)
            if h is None:
                handles[v] = heap.push(d + w, v)
            elif d + w < h.key:
                heap.decrease_key(h, d + w)
        if len(done) % 97 == 0:
            heapkit.check(heap)
    return [float(done[v]) if v in done else float("inf") for v in range(len(adj))]


@pytest.mark.parametrize("seed", range(6))
@pytest.mark.parametrize("stable", [False, True])
def test_dijkstra_matches_scipy(seed: int, stable: bool) -> None:
    rng = random.Random(seed)
    n = rng.randint(2, 300)
    adj = _graph(rng, n, rng.randint(0, 6 * n), rng.choice([1, 10, 1000, 10**9]))
    # Source of truth: scipy.sparse.csgraph.dijkstra on the same graph, keeping the
    # lightest of parallel edges (csr_matrix would add them up).
    best: dict[tuple[int, int], int] = {}
    for u, out in enumerate(adj):
        for v, w in out:
            if u != v and ((u, v) not in best or w < best[(u, v)]):
                best[(u, v)] = w
    rows = [u for u, _ in best]
    cols = [v for _, v in best]
    # scipy treats an explicit 0 as "no edge"; a tiny weight keeps it (results are integers)
    data = [w if w else 1e-9 for w in best.values()]
    mat = csr_matrix((data, (rows, cols)), shape=(n, n))
    want = scipy_dijkstra(mat, directed=True, indices=0)
    got = _radix_dijkstra(adj, 0, stable)
    assert np.allclose(np.array(got), want, atol=1e-3, equal_nan=False)


def _state(heap: RadixHeap[Any, Any]) -> tuple[Any, ...]:
    return (heap.last, len(heap), sorted((h.key, h.value) for h in heap))


@pytest.mark.parametrize("bad", [-1, 2.0, True, False, "3", None])
def test_push_refuses_bad_keys_and_changes_nothing(bad: Any) -> None:
    heap: RadixHeap[int, str] = RadixHeap([(4, "d"), (7, "g")])
    before = _state(heap)
    with pytest.raises(heapkit.KeyOrderError) as err:
        heap.push(bad, "x")
    assert repr(bad) in str(err.value) and "last popped key, which is 0" in str(err.value)
    assert _state(heap) == before
    heapkit.check(heap)


def test_keys_below_last_popped_are_refused_everywhere() -> None:
    heap: RadixHeap[int, str] = RadixHeap([(4, "d"), (7, "g"), (9, "i")])
    x = heap.peek()
    assert heap.pop() == (4, "d") and not x.alive
    g = next(h for h in heap if h.value == "g")
    before = _state(heap)
    for op in (
        lambda: heap.push(3, "c"),
        lambda: heap.extend([(5, "e"), (3, "c")]),
        lambda: heap.decrease_key(g, 3),
        lambda: heap.change_key(g, 1),
        lambda: heap.decrease_key(g, 6.0),
        lambda: heap.change_key(g, True),
    ):
        with pytest.raises(heapkit.KeyOrderError, match="last popped key, which is 4"):
            op()
        assert _state(heap) == before
        heapkit.check(heap)
    heap.decrease_key(g, 4)  # equal to the last popped key is fine
    assert heap.pop() == (4, "g")


def test_meld_needs_the_same_last_popped_key() -> None:
    a: RadixHeap[int, str] = RadixHeap([(1, "a"), (5, "e")])
    b: RadixHeap[int, str] = RadixHeap([(2, "b"), (6, "f")])
    a.pop()
    before = (_state(a), _state(b))
    with pytest.raises(heapkit.KeyOrderError, match=r"last popped key 1 differs from this heap's 0"):
        b.meld(a)
    with pytest.raises(heapkit.KeyOrderError):
        a.meld(b)
    assert (_state(a), _state(b)) == before
    with pytest.raises(TypeError):
        a.meld(heapkit.PairingHeap())  # type: ignore[arg-type]
    with pytest.raises(TypeError):
        a.meld(RadixHeap(stable=True))
    b.pop()
    b.pop()  # b is empty now (last popped 6): nothing moves, so the meld goes through
    a.meld(b)
    assert _state(a) == before[0]
    c: RadixHeap[int, str] = RadixHeap([(1, "z"), (3, "c")])
    c.pop()
    a.meld(c)  # both last popped 1
    assert [a.pop() for _ in range(len(a))] == [(3, "c"), (5, "e")]


def test_stable_keeps_push_order_through_redistribution() -> None:
    heap: RadixHeap[int, int] = RadixHeap(stable=True)
    rng = random.Random(5)
    keys = [rng.randint(0, 40) for _ in range(300)]
    hs = [heap.push(k, i) for i, k in enumerate(keys)]
    for h in hs[::7]:
        heap.decrease_key(h, h.key // 2)
    # Source of truth: Python's sort is stable (documented), so sorting (key, push index)
    # by key alone gives the push order among equal keys.
    want = sorted(((h.key, h.value) for h in hs), key=lambda kv: kv[0])
    assert [heap.pop() for _ in range(len(heap))] == want


# --- every rule of RULES, broken on purpose --------------------------------------
def _sample() -> tuple[RadixHeap[int, str], dict[str, Any]]:
    heap: RadixHeap[int, str] = RadixHeap([(8, "h"), (9, "i"), (12, "l"), (8, "h2"), (30, "x")])
    heap.pop()  # last popped key 8
    return heap, {h.value: h for h in heap}


def _corrupt_key_type(heap: RadixHeap[int, str], by: dict[str, Any]) -> Any:
    x = by["i"]
    x._key = x._k = 9.0
    return x


def _corrupt_monotone(heap: RadixHeap[int, str], by: dict[str, Any]) -> Any:
    # keys 0..7 with last 8 differ first at bit 3: bucket 4, so only "monotone" breaks
    x = by["l"]
    heap._take(x)
    x._key = x._k = 3
    heap._put(x, 4)
    return x


def _corrupt_bucket(heap: RadixHeap[int, str], by: dict[str, Any]) -> Any:
    x = by["x"]
    heap._take(x)
    heap._put(x, 2)
    return x


def _corrupt_index(heap: RadixHeap[int, str], by: dict[str, Any]) -> Any:
    x = by["i"]
    x._i += 5
    return x


def _corrupt_size(heap: RadixHeap[int, str], by: dict[str, Any]) -> Any:
    heap._n += 1
    return None


def _corrupt_ownership(heap: RadixHeap[int, str], by: dict[str, Any]) -> Any:
    x = by["x"]
    x._tok = RadixHeap()._tok
    return x


CORRUPTIONS = {
    "key-type": _corrupt_key_type,
    "monotone": _corrupt_monotone,
    "bucket": _corrupt_bucket,
    "index": _corrupt_index,
    "size": _corrupt_size,
    "ownership": _corrupt_ownership,
}


def test_every_rule_has_a_corruption() -> None:
    assert set(CORRUPTIONS) == set(RadixHeap.RULES)


@pytest.mark.parametrize("rule", sorted(RadixHeap.RULES))
def test_check_names_the_broken_rule(rule: str) -> None:
    heap, by = _sample()
    heapkit.check(heap)
    x = CORRUPTIONS[rule](heap, by)
    with pytest.raises(heapkit.InvariantError) as err:
        heapkit.check(heap)
    text = str(err.value)
    assert f"rule {rule!r}" in text
    others = set(RadixHeap.RULES) - {rule}
    assert not any(f"rule {r!r}" in text for r in others), text
    if x is not None:
        assert repr(x.value) in text


def test_copy_and_pickle_keep_last_and_order() -> None:
    import copy
    import pickle

    heap: RadixHeap[int, int] = RadixHeap((k, k) for k in (5, 3, 11, 3, 40))
    heap.pop()
    for twin in (copy.copy(heap), copy.deepcopy(heap), pickle.loads(pickle.dumps(heap))):
        heapkit.check(twin)
        assert twin.last == 3
        with pytest.raises(heapkit.KeyOrderError):
            twin.push(2, 2)
        assert [twin.pop()[0] for _ in range(len(twin))] == [3, 5, 11, 40]
