"""Every example checked against a source outside heapkit, named beside the check."""

from __future__ import annotations

import heapq

import networkx as nx
import pytest
from event_simulation import mm1_wait, simulate
from job_dispatcher import brute_force, demo_events, dispatch
from knapsack import best_first, exhaustive, gear
from kway_merge import merge, station_logs
from route_planner import fastest_route, shortest_times, street_grid
from spanning_tree import campus, prim

import heapkit

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
