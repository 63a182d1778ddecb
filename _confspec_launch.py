"""The ``confspec`` console command: stop signals are handled from its first instruction.

Importing :mod:`confspec` takes a few tenths of a second (pydantic models, the element table).
A scheduler's SIGTERM or a Ctrl-C in that time would otherwise end the process with Python's
default behaviour (a traceback for SIGINT). Nothing has been read or written yet, so this module,
which lives outside the package so that it runs before the package is imported, ends the
process at once with one line and the status the command uses (128 + the signal number).
Once :func:`confspec.cli.main` runs, its own handlers take over.
"""

from __future__ import annotations

import contextlib
import os
import signal
import sys

__all__ = ["run"]

_SIGNALS = ("SIGINT", "SIGTERM", "SIGHUP")


def _stop_while_starting(signum: int, frame: object) -> None:
    name = signal.Signals(signum).name
    with contextlib.suppress(OSError):
        os.write(2, f"confspec: stopped by {name} while starting; nothing was read or "
                    "changed\n".encode())
    os._exit(128 + signum)  # nothing to clean up: no file or table has been opened


def run() -> None:
    """Import the command line with the start-up handlers in place, then run it."""
    for name in _SIGNALS:
        number = getattr(signal, name, None)
        if number is not None:
            signal.signal(number, _stop_while_starting)
    try:
        # main() keeps an embedding program's own Ctrl-C handler, so SIGINT gets Python's
        # default back first; an interrupt between here and main()'s own handlers is caught
        # below. SIGTERM and SIGHUP stay with the start-up handler until main() replaces them.
        from confspec.cli import main

        signal.signal(signal.SIGINT, signal.default_int_handler)
        status = main()
    except KeyboardInterrupt:
        _stop_while_starting(signal.SIGINT, None)
        return
    for name in _SIGNALS:  # main() restored ours on its way out; the run is over
        number = getattr(signal, name, None)
        if number is not None:
            signal.signal(number, signal.SIG_DFL)
    sys.exit(status)
