"""The ``HEAPKIT_DEBUG`` switch: heaps constructed while it is set come checked or audited.

Accepted values, comma-separated: ``check`` (checked mode, every operation),
``check:N`` (every N-th operation), ``audit`` (``heapkit.audit.attach(heap)``).
The variable is read once, when heapkit is imported; what it switches on is
said once on the ``heapkit`` logger at WARNING.  A part it does not know
(``1``, ``CHECK``, ``check:0``) is named in a warning on the same logger and
ignored: a typo in the environment must not stop the host program.  Programs
that cannot set the environment call :func:`set_debug` with the same string
(there a bad part raises ``ValueError`` and nothing changes).  When no mode is
on, ``_core.on_new`` stays None and a heap pays nothing.
"""

from __future__ import annotations

import importlib
import logging
import os
from typing import Any

from heapkit import _core
from heapkit.contracts.mode import checked

__all__ = ["ACCEPTED", "describe", "parse", "set_debug"]

ACCEPTED = "check, check:N (N a whole number of at least 1), audit"

_log = logging.getLogger("heapkit")

#: The modes in force (from the environment at import, or the last ``set_debug``).
MODES: list[tuple[str, int]] = []


def parse(text: str) -> tuple[list[tuple[str, int]], list[str]]:
    """The modes named by a ``HEAPKIT_DEBUG`` value, in order, and the parts not understood.  O(len).

    >>> parse("check:10, audit")
    ([('check', 10), ('audit', 0)], [])
    >>> parse("CHECK, 1")
    ([], ['CHECK', '1'])
    """
    modes: list[tuple[str, int]] = []
    bad: list[str] = []
    for raw in text.split(","):
        part = raw.strip()
        if not part:
            continue
        name, sep, arg = part.partition(":")
        name, arg = name.strip(), arg.strip()
        if name == "check" and not sep:
            modes.append(("check", 1))
        elif name == "check" and arg.isascii() and arg.isdigit() and int(arg) >= 1:
            modes.append(("check", int(arg)))
        elif name == "audit" and not sep:
            modes.append(("audit", 0))
        else:
            bad.append(part)
    return modes, bad


def _hint(part: str) -> str:
    low = part.lower()
    if low != part and parse(low)[0]:
        return f" (did you mean {low!r}? the names are lower case)"
    return ""


def describe(modes: list[tuple[str, int]]) -> str:
    """What ``modes`` switch on, in words.  O(len(modes)).

    >>> describe([('check', 10), ('audit', 0)])
    'checked mode (every 10th operation) and the audit (a ledger per heap)'
    >>> describe([])
    'nothing'
    """
    words = []
    for name, every in modes:
        if name == "check":
            words.append("checked mode" + ("" if every == 1 else f" (every {_nth(every)} operation)"))
        else:
            words.append("the audit (a ledger per heap)")
    return " and ".join(words) or "nothing"


def _nth(n: int) -> str:
    tail = "th" if 10 <= n % 100 <= 20 else {1: "st", 2: "nd", 3: "rd"}.get(n % 10, "th")
    return f"{n}{tail}"


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


def _apply(modes: list[tuple[str, int]], source: str) -> None:
    MODES[:] = modes
    _core.on_new = _on_new if modes else None
    if modes:
        _log.warning(
            "%s: %s %s on for every heap made from now on (slower; for tests and staging)",
            source,
            describe(modes),
            "is" if len(modes) == 1 else "are",
        )


def set_debug(text: str) -> list[tuple[str, int]]:
    """Switch the modes of heaps made from now on, as ``HEAPKIT_DEBUG=text`` would.  O(1).

    ``""`` switches them off.  Heaps that exist keep their modes.  A part it
    does not know raises ``ValueError`` and changes nothing.  Returns the modes now on.

    >>> set_debug("check:5")
    [('check', 5)]
    >>> set_debug("")
    []
    """
    if not isinstance(text, str):
        raise TypeError(f"set_debug: expected a string like 'check:10,audit', got {text!r}")
    modes, bad = parse(text)
    if bad:
        raise ValueError(f"set_debug({text!r}): unknown value {bad[0]!r}{_hint(bad[0])}; accepted: {ACCEPTED}")
    _apply(modes, f"heapkit.set_debug({text!r})")
    return list(MODES)


def _from_environment() -> None:
    text = os.environ.get("HEAPKIT_DEBUG", "")
    modes, bad = parse(text)
    for part in bad:
        _log.warning("HEAPKIT_DEBUG=%r: ignoring unknown value %r%s; accepted: %s", text, part, _hint(part), ACCEPTED)
    _apply(modes, f"HEAPKIT_DEBUG={text!r}")


_from_environment()
