"""Running the ``confspec`` command in tests: in this process (the default) or in a fresh one.

``cli(*args)`` calls :func:`confspec.cli.main` here, with stdout and stderr captured, stdin
empty and, when ``cwd`` is given, that working folder for the length of the call. It returns
what :func:`subprocess.run` would (``returncode``, ``stdout``, ``stderr``), so a test reads
the same either way. An exception that escapes ``main`` is not turned into a status: it fails
the test with its own traceback (a subprocess would have printed one and exited 1).

``cli_process(*args)`` runs the installed ``confspec`` entry point in a new process, for the
few tests that need one (worker pools, the entry point itself, a fresh interpreter).
"""

from __future__ import annotations

import contextlib
import csv
import io
import os
import subprocess
import sys
from dataclasses import dataclass, field
from pathlib import Path

from confspec.cli import main

EXE = Path(sys.executable).with_name("confspec")
COMMAND = [str(EXE)] if EXE.exists() else [sys.executable, "-m", "confspec.cli"]


@dataclass(frozen=True)
class Done:
    """The outcome of one in-process run, shaped like :class:`subprocess.CompletedProcess`."""

    args: list[str]
    returncode: int
    stdout: str = field(repr=False)
    stderr: str = field(repr=False)


def _status(code: object) -> int:
    """The exit status the interpreter gives for ``SystemExit(code)``."""
    if code is None:
        return 0
    if isinstance(code, int):
        return code
    print(code, file=sys.stderr)  # what the interpreter does with a message
    return 1


def cli(*args: str | Path, cwd: Path | None = None) -> Done:
    """``confspec ARGS...`` in this process."""
    argv = [str(a) for a in args]
    out, err = io.StringIO(), io.StringIO()
    previous = os.getcwd()
    stdin = sys.stdin
    try:
        if cwd is not None:
            os.chdir(cwd)
        sys.stdin = io.StringIO("")
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            try:
                status = main(argv)
            except SystemExit as stop:
                status = _status(stop.code)
    finally:
        sys.stdin = stdin
        os.chdir(previous)
    return Done(argv, status, out.getvalue(), err.getvalue())


def cli_process(*args: str | Path, cwd: Path | None = None,
                env: dict[str, str] | None = None) -> subprocess.CompletedProcess[str]:
    """``confspec ARGS...`` through the installed entry point, in a new process."""
    return subprocess.run([*COMMAND, *map(str, args)], capture_output=True, text=True,
                          cwd=cwd, check=False, timeout=120, stdin=subprocess.DEVNULL,
                          env=env)


def write_csv(path: Path, header: list[str], rows: list[list[str]]) -> Path:
    with open(path, "w", encoding="utf-8", newline="") as handle:
        writer = csv.writer(handle, lineterminator="\n")
        writer.writerow(header)
        writer.writerows(rows)
    return path


def read_csv(path: Path) -> list[dict[str, str]]:
    with open(path, encoding="utf-8", newline="") as handle:
        return list(csv.DictReader(handle))
