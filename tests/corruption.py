"""Shared assertion for corruption tests: break a rule through a kind's internals,
then check that ``heapkit.check`` names that rule, the entry and the path.

Every kind's tests can use it::

    x._key = x._k = -1            # break heap-order at x
    assert_breaks(heap, "heap-order", x, ["root", "child 0"])
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import pytest

import heapkit
from heapkit.contracts import Report, problem_prefix
from heapkit.errors import InvariantError


def matching(problems: Sequence[str], rule: str, handle: Any, path: Sequence[str] | None) -> list[str]:
    """The problem lines that name ``rule`` at ``handle`` (and at ``path`` unless None)."""
    if path is not None:
        prefix = problem_prefix(rule, path, handle)
        return [p for p in problems if p.startswith(prefix + ":")]
    entry = problem_prefix(rule, ["@"], handle).split(" broken at @", 1)[1]
    head = f"rule {rule!r} broken at "
    return [p for p in problems if p.startswith(head) and (entry + ":") in p]


def assert_breaks(heap: Any, rule: str, handle: Any = None, path: Sequence[str] | None = None) -> InvariantError:
    """``check(heap)`` raises, naming ``rule`` at ``handle`` (None: the heap) and ``path``."""
    known = getattr(type(heap), "RULES", {})
    assert rule in known or rule in heapkit.contracts.PROTOCOL_RULES, f"{rule!r} is no rule"
    with pytest.raises(InvariantError) as info:
        heapkit.check(heap)
    got = matching(info.value.problems, rule, handle, path)
    assert got, f"no problem names rule {rule!r} at {handle!r} {path!r}; found: {info.value.problems}"
    return info.value


def local_rules(heap: Any, touched: Any, handle: Any) -> list[str]:
    """The rules the kind's local survey reports for ``touched`` (empty: none)."""
    report = Report(limit=10**6)
    heap._survey_local(report, touched, handle)
    return report.rules
