"""Build script: pure Python by default; ``HEAPKIT_COMPILE=1 pip install .`` compiles with mypyc.

The modules to compile are listed once, in ``heapkit/_compiled.py`` (``MODULES``),
read here without importing heapkit.  mypy (which ships mypyc) is a build
requirement only when compiling (see ``_build/backend.py``); the compiled wheel
needs nothing extra at run time.
"""

from __future__ import annotations

import ast
import os
from pathlib import Path

from setuptools import setup

HERE = Path(__file__).resolve().parent


def compiled_modules() -> tuple[str, ...]:
    """The literal ``MODULES`` tuple of ``heapkit/_compiled.py``."""
    tree = ast.parse((HERE / "heapkit" / "_compiled.py").read_text(encoding="utf-8"))
    for node in tree.body:
        if isinstance(node, ast.AnnAssign) and getattr(node.target, "id", None) == "MODULES":
            return tuple(ast.literal_eval(node.value))  # type: ignore[arg-type]
    raise SystemExit("setup.py: no MODULES tuple in heapkit/_compiled.py")


def ext_modules() -> list[object]:
    flag = os.environ.get("HEAPKIT_COMPILE", "")
    if flag in ("", "0"):
        return []
    if flag != "1":
        raise SystemExit(f"setup.py: HEAPKIT_COMPILE must be 1 or 0, got {flag!r}")
    from mypyc.build import mypycify

    paths = [str(Path(*name.split("."))) + ".py" for name in compiled_modules()]
    os.chdir(HERE)  # mypycify reads the mypy settings of pyproject.toml from here
    return list(mypycify(paths, opt_level="3", debug_level="0"))


setup(ext_modules=ext_modules())
