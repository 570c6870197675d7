"""The types users see: mypy on the typing tests, the negative file, and a user's file.

``typing_checks.py`` must type-check clean under ``--strict`` (its ``assert_type``
lines are the positive checks); ``typing_errors.py`` must give exactly the errors
its ``# E: <error code>`` comments name; a file outside the repository that imports heapkit
must type-check after the README's install command (no import hook hiding it).
"""

from __future__ import annotations

import re
import subprocess
import sys
from pathlib import Path

import pytest

pytest.importorskip("mypy")

ROOT = Path(__file__).resolve().parent.parent
CACHE = ROOT / ".mypy_cache"
ERROR = re.compile(r"^(?P<file>[^:]+):(?P<line>\d+): error: .*\[(?P<code>[a-z-]+)\]$")


def _mypy(*args: str, cwd: Path = ROOT) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-m", "mypy", "--strict", "--cache-dir", str(CACHE), "--no-error-summary", *args],
        cwd=cwd,
        capture_output=True,
        text=True,
        timeout=300,
    )


def test_typing_checks_pass_strict_mypy() -> None:
    run = _mypy("tests/typing_checks.py")
    assert run.returncode == 0, run.stdout + run.stderr


def test_negative_typing_file_gives_exactly_the_expected_errors() -> None:
    path = ROOT / "tests" / "typing_errors.py"
    expected = {
        (n, m.group(1))
        for n, line in enumerate(path.read_text().splitlines(), 1)
        if (m := re.search(r"# E: ([a-z-]+)", line))
    }
    assert len(expected) >= 10  # the file holds the cases the issue names
    run = _mypy("tests/typing_errors.py")
    got = {(int(m["line"]), m["code"]) for line in run.stdout.splitlines() if (m := ERROR.match(line))}
    assert got == expected, run.stdout


def test_a_user_file_outside_the_repository_sees_heapkit(tmp_path: Path) -> None:
    user = tmp_path / "scheduler.py"
    user.write_text(
        "import heapkit\n"
        "q = heapkit.new('pairing', [(7.5, 'reroute van 3')])\n"
        "b = q.push(2.0, 'load dock B')\n"
        "q.decrease_key(b, 1.0)\n"
        "key, job = q.pop()\n"
        "reveal_type(key)\n"
    )
    run = _mypy("scheduler.py", cwd=tmp_path)
    assert 'Revealed type is "float"' in run.stdout, (
        "mypy cannot type-check a user's file against heapkit; install with the README's command "
        "(`pip install -e .` writes a plain path entry thanks to pyproject's package-dir)\n" + run.stdout
    )
    assert run.returncode == 0, run.stdout
