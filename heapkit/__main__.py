"""Command line: ``python -m heapkit demo``."""

from __future__ import annotations

import argparse
import itertools
import random
import sys
import time
from collections.abc import Sequence
from typing import Any

import heapkit
from heapkit.bench.cli import add_parser as add_bench_parser


def _demo(args: argparse.Namespace) -> int:
    """Push an invented dispatch workload through every kind and print a table."""
    rng = random.Random(7)
    jobs = [(rng.uniform(0, 100), f"job-{i}") for i in range(2000)]
    print(f"{'kind':<14}{'pops':>8}{'seconds':>10}  check")
    for name in sorted(heapkit.KINDS):
        heap: Any = heapkit.new(name)
        t0 = time.perf_counter()
        handles = [heap.push(k, v) for k, v in jobs]
        for h in handles[::5]:
            heap.decrease_key(h, h.key / 2)
        for h in handles[1::9]:
            heap.remove(h)
        shape = heapkit.check(heap)
        popped = [heap.pop() for _ in range(len(heap))]
        dt = time.perf_counter() - t0
        ordered = all(not (b[0] < a[0]) for a, b in itertools.pairwise(popped))
        print(f"{name:<14}{len(popped):>8}{dt:>10.4f}  {'ok' if ordered else 'OUT OF ORDER'} "
              f"({shape.size} entries checked)")
    return 0


def main(argv: Sequence[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="heapkit", description=heapkit.__doc__)
    sub = parser.add_subparsers(dest="command", required=True)
    demo = sub.add_parser("demo", help="run an invented dispatch workload through every kind")
    demo.set_defaults(run=_demo)
    add_bench_parser(sub)
    args = parser.parse_args(argv)
    return int(args.run(args))


if __name__ == "__main__":
    sys.exit(main())
