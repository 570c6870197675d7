"""``python -m heapkit demo``: the whole job on an invented scenario, on every kind."""

from __future__ import annotations

import argparse
import os
import sys
import tempfile

import heapkit
from heapkit.commands.compare import as_json, compare, exit_code, render
from heapkit.commands.scenario import record_scenario, tell


def add_parser(sub: argparse._SubParsersAction) -> None:  # type: ignore[type-arg]
    p = sub.add_parser(
        "demo",
        help="dispatch parcels in an invented town on every kind, with checks and the audit on",
        description=__doc__,
    )
    p.add_argument(
        "--kinds", nargs="+", choices=sorted(heapkit.KINDS), metavar="KIND",
        help=f"kinds to run (default: all): {', '.join(sorted(heapkit.KINDS))}",
    )
    p.add_argument("--jobs", type=int, default=4000, help="parcel jobs in the scenario (default 4000)")
    p.add_argument("--json", action="store_true", help="print the results as JSON")
    p.add_argument("--keep", metavar="PATH", help="also keep the scenario's trace at PATH")
    p.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    kinds = args.kinds or sorted(heapkit.KINDS)
    with tempfile.TemporaryDirectory() as tmp:
        path = args.keep or os.path.join(tmp, "brackenford.jsonl")
        if args.keep and os.path.exists(path):
            os.remove(path)
        print("recording the scenario ...", file=sys.stderr, flush=True)
        story = record_scenario(path, jobs=args.jobs)
        rows = compare(path, kinds)
    if args.json:
        print(as_json(rows))
    else:
        print(tell(story))
        print()
        print(render(rows))
    return exit_code(rows)
