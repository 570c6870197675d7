"""Checked mode's re-entrancy guard, and the comparisons it makes off the record.

A key's ``<`` that pushes to or pops from the heap it is compared in gets
``RuntimeError`` from checked mode; a kind's own inner calls (``remove``
calling ``pop``, the shared ``extend`` calling ``meld``) pass.  Which is which
is decided by the code object of the calling frame, against the methods of the
heap's own classes, never by module names (a user's subclass may live beside
its keys).  The checker's own comparisons are taken back out of the auditor's
count, so an audit's figures do not depend on the order the modes came on.
"""

from __future__ import annotations

import sys
from types import CodeType, FunctionType
from typing import Any

__all__ = ["internal", "tally", "untally"]

#: Per class: (code objects of the mode layers' methods, code objects of the kind's methods).
_CODES: dict[type, tuple[frozenset[CodeType], frozenset[CodeType]]] = {}


def codes(cls: type) -> tuple[frozenset[CodeType], frozenset[CodeType]]:
    got = _CODES.get(cls)
    if got is None:
        layer: set[CodeType] = set()
        kind: set[CodeType] = set()
        for c in cls.__mro__:
            into = layer if "_layer" in c.__dict__ else kind
            for v in c.__dict__.values():
                fn = getattr(v, "__func__", v)
                if isinstance(fn, FunctionType):
                    into.add(fn.__code__)
        got = _CODES[cls] = (frozenset(layer), frozenset(kind))
    return got


def internal(h: Any, depth: int) -> bool:
    """Is the wrapper's caller the heap's own code (not a key's ``<``)?

    Decided by the code object of the calling frame: it must be a method of a
    class in this heap's own MRO (a kind's ``remove`` calling its ``pop``, the
    shared ``extend`` calling ``meld``).  Frames of another mode's layer stacked
    above this one (the auditor's) are passed over: their caller is the one that
    counts.  A key's ``<`` is never a method of the heap's class, wherever it is
    defined.
    """
    # Frames: 0 _internal, 1 _begin, 2 the wrapper (3 with _rekey), then its caller.
    layer, kind = codes(type(h))
    frame: Any = sys._getframe(depth + 1)
    while frame is not None and frame.f_code in layer:
        frame = frame.f_back
    return frame is not None and frame.f_code in kind


def tally() -> int:
    """The auditor's comparison count now (0 without an auditor loaded)."""
    aud: Any = sys.modules.get("heapkit.audit")
    return 0 if aud is None else int(aud._COUNT)


def untally(c0: int) -> None:
    """Forget the comparisons made since ``tally`` returned ``c0``: they were the checker's."""
    aud: Any = sys.modules.get("heapkit.audit")
    if aud is not None:
        aud._COUNT = c0
