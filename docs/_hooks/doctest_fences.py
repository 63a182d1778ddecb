"""griffe extension for the API reference: show docstring doctests as code.

confspec's docstrings carry short ``>>>`` examples that run in the tests. Rendered as
Markdown they would be prose, and their output (``['3P', '1D', '1S']``, ``[↑↓][↑ ]``) would
read as link syntax. This extension fences every doctest run as a ``pycon`` block before
the docstring is parsed, leaving the docstrings in the code untouched.
"""

from __future__ import annotations

from typing import Any

import griffe


def fence_doctests(text: str) -> str:
    """Wrap each run of doctest lines (a ``>>>`` line, its ``...`` lines and its output up
    to a blank line) in a fenced ``pycon`` block, keeping the run's indentation."""
    out: list[str] = []
    lines = text.splitlines()
    i = 0
    while i < len(lines):
        line = lines[i]
        stripped = line.lstrip()
        if not stripped.startswith(">>>"):
            out.append(line)
            i += 1
            continue
        indent = line[: len(line) - len(stripped)]
        block = []
        while i < len(lines) and lines[i].strip() and lines[i].startswith(indent):
            block.append(lines[i][len(indent):])
            i += 1
        out.extend([f"{indent}```pycon", *(indent + b for b in block), f"{indent}```"])
    return "\n".join(out)


class DoctestFences(griffe.Extension):
    """Fence the doctests of every docstring that griffe loads."""

    def on_instance(self, *, obj: griffe.Object, **kwargs: Any) -> None:
        if obj.docstring is not None and ">>>" in obj.docstring.value:
            obj.docstring.value = fence_doctests(obj.docstring.value)
