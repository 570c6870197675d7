"""Remove compiled build products from a checkout: ``python _build/clean.py``.

Deletes every extension module under ``heapkit/`` (they would shadow edited
sources), mypyc's shared library beside the package, and ``build/``.
"""

from __future__ import annotations

import importlib.machinery
import shutil
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SUFFIXES = tuple(importlib.machinery.EXTENSION_SUFFIXES)


def main() -> int:
    gone = [p for p in (ROOT / "heapkit").rglob("*") if p.name.endswith(SUFFIXES)]
    gone += [p for p in ROOT.glob("*__mypyc*") if p.name.endswith(SUFFIXES)]
    for p in gone:
        p.unlink()
        print(f"removed {p.relative_to(ROOT)}")
    if (ROOT / "build").is_dir():
        shutil.rmtree(ROOT / "build")
        print("removed build/")
    return 0


if __name__ == "__main__":
    sys.exit(main())
