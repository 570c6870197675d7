"""Every example checked against a source outside heapkit, named beside the check."""

from __future__ import annotations

import heapq
import json
import os
import subprocess
import sys
from pathlib import Path
from typing import Any

import networkx as nx
import pytest
from event_simulation import mm1_wait, simulate
from job_dispatcher import brute_force, demo_events, dispatch
from knapsack import best_first, exhaustive, gear
from kway_merge import merge, station_logs
from route_planner import fastest_route, shortest_times, street_grid
from spanning_tree import campus, prim
from staging_checks import Event, Key, env_staging_shift, shift, staging_shift

import heapkit
from heapkit import trace

KINDS = sorted(heapkit.KINDS)
COMPARING = [k for k in KINDS if k != "radix"]


def _nx(g: dict) -> nx.Graph:  # type: ignore[type-arg]
    G = nx.Graph()
    for u, edges in g.items():
        for v, w in edges:
            G.add_edge(u, v, weight=w)
    return G


@pytest.mark.parametrize("kind", COMPARING)
def test_dijkstra_and_astar_match_networkx(kind: str) -> None:
    town = street_grid(15, 12)
    ours = shortest_times(town, (0, 0), kind)
    theirs = nx.single_source_dijkstra_path_length(_nx(town), (0, 0))  # source: networkx
    assert ours.keys() == theirs.keys()
    assert all(abs(ours[n] - theirs[n]) < 1e-9 for n in ours)
    minutes, route = fastest_route(town, (0, 0), (14, 11), kind)
    assert abs(minutes - theirs[(14, 11)]) < 1e-9
    assert route[0] == (0, 0) and route[-1] == (14, 11)


@pytest.mark.parametrize("kind", COMPARING)
def test_prim_matches_networkx_spanning_tree_weight(kind: str) -> None:
    pts = campus(60)
    total, edges = prim(pts, kind)
    G = nx.Graph()
    for i, (x, y) in enumerate(pts):
        for j in range(i + 1, len(pts)):
            G.add_edge(i, j, weight=((x - pts[j][0]) ** 2 + (y - pts[j][1]) ** 2) ** 0.5)
    mst = nx.minimum_spanning_tree(G)  # source: networkx
    assert len(edges) == len(pts) - 1
    assert abs(total - mst.size(weight="weight")) < 1e-6


@pytest.mark.parametrize("kind", COMPARING)
def test_dispatcher_matches_brute_force(kind: str) -> None:
    events = demo_events()
    assert dispatch(events, 10, kind) == brute_force(events, 10)  # source: exhaustive scan


@pytest.mark.parametrize("kind", COMPARING)
def test_knapsack_matches_exhaustive_search(kind: str) -> None:
    for seed in range(5):
        items = gear(12, seed)
        assert best_first(items, 60, kind)[0] == exhaustive(items, 60)  # source: all 2^12 subsets


@pytest.mark.parametrize("kind", COMPARING)
def test_kway_merge_matches_heapq_merge(kind: str) -> None:
    logs = station_logs(7, 120)
    assert list(merge(logs, kind)) == list(heapq.merge(*logs))  # source: heapq.merge
    assert list(merge(logs, kind)) == sorted(x for log in logs for x in log)  # source: sorted


def test_mm1_wait_matches_the_formula() -> None:
    # Wq = ρ/(μ−λ) for M/M/1 (Kleinrock, Queueing Systems vol. 1, 1975; recalled).
    lam, mu = 0.7, 1.0
    got = simulate(lam, mu, 60_000, seed=2)
    want = mm1_wait(lam, mu)
    assert abs(got - want) / want < 0.1, (got, want)


