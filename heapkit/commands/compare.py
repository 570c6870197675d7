"""Replay one trace on several kinds and compare them: time, comparisons, worst
single operation, check and audit verdicts, and a recommendation.

Used by ``python -m heapkit replay`` and ``python -m heapkit demo``.  Each kind
replays the trace once untimed (to find kinds that cannot take it), then
``repeat`` times timed in CPU time (``time.process_time``, gc paused), the kinds
alternating their order each round; then once with its keys wrapped to count
``<``, and once in checked mode (``heapkit.checked``) under ``heapkit.audit``
with ``keep="totals"``.  The checked replay also compares each popped key with
the key the trace recorded for that pop, naming the trace line.  The
recommendation is the shared rule of :mod:`heapkit.commands.recommend`.
``factories`` maps kind names to classes (default ``heapkit.KINDS``), so tests
can run a deliberately broken kind.
"""

from __future__ import annotations

import contextlib
import gc
import json
import os
import statistics
import sys
import time
from collections.abc import Callable, Mapping, Sequence
from dataclasses import asdict, dataclass, field
from typing import Any

import heapkit
from heapkit import trace
from heapkit.commands.recommend import Recommendation, recommend
from heapkit.ledger import Ledger

Factories = Mapping[str, Callable[[], Any]]


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
    """One kind's results on one trace.

    ``checked`` / ``audited``: ``"ok"``, ``"not run"`` or ``"FAILED: ..."``;
    ``unsuitable``: why the kind cannot take this trace (e.g. radix on keys that
    are not monotone integers), empty when it can.  ``seconds``: the median of
    ``samples`` (CPU seconds per timed replay); ``worst_cost`` is in the kind's
    own cost unit (``unit``).
    """

    kind: str
    seconds: float
    samples: list[float] = field(default_factory=list)
    ratio: float = 1.0
    comparisons: int | None = None
    worst_op: str = ""
    worst_cost: float | None = None
    checked: str = "not run"
    audited: str = "not run"
    unsuitable: str = ""
    unit: str = ""

    @property
    def healthy(self) -> bool:
        return not self.unsuitable and self.checked in ("ok", "not run") and self.audited in ("ok", "not run")

    @property
    def suitable(self) -> bool:
        return not self.unsuitable


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


Ops = list[tuple[int, dict[str, Any]]]

#: A pop line without a recorded key.
_UNKNOWN: Any = object()


def _maker(cls: Callable[[], Any]) -> Callable[[str], Any]:
    return lambda kind: cls()


def _timed(path: str, kind: str, make: Callable[[str], Any], ops: Ops) -> float:
    """CPU seconds of one plain replay, gc paused (as the benchmark measures)."""
    gc.collect()
    gc.disable()
    try:
        t0 = time.process_time()
        trace.replay(path, kind, make=make, ops=ops)
        return time.process_time() - t0
    finally:
        gc.enable()


def _comparisons(path: str, kind: str, cls: Any, ops: Ops) -> int | None:
    if getattr(cls, "MONOTONE", False):
        return None  # integer-only kinds cannot take wrapped keys
    Counted.n = 0
    trace.replay(path, kind, make=lambda k: _CountingQueue(cls()), ops=ops)
    return Counted.n


def _first_line(exc: BaseException) -> str:
    text = str(exc).strip().splitlines()
    return f"{type(exc).__name__}: {text[0] if text else ''}"


def _pops_match(ops: Ops, popped: list[Any]) -> str:
    """'' if each popped key equals (neither ``<`` the other) the key the trace recorded for that pop."""
    want = [(lineno, op.get("key", _UNKNOWN)) for lineno, op in ops if op["op"] == "pop"]
    if len(want) != len(popped):
        return f"{len(popped)} pops replayed, the trace has {len(want)}"
    for (lineno, w), got in zip(want, popped, strict=True):
        if w is _UNKNOWN:
            continue
        if w < got or got < w:
            return f"trace line {lineno}: pop returned key {got!r}; the trace recorded {w!r}"
    return ""


def _failure(exc: BaseException) -> str:
    """A failed replay in one line, naming the trace line where the replay raised."""
    if isinstance(exc, trace.TraceError) and exc.__cause__ is not None and exc.line is not None:
        return f"trace line {exc.line} ({exc.op}): {_first_line(exc.__cause__)}"
    return _first_line(exc)


