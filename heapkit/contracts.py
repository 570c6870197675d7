"""Contracts: ``check`` verifies every rule of a heap's kind and names what broke.

Each kind declares its rules (``RULES``) and checks them in ``_survey`` beside
its code; this module only drives the survey, collects what it reports and
turns it into a :class:`heapkit.Shape` or an :class:`heapkit.InvariantError`.
"""

from __future__ import annotations

import contextlib
from collections.abc import Sequence
from typing import Any

from heapkit._core import HeapBase
from heapkit.errors import InvariantError
from heapkit.protocol import Shape

__all__ = ["check"]

#: How many broken rules one check reports before it stops looking.
LIMIT = 8


class _Enough(Exception):
    """The report is full."""


class Report:
    """Collects broken rules: ``fail(rule, handle, path, detail)``."""

    def __init__(self, limit: int = LIMIT) -> None:
        self.limit = limit
        self.problems: list[str] = []
        self.rules: list[str] = []

    def fail(self, rule: str, handle: Any, path: Sequence[str], detail: str) -> None:
        where = " → ".join(path) if path else "the heap"
        if handle is None:
            entry = ""
        else:
            entry = f" entry ({handle.key!r}, {handle.value!r})"
        self.problems.append(f"rule {rule!r} broken at {where}{entry}: {detail}")
        self.rules.append(rule)
        if len(self.problems) >= self.limit:
            raise _Enough


def check(heap: Any) -> Shape:
    """Verify every invariant of ``heap``'s kind in O(n), iteratively.

    Returns the heap's :class:`Shape`; raises :class:`InvariantError` naming each
    broken rule (up to a small limit), the entry and the path from a root to it.

    >>> from heapkit import PairingHeap
    >>> check(PairingHeap([(2, 'b'), (1, 'a')])).size
    2
    """
    if isinstance(heap, HeapBase):
        report = Report()
        figures: dict[str, Any] = {}
        with contextlib.suppress(_Enough):
            figures = heap._survey(report)
        if report.problems:
            _fail(heap, report)
        return Shape(kind=heap.KIND if heap._family() is type(heap) else _kind_name(heap), **figures)
    return _check_protocol(heap)


def _kind_name(heap: HeapBase[Any, Any]) -> str:
    for c in type(heap).__mro__:
        if "KIND" in c.__dict__:
            return str(c.__dict__["KIND"])
    return type(heap).__name__


def _fail(heap: Any, report: Report) -> None:
    head = f"{type(heap).__name__}: {len(report.problems)} broken rule(s)"
    raise InvariantError(head + "\n  " + "\n  ".join(report.problems), tuple(report.problems))


def _check_protocol(heap: Any) -> Shape:
    """What the protocol alone can show about a user's own queue."""
    report = Report()
    try:
        handles = list(heap)
        if len(handles) != len(heap):
            report.fail("size", None, [], f"iteration gives {len(handles)} handles, len is {len(heap)}")
        for h in handles:
            if not h.alive:
                report.fail("alive", h, [], "iteration gives a dead handle")
            if h not in heap:
                report.fail("ownership", h, [], "an iterated handle is not `in` the heap")
        if handles:
            top = heap.peek()
            for h in handles:
                if h.key < top.key:
                    report.fail("minimum", h, [], f"peek gives {top.key!r} but this key is smaller")
    except _Enough:
        pass
    if report.problems:
        _fail(heap, report)
    n = len(heap)
    return Shape(kind=type(heap).__name__, size=n, roots=1 if n else 0, height=0, max_degree=0)
