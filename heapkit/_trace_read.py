"""Reading and validating trace lines, without recursion (used by :mod:`heapkit.trace`).

Each check raises ``ValueError`` saying what is wrong; ``heapkit.trace.read`` adds the
file and line.  The limits are part of the trace format (README, "Command line").
"""

from __future__ import annotations

import json
import math
import re
from typing import Any

#: The longest trace line read or written, in bytes (16 MiB): an endless line stops here.
MAX_LINE = 1 << 24
#: How deep arrays may nest in a key (a key of tuples of tuples ...).
MAX_KEY_DEPTH = 30


def _key(data: Any) -> Any:
    """A key read from JSON, arrays as tuples, iteratively; ``ValueError`` says what is wrong."""
    if isinstance(data, str | int) and not isinstance(data, bool):
        return data  # the common case, first
    root: list[Any] = []
    stack: list[tuple[Any, list[Any] | None]] = [(data, root)]
    while stack:
        d, out = stack.pop()
        if out is None:  # close a finished array: its items are in d's list
            done, dest = d
            dest.append(tuple(done))
        elif isinstance(d, list):
            items: list[Any] = []
            stack.append(((items, out), None))
            stack.extend((x, items) for x in reversed(d))
        elif isinstance(d, float) and d != d:
            # The parse visits every item once, so it tests each here (the same rule as
            # heapkit.errors.nan_inside, which would walk the key a second time).
            raise ValueError("a key holds NaN, which has no order")
        elif isinstance(d, float) and not math.isfinite(d):
            raise ValueError(f"a key holds {d!r}; trace keys are finite numbers")
        elif isinstance(d, bool) or not isinstance(d, int | float | str):
            raise ValueError(f"a key must be a number, a string or an array of them, not {json.dumps(d)[:40]}")
        else:
            out.append(d)
    return root[0]


_NEEDS: dict[str, tuple[str, ...]] = {
    "push": ("id", "key"),
    "extend": ("ids", "keys"),
    "pop": (),
    "decrease_key": ("id", "key"),
    "change_key": ("id", "key"),
    "remove": ("id",),
    "meld": ("from",),
    "clear": (),
}

# A JSON string or a bracket: counting nesting depth without recursion or a parser.
_NESTING = re.compile(rb'"[^"\\]*(?:\\.[^"\\]*)*"|[\[\]{}]')


def _too_deep(raw: bytes, limit: int) -> bool:
    """Does ``raw`` nest arrays/objects deeper than ``limit``?  O(len(raw)), iterative."""
    if raw.count(b"[") + raw.count(b"{") <= limit:
        return False
    depth = 0
    for m in _NESTING.finditer(raw):
        c = m.group()
        if c in (b"[", b"{"):
            depth += 1
            if depth > limit:
                return True
        elif c in (b"]", b"}"):
            depth -= 1
    return False


def _count(value: Any) -> bool:
    return isinstance(value, int) and not isinstance(value, bool) and value >= 0


def _parse(raw: bytes, pushed: dict[int, int], lineno: int) -> dict[str, Any]:
    """One trace line as a validated operation (keys already tuples); ``ValueError`` says why not."""
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise ValueError(f"not UTF-8 (byte {raw[exc.start]:#04x} at column {exc.start + 1})") from None
    if _too_deep(raw, MAX_KEY_DEPTH + 2):
        raise ValueError(f"arrays nested deeper than a key may be ({MAX_KEY_DEPTH} levels)")
    try:
        op = json.loads(text)
    except ValueError as exc:  # JSONDecodeError, and integers over Python's digit limit
        raise ValueError(f"not a JSON object ({getattr(exc, 'msg', None) or str(exc).split(';')[0]})") from None
    if not isinstance(op, dict) or op.get("op") not in _NEEDS:
        raise ValueError(f"expected an object with op in {sorted(_NEEDS)}")
    what = op["op"]
    missing = [f for f in ("q", *_NEEDS[what]) if f not in op]
    if missing:
        raise ValueError(f"{what} needs {', '.join(missing)}")
    for f in ("q", "id", "from"):
        if (f in op or f in _NEEDS[what]) and not _count(op.get(f)):
            raise ValueError(f"{what}: {f} must be a non-negative integer, not {json.dumps(op.get(f))[:40]}")
    if "key" in op:
        op["key"] = _key(op["key"])
    if what == "extend":
        ids, keys = op["ids"], op["keys"]
        if not isinstance(ids, list) or not isinstance(keys, list) or not all(_count(n) for n in ids):
            raise ValueError("extend: ids must be an array of non-negative integers and keys an array")
        if len(ids) != len(keys):
            raise ValueError(f"extend has {len(ids)} ids but {len(keys)} keys")
        op["keys"] = [_key(k) for k in keys]
    elif what == "meld" and op["from"] == op["q"]:
        raise ValueError(f"meld: queue {op['q']} cannot be melded into itself")
    for n in op["ids"] if what == "extend" else [op["id"]] if what == "push" else []:
        if n in pushed:
            raise ValueError(f"id {n} pushed twice (first at line {pushed[n]}; two traces in one file?)")
        pushed[n] = lineno
    return op
