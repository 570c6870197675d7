"""Recording and replaying operation traces (JSON Lines, one operation per line).

``record(heap, path)`` wraps a heap; every operation through the wrapper writes
one JSON object to ``path`` (overwritten; ``mode="x"`` refuses an existing file)::

    {"op": "push", "q": 0, "id": 7, "key": 2.5}
    {"op": "decrease_key", "q": 0, "id": 7, "key": 1.0}
    {"op": "pop", "q": 0, "id": 7, "key": 1.0}
    {"op": "meld", "q": 0, "from": 1}

``q`` numbers the queues of one trace (``recorder.sibling(other)`` records a second
queue into the same file, so melds can be replayed); ``id`` numbers entries in push
order.  Values are never written.  Keys must be JSON numbers (not bool, finite),
strings, or arrays of them nested at most ``MAX_KEY_DEPTH`` deep (replayed as
tuples); anything else is refused when it is recorded, before the operation.

A write that fails (disk full) never loses or orphans an entry: the operation has
taken effect and returns its result; the recorder logs the failure once on the
``heapkit.trace`` logger, records nothing more, keeps the error in
``write_error``, and ``close()`` (or leaving ``with``) raises :class:`TraceError`.
The file then holds the operations before the failure (its last line may be cut).
The recorder holds a reference to live entries only: memory is bounded by the heap.

``read(path)`` validates each line; ``replay(path, kind)`` runs a trace on any
kind.  Entries with equal keys are interchangeable in a trace, so when a kind pops
a different one of several equal entries the replay swaps their ids and goes on.
Limits (refused with a ``TraceError`` naming file and line): lines over
``MAX_LINE`` bytes, bytes that are not UTF-8, JSON nested deeper than the key limit.
"""

from __future__ import annotations

import json
import logging
import math
import os
from collections.abc import Callable, Iterable, Iterator
from dataclasses import dataclass, field
from types import TracebackType
from typing import IO, Any, Generic, TypeVar

from heapkit._trace_read import MAX_KEY_DEPTH, MAX_LINE, _key, _parse
from heapkit.errors import HeapError
from heapkit.kinds import new
from heapkit.protocol import Handle, Heap

K = TypeVar("K")
V = TypeVar("V")
K2 = TypeVar("K2")
V2 = TypeVar("V2")

__all__ = ["MAX_KEY_DEPTH", "MAX_LINE", "Recorder", "TraceError", "key_from_json", "read", "record", "replay"]

_log = logging.getLogger("heapkit.trace")


class TraceError(HeapError, ValueError):
    """A trace that cannot be read, replayed or written; the message names the file and line.

    ``line`` and ``op``: the trace line and its operation, when the replay of one failed.
    """

    def __init__(self, message: str, *, line: int | None = None, op: str | None = None) -> None:
        super().__init__(message)
        self.line, self.op = line, op


def _json_key(key: Any, op: str) -> Any:
    """The key as JSON data (iteratively), or a refusal naming ``op`` at record time."""
    root: list[Any] = []
    stack: list[tuple[Any, list[Any], int]] = [(key, root, 0)]
    while stack:
        k, out, depth = stack.pop()
        if isinstance(k, tuple | list):
            if depth >= MAX_KEY_DEPTH:
                raise TypeError(f"{op}: a trace records keys nested at most {MAX_KEY_DEPTH} arrays deep")
            sub: list[Any] = []
            out.append(sub)
            stack.extend((x, sub, depth + 1) for x in reversed(k))
        elif isinstance(k, bool) or not isinstance(k, int | float | str):
            raise TypeError(
                f"{op}: a trace records keys that are JSON numbers, strings or arrays of them; "
                f"got {type(k).__name__} {k!r}"
            )
        elif isinstance(k, float) and not math.isfinite(k):
            raise TypeError(f"{op}: a trace cannot record the non-finite key {k!r}")
        else:
            out.append(k)
    return root[0]


def key_from_json(data: Any) -> Any:
    """A key read back from JSON: arrays become tuples.  O(size of the key), no recursion.

    >>> key_from_json([3, [1, "b"]])
    (3, (1, 'b'))
    """
    return _key(data)