def _verdicts(path: str, kind: str, cls: Any, ops: Ops, check: bool, audit: bool, row: Row) -> None:
    """One replay with checked mode and the audit on; fills the verdict columns of ``row``."""
    ledgers: list[Ledger] = []
    with contextlib.ExitStack() as stack:

        def make(k: str) -> Any:
            q = cls()
            if check:
                q = heapkit.checked(q)
            if audit:
                ledgers.append(stack.enter_context(heapkit.audit(q, keep="totals", top=1)))
            return q

        try:
            out = trace.replay(path, kind, make=make, ops=ops)
            if check:
                for q in out.queues.values():
                    heapkit.check(q)
                wrong = _pops_match(ops, out.popped)
                if wrong:
                    raise heapkit.InvariantError(wrong)
        except Exception as exc:  # any failure of the kind is its verdict
            row.checked = f"FAILED: {_failure(exc)}"
            row.audited = "-" if audit else row.audited
            return
        if check:
            row.checked = "ok"
    # The ledgers are closed now (their heaps left the audit): read them.
    if audit:
        over = sum(led.violation_count for led in ledgers)
        row.audited = "ok"
        for led in ledgers:
            try:
                led.assert_bounds()
            except heapkit.BoundExceededError as exc:
                row.audited = f"FAILED: {over} op(s) over bound; {str(exc).splitlines()[0]}"
                break
        worst = [r for led in ledgers for r in led.worst(1)]
        if worst:
            top = max(worst, key=lambda r: r.actual)
            row.worst_op, row.worst_cost = top.op, float(top.actual)


def _unsuitable(cls: Any, exc: BaseException) -> bool:
    """Did a kind that takes only monotone integer keys refuse this trace's keys?"""
    cause = exc.__cause__ if isinstance(exc, trace.TraceError) else exc
    return bool(getattr(cls, "MONOTONE", False)) and isinstance(cause, heapkit.KeyOrderError)


def _say(progress: bool, text: str, end: str = "\n") -> None:
    if progress:
        print(text, end=end, file=sys.stderr, flush=True)


def _trial(path: str, kind: str, cls: Any, ops: Ops) -> Row:
    """One untimed replay: a row ready for timing, or one saying why the kind cannot run."""
    try:
        trace.replay(path, kind, make=_maker(cls), ops=ops)
    except Exception as exc:  # reported in the row
        if _unsuitable(cls, exc):
            where = str(exc).removeprefix(f"{path}:")
            return Row(kind, float("inf"), unsuitable=f"unsuitable: trace line {where}")
        return Row(kind, float("inf"), checked=f"FAILED: {_failure(exc)}", audited="-")
    return Row(kind, 0.0, unit=str(getattr(cls, "COST_UNIT", "")))


def compare(
    path: str | os.PathLike[str],
    kinds: Sequence[str],
    *,
    check: bool = True,
    audit: bool = True,
    repeat: int = 3,
    progress: bool = True,
    factories: Factories | None = None,
    ops: Ops | None = None,
) -> list[Row]:
    """Replay ``path`` on each kind; rows sorted fastest first, ratios to the fastest.

    O(kinds x (repeat + 3) x trace length); the checked replay adds O(1)
    amortized entries checked per operation.  ``ops``: the trace already read
    with ``trace.read`` (then ``path`` only names it in messages).
    """
    path = os.fspath(path)
    table: Factories = heapkit.KINDS if factories is None else factories
    if ops is None:
        ops = list(trace.read(path))  # parse once: the timing is of the replay, not of JSON
    rows = {}
    for i, kind in enumerate(kinds, 1):
        _say(progress, f"[{i}/{len(kinds)}] {kind}: trial replay ...", end="")
        rows[kind] = _trial(path, kind, table[kind], ops)
        _say(progress, f" {rows[kind].unsuitable or _short(rows[kind].checked).replace('not run', 'ok')}"[:60])
    timed = [k for k, r in rows.items() if not r.unsuitable and r.seconds == 0.0] if ops else []
    for rep in range(repeat):
        _say(progress, f"timing round {rep + 1}/{repeat} ({len(timed)} kinds, order alternating)")
        for kind in timed if rep % 2 == 0 else timed[::-1]:
            rows[kind].samples.append(_timed(path, kind, _maker(table[kind]), ops))
    for i, kind in enumerate(timed, 1):
        row, cls = rows[kind], table[kind]
        row.seconds = statistics.median(row.samples) if row.samples else 0.0
        started = time.perf_counter()
        _say(progress, f"[{i}/{len(timed)}] {kind}: comparisons ...", end="")
        row.comparisons = _comparisons(path, kind, cls, ops)
        if check or audit:
            _say(progress, " checked/audited replay ...", end="")
            _verdicts(path, kind, cls, ops, check, audit, row)
        _say(progress, f" {time.perf_counter() - started:.1f} s")
    out = sorted(rows.values(), key=lambda r: r.seconds)
    fastest = out[0].seconds if out else 1.0
    for r in out:
        r.ratio = r.seconds / fastest if fastest and r.seconds != float("inf") else float("inf")
    return out


