"""Best-first branch-and-bound for the 0/1 knapsack: packing the invented Hobbledown
expedition's mule.  Nodes are ordered by their optimistic bound (largest first: keys are
negated); when a better packing is found, nodes whose bound cannot beat it are pruned
from the queue with `remove`."""

from __future__ import annotations

import itertools
import random
from typing import Any

import heapkit


def bound(items: list[tuple[int, int]], i: int, weight: int, value: int, cap: int) -> float:
    """Fractional relaxation: the best value reachable from item i on (items by ratio)."""
    for w, v in items[i:]:
        if weight + w <= cap:
            weight += w
            value += v
        else:
            return value + v * (cap - weight) / w
    return float(value)


def best_first(items: list[tuple[int, int]], cap: int, kind: str = heapkit.DEFAULT) -> tuple[int, int]:
    """(best value, nodes pruned by remove).  Items are (weight, value)."""
    items = sorted(items, key=lambda wv: wv[1] / wv[0], reverse=True)
    q: Any = heapkit.new(kind)
    open_nodes: list[Any] = [q.push(-bound(items, 0, 0, 0, cap), (0, 0, 0))]
    best = 0
    pruned = 0
    while q:
        negb, (i, weight, value) = q.pop()
        if -negb <= best or i == len(items):
            continue
        w, v = items[i]
        children = [(i + 1, weight, value)]
        if weight + w <= cap:
            children.append((i + 1, weight + w, value + v))
        for node in children:
            if node[2] > best:
                best = node[2]
                keep = []
                for h in open_nodes:
                    if h.alive and -h.key <= best:
                        q.remove(h)
                        pruned += 1
                    elif h.alive:
                        keep.append(h)
                open_nodes = keep
            b = bound(items, *node, cap)
            if b > best:
                open_nodes.append(q.push(-b, node))
    return best, pruned


def exhaustive(items: list[tuple[int, int]], cap: int) -> int:
    """Try every subset."""
    best = 0
    for mask in itertools.product((0, 1), repeat=len(items)):
        w = sum(it[0] for it, m in zip(items, mask, strict=True) if m)
        if w <= cap:
            best = max(best, sum(it[1] for it, m in zip(items, mask, strict=True) if m))
    return best


def gear(n: int, seed: int) -> list[tuple[int, int]]:
    rng = random.Random(seed)
    return [(rng.randint(1, 30), rng.randint(1, 60)) for _ in range(n)]


def main() -> None:
    items = gear(16, 4)
    value, pruned = best_first(items, 80)
    print(f"Hobbledown mule: best load worth {value}; {pruned} open nodes pruned")


if __name__ == "__main__":
    main()
