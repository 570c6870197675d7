"""The README's code and the API docs: the first snippet type-checks, the heapq-to-heapkit
loops agree with outside references, the public names table covers ``heapkit.__all__``, the
protocol members and ``new`` are documented."""

from __future__ import annotations

import random
import re
import subprocess
import sys
from pathlib import Path
from typing import Any

import networkx as nx
import pytest

import heapkit

ROOT = Path(__file__).resolve().parent.parent
README = (ROOT / "README.md").read_text()


def _blocks(text: str) -> list[str]:
    return re.findall(r"```python\n(.*?)```", text, flags=re.S)


def _section(title: str) -> str:
    start = README.index(f"## {title}")
    end = README.find("\n## ", start + 3)
    return README[start:end]


def test_first_snippet_type_checks_with_mypy(tmp_path: Path) -> None:
    pytest.importorskip("mypy")
    first = _blocks(README)[0]
    (tmp_path / "first.py").write_text(first)
    run = subprocess.run(
        [sys.executable, "-m", "mypy", "--strict", "--cache-dir", str(ROOT / ".mypy_cache"), "first.py"],
        cwd=tmp_path,
        capture_output=True,
        text=True,
        timeout=300,
    )
    assert run.returncode == 0, run.stdout + run.stderr


def _run(code: str) -> dict[str, Any]:
    scope: dict[str, Any] = {}
    exec(compile(code, "<README>", "exec"), scope)
    return scope


def test_dijkstra_before_and_after_agree_with_networkx() -> None:
    d_before, d_after, *_ = _blocks(_section("From a plain `heapq` loop to heapkit"))
    before = _run(d_before)["shortest_before"]
    after = _run(d_after)["shortest_after"]
    rng = random.Random(13)
    g = nx.gnm_random_graph(300, 1500, seed=13, directed=True)
    graph: dict[str, list[tuple[str, float]]] = {f"n{u}": [] for u in g.nodes}
    for u, v in g.edges:
        w = rng.random()
        g[u][v]["weight"] = w
        graph[f"n{u}"].append((f"n{v}", w))
    want = {f"n{k}": d for k, d in nx.single_source_dijkstra_path_length(g, 0).items()}  # networkx reference
    for found in (before(graph, "n0"), after(graph, "n0")):
        assert found.keys() == want.keys()
        assert all(found[k] == pytest.approx(want[k]) for k in want)


def test_job_queue_before_and_after_agree_with_sorted() -> None:
    *_, j_before, j_after = _blocks(_section("From a plain `heapq` loop to heapkit"))
    rng = random.Random(5)
    names = [f"job {i}" for i in range(200)]
    plan = [(n, rng.randrange(50)) for n in names]
    cancelled = set(rng.sample(names, 40))
    results = []
    for code in (j_before, j_after):
        api = _run(code)
        for name, priority in plan:
            api["submit"](name, priority)
        for name in cancelled:
            api["cancel"](name)
        out = [api["next_job"]() for _ in range(len(names) - len(cancelled))]
        with pytest.raises(IndexError):
            api["next_job"]()
        results.append(out)
    # reference: sorted() by (priority, arrival), the cancelled ones left out
    want = [n for n, _ in sorted((p for p in plan if p[0] not in cancelled), key=lambda p: p[1])]
    assert results == [want, want]


def test_public_names_table_covers_everything_exported() -> None:
    table = _section("Public names")
    for name in heapkit.__all__:
        assert re.search(rf"`{name}[`(]", table), f"{name} missing from the README's public names table"


def test_protocol_members_have_docstrings_and_no_missing_file() -> None:
    for proto in (heapkit.Heap, heapkit.Handle):
        members = [n for n, v in vars(proto).items() if callable(v) or isinstance(v, property)]
        members = [
            n for n in members if not n.startswith("_") or n in ("__len__", "__bool__", "__iter__", "__contains__")
        ]
        assert len(members) >= (13 if proto is heapkit.Heap else 3)
        for name in members:
            doc = getattr(proto, name).__doc__
            assert doc and doc.strip(), f"{proto.__name__}.{name} has no docstring"
        assert "api.md" not in (proto.__doc__ or "")  # it pointed to a file not in the package


def test_new_lists_every_kind_and_option() -> None:
    doc = heapkit.new.__doc__ or ""
    for kind in heapkit.KINDS:
        assert f"``{kind}``" in doc, kind
    assert "stable" in doc and "arity" in doc
