"""The exceptions heapkit raises.

Every class subclasses a builtin as well as :class:`HeapError`, so existing
``except IndexError`` / ``except ValueError`` clauses keep working.
"""

from __future__ import annotations

__all__ = [
    "BoundExceededError",
    "EmptyHeapError",
    "HeapError",
    "InvalidHandleError",
    "InvariantError",
    "KeyOrderError",
]


class HeapError(Exception):
    """Base class of every error heapkit raises on its own account."""


class EmptyHeapError(HeapError, IndexError):
    """``peek`` or ``pop`` on a heap that holds nothing."""


class InvalidHandleError(HeapError, ValueError):
    """A handle that is dead, or live in another heap."""


class KeyOrderError(HeapError, ValueError):
    """A key that cannot be ordered (NaN), or a key change in the wrong direction."""


class InvariantError(HeapError, AssertionError):
    """``heapkit.check`` found a broken rule of the heap's kind.

    ``problems`` holds one line per broken rule found (up to a small limit);
    checked mode also attaches ``history``, the last operations before the failure.
    """

    def __init__(self, message: str, problems: tuple[str, ...] = ()) -> None:
        super().__init__(message)
        self.problems: tuple[str, ...] = problems or (message,)
        self.history: list[tuple[object, ...]] = []


class BoundExceededError(HeapError, AssertionError):
    """An audited operation cost more than its kind's documented bound."""
