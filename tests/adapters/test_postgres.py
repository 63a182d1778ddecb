"""PostgreSQL for real: the CLI reads a table, checks it, and writes normalized tables.

``make test`` starts a local server bound to 127.0.0.1 (``scripts/postgres-up.sh``) and passes
its URL in ``CONFSPEC_TEST_POSTGRES_URL``. Without a server these tests are skipped, with the
reason the script gave.
"""

from __future__ import annotations

import os
import uuid
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import pytest

from ..cli.runner import cli

pytestmark = pytest.mark.postgres

ENV = "CONFSPEC_TEST_POSTGRES_URL"

ROWS = [("Fe", "[ar] 4s^2 3d^{6}"), ("Fe", "3d6 4s2"), ("O2-", "1s2 2s2 2p7"),
        ("Na", "1s22s22p63s1"), ("Cu", "[Ar] 3d¹⁰ 4s¹"), ("Qq", "1s2"), (None, None)]


def _url() -> str:
    value = os.environ.get(ENV, "")
    if not value:
        pytest.skip(f"{ENV} is not set: `make test` starts a local PostgreSQL server with "
                    "scripts/postgres-up.sh")
    if value.startswith("unavailable"):
        pytest.skip(f"no PostgreSQL server: {value}")
    return value if "+" in value.split("://")[0] else value.replace("postgresql://",
                                                                    "postgresql+psycopg://", 1)


@pytest.fixture(scope="session")
def server() -> Iterator[tuple[str, Any]]:
    """One engine (and its connection pool) for the session; each test makes its own table."""
    url = _url()
    sqlalchemy = pytest.importorskip("sqlalchemy")
    pytest.importorskip("psycopg")
    engine = sqlalchemy.create_engine(url)
    try:
        yield url, engine
    finally:
        engine.dispose()


@pytest.fixture
def table(server: tuple[str, Any]) -> Iterator[tuple[str, Any, str]]:
    url, engine = server
    name = f"atoms_{uuid.uuid4().hex[:8]}"
    with engine.begin() as con:  # a failure to connect here is a failure, not a skip
        con.exec_driver_sql(f"CREATE TABLE {name} (id SERIAL PRIMARY KEY, species TEXT, "
                            "configuration VARCHAR(24))")
        con.exec_driver_sql(f"INSERT INTO {name} (species, configuration) VALUES (%s, %s)",
                            ROWS)
    try:
        yield url, engine, name
    finally:
        with engine.begin() as con:
            for suffix in ("", "_normalized", "_copy"):
                con.exec_driver_sql(f"DROP TABLE IF EXISTS {name}{suffix}")


def test_check_reads_every_row(table: tuple[str, Any, str], tmp_path: Path) -> None:
    url, _, name = table
    report = tmp_path / "report.csv"
    done = cli("check", url, "--table", name, "-c", "configuration", "-s", "species",
               "-r", str(report))
    assert done.returncode == 1, done.stderr
    assert "rows read            7" in done.stdout
    assert "valid                3" in done.stdout
    assert ":***@" in done.stdout  # the password is never printed
    lines = report.read_text("utf-8").splitlines()
    assert len(lines) == 8
    assert [line.split(",")[2] for line in lines[1:]] == ["ok", "error", "error", "ok", "ok",
                                                         "error", "error"]


def test_normalize_into_a_new_table(table: tuple[str, Any, str]) -> None:
    url, engine, name = table
    done = cli("normalize", url, "--table", name, "-c", "configuration", "-s", "species",
               "-o", url, "--fill-core", "--style", "latex", "--core", "expand")
    assert done.returncode == 1, done.stderr
    with engine.connect() as con:
        rows = con.exec_driver_sql(f"SELECT id, configuration, status, code, fixes FROM "
                                   f"{name}_normalized ORDER BY id").fetchall()
        kind = con.exec_driver_sql(
            "SELECT data_type FROM information_schema.columns WHERE table_name = %s AND "
            "column_name = 'configuration'", (f"{name}_normalized",)).scalar()
    assert [r[0] for r in rows] == list(range(1, 8))
    fe = r"1s^{2}\,2s^{2}\,2p^{6}\,3s^{2}\,3p^{6}\,3d^{6}\,4s^{2}"  # longer than VARCHAR(24)
    assert tuple(rows[0][1:]) == (fe, "ok", None, None)
    assert tuple(rows[1][1:]) == (fe, "ok", None, "fill-core:[Ar]")
    assert tuple(rows[2][1:]) == ("1s2 2s2 2p7", "error", "pauli-limit", None)
    assert tuple(rows[6][1:]) == (None, "error", "empty", None)
    assert kind == "text"


def test_normalize_in_place_column(table: tuple[str, Any, str]) -> None:
    url, engine, name = table
    done = cli("normalize", url, "--table", name, "-c", "configuration",
               "--in-place-column", "canonical")
    assert done.returncode == 1, done.stderr
    with engine.connect() as con:
        rows = con.exec_driver_sql(f"SELECT configuration, canonical, canonical_status "
                                   f"FROM {name} ORDER BY id").fetchall()
    assert [tuple(r) for r in rows[:4]] == [
        ("[ar] 4s^2 3d^{6}", "[Ar] 3d6 4s2", "ok"), ("3d6 4s2", "3d6 4s2", "ok"),
        ("1s2 2s2 2p7", "1s2 2s2 2p7", "error"), ("1s22s22p63s1", "[Ne] 3s1", "ok")]
    assert len(rows) == 7


def test_a_failed_write_changes_nothing(table: tuple[str, Any, str]) -> None:
    url, engine, name = table
    with engine.begin() as con:
        con.exec_driver_sql(f"CREATE TABLE {name}_normalized (x INT)")
    done = cli("normalize", url, "--table", name, "-c", "configuration", "-o", url)
    assert done.returncode == 2 and "exists already" in done.stderr
    unknown = cli("check", url, "--table", f"{name}_nope", "-c", "configuration")
    assert unknown.returncode == 2 and "no table" in unknown.stderr
    assert "Traceback" not in unknown.stderr
