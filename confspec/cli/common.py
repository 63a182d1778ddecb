"""Helpers shared by the command modules: line output, indentation, one-line error text and
the description of where a ground level comes from."""

from __future__ import annotations

import sys
from collections.abc import Callable
from typing import IO, Any

from .. import ConfspecError

__all__ = ["brief", "chemistry_function", "indent", "provenance", "say"]


def say(text: str = "", stream: IO[str] | None = None) -> None:
    """Print one line to ``stream``, by default the ``sys.stdout`` of the moment."""
    print(text, file=stream or sys.stdout)


def indent(text: str, by: int) -> str:
    """Every line of ``text`` shifted right by ``by`` spaces."""
    pad = " " * by
    return "\n".join(pad + line for line in text.splitlines())


def brief(err: BaseException) -> str:
    """An error in one line: the message and code of a library error, else its first line."""
    if isinstance(err, ConfspecError):
        return f"{err.message} [{err.code}]"
    text = str(err).splitlines()
    return text[0] if text else type(err).__name__


def chemistry_function(name: str) -> Callable[..., Any] | None:
    """A chemistry function of the package, if this build has it."""
    import confspec

    found = getattr(confspec, name, None)
    return found if callable(found) else None


def provenance(level: Any) -> str:
    """Where a ground level comes from, in words: measured, predicted or rule-based."""
    parts = [str(getattr(level, "provenance", "") or "")]
    binding = getattr(level, "binding", "bound")
    if binding == "unbound":
        parts.insert(0, "not bound as a free ion")
    elif binding == "not established":
        parts.insert(0, "binding not established")
    source = getattr(level, "source", None)
    if source:
        parts.append(f"source: {source}")
    hund_term = getattr(level, "hund_term", None)
    if hund_term is not None:
        parts.append(f"Hund's rules would give {hund_term}")
    note = getattr(level, "note", None)
    if note:
        parts.append(f"note: {note}")
    caution = getattr(level, "caution", None)
    if caution:
        parts.append(f"caution: {caution}")
    return "; ".join(p for p in parts if p)
