"""``check``: drive a kind's survey of its rules and name what broke.

Each kind declares its rules (``RULES``) and checks them in ``_survey`` beside
its code; this module only drives the survey, collects what it reports and
turns it into a :class:`heapkit.Shape` or an :class:`heapkit.InvariantError`.
A queue that is not a heapkit kind gets the checks the protocol alone allows
(``PROTOCOL_RULES``).
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

from heapkit._core import HeapBase
from heapkit.concurrent.guard import Wrapper
from heapkit.errors import HeapError, InvariantError, nan_inside
from heapkit.protocol import Shape

__all__ = ["LIMIT", "PROTOCOL_RULES", "Report", "check", "kind_name", "mode_repr", "problem_prefix"]

#: How many broken rules one check reports before it stops looking.
LIMIT = 8

#: What ``check`` verifies on a queue that only satisfies the protocol.
PROTOCOL_RULES: dict[str, str] = {
    "size": "iteration gives len(heap) handles, and bool(heap) is len(heap) > 0",
    "unique": "iteration gives no handle twice",
    "alive": "every iterated handle is alive and `in` the heap",
    "key": "every key is equal to itself (no NaN)",
    "minimum": "peek gives an iterated handle, and no iterated key is below its key",
}


class _Enough(Exception):
    """The report is full."""


def _shown(obj: Any) -> str:
    """``repr(obj)``, or a placeholder when that ``repr`` itself fails."""
    try:
        return repr(obj)
    except Exception as exc:  # a broken user __repr__ must not hide the real problem
        return f"<repr failed: {type(exc).__name__}>"


def problem_prefix(rule: str, path: Sequence[str], handle: Any) -> str:
    """How a problem line starts: the rule, the path from a root and the entry.

    >>> problem_prefix("heap-order", ["root", "child 1"], None)
    "rule 'heap-order' broken at root → child 1"
    """
    where = " → ".join(path) if path else "the heap"
    entry = ""
    if handle is not None:
        entry = f" entry ({_shown(getattr(handle, 'key', None))}, {_shown(getattr(handle, 'value', None))})"
    return f"rule {rule!r} broken at {where}{entry}"


class Report:
    """Collects broken rules: ``fail(rule, handle, path, detail)``.

    ``handle`` is the entry where the rule breaks (or None for the heap as a
    whole); ``path`` the steps from a root to it, e.g. ``["root", "child 1"]``.
    After ``limit`` problems the survey is stopped.
    """

    def __init__(self, limit: int = LIMIT) -> None:
        self.limit = limit
        self.problems: list[str] = []
        self.rules: list[str] = []

    def fail(self, rule: str, handle: Any, path: Sequence[str], detail: str) -> None:
        self.problems.append(f"{problem_prefix(rule, path, handle)}: {detail}")
        self.rules.append(rule)
        if len(self.problems) >= self.limit:
            raise _Enough

    def run(self, survey: Any, *args: Any) -> Any:
        """Call ``survey(self, *args)``; stop quietly once the report is full.

        If the survey itself raises after finding problems (a corrupted
        structure can make it trip), the problems win: :class:`InvariantError`
        from the original exception.  Otherwise its exception propagates.
        """
        try:
            return survey(self, *args)
        except _Enough:
            return None
        except Exception as exc:
            if not self.problems or isinstance(exc, HeapError):
                raise
            self.problems.append(f"the survey stopped on {_shown(exc)}")
            raise self.error(None) from exc

    def error(self, heap: Any, extra: str = "") -> InvariantError:
        """The :class:`InvariantError` listing every problem found."""
        name = "the heap" if heap is None else type(heap).__name__
        head = f"{name}: {len(self.problems)} broken rule(s){extra}"
        return InvariantError(head + "\n  " + "\n  ".join(self.problems), tuple(self.problems))


def kind_name(heap: Any) -> str:
    """The ``KINDS`` name of a heapkit heap (through any checked or audited layer)."""
    for c in type(heap).__mro__:
        if "KIND" in c.__dict__:
            return str(c.__dict__["KIND"])
    return type(heap).__name__


def mode_repr(text: str, tag: str) -> str:
    """A heap's ``repr`` with a mode's tag added: ``<X n=1 ...>`` -> ``<X n=1 ... [tag]>``.  O(len).

    >>> mode_repr(mode_repr("<PairingHeap empty>", "audited"), "checked")
    '<PairingHeap empty [audited, checked]>'
    """
    if text.endswith("]>"):
        return f"{text[:-2]}, {tag}]>"
    return f"{text[:-1]} [{tag}]>"


def check(heap: Any) -> Shape:
    """Verify every invariant of ``heap``'s kind in O(n), iteratively.

    Returns the heap's :class:`Shape`; raises :class:`InvariantError` naming each
    broken rule (up to ``LIMIT``), the entry ``(key, value)`` and the path from a
    root to it.  On a queue that only satisfies the protocol, checks what the
    protocol can show (``PROTOCOL_RULES``); on a concurrent wrapper, checks the
    inner heap holding its lock for the whole check.  O(n) worst-case.

    >>> from heapkit import PairingHeap
    >>> check(PairingHeap([(2, 'b'), (1, 'a')])).size
    2
    >>> h = PairingHeap([(2, 'b'), (1, 'a')])
    >>> c = h.peek()._child
    >>> c._key = c._k = 0                 # corrupt it through the internals
    >>> check(h)
    Traceback (most recent call last):
    ...
    heapkit.errors.InvariantError: PairingHeap: 1 broken rule(s)
      rule 'heap-order' broken at root → child 0 entry (0, 'b'): key 0 is smaller than its parent's 1
    """
    if isinstance(heap, Wrapper):  # locked/blocking/asynchronous: the inner heap, under its lock, once
        with heap.held() as inner:
            return check(inner)
    if not isinstance(heap, HeapBase):
        return _check_protocol(heap)
    report = Report()
    figures = report.run(heap._survey)
    if not report.problems:  # a broken structure may not iterate
        report.run(_survey_keys, heap)
    if report.problems:
        raise report.error(heap)
    return Shape(kind=kind_name(heap), **figures)


def _survey_keys(report: Report, heap: Any) -> None:
    """Rule "key" of every kind: no key is or holds NaN (push refuses them).  O(size of the keys)."""
    for h in heap._handles():
        _key_rule(report, h, h.key)


def _key_rule(report: Report, h: Any, key: Any) -> None:
    """Rule "key", for heapkit's kinds and users' queues alike: ``key`` is not and holds no NaN."""
    if nan_inside(key):
        report.fail("key", h, [], "the key is or holds a value not equal to itself (NaN)")


def _check_protocol(heap: Any) -> Shape:
    """What the protocol alone can show about a user's own queue (or an ``adapt`` wrapper).  O(n)."""
    report = Report()
    n = len(heap)
    seen = report.run(_survey_protocol, heap, n)
    if report.problems:
        raise report.error(heap)
    return Shape(
        kind=type(heap).__name__,
        size=n,
        roots=1 if n else 0,
        height=0,
        max_degree=0,
        details={"checked": "protocol only" if seen else "len, bool and peek only (the queue is not iterable)"},
    )


