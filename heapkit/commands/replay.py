"""``python -m heapkit replay TRACE``: replay a recorded trace on every kind (or the
named ones), compare them and recommend one; ``--dot PATH`` writes a kind's final shape.

Exit codes: 0 ok; 1 a check or bound failed; 2 bad usage, an unreadable or empty
trace, an output path that cannot be written, or no named kind can take the trace
(e.g. only radix on keys that are not monotone integers).  Errors are one line,
prefixed "heapkit replay:".
"""

from __future__ import annotations

import argparse
from typing import Any

import heapkit
from heapkit import trace
from heapkit.commands.compare import as_json, compare, exit_code, render
from heapkit.commands.options import Output, UsageError, add_kinds, chosen_kinds, fail, plain


def add_parser(sub: argparse._SubParsersAction) -> None:  # type: ignore[type-arg]
    p = sub.add_parser(
        "replay",
        help="replay a JSON Lines trace on several kinds and compare",
        description=plain(__doc__),
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("trace", help="the trace file (JSON Lines, one operation per line; a pipe works too)")
    add_kinds(p)
    p.add_argument("--check", action="store_true", help="replay in checked mode and compare each pop with the trace")
    p.add_argument("--audit", action="store_true", help="audit the amortized bounds during the replay")
    p.add_argument("--repeat", type=int, default=3, help="timed replays per kind (default 3)")
    p.add_argument(
        "--dot",
        metavar="PATH",
        help="write the final shape (first queue, first named kind that can replay it) as Graphviz DOT",
    )
    p.add_argument("--json", action="store_true", help="print the results as JSON")
    p.set_defaults(run=run)


def _dot(path: str, kinds: list[str], ops: list[tuple[int, dict[str, Any]]]) -> str:
    """The final shape of the first queue, on the first named kind that can replay the trace."""
    for kind in kinds:
        try:
            out = trace.replay(path, kind, make=lambda k: heapkit.KINDS[k](), ops=ops)
        except (trace.TraceError, TypeError):
            continue
        return heapkit.to_dot(out.queues[min(out.queues)])
    raise UsageError("--dot: none of the named kinds could replay the trace")


def run(args: argparse.Namespace) -> int:
    dot = None
    try:
        kinds = chosen_kinds(args.kinds)
        if args.repeat < 1:
            raise UsageError(f"--repeat must be at least 1, got {args.repeat}")
        dot = Output(args.dot, "--dot") if args.dot else None  # checked before the run
        ops = list(trace.read(args.trace))  # read once: a pipe cannot be read twice
        if not ops:
            raise UsageError(f"{args.trace}: the trace holds no operations; nothing to compare or draw")
        # A plain replay on the default kind: the trace is consistent (known entry
        # ids, no pop from an empty queue, keys comparable).
        trace.replay(args.trace, heapkit.DEFAULT, make=lambda k: heapkit.KINDS[k](), ops=ops)
        rows = compare(args.trace, kinds, check=args.check, audit=args.audit, repeat=args.repeat, ops=ops)
        if dot:
            dot.commit(_dot(args.trace, kinds, ops))
    except (OSError, UsageError, trace.TraceError, TypeError) as exc:
        return fail("replay", exc)
    finally:
        if dot:
            dot.discard()
    print(as_json(rows) if args.json else render(rows))
    code = exit_code(rows)
    if code == 2:
        fail("replay", "none of the named kinds can take this trace's keys")
    return code
