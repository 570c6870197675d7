"""Recording and replaying operation traces (JSON Lines, one operation per line).

``record(heap, path)`` wraps a heap; every operation through the wrapper appends
one JSON object to ``path``::

    {"op": "push", "q": 0, "id": 7, "key": 2.5}
    {"op": "decrease_key", "q": 0, "id": 7, "key": 1.0}
    {"op": "pop", "q": 0, "id": 7, "key": 1.0}
    {"op": "meld", "q": 0, "from": 1}

``q`` numbers the queues of one trace (``recorder.sibling(other)`` records a second
queue into the same file, so melds can be replayed); ``id`` numbers entries in push
order.  Values are never written.  Keys must be JSON numbers (not bool), strings, or
arrays of them (replayed as tuples); anything else is refused when it is recorded.

``replay(path, kind)`` runs a trace on any kind and returns the queues and counts.
Entries with equal keys are interchangeable in a trace, so when a kind pops a
different one of several equal entries the replay swaps their ids and goes on.
"""

from __future__ import annotations

import json
import math
import os
from collections.abc import Callable, Iterable, Iterator
from dataclasses import dataclass, field
from typing import IO, Any

from heapkit.errors import HeapError
from heapkit.kinds import new

__all__ = ["Recorder", "TraceError", "key_from_json", "read", "record", "replay"]


class TraceError(HeapError, ValueError):
    """A trace line that cannot be replayed; the message names the file and line."""


def _json_key(key: Any, op: str) -> Any:
    """The key as JSON data, or a clear refusal at record time."""
    if isinstance(key, bool) or not isinstance(key, int | float | str | tuple | list):
        raise TypeError(
            f"{op}: a trace records keys that are JSON numbers, strings or arrays of them; "
            f"got {type(key).__name__} {key!r}"
        )
    if isinstance(key, float) and not math.isfinite(key):
        raise TypeError(f"{op}: a trace cannot record the non-finite key {key!r}")
    if isinstance(key, tuple | list):
        return [_json_key(k, op) for k in key]
    return key


def key_from_json(data: Any) -> Any:
    """A key read back from JSON: arrays become tuples.  O(size of the key).

    >>> key_from_json([3, [1, "b"]])
    (3, (1, 'b'))
    """
    if isinstance(data, list):
        return tuple(key_from_json(k) for k in data)
    return data


class _Trace:
    """The file and the numbering shared by every queue recorded into it."""

    def __init__(self, path: str | os.PathLike[str]) -> None:
        self.path = os.fspath(path)
        self.out: IO[str] = open(self.path, "a", encoding="utf-8")  # noqa: SIM115 - closed by close()
        self.ids: dict[int, int] = {}  # id(handle) -> entry id
        self.handles: dict[int, Any] = {}  # keeps handles alive so id() stays unique
        self.next_id = 0
        self.queues = 0

    def write(self, **fields: Any) -> None:
        self.out.write(json.dumps(fields, allow_nan=False, separators=(",", ":")) + "\n")
        self.out.flush()

    def entry(self, handle: Any) -> int:
        try:
            return self.ids[id(handle)]
        except KeyError:
            raise TypeError(f"trace: {handle!r} was not pushed through a recorder of this trace") from None

    def new_entry(self, handle: Any) -> int:
        n = self.next_id
        self.next_id += 1
        self.ids[id(handle)] = n
        self.handles[id(handle)] = handle
        return n


class Recorder:
    """A heap that writes each operation to a trace; it satisfies the heap protocol.

    >>> import tempfile, os
    >>> from heapkit import PairingHeap
    >>> path = os.path.join(tempfile.mkdtemp(), "t.jsonl")
    >>> q = record(PairingHeap(), path)
    >>> h = q.push(3, 'c'); q.decrease_key(h, 1); q.pop()
    (1, 'c')
    >>> q.close(); len(open(path).read().splitlines())
    3
    """

    def __init__(self, heap: Any, trace: _Trace) -> None:
        self.inner = heap
        self._trace = trace
        self.q = trace.queues
        trace.queues += 1

    def sibling(self, heap: Any) -> Recorder:
        """Record another queue into the same trace (so melds between them replay)."""
        return Recorder(heap, self._trace)

    def close(self) -> None:
        """Close the trace file (siblings share it)."""
        self._trace.out.close()

    def push(self, key: Any, value: Any) -> Any:
        data = _json_key(key, "push")
        h = self.inner.push(key, value)
        self._trace.write(op="push", q=self.q, id=self._trace.new_entry(h), key=data)
        return h

    def extend(self, pairs: Iterable[tuple[Any, Any]]) -> list[Any]:
        pairs = list(pairs)
        data = [_json_key(k, "extend") for k, _ in pairs]
        hs = self.inner.extend(pairs)
        ids = [self._trace.new_entry(h) for h in hs]
        self._trace.write(op="extend", q=self.q, ids=ids, keys=data)
        return list(hs)

    def peek(self) -> Any:
        return self.inner.peek()

    def pop(self) -> tuple[Any, Any]:
        h = self.inner.peek() if self.inner else None
        key, value = self.inner.pop()
        self._trace.write(op="pop", q=self.q, id=self._trace.entry(h), key=_json_key(key, "pop"))
        return key, value

    def decrease_key(self, handle: Any, key: Any) -> None:
        data = _json_key(key, "decrease_key")
        self.inner.decrease_key(handle, key)
        self._trace.write(op="decrease_key", q=self.q, id=self._trace.entry(handle), key=data)

    def change_key(self, handle: Any, key: Any) -> None:
        data = _json_key(key, "change_key")
        self.inner.change_key(handle, key)
        self._trace.write(op="change_key", q=self.q, id=self._trace.entry(handle), key=data)

    def remove(self, handle: Any) -> tuple[Any, Any]:
        out = self.inner.remove(handle)
        self._trace.write(op="remove", q=self.q, id=self._trace.entry(handle))
        return out  # type: ignore[no-any-return]

    def meld(self, other: Any) -> None:
        if not isinstance(other, Recorder) or other._trace is not self._trace:
            raise TypeError("meld: record the other queue with recorder.sibling(heap) first")
        self.inner.meld(other.inner)
        self._trace.write(op="meld", q=self.q, **{"from": other.q})

    def clear(self) -> None:
        self.inner.clear()
        self._trace.write(op="clear", q=self.q)

    def __len__(self) -> int:
        return len(self.inner)

    def __bool__(self) -> bool:
        return bool(self.inner)

    def __iter__(self) -> Iterator[Any]:
        return iter(self.inner)

    def __contains__(self, handle: object) -> bool:
        return handle in self.inner


