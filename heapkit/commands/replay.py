"""``python -m heapkit replay TRACE``: replay a recorded trace on every kind (or the
named ones), compare them and recommend one; ``--dot PATH`` writes a kind's final shape.

Exit codes: 0 ok; 1 a check or bound failed; 2 bad usage, an unreadable trace, or no
named kind can take the trace (e.g. only ``radix`` on keys that are not monotone integers).
"""

from __future__ import annotations

import argparse
import sys

import heapkit
from heapkit import trace
from heapkit.commands.compare import as_json, compare, exit_code, render


def add_parser(sub: argparse._SubParsersAction) -> None:  # type: ignore[type-arg]
    p = sub.add_parser(
        "replay", help="replay a JSON Lines trace on several kinds and compare", description=__doc__,
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    p.add_argument("trace", help="the trace file (JSON Lines, one operation per line)")
    p.add_argument(
        "--kinds", nargs="+", choices=sorted(heapkit.KINDS), metavar="KIND",
        help=f"kinds to run (default: all): {', '.join(sorted(heapkit.KINDS))}",
    )
    p.add_argument("--check", action="store_true", help="replay in checked mode and compare each pop with the trace")
    p.add_argument("--audit", action="store_true", help="audit the amortized bounds during the replay")
    p.add_argument("--repeat", type=int, default=3, help="timed replays per kind; the best counts (default 3)")
    p.add_argument("--dot", metavar="PATH", help="write the final shape of the first kind as Graphviz DOT")
    p.add_argument("--json", action="store_true", help="print the results as JSON")
    p.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    kinds = args.kinds or sorted(heapkit.KINDS)
    if args.repeat < 1:
        print(f"heapkit replay: --repeat must be at least 1, got {args.repeat}", file=sys.stderr)
        return 2
    try:
        # A plain replay on the default kind: the file is readable and consistent
        # (known entry ids, no pop from an empty queue, keys comparable).
        trace.replay(args.trace, heapkit.DEFAULT, make=lambda k: heapkit.KINDS[k]())
    except (OSError, trace.TraceError, TypeError) as exc:
        print(f"heapkit replay: {exc}", file=sys.stderr)
        return 2
    rows = compare(args.trace, kinds, check=args.check, audit=args.audit, repeat=args.repeat)
    if args.dot:
        out = trace.replay(args.trace, kinds[0], make=lambda k: heapkit.KINDS[k]())
        with open(args.dot, "w", encoding="utf-8") as f:
            f.write(heapkit.to_dot(out.queues[min(out.queues)]))
    print(as_json(rows) if args.json else render(rows))
    code = exit_code(rows)
    if code == 2:
        print("heapkit replay: none of the named kinds can take this trace's keys", file=sys.stderr)
    return code
