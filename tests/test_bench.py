"""The benchmark's correctness (never its timings): every workload at a small size
gives the ``heapq`` idiom's result on every kind, comparison counts against
``heapq`` and log2(n!), and the ``bench`` command line."""

from __future__ import annotations

import functools
import heapq
import json
import math
from pathlib import Path
from typing import Any

import pytest

import heapkit
from heapkit.__main__ import main
from heapkit.bench import idiom
from heapkit.bench.measure import Counted, bytes_per_entry, comparisons, log2_factorial, time_workload
from heapkit.bench.workloads import WORKLOADS, Workload, scheduler_data, sort
from tests.kinds import NAMES

SCALE = 0.005


@functools.cache
def _data(name: str) -> Any:
    return WORKLOADS[name].make(SCALE)


@functools.cache
def _baseline(name: str) -> Any:
    return WORKLOADS[name].baseline(_data(name))


@pytest.mark.parametrize("kind", NAMES)
@pytest.mark.parametrize("name", list(WORKLOADS))
def test_workload_matches_the_heapq_idiom(name: str, kind: str) -> None:
    w = WORKLOADS[name]
    cls = heapkit.KINDS[kind]
    if not w.admits(cls):
        pytest.skip(f"{kind} cannot take the keys of {name}")
    got = w.run(cls, _data(name))
    # Source: the heapq idiom of the Python docs (heapkit.bench.idiom), run on the same data.
    assert w.same(got, _baseline(name))


@pytest.mark.parametrize("name", [n for n in WORKLOADS if n.startswith("dijkstra")])
def test_baseline_distances_match_scipy(name: str) -> None:
    from scipy.sparse import csr_matrix
    from scipy.sparse.csgraph import dijkstra as sp_dijkstra

    adj, src, _ = _data(name)
    rows, cols, weights = [], [], []
    for u, arcs in enumerate(adj):
        best: dict[int, float] = {}
        for v, w in arcs:  # csr_matrix would add parallel arcs; keep the lightest
            best[v] = min(w, best.get(v, math.inf))
        for v, w in best.items():
            rows.append(u)
            cols.append(v)
            weights.append(w)
    graph = csr_matrix((weights, (rows, cols)), shape=(len(adj), len(adj)))
    want = sp_dijkstra(graph, indices=src)
    got = _baseline(name)
    # Source: scipy.sparse.csgraph.dijkstra on the same graph (self-loops do not matter).
    assert len(got) == len(want)
    pairs = zip(got, want, strict=True)
    assert all(a == b or math.isclose(a, b, rel_tol=1e-12, abs_tol=1e-12) for a, b in pairs)


@pytest.mark.parametrize("name", [n for n in WORKLOADS if n.startswith("sort")])
def test_baseline_sort_matches_sorted(name: str) -> None:
    pairs = _data(name)
    # Source: Python's sorted() on the same keys.
    assert [k for k, _ in _baseline(name)] == sorted(k for k, _ in pairs)


@pytest.mark.parametrize("name", [n for n, w in WORKLOADS.items() if w.tuples is not None])
def test_tuple_idiom_matches_the_docs_idiom(name: str) -> None:
    w = WORKLOADS[name]
    assert w.tuples is not None
    # Source: the heapq docs' entry-invalidation idiom on the same data (its Dijkstra
    # distances are checked against scipy above, its sorts against sorted()).
    assert w.same(w.tuples(_data(name)), _baseline(name))


def test_costly_keys_order_as_their_tuples() -> None:
    pairs = _data("sort-costly")
    keys = [k for k, _ in pairs]
    # Source: Python's own ordering of lists of strings (sorted() with str.casefold).
    assert [k.label for k in sorted(keys)] == sorted((k.label for k in keys), key=lambda s: s.casefold().split("/"))
    assert len({tuple(k.fields()) for k in keys}) == len(keys)  # distinct: one pop order


def test_tuple_idiom_covers_what_users_time() -> None:
    # The plain tuple idiom runs every Dijkstra workload (the comparison users make,
    # common practice) and none that needs cancelling or raising a key.
    have = {n for n, w in WORKLOADS.items() if w.tuples is not None}
    assert {n for n in WORKLOADS if n.startswith("dijkstra")} <= have
    assert "scheduler" not in have and "meld" not in have


def test_scheduler_mix_has_every_operation() -> None:
    ops, ntasks = scheduler_data(SCALE)
    seen = {op for op, _, _ in ops}
    assert seen == {0, 1, 2, 3}
    assert ntasks == sum(1 for op, _, _ in ops if op == 0)


N = 2000


@functools.cache
def _counts() -> dict[str, int]:
    return comparisons(heapkit.KINDS, N)


def test_binary_counts_stay_near_heapq() -> None:
    counts = _counts()
    # Source: heapq itself, counted with the same Counted key on the same keys
    # (heapq documents the same bottom-up sift).
    assert counts["binary"] <= 1.02 * counts["heapq"]


def test_heapq_count_is_sane() -> None:
    keys = [Counted(v) for v in range(64, 0, -1)]
    Counted.count = 0
    pq: list[Counted] = []
    for k in keys:
        heapq.heappush(pq, k)
    got = [heapq.heappop(pq).v for _ in range(64)]
    assert got == list(range(1, 65))
    # Source: log2(64!) from math.lgamma; no comparison sort does better.
    assert Counted.count >= math.ceil(log2_factorial(64))


