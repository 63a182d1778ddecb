"""The ``confspec`` command: check and normalize configuration columns, inspect one value.

Exit status: 0 when every row (or value) is valid, 1 when any is not, 2 for a usage or input
error (printed on one line, never as a traceback).

This module is only the entry point: :mod:`.arguments` holds the command-line grammar and each
command lives in its own module, imported when that command runs (``check`` and ``normalize``
in :mod:`.clean`, then :mod:`.show`, :mod:`.ground`, :mod:`.codes`, :mod:`.scf`).
"""

from __future__ import annotations

import argparse
import contextlib
import importlib
import os
import signal
import sys
import threading
from collections.abc import Callable, Sequence
from typing import Any, cast

from .. import ConfspecError
from .arguments import PROG, build_parser
from .common import say

__all__ = ["main"]

#: command name -> (module of this package, function taking the parsed arguments)
_COMMANDS: dict[str, tuple[str, str]] = {
    "check": ("clean", "run_check"),
    "normalize": ("clean", "run_normalize"),
    "show": ("show", "run"),
    "ground": ("ground", "run"),
    "codes": ("codes", "run"),
    "scf": ("scf", "run"),
}


class _Stopped(KeyboardInterrupt):
    """SIGTERM or SIGHUP, raised where the program is so that it stops as for Ctrl-C."""

    def __init__(self, signum: int) -> None:
        super().__init__(signum)
        self.signum = signum


def _on_signal(signum: int, frame: object) -> None:
    global _stopping
    if _stopping:  # a second signal while we clean up: finish the clean-up first
        return
    _stopping = True
    if signum == signal.SIGINT:
        raise KeyboardInterrupt
    raise _Stopped(signum)


_stopping = False


def _handle_signals() -> dict[int, Any]:
    """SIGINT, SIGTERM and SIGHUP all stop the run cleanly; the previous handlers are returned
    (to restore). Only the main thread can set handlers: elsewhere nothing changes."""
    global _stopping
    _stopping = False
    previous: dict[int, Any] = {}
    if threading.current_thread() is not threading.main_thread():
        return previous
    for name in ("SIGINT", "SIGTERM", "SIGHUP"):
        number = getattr(signal, name, None)
        if number is None:
            continue
        current = signal.getsignal(number)
        if name == "SIGINT" and current is not signal.default_int_handler:
            continue  # the embedding program chose its own Ctrl-C handling
        previous[number] = signal.signal(number, _on_signal)
    return previous


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line (``sys.argv[1:]`` by default); returns the exit status.

    SIGINT, SIGTERM and SIGHUP stop a run the same way, at any moment after this function
    starts: sinks are aborted (temporary files removed, transactions rolled back), one line is
    printed, and the status is 128 + the signal number (130, 143, 129).
    """
    previous = _handle_signals()
    try:
        return _main(argv)
    except KeyboardInterrupt as stop:  # during parsing, or while an error is printed
        return _interrupted(stop, None)
    finally:
        for number, handler in previous.items():
            signal.signal(number, handler)


def _interrupted(stop: KeyboardInterrupt, command: str | None) -> int:
    number = stop.signum if isinstance(stop, _Stopped) else signal.SIGINT
    name = signal.Signals(number).name
    with contextlib.suppress(Exception):
        say(f"{PROG}{' ' + command if command else ''}: stopped by {name}; no output file or "
            "table was changed (a stream output, such as stdout, is incomplete)", sys.stderr)
    return 128 + int(number)


def _masked(text: str) -> str:
    """A message with the passwords of any database URL in it masked."""
    if "confspec.cleaning" not in sys.modules:
        return text
    from ..cleaning import mask_secrets

    return mask_secrets(text)


def _main(argv: Sequence[str] | None) -> int:
    try:
        args = build_parser().parse_args(argv)
    except SystemExit as stop:  # --help, --version, or a usage error already printed
        return _status(stop)
    module, function = _COMMANDS[args.command]
    try:
        handler = cast(Callable[[argparse.Namespace], int],
                       getattr(importlib.import_module(f"{__name__}.{module}"), function))
        return handler(args)
    except ConfspecError as err:  # an option the library refuses (style, core, order)
        say(f"{PROG} {args.command}: error: {_masked(err.message)}", sys.stderr)
        return 2
    except KeyboardInterrupt as stop:
        return _interrupted(stop, args.command)
    except BrokenPipeError:
        # the reader of our stdout went away (e.g. `| head`): stop quietly
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        return 1
    except OSError as err:
        where = f"{err.filename}: " if getattr(err, "filename", None) else ""
        say(_masked(f"{PROG} {args.command}: error: {where}{err.strerror or err}"), sys.stderr)
        return 2
    except Exception as err:
        if _is_input_error(err):
            say(_masked(f"{PROG} {args.command}: error: {err}"), sys.stderr)
            return 2
        if _is_database_error(err):
            lines = str(getattr(err, "orig", None) or err).strip().splitlines()
            first = lines[0] if lines else type(err).__name__
            say(_masked(f"{PROG} {args.command}: database error: {first}"), sys.stderr)
            return 2
        raise


def _status(stop: SystemExit) -> int:
    if stop.code is None or isinstance(stop.code, int):
        return stop.code or 0
    say(str(stop.code), sys.stderr)
    return 1


def _is_input_error(err: BaseException) -> bool:
    """An input or usage error of the cleaning layer (which only raises once it is loaded)."""
    if "confspec.cleaning" not in sys.modules:
        return False
    from ..cleaning import InputError

    return isinstance(err, InputError)


def _is_database_error(err: BaseException) -> bool:
    if "sqlite3" in sys.modules:
        import sqlite3

        if isinstance(err, sqlite3.Error):
            return True
    return type(err).__module__.split(".")[0] in ("sqlalchemy", "psycopg", "duckdb")
