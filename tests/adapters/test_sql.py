"""SQL functions on sqlite3 and DuckDB connections."""

from __future__ import annotations

import sqlite3
from typing import Any

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from confspec.sql import FUNCTIONS, register

duckdb = pytest.importorskip("duckdb")


def _connections() -> list[Any]:
    return [pytest.param("sqlite", id="sqlite"), pytest.param("duckdb", id="duckdb")]


def _connect(kind: str) -> Any:
    con = sqlite3.connect(":memory:") if kind == "sqlite" else duckdb.connect()
    register(con)
    return con


def _one(con: Any, sql: str, *params: Any) -> Any:
    return con.execute(sql, params).fetchone()[0]


CASES = [
    # (sql expression, argument(s), expected)
    pytest.param("confspec_normalize(?)", ("[ar] 4s^2 3d^{6}",), "[Ar] 3d6 4s2", id="normalize"),
    pytest.param("confspec_normalize(?)", ("2p7",), None, id="normalize-invalid"),
    pytest.param("confspec_normalize(?)", (None,), None, id="normalize-null"),
    pytest.param("confspec_is_valid(?)", ("1s22s22p6",), 1, id="valid"),
    pytest.param("confspec_is_valid(?)", ("[Xx] 3s2",), 0, id="invalid"),
    pytest.param("confspec_is_valid(?)", (None,), None, id="valid-null"),
    pytest.param("confspec_error_code(?)", ("3d6 4s2 [Ar]",), "misplaced-core", id="code"),
    pytest.param("confspec_error_code(?)", ("[Ne] 3s1",), None, id="code-valid"),
    pytest.param("confspec_error_code(?)", ("",), "empty", id="code-empty"),
    pytest.param("confspec_electron_count(?)", ("[Ar] 3d⁶ 4s²",), 26, id="count"),
    pytest.param("confspec_electron_count(?)", ("2p7",), None, id="count-invalid"),
    pytest.param("confspec_format(?, ?)", ("[Ar] 3d6 4s2", "unicode"), "[Ar] 3d⁶ 4s²",
                 id="format"),
    pytest.param("confspec_format(?, ?)", ("[Ar] 3d6 4s2", "fancy"), None,
                 id="format-unknown-style"),
    pytest.param("confspec_species_error(?, ?)", ("[Ar] 3d6", "Fe"), "electron-count",
                 id="species-count"),
    pytest.param("confspec_species_error(?, ?)", ("[Ar] 3d6", "Fe2+"), None, id="species-ok"),
    pytest.param("confspec_species_error(?, ?)", ("[Ar] 3d6", None), None,
                 id="species-missing"),
]


@pytest.mark.parametrize("kind", ["sqlite", "duckdb"])
@pytest.mark.parametrize(("expression", "args", "expected"), CASES)
def test_functions(kind: str, expression: str, args: tuple[Any, ...], expected: Any) -> None:
    con = _connect(kind)
    if kind == "duckdb" and expression.startswith("confspec_is_valid") and expected is not None:
        expected = bool(expected)
    assert _one(con, f"SELECT {expression}", *args) == expected


@pytest.mark.parametrize("kind", ["sqlite", "duckdb"])
def test_where_not_is_valid_in_plain_sql(kind: str) -> None:
    con = _connect(kind)
    con.execute("CREATE TABLE t (id INTEGER, configuration TEXT)")
    rows = [(1, "[Ar] 3d6 4s2"), (2, "1s2 2s2 2p7"), (3, None), (4, "2p<sup>6</sup>"),
            (5, "FE"), (6, "1s2")]
    con.executemany("INSERT INTO t VALUES (?, ?)", rows)
    bad = con.execute("SELECT id, confspec_error_code(configuration) FROM t "
                      "WHERE NOT confspec_is_valid(configuration) ORDER BY id").fetchall()
    assert bad == [(2, "pauli-limit"), (5, "syntax")]
    good = con.execute("SELECT confspec_normalize(configuration) FROM t "
                       "WHERE confspec_is_valid(configuration) ORDER BY id").fetchall()
    assert [g[0] for g in good] == ["[Ar] 3d6 4s2", "2p6", "1s2"]


def test_register_options_and_reregistering() -> None:
    con = duckdb.connect()
    register(con)
    register(con, style="latex", core="expand")  # DuckDB refuses duplicates: replaced
    assert _one(con, "SELECT confspec_normalize('[He] 2s1')") == r"1s^{2}\,2s^{1}"
    lite = sqlite3.connect(":memory:")
    register(lite, accept_uppercase=True)
    assert _one(lite, "SELECT confspec_normalize('1S2 2S1')") == "[He] 2s1"


def test_register_refuses_other_objects() -> None:
    with pytest.raises(TypeError, match="sqlite3 or DuckDB connection"):
        register(object())


def test_every_documented_function_exists() -> None:
    con = _connect("sqlite")
    for name, (arity, _) in FUNCTIONS.items():
        args = ", ".join(["'1s2'"] * arity)
        con.execute(f"SELECT {name}({args})").fetchone()


@settings(max_examples=150, deadline=None)
@given(st.one_of(st.text(max_size=40), st.binary(max_size=20),
                 st.integers(min_value=-(2**63), max_value=2**63 - 1),
                 st.floats(allow_nan=True)))
def test_sqlite_functions_never_raise(value: Any) -> None:
    con = _connect("sqlite")
    row = con.execute("SELECT confspec_normalize(?), confspec_is_valid(?), "
                      "confspec_error_code(?), confspec_electron_count(?)",
                      (value,) * 4).fetchone()
    assert row[1] in (0, 1, None)
    assert (row[1] == 1) == (row[2] is None and row[1] is not None)
