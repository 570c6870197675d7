"""``to_dot``: a heap's shape as Graphviz DOT text, for debugging."""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any

__all__ = ["to_dot"]

#: How many characters of a key's ``repr`` a node shows.
KEY_CHARS = 40


def _quote(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"').replace("\n", "\\n") + '"'


def _short(obj: Any) -> str:
    try:
        text = repr(obj)
    except Exception as exc:  # a broken user __repr__ must not stop the drawing
        text = f"<repr failed: {type(exc).__name__}>"
    return text if len(text) <= KEY_CHARS else text[: KEY_CHARS - 1] + "…"


def to_dot(heap: Any, *, limit: int = 200) -> str:
    """The heap as Graphviz DOT text: one node per entry, labelled with its key.

    Kinds with the ``_dot_edges`` hook draw their trees (degree, marks or rank
    in the label where the kind has them); other queues are drawn as loose
    entries.  At most ``limit`` entries are drawn; a note in the graph says
    when it is cut short.  Iterative; O(limit) plus what the kind spends
    reaching that many entries.

    >>> from heapkit import PairingHeap
    >>> print(to_dot(PairingHeap([(2, 'b'), (1, 'a')])))
    digraph heap {
      label="PairingHeap, 2 entries";
      node [shape=box];
      n0 [label="1\\ndegree 1"];
      n1 [label="2\\ndegree 0"];
      n0 -> n1;
    }
    """
    if not isinstance(limit, int) or isinstance(limit, bool) or limit < 1:
        raise ValueError(f"to_dot: limit must be an integer of at least 1, got {limit!r}")
    total = len(heap)
    hook = getattr(heap, "_dot_edges", None)
    source: Iterable[tuple[Any, Any, str]]
    if callable(hook):
        source = hook()
    else:
        source = ((None, h, "") for h in heap)
    title = f"{type(heap).__name__}, {total} entries"
    if not callable(hook):
        title += " (no tree drawn for this queue)"
    lines = ["digraph heap {", f"  label={_quote(title)};", "  node [shape=box];"]
    names: dict[int, str] = {}
    shown = 0
    for parent, node, extra in source:
        if shown == limit:
            break
        name = f"n{shown}"
        names[id(node)] = name
        shown += 1
        label = _short(node.key) + (f"\n{extra}" if extra else "")
        lines.append(f"  {name} [label={_quote(label)}];")
        if parent is not None and id(parent) in names:
            lines.append(f"  {names[id(parent)]} -> {name};")
    if shown < total:
        note = f"truncated: {shown} of {total} entries drawn (limit {limit})"
        lines.append(f"  // {note}")
        lines.append(f"  truncated [shape=note, label={_quote(note)}];")
    lines.append("}")
    return "\n".join(lines)
