"""The ``HEAPKIT_DEBUG`` switch: heaps constructed while it is set come checked or audited.

Accepted values, comma-separated: ``check`` (checked mode, every operation),
``check:N`` (every N-th operation), ``audit`` (``heapkit.audit.attach(heap)``
when the auditor provides it, otherwise accepted and ignored).  The variable
is read once, when heapkit is imported; an unknown value raises ``ValueError``
there.  When it is unset, ``_core.on_new`` stays None and a heap pays nothing.
"""

from __future__ import annotations

import importlib
import os
from typing import Any

from heapkit import _core
from heapkit.contracts.mode import checked

__all__ = ["ACCEPTED", "parse"]

ACCEPTED = "check, check:N (N a whole number of at least 1), audit"

#: The modes in force, read from the environment at import.
MODES: list[tuple[str, int]] = []


def parse(text: str) -> list[tuple[str, int]]:
    """The modes named by a ``HEAPKIT_DEBUG`` value, in order.

    >>> parse("check:10, audit")
    [('check', 10), ('audit', 0)]
    >>> parse("")
    []
    """
    modes: list[tuple[str, int]] = []
    for raw in text.split(","):
        part = raw.strip()
        if not part:
            continue
        name, sep, arg = part.partition(":")
        name = name.strip()
        if name == "check" and not sep:
            modes.append(("check", 1))
        elif name == "check" and arg.strip().isdigit() and int(arg) >= 1:
            modes.append(("check", int(arg)))
        elif name == "audit" and not sep:
            modes.append(("audit", 0))
        else:
            raise ValueError(f"HEAPKIT_DEBUG={text!r}: unknown value {part!r}; accepted: {ACCEPTED}")
    return modes


def _attach_audit(heap: Any) -> None:
    try:
        mod = importlib.import_module("heapkit.audit")
    except ModuleNotFoundError as exc:
        if exc.name != "heapkit.audit":
            raise
        return  # no auditor in this build: accepted and ignored
    attach = getattr(mod, "attach", None)
    if callable(attach):
        attach(heap)


def _on_new(heap: Any) -> None:
    """Called by ``_core`` at the end of every heap's ``__init__``."""
    for name, every in MODES:
        if name == "check":
            checked(heap, every=every)
        else:
            _attach_audit(heap)


MODES.extend(parse(os.environ.get("HEAPKIT_DEBUG", "")))
if MODES:
    _core.on_new = _on_new
