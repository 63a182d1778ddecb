"""Databases: SQLite and any SQLAlchemy URL as sources and sinks; writes happen in one
transaction, and a password never reaches a message.
"""

from __future__ import annotations

import json
import os
import re
import sqlite3
from collections.abc import Iterator, Sequence
from pathlib import Path
from typing import Any
from urllib.parse import quote, unquote

from .check import MISSING, InputError, first_line
from .job import Chunk

__all__ = [
    "KEY_COLUMN",
    "AlchemyDatabase",
    "Database",
    "InPlaceSink",
    "SqliteDatabase",
    "TableSink",
    "TableSource",
    "is_database",
    "mask_secrets",
    "open_database",
    "same_database",
]

_SQLITE_EXTENSIONS = (".db", ".sqlite", ".sqlite3")




# ===================================================================== databases
def is_database(target: str) -> bool:
    """A database URL (``scheme://...``) or a path to an SQLite file."""
    return "://" in target or target.lower().endswith(_SQLITE_EXTENSIONS)


def _sqlite_path(target: str) -> str | None:
    """The file of an SQLite target (``sqlite:///x.db``, a ``.db`` path), else None."""
    if "://" not in target:
        return target
    scheme, _, rest = target.partition("://")
    if scheme.split("+")[0] != "sqlite":
        return None
    if not rest.startswith("/") or rest == "/":
        raise InputError(f"{target}: an SQLite URL names a file: sqlite:///relative.db or "
                         "sqlite:////absolute/path.db")
    # as SQLAlchemy reads it: everything up to '?' is the file ('#' included), %-decoded
    return unquote(rest[1:].partition("?")[0])


_URL_PASSWORD = re.compile(r"(?P<head>[A-Za-z][\w+.-]*://[^:/@\s?#]*):(?P<secret>[^\s/]*)@")
_QUERY_PASSWORD = re.compile(
    r"(?P<head>[?&;](?:password|passwd|pwd|pass|sslpassword|secret|token|api_key|"
    r"access_token)=)(?P<secret>[^&;#\s'\"]*?)(?=[&;#\s'\"]|:\s|:$|$)", re.IGNORECASE)


def mask_secrets(text: str) -> str:
    """``text`` with every password of a URL in it masked: ``user:***@host`` and
    ``?password=***`` (also ``passwd``, ``pwd``, ``secret``, ``token`` ...)."""
    if "://" not in text and "=" not in text:
        return text
    text = _URL_PASSWORD.sub(lambda m: f"{m['head']}:***@", text)
    return _QUERY_PASSWORD.sub(lambda m: f"{m['head']}***", text)


_redact = mask_secrets


class Database:
    """The few operations the jobs need, over stdlib sqlite3 or SQLAlchemy.

    The connection is in manual-transaction mode: :meth:`begin`, :meth:`commit` and
    :meth:`rollback` bracket a whole job.
    """

    label: str
    kind: str  # "sqlite" or the SQLAlchemy dialect name

    def quote(self, name: str) -> str:
        raise NotImplementedError

    def table_ref(self, table: str) -> str:
        return self.quote(table)

    def placeholders(self, count: int) -> str:
        raise NotImplementedError

    def tables(self) -> list[str]:
        raise NotImplementedError

    def has_table(self, table: str) -> bool:
        raise NotImplementedError

    def columns(self, table: str) -> list[str]:
        raise NotImplementedError

    def row_key(self, table: str) -> str | None:
        """A column that identifies rows (a one-column primary key, or SQLite's rowid)."""
        raise NotImplementedError

    def execute(self, sql: str, params: Sequence[Any] = ()) -> None:
        raise NotImplementedError

    def executemany(self, sql: str, rows: Sequence[Sequence[Any]]) -> None:
        raise NotImplementedError

    def stream(self, sql: str, size: int) -> Iterator[list[tuple[Any, ...]]]:
        raise NotImplementedError

    def begin(self) -> None:
        raise NotImplementedError

    def commit(self) -> None:
        raise NotImplementedError

    def rollback(self) -> None:
        raise NotImplementedError

    def close(self) -> None:
        raise NotImplementedError

    def error_types(self) -> tuple[type[BaseException], ...]:
        raise NotImplementedError

    def require_table(self, table: str) -> None:
        if not self.has_table(table):
            known = self.tables()
            listing = ", ".join(known[:12]) + (" …" if len(known) > 12 else "")
            raise InputError(f"{self.label}: no table {table!r}"
                             + (f"; tables: {listing}" if known else " (the database is empty)"))


