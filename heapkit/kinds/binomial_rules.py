"""The binomial heap's rules, potential and costs (the checker's and auditor's SPI).

Kept beside :mod:`heapkit.kinds.binomial` (whose docstring states the
invariants and derives the bounds) so that each module stays small; this one
holds only what ``heapkit.check``, checked mode and the auditor ask of the kind.
Every walk is a loop with an explicit stack.
"""

from __future__ import annotations

from collections.abc import Iterator
from typing import Any, ClassVar

from heapkit._core import HandleBase, seen_path
from heapkit.kinds.binomial_forest import _ancestors, _up

__all__ = ["BinomialRules"]


def _lg(n: int) -> int:
    """floor(log2 n), and 0 for n < 2."""
    return max(0, n.bit_length() - 1)


class BinomialRules:
    """Mixin of :class:`heapkit.kinds.binomial.BinomialHeap`: survey, audit SPI."""

    __slots__ = ()

    def _layout_problem(self, handles: list[Any], layout: Any) -> str | None:
        """Loading: distinct root degrees whose trees (2**d nodes) hold every handle,
        and the min's index at a root.  O(number of roots)."""
        if type(layout) is not tuple or len(layout) != 2:
            return f"expected (root degrees, min index), got {layout!r:.80}"
        degs, at = layout
        n = len(handles)
        if type(degs) is not list or any(type(d) is not int or not 0 <= d < 64 for d in degs):
            return f"root degrees {degs!r:.80} are not ints in 0..63"
        if len(set(degs)) != len(degs) or sum(1 << d for d in degs) != n:
            return f"root degrees {degs!r:.80} do not make {n} nodes of distinct degrees"
        starts = {0}
        pos = 0
        for d in degs:
            pos += 1 << d
            starts.add(pos)
        if (n and (type(at) is not int or at == n or at not in starts)) or (not n and at != -1):
            return f"min index {at!r:.40} is not the index of a root"
        return None

    RULES: ClassVar[dict[str, str]] = {
        "heap-order": "no child is smaller than its parent",
        "binomial-shape": "a degree-k node has children of degrees k-1..0 in order; "
        "a degree-k tree has 2**k nodes",
        "root-degrees": "roots[d] is None or a root of degree d (distinct, increasing); "
        "the array ends in None",
        "links": "prev/next/child links agree; roots have no siblings; no node is reachable twice",
        "min": "the min pointer is a root and no root is smaller",
        "size": "the trees hold len(heap) nodes",
        "ownership": "every node's owner token resolves to this heap's",
    }

    _roots: list[Any]
    _min: Any
    _n: int

    # --- paths -------------------------------------------------------------
    def _path_of(self, x: Any) -> list[str]:
        """Steps from a root to x, by walking up the links (bounded)."""
        steps: list[str] = []
        guard = self._n + 1
        while x is not None and len(steps) <= guard:
            p, i = _up(x, guard)
            steps.append(f"root of degree {x._deg}" if p is None else f"child {i}")
            x = p
        steps.reverse()
        return steps

    _path = staticmethod(seen_path)

    # --- full survey ---------------------------------------------------------
    def _survey(self, report: Any) -> dict[str, Any]:
        roots = self._roots
        n = self._n
        self._survey_roots(report)
        seen: dict[int, tuple[Any, str]] = {}

        def path(y: Any) -> list[str]:
            return self._path(y, seen)

        count = trees = height = max_degree = 0
        for d, r in enumerate(roots):
            if r is None:
                continue
            trees += 1
            seen[id(r)] = (None, f"root of degree {d}")
            size = 0
            stack: list[tuple[Any, int]] = [(r, 0)]
            while stack:
                x, depth = stack.pop()
                size += 1
                height = max(height, depth)
                max_degree = max(max_degree, x._deg)
                if x not in self:  # type: ignore[operator]
                    report.fail("ownership", x, path(x), "its owner token is not this heap's")
                for c in self._family_check(report, x, path, seen):
                    stack.append((c, depth + 1))
            count += size
            if size != 1 << r._deg:
                report.fail(
                    "binomial-shape", r, path(r),
                    f"a tree of degree {r._deg} holds {size} nodes, not {1 << r._deg}",
                )
        if count != n:
            report.fail("size", None, [], f"the trees hold {count} nodes but len is {n}")
        return {
            "size": count,
            "roots": trees,
            "height": height,
            "max_degree": max_degree,
            "marked": None,
            "potential": float(trees),
        }

    # Checks x's child list (links, degrees, heap order) and returns the
    # children; ``seen`` (when given) records each child once and refuses twice.
    def _family_check(
        self, report: Any, x: Any, path: Any, seen: dict[int, tuple[Any, str]] | None
    ) -> list[Any]:
        kids: list[Any] = []
        deg = x._deg
        prev = x
        c = x._child
        while c is not None:
            i = len(kids)
            if seen is not None:
                if id(c) in seen:
                    report.fail("links", c, path(x), f"child {i} is reachable twice")
                    break
                seen[id(c)] = (x, f"child {i}")
            if i >= deg:
                report.fail("binomial-shape", x, path(x), f"more children than its degree {deg}")
                break
            if c._prev is not prev:
                report.fail("links", c, path(c), "prev does not point back to its left sibling or parent")
            if c._deg != deg - 1 - i:
                report.fail(
                    "binomial-shape", c, path(c),
                    f"child {i} of a degree-{deg} node has degree {c._deg}, not {deg - 1 - i}",
                )
            if c._k < x._k:
                report.fail(
                    "heap-order", c, path(c), f"key {c._key!r} is smaller than its parent's {x._key!r}"
                )
            kids.append(c)
            prev = c
            c = c._next
        if len(kids) < deg and (c is None):
            report.fail("binomial-shape", x, path(x), f"{len(kids)} children but degree {deg}")
        return kids

    # The root array, the min pointer and the size count: O(log n).
    def _survey_roots(self, report: Any) -> None:
        roots = self._roots
        if not roots or roots[-1] is not None:
            report.fail("root-degrees", None, [], "the root array does not end in an empty slot")
        total = 0
        for d, r in enumerate(roots):
            if r is None:
                continue
            total += 1 << r._deg
            where = [f"root of degree {d}"]
            if r._deg != d:
                report.fail("root-degrees", r, where, f"the root in slot {d} has degree {r._deg}")
            if r._prev is not None or r._next is not None:
                report.fail("links", r, where, "a root has a sibling or parent link")
        if total != self._n:
            report.fail("size", None, [], f"the root degrees add up to {total} nodes but len is {self._n}")
        mn = self._min
        if mn is None:
            if self._n:
                report.fail("min", None, [], "the heap is not empty but has no min pointer")
            return
        d = mn._deg
        if not (0 <= d < len(roots) and roots[d] is mn):
            report.fail("min", mn, self._path_of(mn), "the min pointer is not a root")
            return
        for r in roots:
            if r is not None and r._k < mn._k:
                report.fail(
                    "min", r, [f"root of degree {r._deg}"],
                    f"key {r._key!r} is smaller than the min pointer's {mn._key!r}",
                )

    # --- incremental checking --------------------------------------------------
    def _touched(self, op: str, handle: Any) -> list[Any]:
        """The handle (for key changes and removals) and the min: cheap, O(1)."""
        out = [] if self._min is None else [self._min]
        if isinstance(handle, HandleBase) and handle._tok is not None and handle in self:  # type: ignore[operator]
            out.append(handle)
        return out

    def _survey_local(self, report: Any, touched: Any, handle: Any) -> None:
        """Roots, min and size (O(log n)), then the child lists along the root
        path of each touched node still here and of the new handle: O(log^2 n)."""
        self._survey_roots(report)
        nodes = [r for r in self._roots if r is not None]
        for x in [*touched, handle]:
            if not isinstance(x, HandleBase) or x._tok is None:
                continue  # dead (popped, removed), or not a node (meld's other heap)
            self._link_check(report, x)
            guard = self._n + 1
            while x is not None and guard:
                nodes.append(x)
                x = _up(x, guard)[0]
                guard -= 1
        done: set[int] = set()
        for x in nodes:
            if id(x) in done:
                continue
            done.add(id(x))
            if x not in self:  # type: ignore[operator]
                report.fail("ownership", x, self._path_of(x), "its owner token is not this heap's")
            self._family_check(report, x, self._path_of, None)

    def _link_check(self, report: Any, x: Any) -> None:
        """Every link of x has its partner pointing back."""
        p, n, c = x._prev, x._next, x._child
        if p is not None and p._child is not x and p._next is not x:
            report.fail("links", x, self._path_of(x), "its prev does not point back to it")
        if n is not None and n._prev is not x:
            report.fail("links", x, self._path_of(x), "its right sibling's prev does not point back")
        if c is not None and c._prev is not x:
            report.fail("links", x, self._path_of(x), "its leftmost child's prev does not point back")

    # --- to_dot ------------------------------------------------------------------
    def _dot_edges(self) -> Iterator[tuple[Any, Any, str]]:
        """``(parent or None, node, "degree d")``: each tree in preorder, roots
        by increasing degree.  Lazy, O(1) per node (a stack of sibling
        positions), so ``to_dot``'s limit bounds the work."""
        stack: list[tuple[Any, Any]] = [(None, r) for r in reversed(self._roots) if r is not None]
        while stack:
            parent, x = stack.pop()
            yield parent, x, f"degree {x._deg}"
            if parent is not None and x._next is not None:
                stack.append((parent, x._next))
            if x._child is not None:
                stack.append((x, x._child))

    # --- audit -------------------------------------------------------------------
    def _phi(self) -> float:
        """Number of trees: O(log n)."""
        return float(sum(1 for r in self._roots if r is not None))

    def _depth_root(self, x: Any) -> tuple[int, int]:
        """(depth of x, degree of its tree's root)."""
        up = _ancestors(x, self._n)
        return len(up), (up[-1] if up else x)._deg

    def _cost_probe(self, op: str, handle: Any) -> Any:
        phi = int(self._phi())
        if op == "pop":
            return (phi, 0 if self._min is None else self._min._deg)
        if op in ("decrease_key", "change_key", "remove"):
            depth, top = self._depth_root(handle)
            return (phi, depth, top, handle is self._min, self._raised)  # type: ignore[attr-defined]
        if op == "meld":
            return (phi, int(handle._phi()))
        return (phi,)

    def _cost(self, op: str, probe: Any, handle: Any) -> int:
        after = int(self._phi())
        before: int = probe[0]
        if op == "push":
            return (before + 1 - after) + 1  # links + 1
        if op == "pop":
            deg: int = probe[1]
            return (before - 1 + deg - after) + after + 1  # links + roots scanned + 1
        if op == "meld":
            other: int = probe[1]
            return (before + other - after) + 1
        if len(probe) < 5:
            return 1  # an operation without a cost model here (none of the six above)
        depth: int = probe[1]
        top: int = probe[2]
        was_min, raised = probe[3], probe[4]
        if op == "remove":
            links = before - 1 + top - after
            return depth + links + (after if was_min else 0) + 1
        if op == "change_key" and self._raised != raised:  # type: ignore[attr-defined]
            links = before + top - after
            return depth + links + (after if was_min else 0) + 1
        return depth - self._depth_root(handle)[0] + 1  # levels moved + 1

    @classmethod
    def _bound(cls, op: str, n: int) -> float:
        """The amortized bounds derived in the binomial module's docstring."""
        lg = _lg(n)
        return {
            "push": 2,
            "pop": 2 * lg + 1,
            "decrease_key": lg + 1,
            "change_key": 3 * lg + 2,
            "remove": 3 * lg + 1,
            "meld": lg + 2,
        }.get(op, lg + 1)
