"""``python -m heapkit replay TRACE``: replay a recorded trace on every kind (or the
named ones), compare them and recommend one; ``--dot PATH`` writes a kind's final shape."""

from __future__ import annotations

import argparse
import sys

import heapkit
from heapkit import trace
from heapkit.commands.compare import as_json, compare, render


def add_parser(sub: argparse._SubParsersAction) -> None:  # type: ignore[type-arg]
    p = sub.add_parser("replay", help="replay a JSON Lines trace on several kinds and compare", description=__doc__)
    p.add_argument("trace", help="the trace file (JSON Lines, one operation per line)")
    p.add_argument("--kinds", nargs="+", choices=sorted(heapkit.KINDS), help="kinds to run (default: all)")
    p.add_argument("--check", action="store_true", help="run the invariant checker during the replay")
    p.add_argument("--audit", action="store_true", help="audit the amortized bounds during the replay")
    p.add_argument("--repeat", type=int, default=3, help="timed replays per kind; the best counts (default 3)")
    p.add_argument("--dot", metavar="PATH", help="write the final shape of the first kind as Graphviz DOT")
    p.add_argument("--json", action="store_true", help="print the results as JSON")
    p.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    kinds = args.kinds or sorted(heapkit.KINDS)
    try:
        for _ in trace.read(args.trace):
            pass
    except (OSError, trace.TraceError) as exc:
        print(f"heapkit replay: {exc}", file=sys.stderr)
        return 2
    rows = compare(args.trace, kinds, check=args.check, audit=args.audit, repeat=args.repeat)
    if args.dot:
        to_dot = getattr(heapkit, "to_dot", None)
        if to_dot is None:
            print("heapkit replay: --dot needs heapkit.to_dot", file=sys.stderr)
            return 2
        out = trace.replay(args.trace, kinds[0])
        with open(args.dot, "w", encoding="utf-8") as f:
            f.write(to_dot(out.queues[min(out.queues)]))
    print(as_json(rows) if args.json else render(rows))
    return 0 if all(r.healthy for r in rows if r.suitable) else 1