class _Trace:
    """The file and the numbering shared by every queue recorded into it."""

    def __init__(self, target: str | os.PathLike[str] | IO[str], mode: str) -> None:
        if mode not in ("w", "x"):
            raise ValueError(f"record: mode must be 'w' (overwrite) or 'x' (new file only), got {mode!r}")
        if isinstance(target, str | os.PathLike):
            self.name = os.fspath(target)
            self.out: IO[str] = open(self.name, mode, encoding="utf-8")  # noqa: SIM115 - closed by close()
            self.owned = True
        else:
            self.name = str(getattr(target, "name", "<trace>"))
            self.out, self.owned = target, False
        self.ids: dict[int, int] = {}  # id(handle) -> entry id, live entries only
        self.live: dict[int, Any] = {}  # id(handle) -> handle: keeps id() unique while in ids
        self.next_id = 0
        self.queues = 0
        self.lines = 0
        self.closed = False
        self.error: BaseException | None = None

    def line(self, op: str, **fields: Any) -> str:
        """The JSON line for ``fields``, refused before the operation if it is too long."""
        text = json.dumps({"op": op, **fields}, allow_nan=False, separators=(",", ":")) + "\n"
        if len(text) > MAX_LINE:  # ASCII (json escapes the rest): characters are bytes
            raise TraceError(f"{op}: the trace line would be {len(text)} bytes, over the limit of {MAX_LINE}")
        return text

    def open(self, op: str) -> None:
        if self.closed:
            raise TraceError(f"{op}: the trace {self.name!r} is closed")

    def write(self, text: str) -> None:
        """Write one line; a failure is kept and logged once, never raised (the op took effect)."""
        if self.error is not None:
            return
        try:
            self.out.write(text)
            self.out.flush()
        except Exception as exc:  # any failure of the file: the op took effect, keep its result
            self.error = exc
            _log.error(
                "trace %r: write of line %d failed (%s); later operations are not recorded",
                self.name,
                self.lines + 1,
                exc,
            )
            return
        self.lines += 1

    def entry(self, handle: Any) -> int:
        try:
            return self.ids[id(handle)]
        except KeyError:
            raise TypeError(f"trace: {handle!r} was not pushed through a recorder of this trace") from None

    def new_entry(self, handle: Any) -> int:
        n = self.next_id
        self.next_id += 1
        self.ids[id(handle)] = n
        self.live[id(handle)] = handle
        return n

    def forget(self, handle: Any) -> None:
        self.ids.pop(id(handle), None)
        self.live.pop(id(handle), None)

    def close(self) -> None:
        if not self.closed:
            self.closed = True
            self.ids.clear()
            self.live.clear()
            if self.owned:
                self.out.close()
        if self.error is not None:
            raise TraceError(
                f"trace {self.name!r} is incomplete: writing line {self.lines + 1} failed "
                f"({self.error}); the operations after it were not recorded"
            ) from self.error


class Recorder(Generic[K, V]):
    """A heap that writes each operation to a trace; it satisfies the heap protocol.

    >>> import tempfile, os
    >>> from heapkit import PairingHeap
    >>> path = os.path.join(tempfile.mkdtemp(), "t.jsonl")
    >>> with record(PairingHeap(), path) as q:
    ...     h = q.push(3, 'c'); q.decrease_key(h, 1); q.pop()
    (1, 'c')
    >>> len(open(path).read().splitlines())
    3
    """

    def __init__(self, heap: Heap[K, V], trace: _Trace) -> None:
        self.inner: Heap[K, V] = heap
        self._trace = trace
        self.q = trace.queues
        trace.queues += 1

    def sibling(self, heap: Heap[K2, V2]) -> Recorder[K2, V2]:
        """Record another queue into the same trace (so melds between them replay).  O(1)."""
        return Recorder(heap, self._trace)

    @property
    def write_error(self) -> BaseException | None:
        """The exception that stopped the recording, or None while every line was written."""
        return self._trace.error

    def close(self) -> None:
        """Close the trace (siblings share it); ``TraceError`` if a write had failed.  O(1)."""
        self._trace.close()

    def __enter__(self) -> Recorder[K, V]:
        return self

    def __exit__(self, kind: type[BaseException] | None, exc: BaseException | None, tb: TracebackType | None) -> None:
        if exc is None:
            self.close()
            return
        try:  # an error is already on its way: do not replace it
            self.close()
        except TraceError as failure:
            _log.error("%s", failure)

    def push(self, key: K, value: V) -> Handle[K, V]:
        t = self._trace
        t.open("push")
        text = t.line("push", q=self.q, id=t.next_id, key=_json_key(key, "push"))
        h = self.inner.push(key, value)
        t.new_entry(h)
        t.write(text)
        return h

    def extend(self, pairs: Iterable[tuple[K, V]]) -> list[Handle[K, V]]:
        t = self._trace
        t.open("extend")
        pairs = list(pairs)
        keys = [_json_key(k, "extend") for k, _ in pairs]
        text = t.line("extend", q=self.q, ids=list(range(t.next_id, t.next_id + len(pairs))), keys=keys)
        hs = self.inner.extend(pairs)
        for h in hs:
            t.new_entry(h)
        t.write(text)
        return list(hs)

    def peek(self) -> Handle[K, V]:
        return self.inner.peek()

    def pop(self) -> tuple[K, V]:
        t = self._trace
        t.open("pop")
        h = self.inner.peek() if self.inner else None
        key, value = self.inner.pop()
        ident: dict[str, int] = {}
        if not getattr(h, "alive", False):  # the entry peek named is the one popped: name it
            n = t.ids.get(id(h))
            t.forget(h)
            if n is not None:
                ident["id"] = n
        t.write(t.line("pop", q=self.q, **ident, key=_json_key(key, "pop")))
        return key, value

    def decrease_key(self, handle: Handle[K, V], key: K) -> None:
        t = self._trace
        t.open("decrease_key")
        text = t.line("decrease_key", q=self.q, id=t.entry(handle), key=_json_key(key, "decrease_key"))
        self.inner.decrease_key(handle, key)
        t.write(text)

    def change_key(self, handle: Handle[K, V], key: K) -> None:
        t = self._trace
        t.open("change_key")
        text = t.line("change_key", q=self.q, id=t.entry(handle), key=_json_key(key, "change_key"))
        self.inner.change_key(handle, key)
        t.write(text)

    def remove(self, handle: Handle[K, V]) -> tuple[K, V]:
        t = self._trace
        t.open("remove")
        text = t.line("remove", q=self.q, id=t.entry(handle))
        out = self.inner.remove(handle)
        t.forget(handle)
        t.write(text)
        return out

    def meld(self, other: Heap[K, V]) -> None:
        if not isinstance(other, Recorder) or other._trace is not self._trace:
            raise TypeError("meld: record the other queue with recorder.sibling(heap) first")
        self._trace.open("meld")
        self.inner.meld(other.inner)
        self._trace.write(self._trace.line("meld", q=self.q, **{"from": other.q}))

    def clear(self) -> None:
        t = self._trace
        t.open("clear")
        gone = list(self.inner)
        self.inner.clear()
        for h in gone:
            t.forget(h)
        t.write(t.line("clear", q=self.q))

    def __len__(self) -> int:
        return len(self.inner)

    def __bool__(self) -> bool:
        return bool(self.inner)

    def __iter__(self) -> Iterator[Handle[K, V]]:
        return iter(self.inner)

    def __contains__(self, handle: object) -> bool:
        return handle in self.inner