def verdict(rows: Sequence[Row]) -> Recommendation:
    """The shared recommendation rule over the timings of the kinds whose checks and audit passed."""
    if not any(r.healthy for r in rows):
        return Recommendation(None, "no recommendation: no kind passed its checks")
    return recommend({r.kind: r.samples for r in rows if r.healthy}, lambda s: f"{s * 1000:.3g} ms")


def exit_code(rows: Sequence[Row]) -> int:
    """0 every kind that can take the trace passed; 1 a check or bound failed; 2 no kind could take it."""
    usable = [r for r in rows if r.suitable]
    if not usable:
        return 2
    return 0 if all(r.healthy for r in usable) else 1


def _short(verdict: str) -> str:
    return "FAILED" if verdict.startswith("FAILED") else verdict


def _spread(r: Row) -> str:
    if len(r.samples) < 2 or not r.seconds:
        return "-"
    return f"{(max(r.samples) - min(r.samples)) / r.seconds * 100:.0f}%"


def render(rows: Sequence[Row]) -> str:
    """A plain-text table, one kind a line, then the full text of every failure.

    ``ms``: the median CPU time of the timed replays; ``spread``: their range, in
    percent of the median; ``worst op``: the costliest single operation the audit
    saw, in the kind's own cost unit (listed under the table: not comparable
    across kinds).
    """
    head = (
        f"{'kind':<14}{'ms':>9}{'spread':>8}{'x fastest':>11}{'compares':>11}  "
        f"{'worst op (own unit*)':<24}{'check':<9}audit"
    )
    lines = [head, "-" * len(head)]
    notes, units = [], []
    for r in rows:
        worst = f"{r.worst_op} {r.worst_cost:g}" if r.worst_cost is not None else "-"
        comps = "n/a" if r.comparisons is None else str(r.comparisons)
        if r.unsuitable:
            lines.append(f"{r.kind:<14}{'-':>9}{'-':>8}{'-':>11}{'-':>11}  {r.unsuitable}")
            continue
        if r.seconds == float("inf"):
            lines.append(f"{r.kind:<14}{'-':>9}{'-':>8}{'-':>11}{'-':>11}  {'-':<24}{_short(r.checked):<9}{r.audited}")
        else:
            lines.append(
                f"{r.kind:<14}{r.seconds * 1000:>9.1f}{_spread(r):>8}{r.ratio:>11.2f}{comps:>11}  {worst:<24}"
                f"{_short(r.checked):<9}{_short(r.audited)}"
            )
            if r.worst_cost is not None and r.unit:
                units.append(f"  {r.kind}: {r.unit}")
        for what, verdict_ in (("check", r.checked), ("audit", r.audited)):
            if verdict_.startswith("FAILED"):
                notes.append(f"  {r.kind} {what} {verdict_}")
    if units:
        lines.extend(
            [
                "",
                "* cost units (each kind counts its own work; compare a kind with its bound, not with another kind):",
                *units,
            ]
        )
    if notes:
        lines.extend(["", "failures:", *notes])
    lines.extend(["", verdict(rows).line])
    return "\n".join(lines)


def as_json(rows: Sequence[Row]) -> str:
    """The rows and the recommendation as JSON text."""
    v = verdict(rows)
    data = [
        {
            **asdict(r),
            "seconds": None if r.seconds == float("inf") else r.seconds,
            "ratio": None if r.ratio == float("inf") else r.ratio,
        }
        for r in rows
    ]
    return json.dumps({"rows": data, "recommended": v.best, "recommendation": v.line}, indent=2)