class SqliteDatabase(Database):
    """SQLite through the standard library: the embedded default, no extra install."""

    kind = "sqlite"

    def __init__(self, path: str, *, create: bool, read_only: bool = False) -> None:
        self.path, self.label = path, path
        self.created = False
        if not create and not os.path.exists(path):
            raise InputError(f"{path}: no such database file")
        if os.path.isdir(path):
            raise InputError(f"{path}: is a directory, not a database file")
        self.created = create and not os.path.exists(path)
        try:
            if read_only:
                # quoted: '#', '?' and '%' in a file name are not URI syntax here
                uri = "file:" + quote(Path(path).resolve().as_posix()) + "?mode=ro"
                self.conn = sqlite3.connect(uri, uri=True, isolation_level=None)
            else:
                self.conn = sqlite3.connect(path, isolation_level=None)
            self.conn.execute("SELECT count(*) FROM sqlite_master").fetchone()
        except sqlite3.DatabaseError as err:
            raise InputError(f"{path}: not an SQLite database ({err})") from None

    def quote(self, name: str) -> str:
        return '"' + name.replace('"', '""') + '"'

    def placeholders(self, count: int) -> str:
        return ", ".join("?" * count)

    def tables(self) -> list[str]:
        rows = self.conn.execute("SELECT name FROM sqlite_master WHERE type IN ('table', 'view')"
                                 " AND name NOT LIKE 'sqlite_%' ORDER BY name").fetchall()
        return [r[0] for r in rows]

    def has_table(self, table: str) -> bool:
        row = self.conn.execute("SELECT 1 FROM sqlite_master WHERE type IN ('table', 'view') "
                                "AND name = ?", (table,)).fetchone()
        return row is not None

    def columns(self, table: str) -> list[str]:
        return [r[1] for r in self.conn.execute(f"PRAGMA table_info({self.quote(table)})")]

    def row_key(self, table: str) -> str | None:
        try:
            self.conn.execute(f"SELECT rowid FROM {self.quote(table)} LIMIT 0")
            return "rowid"
        except sqlite3.OperationalError:
            keys = [r[1] for r in self.conn.execute(f"PRAGMA table_info({self.quote(table)})")
                    if r[5]]
            return keys[0] if len(keys) == 1 else None

    def execute(self, sql: str, params: Sequence[Any] = ()) -> None:
        self.conn.execute(sql, tuple(params))

    def executemany(self, sql: str, rows: Sequence[Sequence[Any]]) -> None:
        self.conn.executemany(sql, rows)

    def stream(self, sql: str, size: int) -> Iterator[list[tuple[Any, ...]]]:
        cursor = self.conn.cursor()
        cursor.execute(sql)
        try:
            while batch := cursor.fetchmany(size):
                yield batch
        finally:
            cursor.close()

    def begin(self) -> None:
        self.conn.execute("BEGIN")

    def commit(self) -> None:
        self.conn.execute("COMMIT")

    def rollback(self) -> None:
        if self.conn.in_transaction:
            self.conn.execute("ROLLBACK")

    def close(self) -> None:
        self.conn.close()

    def error_types(self) -> tuple[type[BaseException], ...]:
        return (sqlite3.Error,)


