"""Testing kit (install the ``testing`` extra): property-test your own queue.

* :class:`ReferenceHeap` — the executable specification of the protocol;
* :func:`assert_conforms` / :func:`machine` — drive your queue beside it;
* :mod:`heapkit.testing.strategies` — keys and operation sequences;
* :func:`adapt` — map a queue with other method names onto the protocol.
"""

from heapkit.testing import strategies
from heapkit.testing.kit import Adapted, adapt, assert_conforms, machine
from heapkit.testing.reference import ReferenceHeap, RefHandle

__all__ = ["Adapted", "RefHandle", "ReferenceHeap", "adapt", "assert_conforms", "machine", "strategies"]
