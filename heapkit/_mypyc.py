"""mypyc's class flags for compiled modules, with nothing to import at run time.

Compiled modules write ``from heapkit._mypyc import mypyc_attr``.  mypy (and so mypyc,
at build time) sees ``mypy_extensions.mypyc_attr``; at run time the decorator is a
no-op, so neither build needs ``mypy_extensions`` installed.  This module is never
compiled: an ``if TYPE_CHECKING/else`` in a compiled module raises at import (mypyc
compiles the ``else`` as unreachable).

>>> @mypyc_attr(allow_interpreted_subclasses=True)
... class Core: pass
>>> Core.__name__
'Core'
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

__all__ = ["mypyc_attr"]

if TYPE_CHECKING:
    from mypy_extensions import mypyc_attr as mypyc_attr
else:

    def mypyc_attr(*_names: str, **_flags: object) -> Any:
        """No-op at run time (mypyc reads the flags at build time)."""
        return lambda cls: cls