def record(heap: Heap[K, V], path: str | os.PathLike[str] | IO[str], *, mode: str = "w") -> Recorder[K, V]:
    """Wrap ``heap`` so that every operation is written to the JSON Lines file ``path``.

    O(1) extra per operation (one line written and flushed).  ``mode="w"``
    overwrites the file, ``mode="x"`` refuses an existing one; ``path`` may also
    be an open text file (then ``close()`` leaves it open).
    """
    return Recorder(heap, _Trace(path, mode))


def read(path: str | os.PathLike[str]) -> Iterator[tuple[int, dict[str, Any]]]:
    """Each ``(line number, operation)`` of a trace, validated; ``TraceError`` names file and line.

    O(trace) time; memory O(one line + entries).  Keys come back as tuples.

    >>> import tempfile, os
    >>> path = os.path.join(tempfile.mkdtemp(), "t.jsonl")
    >>> _ = open(path, "w").write('{"op":"push","q":0,"id":0,"key":[1,"a"]}\\n')
    >>> list(read(path))
    [(1, {'op': 'push', 'q': 0, 'id': 0, 'key': (1, 'a')})]
    """
    name = os.fspath(path)
    pushed: dict[int, int] = {}  # entry id -> line of its push
    with open(name, "rb") as f:
        lineno = 0
        while raw := f.readline(MAX_LINE + 1):
            lineno += 1
            if len(raw) > MAX_LINE:
                raise TraceError(f"{name}:{lineno}: line longer than the limit of {MAX_LINE} bytes")
            if not raw.strip():
                continue
            try:
                op = _parse(raw, pushed, lineno)
            except ValueError as exc:
                raise TraceError(f"{name}:{lineno}: {exc}") from None
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

    >>> import tempfile, os
    >>> path = os.path.join(tempfile.mkdtemp(), "t.jsonl")
    >>> _ = open(path, "w").write('{"op":"push","q":0,"id":0,"key":2}\\n{"op":"pop","q":0}\\n')
    >>> replay(path, "binary").popped
    [2]
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
                h = q.push(op["key"], op["id"])
                handles[op["id"]] = h
                ids[id(h)] = op["id"]
            elif what == "extend":
                hs = q.extend(zip(op["keys"], op["ids"], strict=True))
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
                q.decrease_key(handle(lineno, op["id"]), op["key"])
            elif what == "change_key":
                q.change_key(handle(lineno, op["id"]), op["key"])
            elif what == "remove":
                q.remove(handle(lineno, op["id"]))
            elif what == "meld":
                q.meld(queue(op["from"]))
            else:
                q.clear()
        except TraceError:
            raise
        except (HeapError, TypeError) as exc:  # TypeError: keys that cannot be compared
            raise TraceError(f"{name}:{lineno}: {what} failed: {exc}", line=lineno, op=what) from exc
        out.operations += 1
        out.counts[what] = out.counts.get(what, 0) + 1
        if each is not None:
            each(op)
    return out
