"""``python -m heapkit bench``: run the workloads, print a table, optionally save JSON.

Exit codes: 0 done, 1 a kind's result differed from the baseline's, 2 bad usage.
"""

from __future__ import annotations

import argparse
import json
import math
import os
import platform
import statistics
import sys
import time
from collections.abc import Callable, Mapping
from typing import Any

import heapkit
from heapkit.bench import concurrency, measure
from heapkit.bench.workloads import WORKLOADS
from heapkit.commands.options import Output, UsageError, add_kinds, chosen_kinds, fail
from heapkit.commands.recommend import Recommendation, recommend

__all__ = ["SECTIONS", "add_parser", "run", "suggest_default"]

#: Reports beyond the timed workloads; each can be asked for like a workload.
SECTIONS = {
    "comparisons": "key comparisons for n pushes + n pops, per log2(n!)",
    "memory": "bytes per entry (tracemalloc, handles included)",
    "growth": "time per operation as n grows",
    "contracts": "cost of the contract modes on Dijkstra, to a plain heap",
    "concurrency": "heapkit.blocking against queue.PriorityQueue, producer-consumer threads",
}

#: (full, quick) sizes of each section and the scale of the workloads.
SIZES: dict[str, tuple[Any, Any]] = {
    "scale": (1.0, 0.05),
    "repeat": (5, 3),
    "comparisons": (100_000, 10_000),
    "memory": (100_000, 10_000),
    "growth": ([10_000, 100_000, 1_000_000], [1_000, 10_000]),
    "contracts": (0.2, 0.05),
    "contracts-small": (0.01, 0.002),
    "concurrency": (100_000, 5_000),
}


def add_parser(subparsers: Any) -> argparse.ArgumentParser:
    """Add the ``bench`` subcommand to an ``argparse`` subparsers object.

    >>> import argparse
    >>> p = argparse.ArgumentParser(); sub = p.add_subparsers(dest="command")
    >>> _ = add_parser(sub)
    >>> p.parse_args(["bench", "--quick", "--repeat", "2"]).repeat
    2
    """
    names = [*WORKLOADS, *SECTIONS]
    p: argparse.ArgumentParser = subparsers.add_parser(
        "bench",
        help="time every kind against the plain heapq tuple idiom and the docs' idiom",
        description="Time every kind side by side with two heapq baselines -- the plain tuple idiom "
        "(duplicates pushed, stale ones skipped on pop) and the docs' entry-invalidation idiom -- "
        "and report the median ratios kind/baseline per workload (below 1: the kind is faster).",
        epilog="workloads and sections: " + ", ".join(names),
    )
    p.add_argument(
        "--workload",
        action="append",
        metavar="NAME",
        help="a workload or section to run (repeat or comma-separate; default: all)",
    )
    add_kinds(p)
    p.add_argument("--quick", action="store_true", help="small sizes (about 1/20), fewer repetitions")
    p.add_argument("--json", metavar="PATH", help="also write every figure to PATH as JSON")
    p.add_argument("--repeat", type=int, metavar="N", help="repetitions per kind (default 5, quick 3)")
    p.set_defaults(run=run)
    return p


def _progress() -> Callable[[str], None]:
    start = time.perf_counter()
    tty = sys.stderr.isatty()

    def say(msg: str) -> None:
        line = f"[{time.perf_counter() - start:7.1f}s] {msg}"
        if tty:
            sys.stderr.write("\r" + line[:100].ljust(100))
        else:
            sys.stderr.write(line + "\n")
        sys.stderr.flush()

    return say


def _cell(value: float | str | None, width: int, fmt: str = ".2f") -> str:
    if value is None:
        return "-".rjust(width)
    if isinstance(value, str):
        return value.rjust(width)
    return format(value, fmt).rjust(width)


def _ratio(r: float) -> str:
    return f"{r:.2f}x"


def suggestion(results: Mapping[str, Mapping[str, Any]]) -> Recommendation:
    """The shared recommendation rule over the decrease-key workloads: per repetition i,
    a kind's figure is the geometric mean of its i-th ratios over those workloads;
    only kinds that ran all of them correctly compete.

    >>> suggestion({"dijkstra-grid": {"kinds": {"a": {"ratios": [2.0, 2.1, 1.9], "ok": True},
    ...                                         "b": {"ratios": [1.5, 1.4, 1.6], "ok": True}}}}).best
    'b'
    """
    dk = [name for name in results if name in WORKLOADS and WORKLOADS[name].decrease_key]
    per: dict[str, list[list[float]]] = {}
    for name in dk:
        for kind, cell in results[name]["kinds"].items():
            if cell["ok"] and cell["ratios"]:
                per.setdefault(kind, []).append(cell["ratios"])
    samples = {
        k: [statistics.geometric_mean(col) for col in zip(*v, strict=False)]
        for k, v in per.items()
        if len(v) == len(dk)
    }
    return recommend(samples, _ratio)