def _desk_by_scan(events: list[Event]) -> list[Key]:
    """The help desk's rules with a dict of open tickets and min() (an exhaustive scan)."""
    key: dict[int, Key] = {}
    desk: dict[int, str] = {}
    served: list[Key] = []
    for ev in events:
        if ev[0] == "open":
            _, d, no, severity, minute = ev
            key[no], desk[no] = (severity, minute, no), d
        elif ev[0] in ("escalate", "withdraw") and ev[1] in key:
            if ev[0] == "withdraw":
                del key[ev[1]]
            elif key[ev[1]][0] > 0:
                s, m, no = key[ev[1]]
                key[ev[1]] = (s - 1, m, no)
        elif ev[0] == "serve":
            mine = [k for no, k in key.items() if desk[no] == ev[1]]
            if mine:
                best = min(mine)
                served.append(best)
                del key[best[2]]
        elif ev[0] == "hand_over":
            desk = dict.fromkeys(desk, "mill")
    return served


def _popped_by_heapq(path: Path) -> list[Any]:
    """Replay a trace with the heapq entry-invalidation idiom (stale entries skipped)."""
    heaps: dict[int, list[list[Any]]] = {}
    live: dict[int, list[Any]] = {}  # entry id -> its current heapq entry [key, id, alive]
    popped: list[Any] = []
    for line in path.read_text().splitlines():
        op = json.loads(line)
        h = heaps.setdefault(op["q"], [])
        if op["op"] in ("push", "decrease_key", "change_key"):
            if op["id"] in live:
                live[op["id"]][2] = False
            live[op["id"]] = entry = [trace.key_from_json(op["key"]), op["id"], True]
            heapq.heappush(h, entry)
        elif op["op"] == "remove":
            live.pop(op["id"])[2] = False
        elif op["op"] == "meld":
            for entry in heaps.pop(op["from"], []):
                if entry[2]:
                    heapq.heappush(h, entry)
        elif op["op"] == "pop":
            while not h[0][2]:
                heapq.heappop(h)
            key, n, _ = heapq.heappop(h)
            del live[n]
            popped.append(key)
    return popped


@pytest.mark.parametrize("kind", ["pairing", "fibonacci", "binary"])
def test_staging_run_serves_like_a_scan_and_its_trace_replays_like_heapq(kind: str, tmp_path: Path) -> None:
    events = shift(300, seed=11)
    path = tmp_path / "quillmoor.jsonl"
    served, ledger = staging_shift(events, kind, every=1, trace_path=str(path))
    assert served == _desk_by_scan(events)  # source: exhaustive scan with min()
    assert ledger.violation_count == 0 and ledger.count > len(served)
    assert len(ledger.worst(3)) == 3
    theirs = _popped_by_heapq(path)  # source: heapq (entry-invalidation idiom)
    assert [list(k) for k in served] == [list(k) for k in theirs]
    other = "binomial" if kind != "binomial" else "pairing"
    assert trace.replay(path, other).popped == theirs  # source: heapq, as above


def test_evening_drain_is_sorted() -> None:
    events = shift(200, seed=3)
    served, _ = staging_shift(events, "hollow", every=5)
    # after the last arrival the mill desk only serves: that tail comes out in sorted order
    tail = served[-50:]
    assert tail == sorted(tail)  # source: sorted
    assert tail == _desk_by_scan(events)[-50:]  # source: exhaustive scan with min()


def test_heapkit_debug_checks_and_audits_every_queue_of_the_process() -> None:
    here = Path(__file__).resolve().parent
    env = {
        **os.environ,
        "HEAPKIT_DEBUG": "check:50,audit",
        "PYTHONPATH": os.pathsep.join([str(here.parent), os.environ.get("PYTHONPATH", "")]),
    }
    done = subprocess.run(
        [sys.executable, str(here / "staging_checks.py"), "--env"],
        capture_output=True,
        text=True,
        env=env,
        cwd=here,
        check=True,
    )
    out = json.loads(done.stdout)
    assert out["ledgers"] == 2 and out["over_bound"] == 0  # one audit per desk, reported at exit of scope
    assert [tuple(k) for k in out["served"]] == _desk_by_scan(shift())  # source: exhaustive scan with min()
    # without the variable nothing is audited, and the service behaves the same
    plain, reports = env_staging_shift(shift(100, seed=5))
    assert reports == [] and plain == _desk_by_scan(shift(100, seed=5))  # source: exhaustive scan