class AlchemyDatabase(Database):
    """Any database SQLAlchemy reaches (PostgreSQL through psycopg, ...)."""

    def __init__(self, url: str) -> None:
        try:
            import sqlalchemy
        except ImportError:
            raise InputError(f"{_redact(url)}: databases other than SQLite need SQLAlchemy: "
                             "pip install 'confspec[sql]'") from None
        self._sa = sqlalchemy
        self.label = _redact(url)
        try:
            self.engine = sqlalchemy.create_engine(url)
        except (sqlalchemy.exc.ArgumentError, sqlalchemy.exc.NoSuchModuleError,
                ImportError, ValueError) as err:
            raise InputError(f"{self.label}: not a usable database URL ({first_line(err)})"
                             ) from None
        self.kind = self.engine.dialect.name
        try:
            self.conn = self.engine.connect()
        except sqlalchemy.exc.SQLAlchemyError as err:
            raise InputError(f"{self.label}: cannot connect ({first_line(err.orig or err)})"
                             if isinstance(err, sqlalchemy.exc.DBAPIError)
                             else f"{self.label}: cannot connect ({first_line(err)})") from None
        self._inspector = sqlalchemy.inspect(self.conn)
        self.conn.rollback()  # reflection opened a transaction; jobs begin their own

    def quote(self, name: str) -> str:
        quoted: str = self.engine.dialect.identifier_preparer.quote_identifier(name)
        return quoted

    def _split(self, table: str) -> tuple[str | None, str]:
        if "." in table:
            schema, _, name = table.partition(".")
            return schema, name
        return None, table

    def table_ref(self, table: str) -> str:
        schema, name = self._split(table)
        return (self.quote(schema) + "." if schema else "") + self.quote(name)

    def placeholders(self, count: int) -> str:
        style = self.engine.dialect.paramstyle
        if style == "qmark":
            return ", ".join("?" * count)
        if style == "numeric":
            return ", ".join(f":{i + 1}" for i in range(count))
        return ", ".join(["%s"] * count)

    def tables(self) -> list[str]:
        self._inspector = self._sa.inspect(self.conn)
        return sorted(self._inspector.get_table_names() + self._inspector.get_view_names())

    def has_table(self, table: str) -> bool:
        schema, name = self._split(table)
        return bool(self._sa.inspect(self.conn).has_table(name, schema=schema))

    def columns(self, table: str) -> list[str]:
        schema, name = self._split(table)
        return [c["name"] for c in self._sa.inspect(self.conn).get_columns(name, schema=schema)]

    def row_key(self, table: str) -> str | None:
        schema, name = self._split(table)
        keys = self._sa.inspect(self.conn).get_pk_constraint(name, schema=schema)
        columns = keys.get("constrained_columns") or []
        return columns[0] if len(columns) == 1 else None

    def execute(self, sql: str, params: Sequence[Any] = ()) -> None:
        self.conn.exec_driver_sql(sql, tuple(params))

    def executemany(self, sql: str, rows: Sequence[Sequence[Any]]) -> None:
        if rows:
            self.conn.exec_driver_sql(sql, [tuple(r) for r in rows])

    def stream(self, sql: str, size: int) -> Iterator[list[tuple[Any, ...]]]:
        # options for this statement only: Connection.execution_options() would change the
        # connection itself, and every later statement would run in a server-side cursor
        result = self.conn.exec_driver_sql(
            sql, execution_options={"stream_results": True, "max_row_buffer": size})
        try:
            for part in result.partitions(size):
                yield [tuple(r) for r in part]
        finally:
            result.close()

    def begin(self) -> None:
        if not self.conn.in_transaction():
            self.conn.begin()

    def commit(self) -> None:
        self.conn.commit()

    def rollback(self) -> None:
        self.conn.rollback()

    def close(self) -> None:
        self.conn.close()
        self.engine.dispose()

    def error_types(self) -> tuple[type[BaseException], ...]:
        return (self._sa.exc.SQLAlchemyError,)


def open_database(target: str, *, create: bool = False, read_only: bool = False) -> Database:
    path = _sqlite_path(target)
    if path is not None:
        return SqliteDatabase(path, create=create, read_only=read_only)
    return AlchemyDatabase(target)


