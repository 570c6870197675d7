"""What the suites share: the kinds under test and their key strategies."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path
from typing import Any

from hypothesis import strategies as st

import heapkit

#: Every kind, under both stable settings: (kind name, stable).
VARIANTS = [(name, stable) for name in sorted(heapkit.KINDS) for stable in (False, True)]
NAMES = sorted(heapkit.KINDS)

#: Keys with many ties, both signs, ints mixed with extreme and signed-zero floats.
KEYS = st.one_of(
    st.integers(-4, 12),
    st.sampled_from([-1e308, 1e308, 0.5, -0.0, 0.0, 2.5]),
)


def monotone(name: str) -> bool:
    """Kinds that take only keys at or above the last popped (radix): ``MONOTONE = True``."""
    return bool(getattr(heapkit.KINDS[name], "MONOTONE", False))


#: Kinds whose push compares nothing (it appends; a later operation settles the entry),
#: so a key cannot act in the middle of a push: tests of what a key's ``<`` does during
#: push skip them and test the same through an operation that compares.
PUSH_COMPARES_NOTHING = {"weak": "push appends; the next pop, peek, change_key up or remove settles"}


def make(name: str, stable: bool = False, pairs: Any = ()) -> Any:
    return heapkit.KINDS[name](pairs, stable=stable)


def run_python(code: str, debug: str) -> subprocess.CompletedProcess[str]:
    """Run ``code`` in a fresh interpreter with ``HEAPKIT_DEBUG=debug`` (read at import)."""
    root = Path(__file__).resolve().parent.parent
    env = {**os.environ, "HEAPKIT_DEBUG": debug, "PYTHONPATH": str(root)}
    return subprocess.run(
        [sys.executable, "-c", code], env=env, capture_output=True, text=True, timeout=300, check=False
    )
