"""Hypothesis strategies for priority-queue keys and operation sequences.

``keys()`` draws many ties, both signs, and extreme floats; ``tuple_keys()``
draws ``(deadline, tiebreak)`` pairs; ``operations()`` draws whole sequences of
``(operation, key or index)`` steps for tests that replay them by hand.
"""

from __future__ import annotations

from typing import Any

from hypothesis import strategies as st

__all__ = ["keys", "operations", "tuple_keys"]

#: Operations a priority queue may offer, in the protocol's words.
OPERATIONS = ("push", "pop", "peek", "decrease_key", "change_key", "remove", "meld", "clear")


def keys(*, ties: bool = True, floats: bool = True) -> st.SearchStrategy[Any]:
    """Keys that stress a queue: small ints (many ties), negatives, huge and tiny floats.

    >>> isinstance(keys(), st.SearchStrategy)
    True
    """
    small = st.integers(-4, 12) if ties else st.integers(-(10**9), 10**9)
    if not floats:
        return small
    # Small values first: the shrinker moves towards the start of a list and of one_of, so a
    # failing sequence shows keys like 0, 0.5 or 1001.0 (floats shrink to short ones), not -1e308.
    extreme = st.sampled_from([0.0, 0.5, 2.5, -0.0, 5e-324, 1e308, -1e308])
    finite = st.floats(allow_nan=False, allow_infinity=True, width=64)
    return st.one_of(small, small, finite, extreme)


def tuple_keys() -> st.SearchStrategy[tuple[Any, int]]:
    """``(deadline, tiebreak)`` pairs with many tied deadlines.

    >>> isinstance(tuple_keys(), st.SearchStrategy)
    True
    """
    return st.tuples(st.integers(0, 6), st.integers(0, 3))


def operations(
    key_strategy: st.SearchStrategy[Any] | None = None, *, max_size: int = 40
) -> st.SearchStrategy[list[tuple[str, Any]]]:
    """Sequences of ``(operation, argument)``: a key for push/decrease/change, an index otherwise.

    >>> isinstance(operations(max_size=5), st.SearchStrategy)
    True
    """
    k = keys() if key_strategy is None else key_strategy
    step = st.one_of(
        st.tuples(st.just("push"), k),
        st.tuples(st.sampled_from(["pop", "peek", "clear", "meld"]), st.none()),
        st.tuples(st.sampled_from(["decrease_key", "change_key"]), st.tuples(st.integers(0, 99), k)),
        st.tuples(st.just("remove"), st.integers(0, 99)),
    )
    return st.lists(step, max_size=max_size)