def suggest_default(results: Mapping[str, Mapping[str, Any]]) -> str | None:
    """The kind :func:`suggestion` recommends, or None (no clear winner).

    >>> suggest_default({})
    """
    return suggestion(results).best


def run(args: argparse.Namespace) -> int:
    """Run the benchmark the arguments ask for; print the report on stdout."""
    out = None
    try:
        wanted = [n for item in (args.workload or []) for n in item.split(",") if n]
        unknown = [n for n in wanted if n not in WORKLOADS and n not in SECTIONS]
        if unknown:
            raise UsageError(f"unknown workload {unknown[0]!r}; choose from " + ", ".join([*WORKLOADS, *SECTIONS]))
        names = chosen_kinds(args.kinds, default=list(heapkit.KINDS))
        if args.repeat is not None and args.repeat < 1:
            raise UsageError(f"--repeat must be at least 1, got {args.repeat}")
        out = Output(args.json, "--json") if args.json else None  # checked before the run
        report = _measure(args, wanted or [*WORKLOADS, *SECTIONS], names)
        print(render(report))
        if out:
            out.commit(json.dumps(_jsonable(report), indent=1))
    except (UsageError, OSError) as exc:
        return fail("bench", exc)
    finally:
        if out:
            out.discard()
    return 1 if report["failed"] else 0


def _measure(args: argparse.Namespace, wanted: list[str], names: list[str]) -> dict[str, Any]:
    """Every figure the arguments ask for, as the report ``render`` prints."""
    q = 1 if args.quick else 0
    repeat = args.repeat or SIZES["repeat"][q]
    kinds = {n: heapkit.KINDS[n] for n in names}
    say = _progress()
    if os.environ.get("HEAPKIT_DEBUG"):
        say("warning: HEAPKIT_DEBUG is set, so heaps are checked or audited; timings include that")
    report: dict[str, Any] = {
        "meta": {
            "python": platform.python_version(),
            "machine": platform.machine(),
            "cpus": os.cpu_count(),
            "quick": bool(args.quick),
            "repeat": repeat,
            "scale": SIZES["scale"][q],
            "kinds": names,
            "clock": "time.process_time, gc paused",
        },
        "workloads": {},
    }
    failed = False
    for name in [n for n in wanted if n in WORKLOADS]:
        w = WORKLOADS[name]
        say(f"{name}: making data")
        data = w.make(SIZES["scale"][q])
        rows = measure.time_workload(w, data, kinds, repeat, say)
        cells = {
            k: {
                "ratio": r.ratio,
                "ok": r.ok,
                "ratios": r.ratios,
                "kind_s": r.kind_s,
                "base_s": r.base_s,
                "tuple_ratio": r.tuple_ratio,
                "tuple_ratios": r.tuple_ratios,
                "tuple_s": r.tuple_s,
            }
            for k, r in rows.items()
        }
        failed = failed or not all(r.ok for r in rows.values())
        base = [t for r in rows.values() for t in r.base_s]
        tup = [t for r in rows.values() for t in r.tuple_s]
        verdict = recommend({k: r.ratios for k, r in rows.items() if r.ok}, _ratio)
        report["workloads"][name] = {
            "what": w.what,
            "baseline_s": statistics.median(base) if base else None,
            "tuple_s": statistics.median(tup) if tup else None,
            "kinds": cells,
            "fastest": verdict.best,
            "verdict": verdict.line,
        }
    if "comparisons" in wanted:
        n = SIZES["comparisons"][q]
        say(f"comparisons: n = {n}")
        counts = measure.comparisons(kinds, n)
        lower = measure.log2_factorial(n)
        report["comparisons"] = {
            "n": n,
            "log2_factorial": lower,
            "counts": counts,
            "per_log2_factorial": {k: c / lower for k, c in counts.items()},
        }
    if "memory" in wanted:
        n = SIZES["memory"][q]
        say(f"memory: n = {n}")
        report["memory"] = {"n": n, "bytes_per_entry": measure.bytes_per_entry(kinds, n)}
    if "growth" in wanted:
        sizes = SIZES["growth"][q]
        report["growth"] = {"sizes": sizes, "ns_per_op": measure.growth(kinds, sizes, say)}
    if "contracts" in wanted:
        w = WORKLOADS["dijkstra-sparse"]
        data = w.make(SIZES["contracts"][q])
        small = w.make(SIZES["contracts-small"][q])
        report["contracts"] = {
            "workload": w.name,
            "scale": SIZES["contracts"][q],
            "small_scale": SIZES["contracts-small"][q],
            "modes": measure.MODES,
            "ratios": measure.modes(kinds, w, data, small, repeat, say),
        }
    if "concurrency" in wanted:
        report["concurrency"] = concurrency.producer_consumer(
            SIZES["concurrency"][q],
            {k: v for k, v in kinds.items() if not getattr(v, "MONOTONE", False)},
            repeat,
            progress=say,
        )
        failed = failed or not all(r["ok"] for r in report["concurrency"]["kinds"].values())
    advice = suggestion(report["workloads"])
    report["suggested_default"], report["suggestion"] = advice.best, advice.line
    report["failed"] = failed
    if sys.stderr.isatty():
        sys.stderr.write("\n")
    return report


