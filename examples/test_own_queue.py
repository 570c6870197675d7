"""Property-testing a team's own queue with heapkit's testing kit (copy-paste example)."""

from own_queue import TicketQueue

from heapkit.testing import adapt, assert_conforms


def make_queue():  # type: ignore[no-untyped-def]
    return adapt(
        TicketQueue(), push="add", pop="take", peek="next_up", decrease_key="bump", change_key="bump", remove="cancel"
    )


def test_ticket_queue_behaves_like_a_priority_queue() -> None:
    # No meld in TicketQueue; ties pop in arrival order, so it can claim stable.
    assert_conforms(make_queue, meld=False, stable=True, max_examples=60)
