"""Kept for imports written before :mod:`heapkit.concurrent`: ``locked``, ``Locked``, ``unwrap``."""

from heapkit.concurrent.locked import Locked, locked, unwrap

__all__ = ["Locked", "locked", "unwrap"]
