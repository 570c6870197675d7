"""The bench's concurrency section: correctness only (its ratios are reported, never asserted)."""

from __future__ import annotations

import heapkit
from heapkit.__main__ import main
from heapkit.bench.concurrency import producer_consumer


def test_producer_consumer_pops_every_key_through_both_queues() -> None:
    r = producer_consumer(3_000, {"lazy": heapkit.LazyHeap, "pairing": heapkit.PairingHeap}, 2)
    # Source: sorted() of the same keys; both queues' pops are compared with it inside the run.
    assert all(row["ok"] for row in r["kinds"].values())
    assert set(r["kinds"]) == {"lazy", "pairing"}
    assert all(row["cpu_ratio"] > 0 and row["wall_ratio"] > 0 for row in r["kinds"].values())


def test_bench_command_runs_the_concurrency_section(capsys: object) -> None:
    code = main(["bench", "--workload", "concurrency", "--quick", "--repeat", "1", "--kinds", "lazy,radix"])
    out = capsys.readouterr().out  # type: ignore[attr-defined]
    assert code == 0
    assert "queue.PriorityQueue" in out and "lazy" in out
    assert "  radix" not in out  # radix takes monotone keys only: not in a random-key run
