"""SQL functions for ``sqlite3`` and DuckDB connections.

>>> import sqlite3
>>> from confspec.sql import register
>>> con = sqlite3.connect(":memory:")
>>> register(con)
>>> con.execute("SELECT confspec_normalize('2p7'), confspec_is_valid('2p7'),"
...             " confspec_error_code('2p7'), confspec_electron_count('[Ne] 3s1')").fetchone()
(None, 0, 'pauli-limit', 11)
>>> con.execute("SELECT confspec_normalize('[ar] 4s^2 3d^{6}')").fetchone()
('[Ar] 3d6 4s2',)

Every function returns NULL for a NULL argument (the SQL convention), so
``WHERE NOT confspec_is_valid(configuration)`` selects the invalid non-NULL cells. The
functions share one cache of results, so a column with few distinct values is read fast.
Nothing here raises into the database: a value that cannot be read is invalid, not an error.
"""

from __future__ import annotations

import contextlib
import importlib
import sqlite3
from collections.abc import Callable
from typing import Any

from .cleaning import ConfigurationCheck, Outcome, RowJob, cell_text

__all__ = ["FUNCTIONS", "register"]

#: name -> (number of arguments, what it returns)
FUNCTIONS: dict[str, tuple[int, str]] = {
    "confspec_normalize": (1, "the canonical text, or NULL when the value is invalid"),
    "confspec_is_valid": (1, "1 when valid, 0 when not"),
    "confspec_error_code": (1, "the first problem's code, or NULL when valid"),
    "confspec_electron_count": (1, "the number of electrons, or NULL when invalid"),
    "confspec_format": (2, "the value in a style (plain, caret, unicode, latex, html, "
                           "nist-asd), or NULL when invalid or the style is unknown"),
    "confspec_species_error": (2, "the first problem's code of the configuration checked "
                                  "against a species (electron count included), or NULL"),
}


class _Functions:
    """The Python side of the SQL functions, over one cached per-row job."""

    def __init__(self, check: ConfigurationCheck, cache_size: int) -> None:
        self.job = RowJob(check, cache_size)
        self.check = check
        self._styled: dict[str, RowJob] = {}

    def _outcome(self, value: Any, species: Any = None) -> Outcome | None:
        text = cell_text(value)
        if text is None:
            return None
        if species is None:
            return self.job.outcome((text,))
        return self.job.outcome((text, cell_text(species)))

    def normalize(self, value: Any) -> str | None:
        outcome = self._outcome(value)
        return outcome.normalized if outcome is not None and outcome.ok else None

    def is_valid(self, value: Any) -> bool | None:
        outcome = self._outcome(value)
        return None if outcome is None else outcome.ok

    def error_code(self, value: Any) -> str | None:
        outcome = self._outcome(value)
        return None if outcome is None else outcome.code

    def electron_count(self, value: Any) -> int | None:
        outcome = self._outcome(value)
        return outcome.electrons if outcome is not None and outcome.ok else None

    def format(self, value: Any, style: Any) -> str | None:
        if not isinstance(style, str):
            return None
        job = self._styled.get(style)
        if job is None:
            try:
                check = ConfigurationCheck(accept_uppercase=self.check.accept_uppercase,
                                           style=style, core=self.check.core,
                                           order=self.check.order)
            except ValueError:  # unknown style: the library's own error
                return None
            job = self._styled.setdefault(style, RowJob(check, self.job.cache_size))
        text = cell_text(value)
        if text is None:
            return None
        outcome = job.outcome((text,))
        return outcome.normalized if outcome.ok else None

    def species_error(self, value: Any, species: Any) -> str | None:
        if cell_text(species) is None:
            return self.error_code(value)
        outcome = self._outcome(value, species)
        return None if outcome is None else outcome.code


def _as_int(flag: bool | None) -> int | None:
    return None if flag is None else int(flag)


def register(connection: Any, *, style: str = "plain", core: str = "condense",
             order: str = "shell", accept_uppercase: bool = False,
             cache_size: int = 65_536) -> None:
    """Add the ``confspec_*`` functions to a ``sqlite3`` or DuckDB connection.

    ``style``, ``core`` and ``order`` choose the notation ``confspec_normalize`` writes;
    ``accept_uppercase`` reads '2P6' as '2p6' (only for columns without term symbols).
    Registering again replaces the functions.
    """
    check = ConfigurationCheck(accept_uppercase=accept_uppercase, style=style, core=core,
                               order=order)
    impl = _Functions(check, cache_size)
    if isinstance(connection, sqlite3.Connection):
        _register_sqlite(connection, impl)
        return
    if type(connection).__module__.split(".")[0].lstrip("_") == "duckdb":
        _register_duckdb(connection, impl)
        return
    raise TypeError(f"register() takes a sqlite3 or DuckDB connection, not "
                    f"{type(connection).__module__}.{type(connection).__name__}")


def _register_sqlite(con: sqlite3.Connection, impl: _Functions) -> None:
    functions: list[tuple[str, int, Callable[..., Any]]] = [
        ("confspec_normalize", 1, impl.normalize),
        ("confspec_is_valid", 1, lambda v: _as_int(impl.is_valid(v))),
        ("confspec_error_code", 1, impl.error_code),
        ("confspec_electron_count", 1, impl.electron_count),
        ("confspec_format", 2, impl.format),
        ("confspec_species_error", 2, impl.species_error),
    ]
    for name, arity, function in functions:
        con.create_function(name, arity, function, deterministic=True)


def _register_duckdb(con: Any, impl: _Functions) -> None:
    try:
        types: Any = importlib.import_module("duckdb.sqltypes")
    except ImportError:  # DuckDB 1.x
        types = importlib.import_module("duckdb.typing")
    text, boolean, integer = types.VARCHAR, types.BOOLEAN, types.BIGINT
    functions: list[tuple[str, Callable[..., Any], list[Any], Any]] = [
        ("confspec_normalize", impl.normalize, [text], text),
        ("confspec_is_valid", impl.is_valid, [text], boolean),
        ("confspec_error_code", impl.error_code, [text], text),
        ("confspec_electron_count", impl.electron_count, [text], integer),
        ("confspec_format", impl.format, [text, text], text),
        ("confspec_species_error", impl.species_error, [text, text], text),
    ]
    for name, function, parameters, returns in functions:
        # the Python function takes text; a macro of the public name casts any argument to
        # text first, so BIGINT, DOUBLE, BLOB ... are read (and flagged) as in sqlite3
        inner = f"{name}__text"
        for old in (inner, name):  # `name` itself: a function of an earlier version
            with contextlib.suppress(Exception):  # not registered yet: DuckDB cannot tell
                con.remove_function(old)
        con.create_function(inner, function, parameters, returns, null_handling="special",
                            side_effects=False)
        names = ["v", "w"][:len(parameters)]
        cast = ", ".join(f"CAST({n} AS VARCHAR)" for n in names)
        con.execute(f"CREATE OR REPLACE TEMP MACRO {name}({', '.join(names)}) AS "
                    f"{inner}({cast})")