def same_database(a: str, b: str) -> bool:
    pa, pb = _sqlite_path(a), _sqlite_path(b)
    if pa is not None and pb is not None:
        try:
            return os.path.exists(pa) and os.path.exists(pb) and os.path.samefile(pa, pb)
        except OSError:
            return False
    return a == b


class TableSource:
    """Rows of a database table, in a stable order (rowid or primary key when there is one).

    With ``keyed=True`` only ``only`` columns are read, after the row key (for in-place
    updates); the key comes first under the name :data:`KEY_COLUMN`.
    """

    def __init__(self, db: Database, table: str, *, only: Sequence[str] | None = None,
                 keyed: bool = False) -> None:
        db.require_table(table)
        self.db, self.table = db, table
        self.label = f"{db.label} table {table}"
        self.all_columns = db.columns(table)
        self.key = db.row_key(table)
        if keyed and self.key is None:
            raise InputError(f"{self.label}: no primary key to update rows by; write a new "
                             "table instead (-o)")
        self._read = list(only) if only is not None else list(self.all_columns)
        self.keyed = keyed
        self.columns = ([KEY_COLUMN] if keyed else []) + self._read
        self._done = 0
        self._total: int | None = None

    def _key_ref(self) -> str:
        assert self.key is not None
        return "rowid" if self.key == "rowid" else self.db.quote(self.key)

    def select(self) -> str:
        names = ", ".join(self.db.quote(c) for c in self._read)
        if self.keyed:
            names = f"{self._key_ref()}, {names}"
        order = f" ORDER BY {self._key_ref()}" if self.key is not None else ""
        return f"SELECT {names} FROM {self.db.table_ref(self.table)}{order}"

    def count_rows(self) -> None:
        """Count the rows first, so the progress display can show a fraction."""
        for batch in self.db.stream(f"SELECT count(*) FROM {self.db.table_ref(self.table)}", 1):
            self._total = int(batch[0][0])

    def chunks(self, size: int) -> Iterator[Chunk]:
        first = 1
        for batch in self.db.stream(self.select(), size):
            rows = [list(r) for r in batch]
            yield Chunk(self.columns, rows, first)
            first += len(rows)
            self._done += len(rows)

    def fraction(self) -> float | None:
        if self._total is None:
            return None
        return self._done / self._total if self._total else None

    def close(self) -> None:
        """The database is closed by whoever opened it."""


KEY_COLUMN = "\0row-key"


class InPlaceSink:
    """Adds columns to the source table and fills them, all inside one transaction.

    Results go to a temporary staging table while the source is read; one ``UPDATE ... FROM``
    joins them back by the row key at the end, so the table is never changed under an open
    read.
    """

    def __init__(self, source: TableSource, new_columns: Sequence[str], *,
                 overwrite: bool = False, keep: Sequence[str] = ()) -> None:
        db, self.db, self.source = source.db, source.db, source
        self.new_columns = list(new_columns)
        read = [c for c in self.new_columns if c in keep]
        if read:
            raise InputError(f"{source.label}: the column {read[0]!r} is read by this job; "
                             "it is never replaced, choose another name")
        clash = [c for c in self.new_columns if c in source.all_columns]
        if clash and not overwrite:
            raise InputError(f"{source.label}: the column {clash[0]!r} exists already; choose "
                             "another name, or pass --overwrite to replace its values")
        ref = db.table_ref(source.table)
        self.stage = "confspec_stage"
        db.begin()
        for column in self.new_columns:
            if column not in clash:  # existing columns get new values in the same UPDATE
                db.execute(f"ALTER TABLE {ref} ADD COLUMN {db.quote(column)} TEXT")
        key = source._key_ref()
        db.execute(f"CREATE TEMPORARY TABLE {self.stage} AS SELECT {key} AS k FROM {ref} "
                   "WHERE 1 = 0")
        for index in range(len(self.new_columns)):
            db.execute(f"ALTER TABLE {self.stage} ADD COLUMN v{index} TEXT")
        self._sql = (f"INSERT INTO {self.stage} VALUES "
                     f"({db.placeholders(len(self.new_columns) + 1)})")

    def write(self, columns: list[str], rows: list[list[Any]], *,
              plain: bool = False) -> None:
        self.db.executemany(self._sql, rows)

    def commit(self) -> None:
        db, source = self.db, self.source
        ref = db.table_ref(source.table)
        sets = ", ".join(f"{db.quote(c)} = s.v{i}" for i, c in enumerate(self.new_columns))
        db.execute(f"UPDATE {ref} SET {sets} FROM {self.stage} AS s "
                   f"WHERE {ref}.{source._key_ref()} = s.k")
        db.execute(f"DROP TABLE {self.stage}")
        db.commit()

    def abort(self) -> None:
        self.db.rollback()


