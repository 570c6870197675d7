"""In-tree build backend: setuptools, plus mypy as a build requirement when ``HEAPKIT_COMPILE=1``.

``pip install -e .`` and ``pip install .`` stay pure Python and never fetch mypy.
"""

from __future__ import annotations

import os
from typing import Any

from setuptools.build_meta import *  # noqa: F403  (the standard hooks, passed through)

#: What compiling needs at build time only (mypyc ships inside mypy).
COMPILE_REQUIRES = ["mypy>=1.10"]


def _extra() -> list[str]:
    return list(COMPILE_REQUIRES) if os.environ.get("HEAPKIT_COMPILE", "") not in ("", "0") else []


# setuptools' own hooks run setup.py to find requirements, which imports mypyc before it
# is installed; setup.py declares no setup_requires, so the answer is just ours.
def get_requires_for_build_wheel(config_settings: Any = None) -> list[str]:
    return _extra()


def get_requires_for_build_editable(config_settings: Any = None) -> list[str]:
    return _extra()
