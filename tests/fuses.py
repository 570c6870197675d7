"""What the fault-injection suites share: a fuse that makes a key's ``<`` fail after a
chosen number of comparisons, in one of two ways (the ``MODES``):

- ``"raise in <"``: ``__lt__`` itself raises :class:`Boom`;
- ``"raise in bool()"``: ``__lt__`` returns a :class:`Poison` whose ``__bool__`` raises
  :class:`Boom`, as symbolic-math expressions and array-valued keys do, so the failure
  comes when the heap takes the comparison's truth value, not when it compares.

Plus :func:`assert_unchanged` (the failure rule of api.md), and :func:`start_iteration`
and :func:`finish_iteration`, the check that an iteration running across a failed
operation either stops with ``RuntimeError`` or yields every entry exactly once.
"""

from __future__ import annotations

import itertools
from collections.abc import Callable, Iterator
from typing import Any

import heapkit

MODES = ["raise in <", "raise in bool()"]


class Boom(Exception):
    """The injected fault."""


class Poison:
    """A comparison result with no truth value."""

    __slots__ = ()

    def __bool__(self) -> bool:
        raise Boom


class Fuse:
    """How many comparisons may still happen before one fails (negative: never)."""

    left = -1
    mode = MODES[0]
    once = False  # True: only the one comparison fails; False: every one after it too

    @classmethod
    def arm(cls, left: int, mode: str, once: bool = False) -> None:
        if mode not in MODES:
            raise ValueError(mode)
        cls.left, cls.mode, cls.once = left, mode, once

    @classmethod
    def disarm(cls) -> None:
        cls.left = -1

    @classmethod
    def result(cls, lt: bool) -> Any:
        """What the key's ``__lt__`` returns for a true result ``lt`` (or raise)."""
        if cls.left < 0:
            return lt
        if cls.left > 0:
            cls.left -= 1
            return lt
        if cls.once:
            cls.left = -1
        if cls.mode == MODES[0]:
            raise Boom
        return Poison()


def start_iteration(heap: Any) -> list[tuple[Iterator[Any], list[Any]]]:
    """Iterations over ``heap`` stopped after one entry, and halfway: each iterator and
    what it yielded so far (for :func:`finish_iteration`)."""
    walks = []
    for stop in sorted({min(1, len(heap)), (len(heap) + 1) // 2}):
        walk = iter(heap)
        walks.append((walk, list(itertools.islice(walk, stop))))
    return walks


def finish_iteration(walks: list[tuple[Iterator[Any], list[Any]]], heap: Any) -> None:
    """Run each iteration of ``walks`` to its end across a failed operation: it must
    raise ``RuntimeError`` or have yielded each live handle of ``heap`` exactly once
    (api.md: iteration raises ``RuntimeError`` if the heap changes while it runs)."""
    for walk, seen in walks:
        got = list(seen)
        try:
            got.extend(walk)
        except RuntimeError:
            continue
        assert sorted(map(id, got)) == sorted(map(id, heap)), "iteration skipped or repeated entries"


def assert_unchanged(state: Callable[[Any], Any], *sides: tuple[Any, Any, list[Any]]) -> None:
    """For each ``(heap, state before, handles live before)`` after a failed operation:
    the same ``state(heap)``, every handle still live there, and ``heapkit.check`` passes."""
    for heap, before, live in sides:
        assert state(heap) == before
        assert all(x.alive and x in heap for x in live)
        heapkit.check(heap)
