"""The exceptions heapkit raises.

Every class subclasses a builtin as well as :class:`HeapError`, so existing
``except IndexError`` / ``except ValueError`` clauses keep working.
"""

from __future__ import annotations

from collections.abc import Iterable

__all__ = [
    "BoundExceededError",
    "ClosedError",
    "EmptyHeapError",
    "FullHeapError",
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


class ClosedError(HeapError, RuntimeError):
    """A push into a closed concurrent queue, or a pop from one that is closed and drained."""


class FullHeapError(HeapError, OverflowError):
    """A concurrent queue stayed at its capacity for the whole timeout of a push."""


def nan_inside(key: object) -> bool:
    """True if ``key`` is not equal to itself (NaN) or is a tuple holding such a value
    at any depth (tuple ``!=`` skips items that are the same object).  O(size of the key).

    >>> nan_inside((1, (2, float('nan')))), nan_inside((1, 'a')), nan_inside(float('nan'))
    (True, False, True)
    """
    if key != key:
        return True
    if not isinstance(key, tuple):
        return False
    stack = [key]
    while stack:
        for x in stack.pop():
            if isinstance(x, tuple):
                stack.append(x)
            elif x != x:
                return True
    return False


def refuse_nan(op: str, key: object) -> None:
    """Checked mode's key test: raise :class:`KeyOrderError` if ``key`` is or holds NaN
    (bare heaps test only ``key != key``).  O(size of the key).

    >>> refuse_nan("push", (1, 2.5))
    """
    if nan_inside(key):
        raise nan_error(op, key)


def refuse_nan_pairs(op: str, pairs: Iterable[object]) -> list[object]:
    """The pairs as a list, after :func:`refuse_nan` on each pair's key.  O(total key size).

    >>> refuse_nan_pairs("extend", iter([(1, 'a')]))
    [(1, 'a')]
    """
    out = list(pairs)
    for p in out:
        if isinstance(p, tuple | list) and p:
            refuse_nan(op, p[0])
    return out


# --- the messages kinds raise (``heapkit._core`` re-exports them) ---------------
def nan_error(op: str, key: object) -> KeyOrderError:
    if key == key:
        return KeyOrderError(f"{op}: key {key!r} holds a value that is not equal to itself (NaN cannot be ordered)")
    return KeyOrderError(f"{op}: key {key!r} is not equal to itself (NaN cannot be ordered)")


def empty_error(op: str) -> EmptyHeapError:
    return EmptyHeapError(f"{op}: the heap is empty")


def upward_error(handle: object, key: object) -> KeyOrderError:
    cur = getattr(handle, "key", None)
    return KeyOrderError(
        f"decrease_key: new key {key!r} is larger than the current key {cur!r} of {handle!r}; "
        "use change_key to move a key up"
    )
