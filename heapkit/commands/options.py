"""What the subcommands share: the ``--kinds`` option, one-line usage errors, output
files checked before the long run, help text without markup.

>>> chosen_kinds(["pairing,lazy", "binary"])
['pairing', 'lazy', 'binary']
"""

from __future__ import annotations

import argparse
import contextlib
import os
import stat
import sys
import tempfile
from collections.abc import Sequence

import heapkit

__all__ = ["Output", "UsageError", "add_kinds", "chosen_kinds", "fail", "plain"]


class UsageError(ValueError):
    """Bad usage or an output that cannot be written: one line, exit code 2."""


def fail(command: str, problem: object) -> int:
    """Print ``heapkit COMMAND: problem`` on stderr (one line) and return exit code 2."""
    print(f"heapkit {command}: {problem}", file=sys.stderr)
    return 2


def plain(doc: str | None) -> str:
    """A docstring as help text: no reStructuredText double backticks."""
    return (doc or "").replace("``", "")


def add_kinds(p: argparse.ArgumentParser) -> None:
    """Add ``--kinds`` (comma-separated; spaces are accepted too)."""
    p.add_argument(
        "--kinds",
        nargs="+",
        metavar="KINDS",
        help=f"kinds to run, comma-separated (default: all): {','.join(sorted(heapkit.KINDS))}",
    )


def chosen_kinds(values: Sequence[str] | None, default: Sequence[str] | None = None) -> list[str]:
    """The kinds named by ``--kinds`` (commas or spaces, each once), or ``default`` (all kinds)."""
    names: list[str] = []
    for value in values or ():
        for name in value.replace(",", " ").split():
            if name not in heapkit.KINDS:
                raise UsageError(f"--kinds: unknown kind {name!r}; known kinds: {','.join(sorted(heapkit.KINDS))}")
            if name not in names:
                names.append(name)
    if values and not names:
        raise UsageError("--kinds: no kind named")
    return names or list(sorted(heapkit.KINDS) if default is None else default)


def _umask() -> int:
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


class Output:
    """A file written at the end of a run, checked when the run starts.

    ``Output(path, option)`` refuses (``UsageError``) a path that is a directory, a
    device, a pipe or anything else that is not a regular file, an existing file
    that is not writable, and a directory heapkit cannot create files in.  The text
    goes to a temporary file beside the target (``tmp``), renamed over the target
    by ``commit()``; a symbolic link is followed and kept.  ``discard()`` removes
    the temporary file if it was not committed.
    """

    def __init__(self, path: str, option: str) -> None:
        self.path, self.option = path, option
        self.target = os.path.realpath(path)
        mode = self._check()
        folder, base = os.path.split(self.target)
        try:
            fd, self.tmp = tempfile.mkstemp(prefix=f".{base}.", suffix=".tmp", dir=folder)
        except OSError as exc:
            raise UsageError(f"{option} {path!r}: cannot write in {folder!r} ({exc.strerror})") from None
        os.close(fd)
        os.chmod(self.tmp, mode)
        self.done = False

    def _check(self) -> int:
        """The mode the written file gets; ``UsageError`` if the target must not be replaced."""
        try:
            st = os.stat(self.target)
        except FileNotFoundError:
            return 0o666 & ~_umask()
        except OSError as exc:
            raise UsageError(f"{self.option} {self.path!r}: {exc.strerror}") from None
        if stat.S_ISDIR(st.st_mode):
            raise UsageError(f"{self.option} {self.path!r} is a directory")
        if not stat.S_ISREG(st.st_mode):
            raise UsageError(
                f"{self.option} {self.path!r} is not a regular file; heapkit replaces only "
                "a regular file or writes a new one"
            )
        if not os.access(self.target, os.W_OK):
            raise UsageError(f"{self.option} {self.path!r} is not writable")
        return stat.S_IMODE(st.st_mode)

    def commit(self, text: str | None = None) -> None:
        """Write ``text`` (if given) to the temporary file and rename it over the target."""
        if text is not None:
            with open(self.tmp, "w", encoding="utf-8") as f:
                f.write(text)
        self._check()  # still a regular file or nothing
        os.replace(self.tmp, self.target)
        self.done = True

    def discard(self) -> None:
        """Remove the temporary file unless it was committed."""
        if not self.done:
            with contextlib.suppress(FileNotFoundError):
                os.unlink(self.tmp)
