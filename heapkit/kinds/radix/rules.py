"""The radix heap's rules checked: loading, the full survey, checked mode's local
survey.  The invariants are stated in ``heap.py``'s docstring.
"""

from __future__ import annotations

from typing import Any

__all__ = ["RULES", "layout_problem", "survey", "survey_local", "touched"]

RULES: dict[str, str] = {
    "key-type": "every key is a non-negative int (not a bool)",
    "monotone": "no key is below the last popped key",
    "bucket": "an entry with key k sits in bucket (k ^ last).bit_length()",
    "index": "every handle's bucket and position are where it stands",
    "size": "the buckets hold len(heap) entries",
    "ownership": "every handle's owner token resolves to this heap's",
}


def layout_problem(heap: Any, handles: list[Any], layout: Any) -> str | None:
    """Loading: bucket sizes adding up to the handles, each key in its bucket.  O(n)."""
    from heapkit.kinds.radix.heap import MAX_BITS  # heap.py imports this module

    return _bucket_problem(handles, layout, MAX_BITS)


def _bucket_problem(handles: list[Any], layout: Any, max_bits: int) -> str | None:
    """Radix heap: bucket sizes adding up to the handles, each key an int in its bucket
    ``(key ^ last).bit_length()``, at most ``max_bits + 1`` buckets.  O(n)."""
    if type(layout) is not tuple or len(layout) != 2:
        return f"expected (last, bucket sizes), got {layout!r:.80}"
    last, sizes = layout
    if type(last) is not int or last < 0 or type(sizes) is not list or len(sizes) > max_bits + 1:
        return f"expected a last key >= 0 and at most {max_bits + 1} bucket sizes, got {layout!r:.80}"
    if any(type(s) is not int or s < 0 for s in sizes) or sum(sizes) != len(handles):
        return f"bucket sizes {sizes!r:.80} do not add up to {len(handles)} handles"
    at = 0
    for b, s in enumerate(sizes):
        for x in handles[at : at + s]:
            k = x._key
            if type(k) is not int or k < last or (k ^ last).bit_length() != b:
                return f"key {k!r:.40} does not belong in bucket {b} (last popped {last})"
        at += s
    return None


def touched(heap: Any, op: str, handle: Any) -> Any:
    """The entries the op may move: a pop's source bucket and bucket 0, a meld's incoming ones."""
    if op == "pop":
        buckets = heap._buckets
        src: list[Any] = next(filter(None, buckets), [])
        return list(src) + list(buckets[0])
    if op == "meld":
        return list(handle._handles()) if isinstance(handle, heap._family()) else []
    return [] if handle is None else [handle]


def survey_local(heap: Any, report: Any, touched: Any, handle: Any) -> None:
    """Each touched entry still here (and the handle) where its key says it stands."""
    buckets = heap._buckets
    last = heap._last
    if isinstance(handle, heap._NODE):
        touched = [*touched, handle]
    for x in touched:
        if x._tok is None:
            continue
        key = x._key
        b = (key ^ last).bit_length() if type(key) is int else 0
        i = x._i
        where = buckets[b] if b < len(buckets) else []
        if not (0 <= i < len(where) and where[i] is x):
            report.fail("index", x, [f"bucket {b}"], "the handle's key and slot do not lead to it")
        else:
            _check_entry(heap, report, x, b, i)


# Checks x, found (or expected) at slot i of bucket b, against every rule.
def _check_entry(heap: Any, report: Any, x: Any, b: int, i: int) -> None:
    last = heap._last
    path = [f"bucket {b}", f"slot {i}"]
    if x._i != i:
        report.fail("index", x, path, f"the handle says slot {x._i}, it stands at slot {i}")
    if x not in heap:
        report.fail("ownership", x, path, "its owner token is not this heap's")
    key = x._key
    if type(key) is bool or not isinstance(key, int) or key < 0:
        report.fail("key-type", x, path, f"key {key!r} is not a non-negative int")
        return
    if key < last:
        report.fail("monotone", x, path, f"key {key!r} is below the last popped key {last!r}")
    want = (key ^ last).bit_length()
    if want != b:
        report.fail("bucket", x, path, f"key {key!r} belongs in bucket {want}, not {b}")


def survey(heap: Any, report: Any) -> dict[str, Any]:
    """Check every rule in O(n); return the figures of :class:`heapkit.Shape`."""
    for b, bl in enumerate(heap._buckets):
        for i, x in enumerate(bl):
            _check_entry(heap, report, x, b, i)
    total = sum(len(bl) for bl in heap._buckets)
    if total != heap._n:
        report.fail("size", None, [], f"the buckets hold {total} entries but len is {heap._n}")
    return {
        "size": total,
        "roots": sum(1 for bl in heap._buckets if bl),
        "height": 0,
        "max_degree": max((len(bl) for bl in heap._buckets), default=0),
        "marked": None,
        "potential": heap._phi(),
        "details": {"last": heap._last, "buckets": len(heap._buckets)},
    }
