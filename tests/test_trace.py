"""Traces: what is recorded replays to the same keys on every kind (checked against
`sorted` of the recorded keys), bad keys are refused when recorded, bad files name
the file and line."""

from __future__ import annotations

import errno
import gc
import io
import json
import random
import re
import tracemalloc
import weakref
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


# --- hostile trace files: each refused with the file and line, never a traceback or a hang ---

DEEP = "[" * 5000 + "1" + "]" * 5000


@pytest.mark.parametrize(
    ("raw", "says"),
    [
        (b'{"op":"push","q":0,"id":0,"key":"caf\xe9"}\n', ":1: not UTF-8 (byte 0xe9 at column 37)"),
        (b'{"op":"push","q":0,"id":0,"key":' + b"9" * 5000 + b"}\n", ":1: not a JSON object (Exceeds the limit"),
        (b'{"op":"push","q":0,"id":0,"key":' + DEEP.encode() + b"}\n", ":1: arrays nested deeper"),
        (b'{"op":"extend","q":0,"ids":[0,1,2],"keys":[5,6]}\n', ":1: extend has 3 ids but 2 keys"),
        (b'{"op":"push","q":0,"id":0,"key":1}\n{"op":"meld","q":0,"from":0}\n', ":2: meld: queue 0 cannot be melded"),
        (b'{"op":"push","q":0,"id":0,"key":[NaN,0]}\n', ":1: a key holds NaN"),
        (b'{"op":"push","q":0,"id":0,"key":[1e400,0]}\n', ":1: a key holds inf"),
        (b'{"op":"push","q":0,"id":0,"key":{"a":1}}\n', ":1: a key must be"),
        (b'{"op":"push","q":"0","id":0,"key":1}\n', ':1: push: q must be a non-negative integer, not "0"'),
        (b'{"op":"push","q":0,"id":0,"key":1}\n{"op":"push","q":0,"id":0,"key":2}\n', ":2: id 0 pushed twice"),
    ],
)
def test_hostile_files_name_the_file_and_line(tmp_path: Path, raw: bytes, says: str) -> None:
    path = tmp_path / "bad.jsonl"
    path.write_bytes(raw)
    with pytest.raises(trace.TraceError, match=re.escape(f"{path}{says}")):
        trace.replay(path, "pairing")


