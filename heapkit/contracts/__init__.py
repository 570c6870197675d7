"""Contracts: ``check``, checked mode, the ``HEAPKIT_DEBUG`` switch and ``to_dot``.

The modules, one idea each:

* :mod:`~heapkit.contracts.report`: ``check`` and the ``Report`` a kind's
  ``_survey`` fills in;
* :mod:`~heapkit.contracts.mode`: ``checked`` / ``unchecked`` (the checking
  layer, incremental checks);
* :mod:`~heapkit.contracts.guard`: the re-entrancy guard, and the checker's
  comparisons kept out of the auditor's count;
* :mod:`~heapkit.contracts.history`: the operation history and the
  ``HistoryError`` a failure raises (it never imports ``mode``);
* :mod:`~heapkit.contracts.replaying`: ``replay``, a history rerun in checked mode;
* :mod:`~heapkit.contracts.switch`: ``HEAPKIT_DEBUG`` and ``set_debug``;
* :mod:`~heapkit.contracts.dot`: ``to_dot``.
"""

from __future__ import annotations

from heapkit.contracts.dot import to_dot
from heapkit.contracts.history import HistoryError
from heapkit.contracts.mode import checked, unchecked
from heapkit.contracts.replaying import replay
from heapkit.contracts.report import LIMIT, PROTOCOL_RULES, Report, check, problem_prefix
from heapkit.contracts.switch import set_debug  # reads HEAPKIT_DEBUG once, at import

__all__ = [
    "LIMIT",
    "PROTOCOL_RULES",
    "HistoryError",
    "Report",
    "check",
    "checked",
    "problem_prefix",
    "replay",
    "set_debug",
    "to_dot",
    "unchecked",
]
