"""Replay one trace on several kinds and compare them: time, comparisons, worst
single operation, check and audit verdicts, and a recommendation.

Used by ``python -m heapkit replay`` and ``python -m heapkit demo``.
"""

from __future__ import annotations

import json
import sys
import time
from collections.abc import Sequence
from dataclasses import asdict, dataclass
from typing import Any

import heapkit
from heapkit import trace


class Counted:
    """A key wrapper that counts ``<`` (for the comparisons column)."""

    __slots__ = ("k",)
    n = 0

    def __init__(self, k: Any) -> None:
        self.k = k

    def __lt__(self, other: Counted) -> bool:
        Counted.n += 1
        return bool(self.k < other.k)


@dataclass
class Row:
    """One kind's results on one trace."""

    kind: str
    seconds: float
    ratio: float = 1.0
    comparisons: int | None = None
    worst_op: str = ""
    worst_cost: float | None = None
    checked: str = "not run"
    audited: str = "not run"

    @property
    def healthy(self) -> bool:
        return self.checked in ("ok", "not run") and self.audited in ("ok", "not run")

    @property
    def suitable(self) -> bool:
        return not self.checked.startswith("unsuitable")


def _timed(path: str, kind: str, repeat: int) -> float:
    ops = list(trace.read(path))  # parse once: the timing is of the replay, not of JSON
    best = float("inf")
    for _ in range(repeat):
        t0 = time.perf_counter()
        trace.replay(path, kind, ops=ops)
        best = min(best, time.perf_counter() - t0)
    return best


def _comparisons(path: str, kind: str) -> int | None:
    if getattr(heapkit.KINDS[kind], "MONOTONE", False):
        return None  # integer-only kinds cannot take wrapped keys
    Counted.n = 0

    def make(k: str) -> Any:
        return _CountingQueue(heapkit.new(k))

    trace.replay(path, kind, make=make)
    return Counted.n


class _CountingQueue:
    """Wraps every key in :class:`Counted` on the way in (replay only needs these calls)."""

    def __init__(self, inner: Any) -> None:
        self.inner = inner

    def push(self, key: Any, value: Any) -> Any:
        return self.inner.push(Counted(key), value)

    def extend(self, pairs: Any) -> Any:
        return self.inner.extend((Counted(k), v) for k, v in pairs)

    def peek(self) -> Any:
        return self.inner.peek()

    def pop(self) -> Any:
        k, v = self.inner.pop()
        return k.k, v

    def decrease_key(self, h: Any, key: Any) -> None:
        self.inner.decrease_key(h, Counted(key))

    def change_key(self, h: Any, key: Any) -> None:
        self.inner.change_key(h, Counted(key))

    def remove(self, h: Any) -> Any:
        return self.inner.remove(h)

    def meld(self, other: _CountingQueue) -> None:
        self.inner.meld(other.inner)

    def clear(self) -> None:
        self.inner.clear()

    def __len__(self) -> int:
        return len(self.inner)


def _verdicts(path: str, kind: str, check: bool, audit: bool, row: Row) -> None:
    checked = getattr(heapkit, "checked", None) if check else None
    auditor = getattr(heapkit, "audit", None) if audit else None
    results: list[Any] = []

    def make(k: str) -> Any:
        q = heapkit.new(k)
        if checked is not None:
            q = checked(q)
        if auditor is not None:
            ctx = auditor(q)
            results.append(ctx.__enter__())
        return q

    try:
        out = trace.replay(path, kind, make=make)
        if check:
            for q in out.queues.values():
                heapkit.check(q)
            row.checked = "ok"
    except heapkit.InvariantError as exc:
        row.checked = f"FAILED: {str(exc).splitlines()[0]}"
        return
    if auditor is not None and results:
        violations = sum(len(r.violations) for r in results)
        row.audited = "ok" if not violations else f"{violations} bound(s) exceeded"
        worst = [w for r in results for w in r.worst(1)]
        if worst:
            top = max(worst, key=lambda w: w.actual)
            row.worst_op, row.worst_cost = top.op, float(top.actual)


def compare(
    path: str, kinds: Sequence[str], *, check: bool = True, audit: bool = True, repeat: int = 3,
    progress: bool = True,
) -> list[Row]:
    """Replay ``path`` on each kind; rows sorted fastest first, ratios to the fastest."""
    rows = []
    for i, kind in enumerate(kinds, 1):
        if progress:
            print(f"[{i}/{len(kinds)}] replaying on {kind} ...", file=sys.stderr, flush=True)
        try:
            row = Row(kind, _timed(path, kind, repeat))
        except (heapkit.KeyOrderError, trace.TraceError) as exc:
            # e.g. the radix kind on keys that are not monotone integers
            rows.append(Row(kind, float("inf"), checked=f"unsuitable: {exc}", audited="-"))
            continue
        row.comparisons = _comparisons(path, kind)
        _verdicts(path, kind, check, audit, row)
        rows.append(row)
    rows.sort(key=lambda r: r.seconds)
    fastest = rows[0].seconds if rows else 1.0
    for r in rows:
        r.ratio = r.seconds / fastest if fastest and r.seconds != float("inf") else float("inf")
    return rows


def recommend(rows: Sequence[Row]) -> Row | None:
    """The fastest kind whose checks and audit passed."""
    healthy = [r for r in rows if r.healthy]
    return min(healthy, key=lambda r: r.seconds) if healthy else None


def render(rows: Sequence[Row]) -> str:
    """A plain-text table, one kind a line."""
    head = f"{'kind':<14}{'ms':>9}{'x fastest':>11}{'compares':>11}  {'worst op (cost)':<24}{'check':<8}audit"
    lines = [head, "-" * len(head)]
    for r in rows:
        worst = f"{r.worst_op} ({r.worst_cost:g})" if r.worst_cost is not None else "-"
        comps = "n/a" if r.comparisons is None else str(r.comparisons)
        if r.seconds == float("inf"):
            lines.append(f"{r.kind:<14}{'-':>9}{'-':>11}{'-':>11}  {r.checked}")
            continue
        lines.append(
            f"{r.kind:<14}{r.seconds * 1000:>9.1f}{r.ratio:>11.2f}{comps:>11}  {worst:<24}"
            f"{r.checked[:7]:<8}{r.audited}"
        )
    best = recommend(rows)
    lines.append("")
    lines.append(f"recommended: {best.kind}" if best else "recommended: none (every kind failed a check)")
    return "\n".join(lines)


def as_json(rows: Sequence[Row]) -> str:
    best = recommend(rows)
    return json.dumps({"rows": [asdict(r) for r in rows], "recommended": best.kind if best else None}, indent=2)
