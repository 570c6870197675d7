"""Every kind against outside references: `sorted` (a stable sort, so equal keys keep
push order — Python docs, "Sorting Techniques") and `heapq` (CPython's binary heap)."""

from __future__ import annotations

import heapq
import random
from typing import Any

import pytest

from tests.kinds import NAMES, make, monotone


def _sequences(n: int) -> dict[str, list[int]]:
    rng = random.Random(1234)
    return {
        "random": [rng.randrange(10**6) for _ in range(n)],
        "sorted": list(range(n)),
        "reversed": list(range(n, 0, -1)),
        "all-equal": [7] * n,
        "sawtooth": [i % 17 for i in range(n)],
        "few-distinct": [rng.randrange(4) for _ in range(n)],
    }


@pytest.mark.parametrize("name", NAMES)
@pytest.mark.parametrize("shape", sorted(_sequences(1)))
@pytest.mark.parametrize("stable", [False, True])
def test_push_all_pop_all_matches_sorted(name: str, shape: str, stable: bool) -> None:
    keys = _sequences(600)[shape]
    heap = make(name, stable)
    for i, k in enumerate(keys):
        heap.push(k, i)
    out = [heap.pop() for _ in range(len(keys))]
    # `sorted` is stable, so for a stable heap the whole (key, value) order must agree.
    expected = sorted(((k, i) for i, k in enumerate(keys)), key=lambda p: p[0])
    if stable:
        assert out == expected
    else:
        assert [k for k, _ in out] == [k for k, _ in expected]
        assert sorted(v for _, v in out) == list(range(len(keys)))


@pytest.mark.parametrize("name", NAMES)
def test_extend_then_pop_matches_sorted(name: str) -> None:
    keys = _sequences(500)["random"]
    heap = make(name, pairs=[(k, None) for k in keys[:250]])
    heap.extend((k, None) for k in keys[250:])
    assert [heap.pop()[0] for _ in range(len(keys))] == sorted(keys)


@pytest.mark.parametrize("name", NAMES)
@pytest.mark.parametrize("seed", range(4))
def test_interleaved_push_pop_matches_heapq(name: str, seed: int) -> None:
    rng = random.Random(seed)
    ref: list[int] = []
    heap = make(name)
    floor = 0
    for _ in range(3000):
        if ref and rng.random() < 0.45:
            got = heap.pop()[0]
            want = heapq.heappop(ref)
            assert got == want
            floor = want
        else:
            k = rng.randrange(floor, floor + 1000) if monotone(name) else rng.randrange(-500, 500)
            heapq.heappush(ref, k)
            heap.push(k, None)
        assert len(heap) == len(ref)
    assert [heap.pop()[0] for _ in range(len(ref))] == sorted(ref)


@pytest.mark.parametrize("name", NAMES)
def test_decrease_and_remove_match_a_rebuilt_sorted_list(name: str) -> None:
    rng = random.Random(99)
    heap = make(name)
    live: dict[int, Any] = {}
    keys: dict[int, int] = {}
    for i in range(800):
        k = rng.randrange(1000, 2000)
        live[i] = heap.push(k, i)
        keys[i] = k
    for i in rng.sample(range(800), 300):
        new = keys[i] - rng.randrange(0, 900)
        heap.decrease_key(live[i], new)
        keys[i] = new
    for i in rng.sample(range(800), 200):
        if i in live:
            assert heap.remove(live.pop(i)) == (keys.pop(i), i)
    out = [heap.pop() for _ in range(len(heap))]
    assert [k for k, _ in out] == sorted(keys.values())
    assert sorted(v for _, v in out) == sorted(keys)