def record(heap: Any, path: str | os.PathLike[str]) -> Recorder:
    """Wrap ``heap`` so that every operation is appended to the JSON Lines file ``path``.

    O(1) extra per operation (one line written and flushed).
    """
    return Recorder(heap, _Trace(path))


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


def read(path: str | os.PathLike[str]) -> Iterator[tuple[int, dict[str, Any]]]:
    """Each ``(line number, operation)`` of a trace, validated; ``TraceError`` names file and line."""
    name = os.fspath(path)
    with open(name, encoding="utf-8") as f:
        for lineno, line in enumerate(f, 1):
            if not line.strip():
                continue
            try:
                op = json.loads(line)
            except json.JSONDecodeError as exc:
                raise TraceError(f"{name}:{lineno}: not a JSON object ({exc.msg})") from None
            if not isinstance(op, dict) or op.get("op") not in _NEEDS:
                raise TraceError(f"{name}:{lineno}: expected an object with op in {sorted(_NEEDS)}")
            missing = [f for f in ("q", *_NEEDS[op["op"]]) if f not in op]
            if missing:
                raise TraceError(f"{name}:{lineno}: {op['op']} needs {', '.join(missing)}")
            yield lineno, op


@dataclass
class Replayed:
    """What a replay produced: the queues, the operation count, and per-op tallies."""

    kind: str
    queues: dict[int, Any] = field(default_factory=dict)
    operations: int = 0
    counts: dict[str, int] = field(default_factory=dict)
    popped: list[Any] = field(default_factory=list)


def replay(
    path: str | os.PathLike[str],
    kind: str,
    *,
    make: Callable[[str], Any] | None = None,
    each: Callable[[dict[str, Any]], None] | None = None,
    ops: Iterable[tuple[int, dict[str, Any]]] | None = None,
) -> Replayed:
    """Run the trace at ``path`` on a fresh queue of ``kind``.  O(trace) operations.

    ``make(kind)`` builds each queue (default ``heapkit.new``); ``each(op)`` is
    called after every operation (e.g. to check or time); ``ops`` are the
    trace's operations already read with :func:`read` (to replay several times).
    """
    name = os.fspath(path)
    build = make or (lambda k: new(k))
    out = Replayed(kind)
    handles: dict[int, Any] = {}
    ids: dict[int, int] = {}  # id(handle) -> entry id

    def queue(q: int) -> Any:
        if q not in out.queues:
            out.queues[q] = build(kind)
        return out.queues[q]

    def handle(lineno: int, n: int) -> Any:
        if n not in handles:
            raise TraceError(f"{name}:{lineno}: unknown entry id {n}")
        return handles[n]

    for lineno, op in read(name) if ops is None else ops:
        what = op["op"]
        q = queue(op["q"])
        try:
            if what == "push":
                h = q.push(key_from_json(op["key"]), op["id"])
                handles[op["id"]] = h
                ids[id(h)] = op["id"]
            elif what == "extend":
                hs = q.extend((key_from_json(k), n) for k, n in zip(op["keys"], op["ids"], strict=True))
                for n, h in zip(op["ids"], hs, strict=True):
                    handles[n] = h
                    ids[id(h)] = n
            elif what == "pop":
                top = q.peek()
                out.popped.append(q.pop()[0])
                want = op.get("id")
                got = ids.get(id(top))
                if want is not None and got != want and want in handles:
                    # equal keys are interchangeable: swap the two entries' ids
                    other = handles[want]
                    handles[want], handles[got] = top, other  # type: ignore[index]
                    ids[id(top)], ids[id(other)] = want, got  # type: ignore[assignment]
            elif what == "decrease_key":
                q.decrease_key(handle(lineno, op["id"]), key_from_json(op["key"]))
            elif what == "change_key":
                q.change_key(handle(lineno, op["id"]), key_from_json(op["key"]))
            elif what == "remove":
                q.remove(handle(lineno, op["id"]))
            elif what == "meld":
                q.meld(queue(op["from"]))
            else:
                q.clear()
        except TraceError:
            raise
        except HeapError as exc:
            raise TraceError(f"{name}:{lineno}: {what} failed: {exc}") from exc
        out.operations += 1
        out.counts[what] = out.counts.get(what, 0) + 1
        if each is not None:
            each(op)
    return out
