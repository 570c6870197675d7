"""The benchmark: heapkit's kinds against the ``heapq`` entry-invalidation idiom.

``python -m heapkit bench`` runs it (see :mod:`heapkit.bench.cli`); the
workloads live in :mod:`heapkit.bench.workloads`, the baseline in
:mod:`heapkit.bench.idiom`, the measuring in :mod:`heapkit.bench.measure`.
"""
