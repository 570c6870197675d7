"""The audit's result: one compact line per operation, the totals and the report.

A :class:`Ledger` keeps, for every audited operation, seven numbers in one
flat ``array`` of doubles (56 bytes an operation; integers are exact below
2**53): the operation, the
size ``n`` before it, its actual cost, the potential before and after, the
bound and the comparisons made.  The amortized cost is derived:
``actual + c * (phi_after - phi_before)``.  With ``keep="totals"`` it keeps
only per-operation totals, an exact cost histogram (for p99), the ``top``
costliest operations and the first violations: memory stays flat on long
staging runs.

The sum rule of the potential method (Tarjan 1985, "Amortized computational
complexity", SIAM J. Alg. Disc. Meth. 6) is reported exactly::

    total actual = total amortized + c * (Phi(start) - Phi(end)) + c * outside

where ``outside`` is the potential that came in or went out between audited
operations (a heap melded into this one brings its potential; one melded away
takes it).  Since Phi >= 0, every amortized cost within its bound gives
``total actual <= sum of bounds + c * (Phi(start) + outside)``.
"""

from __future__ import annotations

import heapq
import math
from array import array
from collections import Counter
from collections.abc import Iterator, Sequence
from typing import Any, NamedTuple, overload

from heapkit.errors import BoundExceededError

__all__ = ["OPS", "Ledger", "Record"]

#: Operation codes, in the order of the ``op`` column.
OPS: tuple[str, ...] = ("push", "extend", "pop", "decrease_key", "change_key", "remove", "meld", "clear")

_W = 7  # numbers per operation in the flat record array

#: Relative slack when comparing an amortized cost with its bound (float potentials).
SLACK = 1e-9


def _num(x: float) -> str:
    """A float for people: 4 significant digits, no ``-0``."""
    text = f"{x:.4g}"
    return "0" if text == "-0" else text


class Record(NamedTuple):
    """One audited operation; ``step`` is its number in the audit (from 0).

    >>> Record(3, "pop", 10, 4, 12.123456, 9.87654321, 1.75308679, 11.0, 6)  # doctest: +NORMALIZE_WHITESPACE
    Record(step=3, op='pop', n=10, actual=4, phi_before=12.12, phi_after=9.877,
           amortized=1.753, bound=11, comparisons=6)
    """

    step: int
    op: str
    n: int
    actual: int
    phi_before: float
    phi_after: float
    amortized: float
    bound: float
    comparisons: int

    def __repr__(self) -> str:
        return (
            f"Record(step={self.step}, op={self.op!r}, n={self.n}, actual={self.actual}, "
            f"phi_before={_num(self.phi_before)}, phi_after={_num(self.phi_after)}, "
            f"amortized={_num(self.amortized)}, bound={_num(self.bound)}, "
            f"comparisons={self.comparisons})"
        )


class _Tally:
    """Totals of one operation name."""

    __slots__ = ("amortized_max", "bound_at_max_n", "comparisons", "costs", "count", "max_n", "total")

    def __init__(self) -> None:
        self.count = 0
        self.total = 0
        self.comparisons = 0
        self.amortized_max = -math.inf
        self.max_n = -1
        self.bound_at_max_n = 0.0
        self.costs: Counter[int] = Counter()

    def add(self, n: int, actual: int, amortized: float, bound: float, comparisons: int) -> None:
        self.count += 1
        self.total += actual
        self.comparisons += comparisons
        self.costs[actual] += 1
        if amortized > self.amortized_max:
            self.amortized_max = amortized
        if n >= self.max_n:
            self.max_n = n
            self.bound_at_max_n = bound

    def merge(self, other: _Tally) -> None:
        """Add another tally of the same operation name (another heap's)."""
        self.count += other.count
        self.total += other.total
        self.comparisons += other.comparisons
        self.costs.update(other.costs)
        self.amortized_max = max(self.amortized_max, other.amortized_max)
        if other.max_n >= self.max_n:
            self.max_n, self.bound_at_max_n = other.max_n, other.bound_at_max_n

    def p99(self) -> int:
        """Nearest-rank 99th percentile of the actual costs."""
        need = math.ceil(0.99 * self.count)
        seen = 0
        for cost in sorted(self.costs):
            seen += self.costs[cost]
            if seen >= need:
                return cost
        return 0  # pragma: no cover - count is never 0 when asked