def _key_of(item: Any) -> Any:
    """A handle's key, or the key of a ``(key, value)`` pair (what some queues' ``peek`` gives)."""
    return item[0] if isinstance(item, tuple) and len(item) == 2 else item.key


def _survey_protocol(report: Report, heap: Any, n: int) -> bool:
    """The protocol rules; False when the queue cannot be iterated (then only len, bool, peek)."""
    if bool(heap) != (n > 0):
        report.fail("size", None, [], f"bool(heap) is {bool(heap)} but len is {n}")
    try:
        handles = list(heap)
    except TypeError:  # not iterable: a user's queue need not be
        if n:
            tk = _key_of(heap.peek())
            if tk != tk:
                report.fail("key", None, [], f"peek gives key {tk!r}, which is not equal to itself (NaN)")
        return False
    if len(handles) != n:
        report.fail("size", None, [], f"iteration gives {len(handles)} handles, len is {n}")
    seen: set[int] = set()
    member = hasattr(heap, "__contains__")
    for h in handles:
        if id(h) in seen:
            report.fail("unique", h, [], "iteration gives this handle twice")
        seen.add(id(h))
        if not getattr(h, "alive", True):
            report.fail("alive", h, [], "iteration gives a dead handle")
        elif member and h not in heap:
            report.fail("alive", h, [], "an iterated handle is not `in` the heap")
        _key_rule(report, h, _key_of(h))
    if not handles:
        return True
    top = heap.peek()
    if not isinstance(top, tuple) and id(top) not in seen:
        report.fail("minimum", top, [], "peek gives a handle that iteration does not")
    tk = _key_of(top)
    for h in handles:
        if _key_of(h) < tk:
            report.fail("minimum", h, [], f"peek gives key {tk!r} but this key is smaller")
    return True
