"""Discrete-event simulation of one checkout at the invented Copperfield market:
customers arrive at random (rate λ), one clerk serves them (rate μ).  The event list is
a heap of (time, event).  The mean wait in line is compared with the M/M/1 formula."""

from __future__ import annotations

import random
from collections import deque
from typing import Any

import heapkit


def simulate(lam: float, mu: float, customers: int, seed: int = 1, kind: str = heapkit.DEFAULT) -> float:
    """Mean time a customer waits before service (FIFO, one server)."""
    rng = random.Random(seed)
    events: Any = heapkit.new(kind, stable=True)
    events.push(rng.expovariate(lam), "arrive")
    line: deque[float] = deque()
    busy = False
    served = 0
    arrived = 0
    waited = 0.0
    while served < customers:
        now, what = events.pop()
        if what == "arrive":
            arrived += 1
            if arrived < customers:
                events.push(now + rng.expovariate(lam), "arrive")
            if busy:
                line.append(now)
            else:
                busy = True
                events.push(now + rng.expovariate(mu), "leave")
        else:
            served += 1
            if line:
                waited += now - line.popleft()
                events.push(now + rng.expovariate(mu), "leave")
            else:
                busy = False
    return waited / customers


def mm1_wait(lam: float, mu: float) -> float:
    """Mean wait in queue of an M/M/1 queue: Wq = ρ/(μ−λ) with ρ = λ/μ."""
    rho = lam / mu
    return rho / (mu - lam)


def main() -> None:
    lam, mu = 0.8, 1.0
    print(
        f"Copperfield checkout: simulated wait {simulate(lam, mu, 50_000):.2f} min, "
        f"M/M/1 formula {mm1_wait(lam, mu):.2f} min"
    )


if __name__ == "__main__":
    main()