class _Records(Sequence[Record]):
    """A read-only view of the ledger's columns as :class:`Record` tuples."""

    def __init__(self, ledger: Ledger) -> None:
        self._l = ledger

    def __len__(self) -> int:
        return len(self._l._rows) // _W

    @overload
    def __getitem__(self, i: int) -> Record: ...

    @overload
    def __getitem__(self, i: slice) -> list[Record]: ...

    def __getitem__(self, i: int | slice) -> Record | list[Record]:
        if isinstance(i, slice):
            return [self._l._row(j) for j in range(*i.indices(len(self)))]
        if i < 0:
            i += len(self)
        if not 0 <= i < len(self):
            raise IndexError(f"record {i} out of range (the ledger holds {len(self)})")
        return self._l._row(i)

    def __iter__(self) -> Iterator[Record]:
        return (self._l._row(j) for j in range(len(self)))


class Ledger:
    """What an audit recorded (see the module docstring).

    >>> from heapkit import PairingHeap
    >>> from heapkit.audit import audit
    >>> h = PairingHeap()
    >>> with audit(h) as led:
    ...     _ = h.push(2, 'b'); _ = h.push(1, 'a'); _ = h.pop()
    >>> [(r.op, r.n, r.actual) for r in led.records]
    [('push', 0, 1), ('push', 1, 2), ('pop', 2, 1)]
    >>> led.violations
    []
    """

    def __init__(self, kind: str, unit: str, phi_c: float, keep: str = "all", top: int = 16) -> None:
        if keep not in ("all", "totals"):
            raise ValueError(f"audit: keep must be 'all' or 'totals', got {keep!r}")
        self.kind = kind
        self.unit = unit
        self.phi_c = float(phi_c)
        self.keep = keep
        self.top = top
        self.heaps = 1  # how many heaps' audits this ledger combines (see __add__)
        self.count = 0
        self.phi_start: float | None = None
        self.phi_end: float | None = None
        self.outside = 0.0
        self.phi_min = math.inf
        self.total_actual = 0
        self.total_amortized = 0.0
        self.total_bound = 0.0
        self.violation_count = 0
        self._last: float | None = None
        self._rows = array("d")  # (op, n, actual, phi0, phi1, bound, cmp) per operation
        self._bad: list[int] = []
        self._tallies: dict[int, _Tally] = {}
        self._worst: list[tuple[int, int, Record]] = []
        self._kept_bad: list[Record] = []

    def __repr__(self) -> str:
        heaps = "" if self.heaps == 1 else f", heaps={self.heaps}"
        return (
            f"<Ledger {self.kind}: {self.count} operation(s){heaps}, keep={self.keep!r}, "
            f"{self.violation_count} over bound>"
        )

    def __add__(self, other: Ledger) -> Ledger:
        """The two audits combined, as one ledger of their kind.  O(records) or O(totals).

        Same kind (cost unit and ``c``) only; both ``keep="all"`` keep every record
        (``other``'s after this one's), otherwise the totals.  ``sum(ledgers)`` works.

        >>> from heapkit import PairingHeap
        >>> from heapkit.audit import audit
        >>> a, b = PairingHeap(), PairingHeap()
        >>> with audit(a) as la, audit(b) as lb:
        ...     _ = a.push(1, 'a'); _ = b.push(2, 'b'); _ = b.pop()
        >>> la + lb
        <Ledger pairing: 3 operation(s), heaps=2, keep='all', 0 over bound>
        """
        if not isinstance(other, Ledger):
            return NotImplemented
        if (self.kind, self.unit, self.phi_c) != (other.kind, other.unit, other.phi_c):
            raise TypeError(
                f"Ledger addition: ledgers of different kinds ({self.kind!r} and {other.kind!r}) "
                "do not combine; combine them per kind"
            )
        both_all = self.keep == other.keep == "all"
        out = Ledger(
            self.kind, self.unit, self.phi_c, keep="all" if both_all else "totals", top=max(self.top, other.top)
        )
        out.heaps = self.heaps + other.heaps
        out.count = self.count + other.count
        starts = [x for x in (self.phi_start, other.phi_start) if x is not None]
        ends = [x for x in (self.phi_end, other.phi_end) if x is not None]
        out.phi_start = sum(starts) if starts else None
        out.phi_end = sum(ends) if ends else None
        out.outside = self.outside + other.outside
        out.phi_min = min(self.phi_min, other.phi_min)
        out.total_actual = self.total_actual + other.total_actual
        out.total_amortized = self.total_amortized + other.total_amortized
        out.total_bound = self.total_bound + other.total_bound
        out.violation_count = self.violation_count + other.violation_count
        if both_all:
            out._rows = self._rows + other._rows
            out._bad = self._bad + [i + self.count for i in other._bad]
            return out
        for led in (self, other):
            for name, tally in led.tallies().items():
                mine = out._tallies.setdefault(OPS.index(name), _Tally())
                mine.merge(tally)
            for rec in led.worst(led.top):
                out._worst.append((rec.actual, -rec.step, rec))
            out._kept_bad.extend(led.violations[: 100 - len(out._kept_bad)])
        out._worst = heapq.nlargest(out.top, out._worst, key=lambda t: (t[0], t[1]))
        heapq.heapify(out._worst)
        return out

    def __radd__(self, other: object) -> Ledger:
        if other == 0:  # sum(ledgers) starts from 0
            return self
        return NotImplemented

    # --- recording (called by heapkit.audit) --------------------------------
    def start(self, phi: float) -> None:
        self.phi_start = phi
        self.phi_end = phi
        self._last = phi
        self.phi_min = min(self.phi_min, phi)

    def add(self, code: int, n: int, actual: int, phi0: float, phi1: float, bound: float, cmp: int) -> None:
        amortized = actual + self.phi_c * (phi1 - phi0)
        i = self.count
        self.count = i + 1
        if self._last is not None:
            self.outside += phi0 - self._last
        self._last = phi1
        self.phi_end = phi1
        if phi1 < self.phi_min:
            self.phi_min = phi1
        self.total_actual += actual
        self.total_amortized += amortized
        self.total_bound += bound
        bad = amortized > bound + SLACK * (1.0 + abs(bound))
        if bad:
            self.violation_count += 1
        if self.keep == "all":
            # One extend of a 7-tuple: 7 appends cost about 2x more (measured, Dijkstra 10^5 nodes).
            self._rows.extend((code, n, actual, phi0, phi1, bound, cmp))
            if bad:
                self._bad.append(i)
            return
        tally = self._tallies.get(code)
        if tally is None:
            tally = self._tallies[code] = _Tally()
        tally.add(n, actual, amortized, bound, cmp)
        if bad or len(self._worst) < self.top or actual > self._worst[0][0]:
            rec = Record(i, OPS[code], n, actual, phi0, phi1, amortized, bound, cmp)
            if bad and len(self._kept_bad) < 100:
                self._kept_bad.append(rec)
            if len(self._worst) < self.top:
                heapq.heappush(self._worst, (actual, -i, rec))
            elif actual > self._worst[0][0]:
                heapq.heapreplace(self._worst, (actual, -i, rec))

    def finish(self, phi: float | None) -> None:
        """Close the books with the potential at the end (None: unknown, keep the last)."""
        if phi is not None and self._last is not None:
            self.outside += phi - self._last
            self._last = phi
            self.phi_end = phi
            self.phi_min = min(self.phi_min, phi)

    # --- reading -----------------------------------------------------------
    def _row(self, i: int) -> Record:
        code, n, actual, phi0, phi1, bound, cmp = self._rows[_W * i : _W * i + _W]
        return Record(
            i,
            OPS[int(code)],
            int(n),
            int(actual),
            phi0,
            phi1,
            actual + self.phi_c * (phi1 - phi0),
            bound,
            int(cmp),
        )

    def _column(self, j: int) -> array[float]:
        return self._rows[j::_W]

    @property
    def records(self) -> Sequence[Record]:
        """Every operation in order (empty when only totals are kept).  O(1) to get the view."""
        return _Records(self)

    @property
    def violations(self) -> list[Record]:
        """The operations whose amortized cost exceeded their bound (the first 100 with ``keep="totals"``)."""
        if self.keep == "all":
            return [self._row(i) for i in self._bad]
        return list(self._kept_bad)

    def tallies(self) -> dict[str, _Tally]:
        """Per-operation totals, in ``OPS`` order.  O(records) with ``keep="all"``."""
        if self.keep == "totals":
            src = self._tallies
        else:
            src = {}
            c = self.phi_c
            for code, n, actual, p0, p1, bound, cmp in zip(*(self._column(j) for j in range(_W)), strict=True):
                code, n, actual, cmp = int(code), int(n), int(actual), int(cmp)
                tally = src.get(code)
                if tally is None:
                    tally = src[code] = _Tally()
                tally.add(n, actual, actual + c * (p1 - p0), bound, cmp)
        return {OPS[code]: src[code] for code in sorted(src)}

    def worst(self, k: int = 5) -> list[Record]:
        """The ``k`` costliest single operations (by actual cost), costliest first: the spikes.

        With ``keep="totals"`` at most ``top`` of them are known.  O(records) or O(top).
        """
        if self.keep == "all":
            col = self._column(2)
            idx = heapq.nlargest(k, range(self.count), key=lambda i: (col[i], -i))
            return [self._row(i) for i in idx]
        return [r for _, _, r in sorted(self._worst, reverse=True)[:k]]

    def assert_bounds(self) -> None:
        """Raise :class:`BoundExceededError` naming the first operation over its bound.  O(1)."""
        bad = self.violations
        if bad:
            r = bad[0]
            raise BoundExceededError(
                f"{self.kind}: operation #{r.step} ({r.op} at n={r.n}) has amortized cost "
                f"{r.amortized:.3f} above its bound {r.bound:.3f} (actual {r.actual} {self.unit}, "
                f"potential {r.phi_before:.3f} -> {r.phi_after:.3f}); "
                f"{self.violation_count} operation(s) over their bound in all"
            )

    def summary(self) -> str:
        """The report: one row per operation name, then the sum rule.  O(records).

        >>> from heapkit import BinaryHeap
        >>> from heapkit.audit import audit
        >>> h = BinaryHeap()
        >>> with audit(h) as led:
        ...     _ = h.push(1, 'a')
        >>> print(led.summary().splitlines()[0])
        audit of binary: 1 operation(s); cost in levels an entry moves + 1; c = 1
        """
        heaps = "" if self.heaps == 1 else f" ({self.heaps} heaps combined)"
        head = f"audit of {self.kind}{heaps}: {self.count} operation(s); cost in {self.unit}; c = {self.phi_c:g}"
        cols = ("op", "count", "mean", "p99", "max", "max amort.", "bound@max n", "cmp/op")
        rows = [cols]
        for name, t in self.tallies().items():
            rows.append(
                (
                    name,
                    str(t.count),
                    f"{t.total / t.count:.2f}",
                    str(t.p99()),
                    str(max(t.costs)),
                    f"{t.amortized_max:.2f}",
                    f"{t.bound_at_max_n:.2f}",
                    f"{t.comparisons / t.count:.2f}",
                )
            )
        widths = [max(len(r[j]) for r in rows) for j in range(len(cols))]
        lines = [head, "  actual cost: mean, p99, max | amortized = actual + c·ΔΦ"]
        for r in rows:
            cells = [r[0].ljust(widths[0])] + [v.rjust(w) for v, w in zip(r[1:], widths[1:], strict=True)]
            lines.append("  " + "  ".join(cells))
        lines.extend(self._sum_rule())
        if self.violation_count:
            first = self.violations[0]
            lines.append(
                f"  OVER BOUND: {self.violation_count} operation(s); first #{first.step} "
                f"{first.op} at n={first.n}: amortized {first.amortized:.2f} > {first.bound:.2f}"
            )
        else:
            lines.append("  every amortized cost within its bound")
        return "\n".join(lines)

    def _sum_rule(self) -> list[str]:
        c = self.phi_c
        start = (self.phi_start or 0.0) + 0.0  # + 0.0: no "-0.00" in the report
        end = (self.phi_end or 0.0) + 0.0
        if abs(end) < 5e-3:
            end = 0.0
        rhs = self.total_amortized + c * (start - end) + c * self.outside
        cap = self.total_bound + c * (start + max(0.0, self.outside))
        holds = self.total_actual <= cap + SLACK * (1.0 + cap)
        return [
            f"  sum rule: Σ actual {self.total_actual} = Σ amortized {self.total_amortized:.2f}"
            f" + c·(Φ start {start:.2f} − Φ end {end:.2f}) + c·Φ outside {self.outside:.2f}"
            f" = {rhs:.2f}",
            f"  guarantee: Σ actual {self.total_actual} ≤ Σ bound {self.total_bound:.2f}"
            f" + c·(Φ start + Φ brought in) = {cap:.2f}: {'holds' if holds else 'FAILS'};"
            f" lowest Φ seen {_num(self.phi_min if self.count or self.phi_start is not None else 0.0)}",
        ]

    def plot(self, path: Any, *, max_points: int = 2000) -> None:
        """Write a PNG: the cost of each operation name in its own panel, then Φ.  O(records).

        Beyond ``max_points`` operations each panel shows, per bucket of
        consecutive operations, the mean with the p99 and max envelopes, so a
        staging run of 10^5+ operations stays readable.  Needs matplotlib
        (``pip install 'heapkit[plot]'``) and ``keep="all"``.
        """
        from heapkit.ledger_plot import plot

        plot(self, path, max_points)
