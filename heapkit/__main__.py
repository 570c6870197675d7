"""Command line: ``python -m heapkit {demo,replay,kinds,bench}``.

Exit codes: 0 ok, 1 a check or bound failed, 2 bad usage or a bad input file.
"""

from __future__ import annotations

import argparse
import sys
from collections.abc import Sequence

import heapkit
from heapkit.bench.cli import add_parser as add_bench_parser
from heapkit.commands import demo, kinds, replay


def parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="python -m heapkit",
        description="Addressable priority queues: demo, trace replay across kinds, benchmark.",
        epilog="exit codes: 0 ok, 1 a check or bound failed, 2 bad usage or input",
    )
    p.add_argument("--version", action="version", version=f"heapkit {heapkit.__version__}")
    sub = p.add_subparsers(dest="command", required=True, metavar="COMMAND")
    demo.add_parser(sub)
    replay.add_parser(sub)
    kinds.add_parser(sub)
    add_bench_parser(sub)
    return p


def main(argv: Sequence[str] | None = None) -> int:
    args = parser().parse_args(argv)
    return int(args.run(args))


if __name__ == "__main__":
    sys.exit(main())
