"""The rank-pairing heap kind (``rank-pairing``): type-2 rank-pairing heap with handles.

Rooms: ``heap.py`` the public class (interpreted), ``core.py`` the operations
(compiled in the compiled build, with ``cuts.py``: the nodes, the cuts and
re-ranking, the work that compares nothing), ``trees.py`` walks, counters and
flat export/import, ``rules.py`` the invariants (survey, checks, ``to_dot``
edges, loading), ``cost.py`` what the auditor asks.
"""

from heapkit.kinds.rank_pairing.heap import RankPairingHeap

__all__ = ["RankPairingHeap"]