def _jsonable(x: Any) -> Any:
    if isinstance(x, float) and not math.isfinite(x):
        return None
    if isinstance(x, dict):
        return {str(k): _jsonable(v) for k, v in x.items()}
    if isinstance(x, list | tuple):
        return [_jsonable(v) for v in x]
    return x


def render(report: Mapping[str, Any]) -> str:
    """The report as text: one table per section, the fastest kind per workload last."""
    meta = report["meta"]
    kinds: list[str] = meta["kinds"]
    size = "quick: sizes x 1/20 of those named" if meta["quick"] else "full sizes"
    out = [
        f"heapkit bench ({size}): python {meta['python']}, {meta['cpus']} cpus; CPU time, gc paused;",
        f"median of {meta['repeat']} ratios per kind (below 1.00: the kind is faster), against two "
        "baselines run side by side:",
        "  tuple idiom: heappush((key, item)) duplicates, stale ones skipped on pop (what users write)",
        "  docs idiom:  the heapq docs' [priority, count, task] entries with an entry finder",
    ]
    wl: Mapping[str, Any] = report["workloads"]
    if wl:
        width = max(7, *(len(k) + 1 for k in kinds))
        for title, col, ratio in (("tuple idiom", "tuple_s", "tuple_ratio"), ("docs idiom", "baseline_s", "ratio")):
            rows = {name: r for name, r in wl.items() if r.get(col) is not None}
            if not rows:
                continue
            out += [
                "",
                f"kind / {title}",
                "workload".ljust(17) + "base s".rjust(9) + "".join(k.rjust(width) for k in kinds) + "  fastest",
            ]
            for name, r in rows.items():
                cells = []
                for k in kinds:
                    c = r["kinds"].get(k)
                    cells.append(_cell(None if c is None else (c[ratio] if c["ok"] else "WRONG"), width))
                out.append(
                    name.ljust(17)
                    + _cell(r[col], 9, ".3f")
                    + "".join(cells)
                    + "  "
                    + (r["fastest"] or "no clear winner")
                )
        out.append("  (- : the kind cannot take these keys; WRONG: result differs from the idiom's;")
        out.append("   the tuple idiom has no table row where it cannot re-prioritise up or cancel)")
        for name, r in wl.items():
            out.append(f"  {name}: {r['what']}")
    if "comparisons" in report:
        c = report["comparisons"]
        out += [
            "",
            f"key comparisons, n = {c['n']} pushes then pops of random keys, per log2(n!) = "
            f"{c['log2_factorial']:.0f} (sorting lower bound, Knuth TAOCP 3, 5.3.1)",
        ]
        out.append("  " + "  ".join(f"{k} {v:.3f}" for k, v in c["per_log2_factorial"].items()))
    if "memory" in report:
        m = report["memory"]
        out += ["", f"bytes per entry, n = {m['n']} (tracemalloc; handles and finder included)"]
        out.append("  " + "  ".join(f"{k} {v:.0f}" for k, v in m["bytes_per_entry"].items()))
    if "growth" in report:
        g = report["growth"]
        sizes = g["sizes"]
        out += ["", "ns per operation, n pushes then n pops of random keys, as n grows"]
        out.append("  " + "kind".ljust(14) + "".join(f"n={n:,}".rjust(14) for n in sizes) + "    last/first")
        for k, vals in g["ns_per_op"].items():
            out.append("  " + k.ljust(14) + "".join(f"{v:14.0f}" for v in vals) + f"{vals[-1] / vals[0]:14.2f}")
    if "contracts" in report:
        c = report["contracts"]
        modes = list(c["modes"])
        out += [
            "",
            f"contract modes on {c['workload']}: time / same kind's plain heap (scale "
            f"{c['scale']}; checked and audited at {c['small_scale']})",
        ]
        out.append("  " + "kind".ljust(14) + "".join(m.rjust(10) for m in modes))
        for k, row in c["ratios"].items():
            out.append("  " + k.ljust(14) + "".join(_cell(row.get(m), 10) for m in modes))
        out += [f"  {m}: {what}" for m, what in c["modes"].items()]
        out.append("  n/a: that feature is not in this heapkit; failed: the mode raised an error")
    if "concurrency" in report:
        out += concurrency.render(report["concurrency"])
    if wl:
        out += [
            "",
            "fastest kind per workload (one rule for demo, replay and bench: the lowest median wins "
            "only if every repeat beat every other kind's; ratios to the docs idiom):",
        ]
        for name, r in wl.items():
            line = f"  {name}: {r['verdict']}"
            f = r["fastest"]
            if f is not None and r["kinds"][f].get("tuple_ratio") is not None:
                line += f" ({r['kinds'][f]['tuple_ratio']:.2f}x the tuple idiom)"
            out.append(line)
        out.append(f"heapkit.DEFAULT, over the decrease-key workloads: {report.get('suggestion', '-')}")
    return "\n".join(out)
