"""Reference tables shipped as package data (CSV, one source per row), loaded once."""

from __future__ import annotations

import csv
import io
from functools import cache
from importlib import resources

__all__ = ["read_table"]


@cache
def read_table(name: str) -> tuple[dict[str, str], ...]:
    """Rows of ``confspec/data/<name>`` as dictionaries (read once, then cached)."""
    text = resources.files("confspec").joinpath("data", name).read_text(encoding="utf-8")
    rows = tuple(csv.DictReader(io.StringIO(text)))
    for row in rows:
        if not row.get("source"):
            raise RuntimeError(f"{name}: a row without a source: {row}")
    return rows
