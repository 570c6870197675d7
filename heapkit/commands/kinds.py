"""``python -m heapkit kinds``: each kind with its bounds, one line each, then which build runs."""

from __future__ import annotations

import argparse

import heapkit
from heapkit.commands.options import plain


def add_parser(sub: argparse._SubParsersAction) -> None:  # type: ignore[type-arg]
    p = sub.add_parser("kinds", help="list the heap kinds and their bounds", description=plain(__doc__))
    p.set_defaults(run=run)


def describe(name: str) -> str:
    cls = heapkit.KINDS[name]
    bounds = getattr(cls, "BOUNDS", "") or (cls.__doc__ or "").strip().splitlines()[0]
    star = " (default)" if name == heapkit.DEFAULT else ""
    return f"{name + star:<24}{cls.__name__:<18}{bounds}"


def run(args: argparse.Namespace) -> int:
    for name in sorted(heapkit.KINDS):
        print(describe(name))
    print(f"compiled: {heapkit.COMPILED}")
    return 0
