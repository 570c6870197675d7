"""Audits for a heap's whole life (``attach``, ``HEAPKIT_DEBUG=audit``) and where they report.

``attach(heap)`` audits a heap until it goes away, then hands its ledger to the
``report`` given to ``configure`` (default: its summary logged on the
``heapkit.audit`` logger); ``flush()`` reports the ones still alive now.

A server that makes a heap per request, audited by ``HEAPKIT_DEBUG=audit``,
would log one summary per heap.  Hand a :class:`Collector` to
``heapkit.audit.configure(report=...)`` instead: each heap's ledger, when the
heap goes away, is added (``Ledger.__add__``) to the ledger of its kind; the
combined report comes on demand (``summary()``, ``report()``) and, with
``at_exit=True``, once when the interpreter exits (after the heaps still alive
have reported).
"""

from __future__ import annotations

import atexit
import logging
import threading
import weakref
from collections.abc import Callable
from typing import Any

from heapkit.ledger import Ledger

__all__ = ["Collector", "attach", "configure", "detach", "flush"]

_log = logging.getLogger("heapkit.audit")


_REPORT: Callable[[Ledger], None] | None = None
_KEEP = "totals"


def configure(*, report: Callable[[Ledger], None] | None = None, keep: str = "totals") -> None:
    """Where ``attach``-ed audits report when their heap goes away (or at interpreter exit).

    ``report``: called with the :class:`Ledger`; None logs the summary on the
    ``heapkit.audit`` logger (WARNING if a bound was exceeded, INFO otherwise);
    a :class:`Collector` combines the ledgers per kind into one report.
    ``keep``: what attached audits keep (``"totals"`` by default, flat memory).

    >>> configure(report=None, keep="totals")
    """
    global _REPORT, _KEEP
    if keep not in ("all", "totals"):
        raise ValueError(f"configure: keep must be 'all' or 'totals', got {keep!r}")
    _REPORT = report
    _KEEP = keep


def _report(led: Ledger) -> None:
    if _REPORT is not None:
        _REPORT(led)
        return
    level = logging.WARNING if led.violation_count else logging.INFO
    _log.log(level, "%s", led.summary())


def attach(heap: Any) -> Ledger:
    """Audit ``heap`` for the rest of its life; report through ``configure`` when it goes away.

    Used by ``HEAPKIT_DEBUG=audit``.  O(n) once (wrapping the entries).

    >>> from heapkit import PairingHeap
    >>> seen = []
    >>> configure(report=seen.append)
    >>> h = PairingHeap(); led = attach(h); _ = h.push(1, 'a')
    >>> del h; [x.count for x in seen]
    [1]
    >>> configure(report=None)
    """
    from heapkit.audit import _begin

    led = _begin(heap, _KEEP, 16)
    _PENDING[id(led)] = weakref.finalize(heap, _report_once, led)
    return led


#: The reports still to come, one per attached heap alive.
_PENDING: dict[int, weakref.finalize[Any, Any]] = {}


def _report_once(led: Ledger) -> None:
    _PENDING.pop(id(led), None)
    _report(led)


def flush() -> None:
    """Report now every attached heap's ledger still to come (they report once).  O(heaps)."""
    for fin in list(_PENDING.values()):
        fin()


def detach(heap: Any, ledger: Ledger) -> None:
    """Stop an ``attach``-ed audit now (its report still comes when the heap goes away).  O(n)."""
    from heapkit.audit import _end

    _end(heap, ledger)


class Collector:
    """Combines the ledgers it is called with, per kind.

    >>> from heapkit import PairingHeap
    >>> from heapkit.audit import attach, configure
    >>> pool = Collector()
    >>> configure(report=pool)
    >>> for n in range(3):
    ...     h = PairingHeap(); _ = attach(h); _ = h.push(n, 'x'); del h
    >>> pool.ledgers()["pairing"]
    <Ledger pairing: 3 operation(s), heaps=3, keep='totals', 0 over bound>
    >>> configure(report=None)
    """

    def __init__(self, *, at_exit: bool = False) -> None:
        self._lock = threading.Lock()
        self._by_kind: dict[str, Ledger] = {}
        if not isinstance(at_exit, bool):
            raise TypeError(f"Collector: at_exit must be True or False, got {at_exit!r}")
        if at_exit:
            atexit.register(self._at_exit)

    def __call__(self, ledger: Ledger) -> None:
        """Add one heap's ledger to its kind's.  O(its totals)."""
        with self._lock:
            mine = self._by_kind.get(ledger.kind)
            self._by_kind[ledger.kind] = ledger if mine is None else mine + ledger

    def __repr__(self) -> str:
        kinds = ", ".join(f"{k}: {v.heaps} heap(s)" for k, v in sorted(self._by_kind.items()))
        return f"<Collector {kinds or 'empty'}>"

    def ledgers(self) -> dict[str, Ledger]:
        """The combined ledger of each kind seen so far.  O(kinds)."""
        with self._lock:
            return dict(sorted(self._by_kind.items()))

    def summary(self) -> str:
        """Every kind's combined summary, one block each.  O(kinds * totals)."""
        blocks = [led.summary() for led in self.ledgers().values()]
        return "\n\n".join(blocks) if blocks else "audit: no ledger collected"

    def report(self) -> None:
        """Log ``summary()`` on the ``heapkit.audit`` logger: WARNING if a bound was exceeded, else INFO."""
        over = any(led.violation_count for led in self.ledgers().values())
        _log.log(logging.WARNING if over else logging.INFO, "%s", self.summary())

    def _at_exit(self) -> None:
        flush()  # heaps still alive report first
        self.report()
