"""The command line on hostile input: a clear one-line message and exit code 2 (never a
traceback, a hang or unbounded memory), outputs checked before the long run, and
``demo --keep`` never deleting or replacing anything but a regular file."""

from __future__ import annotations

import json
import os
import stat
import subprocess
import sys
from pathlib import Path

import pytest

import heapkit
import heapkit.bench.measure
import heapkit.commands.demo
import heapkit.commands.replay
from heapkit.__main__ import main

ROOT = Path(__file__).resolve().parents[1]
TRACE = ROOT / "examples" / "traces" / "brackenford.jsonl"
GOOD = b'{"op":"push","q":0,"id":0,"key":1}\n'


def _one_line(err: str, command: str) -> str:
    lines = err.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith(f"heapkit {command}: "), err
    assert "Traceback" not in err
    return lines[0]


def _not_run(monkeypatch: pytest.MonkeyPatch) -> None:
    """Make the long part of every command fail the test if it starts."""

    def boom(*args: object, **kwargs: object) -> None:
        pytest.fail("the long run started before the bad output path was reported")

    monkeypatch.setattr(heapkit.commands.replay, "compare", boom)
    monkeypatch.setattr(heapkit.commands.demo, "record_scenario", boom)
    monkeypatch.setattr(heapkit.bench.measure, "time_workload", boom)


@pytest.mark.parametrize(
    ("raw", "says"),
    [
        (b'{"op":"push","q":0,"id":0,"key":"\xff"}\n', ":1: not UTF-8"),
        (GOOD + b'{"op":"push","q":0,"id":1,"key":' + b"7" * 6000 + b"}\n", ":2: not a JSON object"),
        (b'{"op":"push","q":0,"id":0,"key":' + b"[" * 100_000 + b"]" * 100_000 + b"}\n", ":1: arrays nested deeper"),
        (b'{"op":"extend","q":0,"ids":[0],"keys":[1,2]}\n', ":1: extend has 1 ids but 2 keys"),
        (GOOD + b'{"op":"meld","q":0,"from":0}\n', ":2: meld: queue 0 cannot be melded into itself"),
        (b'{"op":"push","q":0,"id":0,"key":[NaN,0]}\n{"op":"push","q":0,"id":1,"key":[1,0]}\n', ":1: a key holds NaN"),
        (GOOD + GOOD, ":2: id 0 pushed twice"),
        (GOOD + b'{"op":"push","q":0,"id":1,"key":"a"}\n', ":2: push failed: '<' not supported"),
    ],
)
def test_replay_of_a_hostile_trace_is_one_line_and_exit_2(
    tmp_path: Path, capsys: pytest.CaptureFixture[str], raw: bytes, says: str
) -> None:
    path = tmp_path / "bad.jsonl"
    path.write_bytes(raw)
    assert main(["replay", str(path), "--check", "--repeat", "1"]) == 2
    assert f"{path}{says}" in _one_line(capsys.readouterr().err, "replay")


def test_replay_of_an_endless_line_stops_at_the_limit(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["replay", "/dev/zero"]) == 2
    assert "/dev/zero:1: line longer than the limit of 16777216 bytes" in _one_line(capsys.readouterr().err, "replay")


def test_replay_reads_a_pipe_once() -> None:
    done = subprocess.run(
        [sys.executable, "-m", "heapkit", "replay", "/dev/stdin", "--kinds", "binary", "--repeat", "1", "--json"],
        input=TRACE.read_bytes(),
        capture_output=True,
        cwd=ROOT,
        timeout=300,
    )
    assert done.returncode == 0, done.stderr
    (row,) = json.loads(done.stdout)["rows"]
    assert row["kind"] == "binary" and row["comparisons"] > 0  # the replays saw the trace, not a drained pipe