def test_a_line_over_the_limit_is_refused_without_reading_it_all(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setattr(trace, "MAX_LINE", 1000)
    path = tmp_path / "long.jsonl"
    path.write_bytes(b'{"op":"push","q":0,"id":0,"key":1}\n' + b" " * 5000 + b"\n")
    with pytest.raises(trace.TraceError, match=re.escape(f"{path}:2: line longer than the limit of 1000 bytes")):
        list(trace.read(path))


def test_a_key_nested_too_deep_is_refused_when_recorded(tmp_path: Path) -> None:
    key: Any = 1
    for _ in range(trace.MAX_KEY_DEPTH + 1):
        key = (key,)
    q = trace.record(heapkit.new("pairing"), tmp_path / "t.jsonl")
    with pytest.raises(TypeError, match="nested at most"):
        q.push(key, None)
    assert len(q) == 0


def test_a_doubled_file_says_which_id_was_pushed_twice(tmp_path: Path) -> None:
    one = tmp_path / "one.jsonl"
    _workload(one)
    doubled = tmp_path / "doubled.jsonl"
    doubled.write_text(one.read_text() * 2)
    first = len(one.read_text().splitlines()) + 1
    with pytest.raises(trace.TraceError, match=f":{first}: id 0 pushed twice \\(first at line 1"):
        trace.replay(doubled, "pairing")


# --- the recorder: overwrite, with-statement, memory, failing writes ---


def test_record_overwrites_by_default_and_mode_x_refuses(tmp_path: Path) -> None:
    path = tmp_path / "t.jsonl"
    popped = _workload(path)
    assert _workload(path) == popped  # recorded again over the same file
    assert trace.replay(path, "binary").popped == popped  # one recording, not two appended
    with pytest.raises(FileExistsError):
        trace.record(heapkit.new("binary"), path, mode="x")
    with pytest.raises(ValueError, match="mode"):
        trace.record(heapkit.new("binary"), tmp_path / "u.jsonl", mode="a")


def test_record_is_a_context_manager(tmp_path: Path) -> None:
    path = tmp_path / "t.jsonl"
    with trace.record(heapkit.new("pairing"), path) as q:
        q.push(2, "b")
    with pytest.raises(trace.TraceError, match="closed"):
        q.push(1, "a")
    assert len(q) == 1 and trace.replay(path, "binary").operations == 1


class Payload:
    """A value that can be watched with a weak reference."""

    def __init__(self) -> None:
        self.data = bytes(1024)


@pytest.mark.parametrize("name", ["pairing", "lazy", "binary"])
def test_the_recorder_keeps_no_dead_entry_alive(tmp_path: Path, name: str) -> None:
    q = trace.record(heapkit.new(name), tmp_path / "t.jsonl")
    refs = []
    for i in range(300):
        v = Payload()
        refs.append(weakref.ref(v))
        h = q.push(i % 17, v)
        if i % 3 == 0:
            q.remove(h)
    del v, h
    while q:
        q.pop()
    q.push(1, Payload())
    q.clear()
    gc.collect()
    assert [r for r in refs if r() is not None] == []
    q.close()


def test_recorder_memory_is_bounded_by_the_live_heap(tmp_path: Path) -> None:
    # The issue's repro: 20,000 push+pop of 1 KB payloads kept 29 MB; the live heap holds one entry.
    q = trace.record(heapkit.new("pairing"), tmp_path / "t.jsonl")
    tracemalloc.start()
    try:
        before = tracemalloc.get_traced_memory()[0]
        for i in range(20_000):
            q.push(i, bytes(1024))
            q.pop()
        grown = tracemalloc.get_traced_memory()[0] - before
    finally:
        tracemalloc.stop()
        q.close()
    assert grown < 200_000, grown  # 20,000 payloads would be over 20 MB


class FullDisk(io.StringIO):
    """A file whose writes fail (as on a full disk) after ``room`` lines."""

    def __init__(self, room: int) -> None:
        super().__init__()
        self.room = room

    def write(self, text: str) -> int:
        if self.room <= 0:
            raise OSError(errno.ENOSPC, "No space left on device")
        self.room -= 1
        return super().write(text)


@pytest.mark.parametrize("room", [0, 1, 3, 6])
def test_a_failing_write_loses_no_entry(room: int, caplog: pytest.LogCaptureFixture) -> None:
    f = FullDisk(room)
    q = trace.record(heapkit.new("pairing"), f)
    keys = [5, 3, 8, 1]
    hs = [q.push(k, f"v{k}") for k in keys]  # every push returns its handle
    assert all(h.alive for h in hs) and len(q) == 4
    q.decrease_key(hs[2], 0)
    assert q.pop() == (0, "v8")  # the pop returns its entry
    assert len(q) == 3
    rest = [q.pop()[0] for _ in range(3)]
    assert rest == sorted(k for k in keys if k != 8)  # source: sorted
    assert q.write_error is not None and "No space" in caplog.text
    with pytest.raises(trace.TraceError, match=f"incomplete: writing line {room + 1} failed"):
        q.close()
    assert len(f.getvalue().splitlines()) == room  # the lines before the failure, nothing after


class PeekNamesAnother(heapkit.PairingHeap):  # type: ignore[type-arg]
    """Deliberately off: peek names the newest entry among equal keys, pop takes another."""

    def peek(self) -> Any:
        top = super().peek()
        return max((h for h in self if not (top.key < h.key)), key=lambda h: h.value)


def test_a_pop_that_is_not_the_peeked_entry_orphans_nothing(tmp_path: Path) -> None:
    path = tmp_path / "t.jsonl"
    with trace.record(PeekNamesAnother(), path) as q:
        a, b = q.push(1, 0), q.push(1, 1)
        assert q.pop()[0] == 1
        left = a if a.alive else b
        assert q.remove(left) == (1, left.value)  # the entry that stayed can still be removed
    assert trace.replay(path, "binary").popped == [1]
