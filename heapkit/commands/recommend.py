"""The one recommendation rule of ``demo``, ``replay`` and ``bench``.

Each candidate has one figure per repetition (seconds, or a ratio to a baseline;
lower is better).  The candidate with the lowest median is recommended only if
its slowest repetition beat the fastest repetition of every other candidate: when
the spread (the range of the repetitions) covers the difference, or a single
repetition shows no spread at all, the verdict is "no clear winner".  Nothing
measured, nothing recommended.
"""

from __future__ import annotations

import statistics
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass

__all__ = ["Recommendation", "recommend"]


@dataclass(frozen=True)
class Recommendation:
    """``best``: the recommended candidate or None; ``line``: the verdict with its evidence."""

    best: str | None
    line: str


def _said(name: str, xs: Sequence[float], fmt: Callable[[float], str]) -> str:
    return f"{name} {fmt(statistics.median(xs))} (range {fmt(min(xs))} to {fmt(max(xs))})"


def recommend(samples: Mapping[str, Sequence[float]], fmt: Callable[[float], str] = "{:.3g}".format) -> Recommendation:
    """Apply the rule to each candidate's repetitions.  O(total samples log).

    >>> recommend({"a": [1.0, 1.1, 1.2], "b": [1.5, 1.6, 1.7]}).best
    'a'
    >>> recommend({"a": [1.0, 1.4, 1.2], "b": [1.3, 1.6, 1.7]}).line
    'no clear winner: a 1.2 (range 1 to 1.4) and b 1.6 (range 1.3 to 1.7) overlap (medians of 3 repeats)'
    >>> recommend({}).line
    'no recommendation: nothing was measured'
    """
    cands = {k: list(v) for k, v in samples.items() if v}
    if not cands:
        return Recommendation(None, "no recommendation: nothing was measured")
    ranked = sorted(cands, key=lambda k: statistics.median(cands[k]))
    best = ranked[0]
    if len(ranked) == 1:
        return Recommendation(best, f"recommended: {best} (the only candidate)")
    repeats = min(len(v) for v in cands.values())
    if repeats < 2:
        return Recommendation(
            None,
            f"no clear winner: one repeat shows no spread (lowest: "
            f"{_said(best, cands[best], fmt)}); use 3 or more repeats",
        )
    close = [k for k in ranked[1:] if min(cands[k]) <= max(cands[best])]
    if close:
        names = " and ".join(_said(k, cands[k], fmt) for k in [best, *close[:2]])
        more = f" (and {len(close) - 2} more)" if len(close) > 2 else ""
        return Recommendation(None, f"no clear winner: {names}{more} overlap (medians of {repeats} repeats)")
    nxt = ranked[1]
    return Recommendation(
        best,
        f"recommended: {_said(best, cands[best], fmt)}, every repeat ahead of the next, "
        f"{_said(nxt, cands[nxt], fmt)} (medians of {repeats} repeats)",
    )
