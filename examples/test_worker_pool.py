"""The render farm (worker_pool.py) checked against its sequential model, a plain sort
(Python's sorted, common practice)."""

from __future__ import annotations

import pytest
from worker_pool import run_shift, sequential, studio_day

import heapkit

KINDS = [k for k in sorted(heapkit.KINDS) if k != "radix"]  # radix: monotone keys only


@pytest.mark.parametrize("kind", KINDS)
def test_one_worker_renders_in_the_models_order(kind: str) -> None:
    day = studio_day(60)
    shift = run_shift(day, workers=1, hold=True, kind=kind)
    assert shift.rendered[0] == sequential(day)


@pytest.mark.parametrize("kind", KINDS)
def test_three_workers_share_the_models_jobs_each_in_order(kind: str) -> None:
    day = studio_day(60)
    shift = run_shift(day, workers=3, hold=True, kind=kind)
    want = sequential(day)
    rank = {name: i for i, (_, name) in enumerate(want)}
    assert sorted(x for part in shift.rendered for x in part) == sorted(want)
    for part in shift.rendered:  # nothing is pushed while they run: each takes in model order
        assert [rank[name] for _, name in part] == sorted(rank[name] for _, name in part)


@pytest.mark.parametrize("seed", range(5))
def test_live_shift_renders_or_withdraws_each_job_once(seed: int) -> None:
    day = studio_day(300, seed)
    shift = run_shift(day, workers=4)
    rendered = [x for part in shift.rendered for x in part]
    names = [name for _, name in rendered]
    assert len(set(names)) == len(names)  # nothing rendered twice
    assert set(names).isdisjoint(shift.withdrawn)
    assert set(names) | shift.withdrawn == {j.name for j in day}  # nothing lost
    # each job rendered at the last priority the director managed to set before a worker took it
    assert all(p == shift.final[name] for p, name in rendered)