#: Kinds measured above one of the issue's targets (1.6 log2(n!) first, then 1.5 for
#: every kind), kept visible: the test must keep failing for them (strict xfail)
#: until the kind is improved.  dary and rank-pairing measured 1.63 and 2.18 at
#: n = 1e5 before issue 15.
OVER_TARGET: dict[float, dict[str, str]] = {
    1.6: {},
    1.5: {"fibonacci": "measured 1.557 log2(n!) at n = 2000, 1.531 at n = 1e5"},
}


@pytest.mark.parametrize("margin", list(OVER_TARGET))
@pytest.mark.parametrize("kind", NAMES)
def test_comparisons_within_target_of_log2_factorial(kind: str, margin: float, request: pytest.FixtureRequest) -> None:
    counts = _counts()
    if kind not in counts:
        pytest.skip(f"{kind} cannot take these keys")
    if kind in OVER_TARGET[margin]:
        request.applymarker(pytest.mark.xfail(strict=True, reason=OVER_TARGET[margin][kind]))
    # Source: log2(n!) = lgamma(n + 1) / ln 2, the comparison-sorting lower bound
    # (Knuth, TAOCP vol. 3, 5.3.1); the margins are the targets.
    assert counts[kind] <= margin * log2_factorial(N)


def test_dary_picks_the_least_child_cheaper_than_d_minus_1() -> None:
    # Without remembered verdicts a 4-ary pop needs d - 1 = 3 comparisons a level,
    # (d - 1) / log2(d) = 1.5 per binary level (common practice: finding the least of
    # d keys takes d - 1 comparisons), so pops alone cost about 1.5 log2(n!).
    n = 20_000
    got = comparisons({"dary": heapkit.DaryHeap}, n)
    # Source: log2(n!) (Knuth, TAOCP vol. 3, 5.3.1); heapq counted on the same keys.
    assert got["dary"] <= 1.25 * log2_factorial(n)
    assert got["dary"] <= 1.01 * got["heapq"]


def test_bytes_per_entry_counts_the_queue() -> None:
    got = bytes_per_entry({"pairing": heapkit.PairingHeap}, 2000)
    # A handle holds at least its seven slots of 8 bytes (recalled from memory:
    # CPython object pointers are 8 bytes on 64-bit builds).
    assert got["pairing"] >= 56
    assert got["heapq idiom"] >= 56


def test_idiom_skips_removed_entries() -> None:
    ops = [(0, 0, 5.0), (0, 1, 7.0), (2, 1, 3.0), (1, 0, None), (1, 0, None)]
    # Source: the docs' idiom pops the re-prioritised task once, at its new priority.
    assert idiom.scheduler(ops, 2) == [(3.0, 1), (5.0, 0)]


def test_kinds_are_timed_in_rounds_in_alternating_order() -> None:
    # One run of every kind per round, the kinds' order reversed every other round (as
    # replay times them), so no kind is always the one timed first.
    seen: list[str] = []

    def run(factory: Any, pairs: list[tuple[int, int]]) -> list[tuple[Any, int]]:
        seen.append(factory.__name__)
        return sort(factory, pairs)

    pairs = [(3, 0), (1, 1), (2, 2)]
    w = Workload("tiny", "three pushes, three pops", lambda s: pairs, run, idiom.sort, lambda a, b: a == b)
    kinds = {"binary": heapkit.BinaryHeap, "pairing": heapkit.PairingHeap, "weak": heapkit.WeakHeap}
    rows = time_workload(w, pairs, kinds, repeat=3)
    first, second, third = "BinaryHeap", "PairingHeap", "WeakHeap"
    assert seen == [first, second, third, third, second, first, first, second, third]
    assert all(r.ok and len(r.ratios) == 3 for r in rows.values())


def test_cli_quick_one_workload(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    out = tmp_path / "bench.json"
    code = main(["bench", "--quick", "--repeat", "1", "--workload", "sort-random", "--json", str(out)])
    assert code == 0
    data = json.loads(out.read_text())
    cells = data["workloads"]["sort-random"]["kinds"]
    assert set(cells) == {k for k in NAMES if WORKLOADS["sort-random"].admits(heapkit.KINDS[k])}
    assert all(c["ok"] for c in cells.values())
    assert all(c["tuple_ratio"] is not None and len(c["tuple_ratios"]) == 1 for c in cells.values())
    assert data["workloads"]["sort-random"]["tuple_s"] > 0
    text = capsys.readouterr().out
    assert "fastest kind per workload" in text and "sort-random" in text
    assert "kind / tuple idiom" in text and "kind / docs idiom" in text


@pytest.mark.parametrize("argv", [["--kinds", "no-such-kind"], ["--workload", "nothing"], ["--repeat", "0"]])
def test_cli_bad_usage_exits_2(argv: list[str]) -> None:
    assert main(["bench", "--quick", *argv]) == 2


def test_cli_unknown_option_exits_2() -> None:
    with pytest.raises(SystemExit) as e:
        main(["bench", "--no-such-option"])
    assert e.value.code == 2


def test_cli_sections_render(capsys: pytest.CaptureFixture[str]) -> None:
    kind = next(k for k in NAMES if not getattr(heapkit.KINDS[k], "MONOTONE", False))
    code = main(
        ["bench", "--quick", "--repeat", "1", "--kinds", kind, "--workload", "comparisons,memory,growth,contracts"]
    )
    assert code == 0
    text = capsys.readouterr().out
    for head in ("key comparisons", "bytes per entry", "ns per operation", "contract modes"):
        assert head in text
