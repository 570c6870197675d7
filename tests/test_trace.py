"""Traces: what is recorded replays to the same keys on every kind (checked against
`sorted` of the recorded keys), bad keys are refused when recorded, bad files name
the file and line."""

from __future__ import annotations

import json
import random
from pathlib import Path
from typing import Any

import pytest

import heapkit
from heapkit import trace
from tests.kinds import NAMES, monotone


def _workload(path: Path, name: str = "pairing") -> list[Any]:
    rng = random.Random(3)
    a = trace.record(heapkit.new(name), path)
    b = a.sibling(heapkit.new(name))
    hs: list[Any] = []
    popped: list[Any] = []
    for i in range(300):
        r = rng.random()
        if r < 0.5 or not hs:
            hs.append((a if i % 3 else b).push(rng.randrange(100, 200), f"job{i}"))
        elif r < 0.65:
            h = hs[rng.randrange(len(hs))]
            if h.alive:
                (a if h in a else b).decrease_key(h, h.key - rng.randrange(5))
        elif r < 0.75:
            h = hs.pop(rng.randrange(len(hs)))
            if h.alive:
                (a if h in a else b).remove(h)
        elif r < 0.95 and a:
            popped.append(a.pop()[0])
        else:
            a.meld(b)
    a.extend([(150, "x"), (151, "y")])
    a.meld(b)
    popped.extend(a.pop()[0] for _ in range(len(a)))
    a.close()
    return popped


@pytest.mark.parametrize("name", [n for n in NAMES if not monotone(n)])
def test_a_trace_replays_to_the_same_pop_keys(tmp_path: Path, name: str) -> None:
    path = tmp_path / "t.jsonl"
    popped = _workload(path)
    out = trace.replay(path, name)
    assert out.operations == sum(1 for line in path.read_text().splitlines() if line.strip())
    assert all(len(q) == 0 for q in out.queues.values())
    pops = [json.loads(line)["key"] for line in path.read_text().splitlines() if '"pop"' in line]
    assert pops == popped  # the recorded keys are the ones the original run popped
    assert out.popped == popped  # and the replay on this kind pops the same keys


def test_tuple_keys_come_back_as_tuples(tmp_path: Path) -> None:
    path = tmp_path / "t.jsonl"
    q = trace.record(heapkit.new("binary"), path)
    q.push((2, "b"), None)
    q.push((1, "z"), None)
    q.close()
    out = trace.replay(path, "pairing")
    assert out.queues[0].pop() == ((1, "z"), 1)


@pytest.mark.parametrize("key", [object(), True, float("inf"), {"a": 1}, (1, object())])
def test_keys_that_json_cannot_hold_are_refused_when_recorded(tmp_path: Path, key: Any) -> None:
    q = trace.record(heapkit.new("pairing"), tmp_path / "t.jsonl")
    with pytest.raises(TypeError, match="push"):
        q.push(key, None)
    assert len(q) == 0


@pytest.mark.parametrize(
    ("text", "says"),
    [
        ('{"op":"push","q":0,"id":0,"key":1}\nnot json\n', ":2: not a JSON object"),
        ('{"op":"jump","q":0}\n', ":1: expected an object"),
        ('{"op":"push","q":0,"key":1}\n', ":1: push needs id"),
        ('{"op":"push","q":0,"id":0,"key":1}\n{"op":"remove","q":0,"id":9}\n', ":2: unknown entry id 9"),
        ('{"op":"pop","q":0}\n', ":1: pop failed"),
    ],
)
def test_bad_files_name_the_file_and_line(tmp_path: Path, text: str, says: str) -> None:
    path = tmp_path / "bad.jsonl"
    path.write_text(text)
    with pytest.raises(trace.TraceError, match=str(path).replace(".", r"\.") + says):
        trace.replay(path, "binary")
