"""Level designations in the data-cleaning job: --level, --term-column, --j-column."""

from __future__ import annotations

import sqlite3
from pathlib import Path

import pytest

from .runner import cli, read_csv, write_csv

# (species, level designation, expected code or "ok"); terms and parents checked by hand
# against the LS coupling rules, ground levels from NIST ASD.
LEVEL_ROWS = [
    ("Fe", "3d6 4s2 5D4", "ok"),  # Fe I ground level (NIST ASD); the [Ar] core is implied
    ("Fe+", "3d6(5D)4s a6D9/2", "ok"),  # Fe II ground level (NIST ASD)
    ("", "3d7(4F)4s4p(3P°) z6G°13/2", "ok"),
    ("", "2p2 1P", "term-not-allowed"),
    ("", "3d6(5D)4s 8D", "term-not-allowed"),
    ("", "3d6(4S)", "parent-not-allowed"),
    ("", "2p2 3P3", "j-not-allowed"),
    ("", "2p 2P", "parity-mismatch"),
    ("Co", "3d6 4s2 5D4", "electron-count"),
    ("", "2p1/2^3 2P°1/2", "pauli-limit"),
    ("", "[Xx] 3s 2S1/2", "unknown-core"),
    ("", "3d6 4s2 5D4 ?", "ok"),
]


@pytest.fixture()
def levels(tmp_path: Path) -> Path:
    rows = [[str(i), sp, text] for i, (sp, text, _) in enumerate(LEVEL_ROWS, 1)]
    return write_csv(tmp_path / "levels.csv", ["id", "species", "level"], rows)


def test_check_reports_the_level_codes_per_row(levels: Path, tmp_path: Path) -> None:
    report = tmp_path / "report.csv"
    done = cli("check", levels, "-c", "level", "-s", "species", "--level", "-r", report)
    assert done.returncode == 1, done.stderr
    rows = read_csv(report)
    assert len(rows) == len(LEVEL_ROWS)
    assert [r["code"] or "ok" for r in rows] == [code for _, _, code in LEVEL_ROWS]
    assert rows[1]["normalized"] == "3d6(5D) 4s1 a6D9/2"
    assert "term-not-allowed" in done.stdout


def test_normalize_levels_keeps_every_row(levels: Path, tmp_path: Path) -> None:
    out = tmp_path / "out.csv"
    done = cli("normalize", levels, "-c", "level", "--level", "-o", out, "--style", "unicode")
    assert done.returncode == 1
    rows = read_csv(out)
    assert len(rows) == len(LEVEL_ROWS)
    assert rows[0]["level"] == "3d⁶ 4s² ⁵D₄" and rows[0]["status"] == "ok"
    assert rows[3]["level"] == "2p2 1P" and rows[3]["code"] == "term-not-allowed"


def test_term_and_j_in_their_own_columns(tmp_path: Path) -> None:
    data = write_csv(tmp_path / "t.csv", ["species", "configuration", "term", "J"], [
        ["Fe", "3d6 4s2", "5D", "4"],
        ["Fe+", "3d6(5D)4s", "a6D", "4.5"],  # J written as a decimal in some tables
        ["Fe", "3d6 4s2", "5D", "5"],
        ["", "2p", "2P°", "1/2"],
        ["", "2p", "2P", "1/2"],
        ["", "2p2", "3P2", ""],  # J inside the term cell
    ])
    out = tmp_path / "out.csv"
    done = cli("normalize", data, "-c", "configuration", "-s", "species", "--term-column",
               "term", "--j-column", "J", "-o", out)
    assert done.returncode == 1, done.stderr
    rows = read_csv(out)
    assert [r["status"] for r in rows] == ["ok", "ok", "error", "ok", "error", "ok"]
    assert [r["code"] for r in rows][2:5] == ["j-not-allowed", "", "parity-mismatch"]
    assert rows[1]["configuration"] == "3d6(5D) 4s1" and rows[1]["term"] == "a6D"


def test_levels_in_sqlite(levels: Path, tmp_path: Path) -> None:
    db = tmp_path / "levels.db"
    with sqlite3.connect(db) as conn:
        conn.execute("CREATE TABLE lv (id INTEGER PRIMARY KEY, species TEXT, level TEXT)")
        conn.executemany("INSERT INTO lv VALUES (?, ?, ?)",
                         [(i, sp or None, text) for i, (sp, text, _) in
                          enumerate(LEVEL_ROWS, 1)])
    done = cli("normalize", db, "--table", "lv", "-c", "level", "-s", "species", "--level",
               "--in-place-column", "clean")
    assert done.returncode == 1, done.stderr
    with sqlite3.connect(db) as conn:
        got = conn.execute("SELECT clean_code FROM lv ORDER BY id").fetchall()
    assert [code or "ok" for (code,) in got] == [c for _, _, c in LEVEL_ROWS]


def test_level_options_are_checked(levels: Path) -> None:
    done = cli("check", levels, "-c", "level", "--j-column", "J")
    assert done.returncode == 2 and "--j-column needs --term-column" in done.stderr
    done = cli("check", levels, "-c", "level", "--level", "--fill-core")
    assert done.returncode == 2 and len(done.stderr.strip().splitlines()) == 1
