"""``python -m heapkit demo``: the whole job on an invented scenario, on every kind.

Errors are one line, prefixed "heapkit demo:", with exit code 2.
"""

from __future__ import annotations

import argparse
import os
import sys
import tempfile

from heapkit.commands.compare import as_json, compare, exit_code, render
from heapkit.commands.options import Output, UsageError, add_kinds, chosen_kinds, fail, plain
from heapkit.commands.scenario import record_scenario, tell

#: The most parcel jobs the demo takes (about 3 minutes of replays on a small machine).
MAX_JOBS = 200_000


def add_parser(sub: argparse._SubParsersAction) -> None:  # type: ignore[type-arg]
    p = sub.add_parser(
        "demo",
        help="dispatch parcels in an invented town on every kind, with checks and the audit on",
        description=plain(__doc__),
    )
    add_kinds(p)
    p.add_argument(
        "--jobs", type=int, default=4000, help=f"parcel jobs in the scenario, 1 to {MAX_JOBS} (default 4000)"
    )
    p.add_argument("--json", action="store_true", help="print the results as JSON")
    p.add_argument(
        "--keep", metavar="PATH", help="also keep the scenario's trace at PATH (a regular file or a new one)"
    )
    p.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    keep = None
    try:
        kinds = chosen_kinds(args.kinds)
        if not 1 <= args.jobs <= MAX_JOBS:
            raise UsageError(f"--jobs must be between 1 and {MAX_JOBS}, got {args.jobs}")
        keep = Output(args.keep, "--keep") if args.keep else None  # checked before the run
        with tempfile.TemporaryDirectory() as tmp:
            path = keep.tmp if keep else os.path.join(tmp, "brackenford.jsonl")
            print("recording the scenario ...", file=sys.stderr, flush=True)
            story = record_scenario(path, jobs=args.jobs)
            if keep:
                keep.commit()
                path = keep.target
            rows = compare(path, kinds)
    except (UsageError, OSError) as exc:
        return fail("demo", exc)
    finally:
        if keep:
            keep.discard()
    if args.json:
        print(as_json(rows))
    else:
        print(tell(story))
        print()
        print(render(rows))
    return exit_code(rows)
