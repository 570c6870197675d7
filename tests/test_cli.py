"""The command line: demo, replay, kinds; exit codes 0 / 1 / 2 as documented."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

import heapkit
from heapkit.__main__ import main

ROOT = Path(__file__).resolve().parents[1]
TRACE = ROOT / "examples" / "traces" / "brackenford.jsonl"


def test_demo_runs_every_kind_and_recommends(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["demo", "--jobs", "300"]) == 0
    out = capsys.readouterr().out
    assert "Brackenford" in out and "recommended:" in out
    for name in heapkit.KINDS:
        assert name in out


def test_replay_of_the_shipped_trace_as_json(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["replay", str(TRACE), "--check", "--json", "--repeat", "1"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert {r["kind"] for r in data["rows"]} == set(heapkit.KINDS)
    assert data["recommended"] in heapkit.KINDS


def test_replay_of_a_bad_file_exits_2(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    bad = tmp_path / "bad.jsonl"
    bad.write_text('{"op":"push","q":0,"id":0,"key":1}\n{oops\n')
    assert main(["replay", str(bad)]) == 2
    assert f"{bad}:2" in capsys.readouterr().err
    assert main(["replay", str(tmp_path / "missing.jsonl")]) == 2


def test_kinds_lists_each_kind_once(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["kinds"]) == 0
    lines = capsys.readouterr().out.strip().splitlines()
    assert sorted(line.split()[0] for line in lines) == sorted(heapkit.KINDS)


def test_bad_usage_exits_2() -> None:
    done = subprocess.run([sys.executable, "-m", "heapkit", "frobnicate"], capture_output=True, cwd=ROOT)
    assert done.returncode == 2 and b"usage" in done.stderr
    helped = subprocess.run([sys.executable, "-m", "heapkit", "replay", "--help"], capture_output=True, cwd=ROOT)
    assert helped.returncode == 0 and b"--kinds" in helped.stdout
