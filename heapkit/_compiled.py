"""Which modules the compiled build compiles, and whether they are running compiled.

``MODULES`` is the one list: ``setup.py`` reads it (without importing heapkit) to
hand to mypyc when ``HEAPKIT_COMPILE=1``, and :func:`running_compiled` checks it at
import.  This module itself is never compiled.  Phase 2 grows the list.
"""

from __future__ import annotations

import importlib
import importlib.machinery
import importlib.util
import os

__all__ = ["MODULES", "StaleBuildError", "running_compiled", "stale_extensions"]

#: Modules that mypyc compiles, as dotted names.  Keep this a literal tuple of
#: strings: setup.py reads it with ``ast.literal_eval``.
MODULES: tuple[str, ...] = (
    "heapkit._core",
    "heapkit.bench.graphs",
    "heapkit.kinds.dary.slot",
    "heapkit.kinds.pairing.core",
    "heapkit.kinds.dary.paths",
    "heapkit.kinds.dary.core",
    "heapkit.kinds.weak.core",
    "heapkit.kinds.fibonacci.rings",
    "heapkit.kinds.fibonacci.core",
    "heapkit.kinds.binomial.forest",
    "heapkit.kinds.binomial.core",
    "heapkit.kinds.hollow.core",
    "heapkit.kinds.hollow.dag",
    "heapkit.kinds.rank_pairing.core",
    "heapkit.kinds.rank_pairing.cuts",
    "heapkit.kinds.lazy.entries",
    "heapkit.kinds.lazy.core",
    "heapkit.kinds.radix.core",
)

_SUFFIXES = tuple(importlib.machinery.EXTENSION_SUFFIXES)


class StaleBuildError(ImportError):
    """A compiled module in the source tree is older than its ``.py`` (it would shadow the edit)."""


def _is_extension(spec: importlib.machinery.ModuleSpec | None) -> bool:
    path = (spec.origin if spec is not None else None) or ""
    return path.endswith(_SUFFIXES)


def running_compiled() -> bool:
    """True when every module in ``MODULES`` was loaded from a compiled extension.  O(len(MODULES)).

    >>> isinstance(running_compiled(), bool)
    True
    """
    if not MODULES:
        return False
    # find_spec says where each module would load from without running it (importing
    # them all here pulled heapkit.bench.graphs, and with it `random`, into every import).
    return all(_is_extension(importlib.util.find_spec(name)) for name in MODULES)


def stale_extensions(package_dir: str) -> list[str]:
    """Compiled files under ``package_dir`` that would shadow a source: older than the ``.py``
    beside them, or for a module no longer in ``MODULES``.  O(files).

    >>> import tempfile; stale_extensions(tempfile.mkdtemp())
    []
    """
    root = os.path.dirname(os.path.abspath(package_dir))
    stale: list[str] = []
    for folder, _dirs, files in os.walk(package_dir):
        for name in files:
            if not name.endswith(_SUFFIXES):
                continue
            stem = name.split(".", 1)[0]
            so = os.path.join(folder, name)
            src = os.path.join(folder, stem + ".py")
            dotted = os.path.relpath(os.path.join(folder, stem), root).replace(os.sep, ".")
            if dotted not in MODULES or (os.path.exists(src) and os.path.getmtime(so) < os.path.getmtime(src)):
                stale.append(so)
    return sorted(stale)


def _guard_source_tree(here: str | None = None) -> None:
    """Refuse to run compiled modules from a source checkout whose sources are newer.

    Only in a checkout (a ``pyproject.toml`` beside the package ``here``, by default
    heapkit's own folder); an installed wheel has no such file and its file times mean
    nothing.
    """
    if here is None:
        here = os.path.dirname(os.path.abspath(__file__))
    if not os.path.exists(os.path.join(os.path.dirname(here), "pyproject.toml")):
        return
    stale = stale_extensions(here)
    if stale:
        raise StaleBuildError(
            "heapkit: compiled files older than their sources (or no longer in MODULES) would shadow them: "
            f"{', '.join(stale)}; remove them with `python _build/clean.py` "
            "(see DEVELOPERS.md, 'Compiled build')"
        )


_guard_source_tree()  # at ``import heapkit``, before any compiled module is loaded