def test_an_empty_trace_is_refused_and_nothing_is_recommended(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    empty = tmp_path / "empty.jsonl"
    empty.write_text("\n")
    for extra in ([], ["--dot", str(tmp_path / "shape.dot")]):
        assert main(["replay", str(empty), *extra]) == 2
        captured = capsys.readouterr()
        assert "holds no operations" in _one_line(captured.err, "replay")
        assert "recommended" not in captured.out
    assert not (tmp_path / "shape.dot").exists() and os.listdir(tmp_path) == ["empty.jsonl"]


@pytest.mark.parametrize("target", ["dir", "missing/x.out", "fifo"])
@pytest.mark.parametrize(("command", "flag"), [("replay", "--dot"), ("demo", "--keep"), ("bench", "--json")])
def test_an_output_that_cannot_be_written_is_reported_before_the_run(
    tmp_path: Path,
    monkeypatch: pytest.MonkeyPatch,
    capsys: pytest.CaptureFixture[str],
    command: str,
    flag: str,
    target: str,
) -> None:
    _not_run(monkeypatch)
    # A pipe stands for every special file (never a real device: a regression would delete it).
    os.mkfifo(tmp_path / "fifo")
    out = {"dir": str(tmp_path), "missing/x.out": str(tmp_path / "missing" / "x.out"), "fifo": str(tmp_path / "fifo")}[
        target
    ]
    argv = {
        "replay": ["replay", str(TRACE)],
        "demo": ["demo", "--jobs", "10"],
        "bench": ["bench", "--quick", "--workload", "sort-random"],
    }[command]
    assert main([*argv, flag, out]) == 2
    line = _one_line(capsys.readouterr().err, command)
    assert flag in line and repr(out) in line
    assert stat.S_ISFIFO(os.lstat(tmp_path / "fifo").st_mode)  # the pipe is still a pipe


def test_demo_keep_never_replaces_a_pipe(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    fifo = tmp_path / "fifo"
    os.mkfifo(fifo)
    assert main(["demo", "--jobs", "10", "--kinds", "binary", "--keep", str(fifo)]) == 2
    assert "is not a regular file" in _one_line(capsys.readouterr().err, "demo")
    assert stat.S_ISFIFO(os.lstat(fifo).st_mode) and os.listdir(tmp_path) == ["fifo"]


def test_demo_keep_replaces_a_regular_file_through_a_temporary_one(
    tmp_path: Path, capsys: pytest.CaptureFixture[str]
) -> None:
    kept = tmp_path / "kept.jsonl"
    kept.write_text("old content\n")
    link = tmp_path / "link.jsonl"
    link.symlink_to(kept)
    assert main(["demo", "--jobs", "20", "--kinds", "binary", "--keep", str(link)]) == 0
    assert link.is_symlink() and kept.read_text() != "old content\n"
    assert sorted(os.listdir(tmp_path)) == ["kept.jsonl", "link.jsonl"]  # no temporary file left
    assert heapkit.trace.replay(kept, "pairing").operations == len(kept.read_text().splitlines())


@pytest.mark.parametrize("jobs", ["0", "-3"])
def test_demo_jobs_must_be_positive(capsys: pytest.CaptureFixture[str], jobs: str) -> None:
    assert main(["demo", "--jobs", jobs]) == 2
    assert f"--jobs must be between 1 and 200000, got {jobs}" in _one_line(capsys.readouterr().err, "demo")


@pytest.mark.parametrize(
    "argv",
    [
        ["demo", "--kinds", "pa\udcffring"],
        ["bench", "--kinds", "\udcff"],
        ["replay", "tr\udcffce.jsonl"],
        ["demo", "--keep", "/no-such-dir/\udcff"],
    ],
)
def test_bytes_that_are_not_utf8_in_arguments(argv: list[str]) -> None:
    args = [a.encode("utf-8", "surrogateescape") for a in argv]
    done = subprocess.run(
        [sys.executable.encode(), b"-m", b"heapkit", *args], capture_output=True, cwd=ROOT, timeout=120
    )
    assert done.returncode == 2
    _one_line(done.stderr.decode("utf-8", "replace"), argv[0])
