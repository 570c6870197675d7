"""``Ledger.plot``: a ledger as a PNG that stays readable at 10^5+ operations.

One panel per operation name (its actual and amortized cost and its bound,
against the operation's number in the audit), then a panel for the potential.
A panel with more than ``max_points`` points is cut into ``max_points // 4``
buckets of consecutive operations and drawn as envelopes: the mean, the p99
(nearest rank) and the max of each bucket, so a single spike stays visible
where a line per operation would be a solid band.  Legends sit to the right
of the panels, never over the data.  matplotlib and numpy are imported here
only, when a plot is asked for.
"""

from __future__ import annotations

from itertools import pairwise
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from heapkit.ledger import Ledger

__all__ = ["envelopes", "plot"]


def envelopes(xs: Any, ys: Any, buckets: int) -> tuple[Any, Any, Any, Any]:
    """Per bucket of consecutive points: (x middle, mean, p99, max).  O(len(xs) log).

    >>> import numpy as np
    >>> x, mean, p99, top = envelopes(np.arange(8.0), np.array([1, 1, 1, 9, 2, 2, 2, 2.0]), 2)
    >>> mean.tolist(), p99.tolist(), top.tolist()
    ([3.0, 2.0], [9.0, 2.0], [9.0, 2.0])
    """
    import numpy as np

    edges = np.linspace(0, len(xs), buckets + 1).astype(int)
    mid, mean, p99, top = [], [], [], []
    for lo, hi in pairwise(edges):
        if hi <= lo:
            continue
        part = np.sort(ys[lo:hi])
        mid.append(float(xs[(lo + hi - 1) // 2]))
        mean.append(float(part.mean()))
        p99.append(float(part[max(0, -(-99 * len(part) // 100) - 1)]))  # nearest rank
        top.append(float(part[-1]))
    return np.array(mid), np.array(mean), np.array(p99), np.array(top)


def _pyplot() -> Any:
    try:
        import matplotlib

        matplotlib.use("Agg")
        import matplotlib.pyplot as plt
    except ImportError as exc:
        raise ImportError(
            "Ledger.plot needs matplotlib, which heapkit installs with its optional "
            "extra 'plot': pip install 'heapkit[plot]'"
        ) from exc
    return plt


def plot(ledger: Ledger, path: Any, max_points: int = 2000) -> None:
    """Write ``ledger`` as a PNG to ``path`` (see the module docstring).  O(records log records)."""
    plt = _pyplot()
    import numpy as np

    from heapkit.ledger import OPS

    if ledger.keep != "all":
        raise ValueError("Ledger.plot needs every record; this audit kept only totals")
    if not isinstance(max_points, int) or isinstance(max_points, bool) or max_points < 8:
        raise ValueError(f"Ledger.plot: max_points must be an integer of at least 8, got {max_points!r}")
    rows = np.frombuffer(ledger._rows, dtype=np.float64).reshape(-1, 7)
    codes = rows[:, 0].astype(int)
    present = [c for c in range(len(OPS)) if (codes == c).any()]
    panels = len(present) + 1
    fig, axes = plt.subplots(panels, 1, sharex=True, figsize=(11, 1.9 * panels + 0.8), squeeze=False)
    c = ledger.phi_c
    steps = np.arange(len(rows), dtype=np.float64)
    for ax, code in zip(axes[:-1, 0], present, strict=True):
        sel = codes == code
        xs, part = steps[sel], rows[sel]
        actual = part[:, 2]
        amort = actual + c * (part[:, 4] - part[:, 3])
        bound = part[:, 5]
        if len(xs) <= max_points:
            ax.plot(xs, actual, ".", ms=2, label="actual")
            ax.plot(xs, amort, ".", ms=2, label="amortized")
            ax.plot(xs, bound, "--", lw=0.8, color="black", label="bound")
        else:
            b = max_points // 4
            mx, mean, p99, top = envelopes(xs, actual, b)
            ax.fill_between(mx, mean, p99, alpha=0.35, step="mid", label="actual mean..p99")
            ax.plot(mx, top, lw=0.6, drawstyle="steps-mid", label="actual max")
            _, _, _, amax = envelopes(xs, amort, b)
            ax.plot(mx, amax, lw=0.6, drawstyle="steps-mid", label="amortized max")
            _, _, _, bmax = envelopes(xs, bound, b)
            ax.plot(mx, bmax, "--", lw=0.8, color="black", label="bound")
        ax.set_ylabel(f"{OPS[code]}\n({int(sel.sum())})")
        ax.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0), fontsize="small", frameon=False)
    low = axes[-1, 0]
    phi = rows[:, 4]
    if len(steps) <= max_points:
        low.plot(steps, phi, lw=0.8, color="tab:green", label="Φ after")
    else:
        mx, mean, _, top = envelopes(steps, phi, max_points // 4)
        _, _, _, bottom = envelopes(steps, -phi, max_points // 4)
        low.fill_between(mx, -bottom, top, color="tab:green", alpha=0.35, step="mid", label="Φ min..max")
        low.plot(mx, mean, lw=0.8, color="tab:green", drawstyle="steps-mid", label="Φ mean")
    low.set_ylabel("Φ")
    low.set_xlabel("operation number in the audit")
    low.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0), fontsize="small", frameon=False)
    axes[0, 0].set_title(f"audit of {ledger.kind}: {ledger.count} operations; cost in {ledger.unit}")
    fig.tight_layout()
    fig.savefig(path, format="png")
    plt.close(fig)
