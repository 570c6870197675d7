"""The command line: demo, replay, kinds; exit codes 0 / 1 / 2 as documented."""

from __future__ import annotations

import importlib.metadata
import json
import statistics
import subprocess
import sys
from pathlib import Path
from types import MappingProxyType
from typing import Any

import pytest

import heapkit
from heapkit.__main__ import main
from heapkit.bench.cli import suggestion
from heapkit.commands.compare import Row, compare, exit_code, render
from heapkit.commands.recommend import recommend

ROOT = Path(__file__).resolve().parents[1]
TRACE = ROOT / "examples" / "traces" / "brackenford.jsonl"


def test_demo_runs_every_kind_and_recommends(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["demo", "--jobs", "300"]) == 0
    out = capsys.readouterr().out
    assert "Brackenford" in out and ("recommended:" in out or "no clear winner:" in out)
    for name in heapkit.KINDS:
        assert name in out


def test_replay_of_the_shipped_trace_as_json(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["replay", str(TRACE), "--check", "--json", "--repeat", "1"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert {r["kind"] for r in data["rows"]} == set(heapkit.KINDS)
    assert data["recommended"] is None  # one repeat shows no spread: no clear winner
    assert data["recommendation"].startswith("no clear winner: one repeat")


def test_replay_of_a_bad_file_exits_2(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    bad = tmp_path / "bad.jsonl"
    bad.write_text('{"op":"push","q":0,"id":0,"key":1}\n{oops\n')
    assert main(["replay", str(bad)]) == 2
    assert f"{bad}:2" in capsys.readouterr().err
    assert main(["replay", str(tmp_path / "missing.jsonl")]) == 2


def test_kinds_lists_each_kind_once(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["kinds"]) == 0
    *lines, build = capsys.readouterr().out.strip().splitlines()
    assert sorted(line.split()[0] for line in lines) == sorted(heapkit.KINDS)
    assert build == f"compiled: {heapkit.COMPILED}"


def test_bad_usage_exits_2() -> None:
    done = subprocess.run([sys.executable, "-m", "heapkit", "frobnicate"], capture_output=True, cwd=ROOT)
    assert done.returncode == 2 and b"usage" in done.stderr
    helped = subprocess.run([sys.executable, "-m", "heapkit", "replay", "--help"], capture_output=True, cwd=ROOT)
    assert helped.returncode == 0 and b"--kinds" in helped.stdout


# --- the verdict columns: checked mode and the audit, on healthy and broken kinds ---


class SloppyPairing(heapkit.PairingHeap):  # type: ignore[type-arg]
    """Deliberately broken: decrease_key rewrites the key in place and never re-links,
    so an entry can sit below a parent with a larger key (heap order broken)."""

    def decrease_key(self, handle: Any, key: Any) -> None:
        w = self._wrap
        handle._k = key if w is None else w(key, handle._k)
        handle._key = key


class OverpromisingPairing(heapkit.PairingHeap):  # type: ignore[type-arg]
    """Deliberately broken: documents a bound of half a link for every operation."""

    @classmethod
    def _bound(cls, op: str, n: int) -> float:
        return 0.5


def test_every_suitable_kind_fills_worst_op_check_and_audit(capsys: pytest.CaptureFixture[str]) -> None:
    rows = compare(TRACE, sorted(heapkit.KINDS), repeat=1, progress=False)
    for r in rows:
        if r.kind == "radix":
            # the shipped trace has tuple keys: radix takes monotone ints only
            assert not r.suitable and r.unsuitable.startswith("unsuitable: trace line")
            continue
        assert r.checked == "ok" and r.audited == "ok", (r.kind, r.checked, r.audited)
        assert r.worst_op in ("push", "pop", "decrease_key", "change_key", "remove", "meld")
        assert r.worst_cost is not None and r.worst_cost >= 1
    assert exit_code(rows) == 0
    assert "unsuitable" in render(rows)


def test_radix_on_a_monotone_trace_gets_every_column(tmp_path: Path) -> None:
    # The shipped trace starts with Dijkstra on integer minutes (monotone pops) up to line 436.
    mono = tmp_path / "dijkstra.jsonl"
    mono.write_text("".join(TRACE.read_text().splitlines(keepends=True)[:436]))
    (row,) = compare(mono, ["radix"], repeat=1, progress=False)
    assert row.suitable and row.checked == "ok" and row.audited == "ok" and row.worst_cost is not None


def test_a_kind_that_breaks_heap_order_fails_the_check() -> None:
    rows = compare(
        TRACE,
        ["sloppy", "pairing"],
        repeat=1,
        progress=False,
        factories={"sloppy": SloppyPairing, "pairing": heapkit.PairingHeap},
    )
    by = {r.kind: r for r in rows}
    assert by["sloppy"].checked.startswith("FAILED: trace line ") and "after decrease_key" in by["sloppy"].checked
    assert "HistoryError" in by["sloppy"].checked
    assert by["pairing"].checked == "ok"
    assert exit_code(rows) == 1
    text = render(rows)
    assert "sloppy check FAILED" in text and "recommended: pairing" in text


def test_a_kind_over_its_bound_fails_the_audit() -> None:
    (row,) = compare(TRACE, ["tight"], repeat=1, progress=False, factories={"tight": OverpromisingPairing})
    assert row.checked == "ok"
    assert row.audited.startswith("FAILED:") and "over bound" in row.audited
    assert "above its bound 0.500" in row.audited
    assert exit_code([row]) == 1


def test_replay_exits_1_on_a_broken_kind(monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]) -> None:
    # heapkit.KINDS is read-only; swap the module attribute for the test (monkeypatch restores it).
    monkeypatch.setattr(heapkit, "KINDS", MappingProxyType({**heapkit.KINDS, "sloppy": SloppyPairing}))
    assert main(["replay", str(TRACE), "--kinds", "sloppy", "binary", "--check", "--audit", "--repeat", "1"]) == 1
    out = capsys.readouterr().out
    assert "sloppy check FAILED" in out and "recommended: binary" in out


def test_replay_exits_2_when_no_named_kind_takes_the_keys(capsys: pytest.CaptureFixture[str]) -> None:
    assert main(["replay", str(TRACE), "--kinds", "radix", "--repeat", "1"]) == 2
    assert "none of the named kinds" in capsys.readouterr().err


def test_replay_exits_2_on_an_inconsistent_trace(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    bad = tmp_path / "ghost.jsonl"
    bad.write_text('{"op":"push","q":0,"id":0,"key":1}\n{"op":"remove","q":0,"id":9}\n')
    assert main(["replay", str(bad)]) == 2
    assert "unknown entry id 9" in capsys.readouterr().err


# --- issue 13, command line ---


def _kinds_of(argv: list[str], capsys: pytest.CaptureFixture[str]) -> list[str]:
    assert main(argv) == 0
    data = json.loads(capsys.readouterr().out)
    return sorted(r["kind"] for r in data["rows"])


def test_kinds_take_commas_or_spaces_in_every_command(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    base = ["replay", str(TRACE), "--repeat", "1", "--json"]
    assert _kinds_of([*base, "--kinds", "binary,pairing"], capsys) == ["binary", "pairing"]
    assert _kinds_of([*base, "--kinds", "binary", "pairing"], capsys) == ["binary", "pairing"]
    assert _kinds_of(["demo", "--jobs", "5", "--json", "--kinds", "lazy,", "binary"], capsys) == ["binary", "lazy"]
    for kinds in (["binary,pairing"], ["binary", "pairing"]):
        out = tmp_path / "bench.json"
        assert main(["bench", "--quick", "--workload", "comparisons", "--json", str(out), "--kinds", *kinds]) == 0
        assert json.loads(out.read_text())["meta"]["kinds"] == ["binary", "pairing"]
    assert main(["replay", str(TRACE), "--kinds", "binary,nope"]) == 2
    assert "heapkit replay: --kinds: unknown kind 'nope'" in capsys.readouterr().err


def test_version(capsys: pytest.CaptureFixture[str]) -> None:
    with pytest.raises(SystemExit) as e:
        main(["--version"])
    assert e.value.code == 0
    # Source: the installed distribution's metadata (pyproject.toml), not heapkit's own code.
    assert capsys.readouterr().out.strip() == f"heapkit {importlib.metadata.version('heapkit')}"


@pytest.mark.parametrize("command", ["demo", "replay", "kinds", "bench"])
def test_help_has_no_markup(command: str, capsys: pytest.CaptureFixture[str]) -> None:
    with pytest.raises(SystemExit):
        main([command, "--help"])
    text = capsys.readouterr().out
    assert "usage:" in text and "``" not in text


def _row(kind: str, samples: list[float]) -> Row:
    return Row(kind, statistics.median(samples), samples=samples, checked="ok", audited="ok")


def test_one_recommendation_rule_with_spread() -> None:
    # Hand-made samples: a's slowest repeat (1.2) beats b's fastest (1.5) -> a; ranges that
    # overlap (a up to 1.4, b from 1.3) -> no clear winner; one repeat -> no clear winner.
    assert recommend({"a": [1.0, 1.1, 1.2], "b": [1.5, 1.6, 1.7]}).best == "a"
    assert recommend({"a": [1.0, 1.1, 1.4], "b": [1.3, 1.6, 1.7]}).best is None
    assert recommend({"a": [1.0], "b": [2.0]}).best is None
    clear = [_row("a", [0.010, 0.011, 0.012]), _row("b", [0.015, 0.016, 0.017])]
    close = [_row("a", [0.010, 0.011, 0.014]), _row("b", [0.013, 0.016, 0.017])]
    assert render(clear).splitlines()[-1].startswith("recommended: a 11 ms (range 10 ms to 12 ms)")
    assert render(close).splitlines()[-1].startswith("no clear winner: a 11 ms")
    # bench applies the same rule to its ratios
    cells = {"a": {"ratios": [1.0, 1.1, 1.4], "ok": True}, "b": {"ratios": [1.3, 1.6, 1.7], "ok": True}}
    line = suggestion({"dijkstra-grid": {"kinds": cells}}).line
    assert line.startswith("no clear winner: a 1.10x (range 1.00x to 1.40x)")


def test_no_recommendation_on_an_empty_trace(tmp_path: Path) -> None:
    empty = tmp_path / "empty.jsonl"
    empty.write_text("")
    rows = compare(empty, ["binary", "pairing"], repeat=3, progress=False)
    assert render(rows).splitlines()[-1] == "no recommendation: nothing was measured"


def test_worst_op_names_each_kinds_cost_unit() -> None:
    rows = compare(TRACE, ["binary", "pairing"], repeat=1, progress=False)
    text = render(rows)
    assert "worst op (own unit*)" in text
    for name in ("binary", "pairing"):
        assert f"  {name}: {heapkit.KINDS[name].COST_UNIT}" in text


def test_a_check_failure_names_the_trace_line(tmp_path: Path) -> None:
    wrong = tmp_path / "wrong.jsonl"
    wrong.write_text(
        '{"op":"push","q":0,"id":0,"key":1}\n{"op":"push","q":0,"id":1,"key":2}\n\n{"op":"pop","q":0,"key":2}\n'
    )
    (row,) = compare(wrong, ["binary"], repeat=1, progress=False)
    assert row.checked == "FAILED: InvariantError: trace line 4: pop returned key 1; the trace recorded 2"