def _db_value(value: Any) -> Any:
    if value is MISSING:
        return None
    if isinstance(value, dict | list):
        return json.dumps(value, ensure_ascii=False)
    return value


class TableSink:
    """A new table, created and filled inside one transaction (committed at the end)."""

    def __init__(self, db: Database, table: str, *, overwrite: bool = False,
                 like: TableSource | None = None, text_columns: Sequence[str] = ()) -> None:
        self.db, self.table = db, table
        self._like, self._text_columns = like, list(text_columns)
        self._created = False
        self._sql = ""
        db.begin()
        if db.has_table(table):
            if not overwrite:
                db.rollback()
                raise InputError(f"{db.label}: the table {table!r} exists already; choose "
                                 "another name or pass --overwrite")
            db.execute(f"DROP TABLE {db.table_ref(table)}")

    def _create(self, columns: list[str], rows: list[list[Any]]) -> None:
        db, ref = self.db, self.db.table_ref(self.table)
        like = self._like
        if like is not None and like.db is db:
            # same database: copy the declared column types of the source table
            copied = [c for c in columns if c in like.columns]
            names = ", ".join(db.quote(c) for c in copied)
            db.execute(f"CREATE TABLE {ref} AS SELECT {names} FROM "
                       f"{db.table_ref(like.table)} WHERE 1 = 0")
            for column in self._text_columns:
                if column in copied and db.kind == "postgresql":
                    db.execute(f"ALTER TABLE {ref} ALTER COLUMN {db.quote(column)} TYPE TEXT")
            for column in columns:
                if column not in copied:
                    db.execute(f"ALTER TABLE {ref} ADD COLUMN {db.quote(column)} TEXT")
        else:
            kinds = [_sql_type(db, [r[i] for r in rows]) for i in range(len(columns))]
            body = ", ".join(f"{db.quote(c)} {k}".rstrip() for c, k in
                             zip(columns, kinds, strict=True))
            db.execute(f"CREATE TABLE {ref} ({body})")
        self._sql = (f"INSERT INTO {ref} ({', '.join(db.quote(c) for c in columns)}) "
                     f"VALUES ({db.placeholders(len(columns))})")
        self._columns = list(columns)
        self._created = True

    def write(self, columns: list[str], rows: list[list[Any]], *,
              plain: bool = False) -> None:
        if not self._created:
            self._create(columns, rows)
        elif columns != self._columns:
            raise InputError("a row has fields the first rows lack; write JSON Lines instead")
        self.db.executemany(self._sql, [[_db_value(v) for v in row] for row in rows])

    def commit(self) -> None:
        if not self._created:
            raise InputError("nothing to write")  # pragma: no cover - run() writes headers
        self.db.commit()

    def abort(self) -> None:
        self.db.rollback()


def _sql_type(db: Database, values: list[Any]) -> str:
    """A column type for values from a file: TEXT unless every value is a number or bool."""
    seen = {type(v) for v in values if v is not None and v is not MISSING}
    if db.kind == "sqlite":
        return "" if seen and seen <= {int, float, bool} else "TEXT"
    if seen and seen <= {bool}:
        return "BOOLEAN"
    if seen and seen <= {int}:
        return "BIGINT"
    if seen and seen <= {int, float}:
        return "DOUBLE PRECISION"
    return "TEXT"


