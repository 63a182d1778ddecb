"""Level designations in the data-cleaning job: --level, --term-column, --j-column."""

from __future__ import annotations

import json
import sqlite3
import subprocess
from pathlib import Path

import pytest

from .runner import COMMAND, cli, read_csv, write_csv

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
    done = cli("check", levels, "-c", "level", "--level", "--parity", "sometimes")
    assert done.returncode == 2 and "invalid choice: 'sometimes'" in done.stderr


def test_repairs_and_level_columns_work_in_one_pass(tmp_path: Path) -> None:
    # NIST ASD 'Ground Config.' cells leave closed inner shells out and come with a term
    # column (Fe II ground level 3d6(5D)4s a6D9/2, N I 2p2(3P)3p 4D°7/2: NIST ASD)
    data = write_csv(tmp_path / "ground.csv", ["species", "configuration", "term", "J"], [
        ["Fe II", "3d6(5D)4s", "a6D", "9/2"],
        ["N I", "2s2.2p2.(3P).3p", "4D*", "7/2"],
        ["Na I", "2p6.3s", "2S", "1/2"],
        ["Fe II", "3d6(5D)4sÂ¹", "a6D", "9/2"],  # mojibake of a superscript one
    ])
    out = tmp_path / "out.csv"
    done = cli("normalize", data, "-c", "configuration", "-s", "species", "--term-column",
               "term", "--j-column", "J", "--fill-core", "--repair-text", "-o", out)
    assert done.returncode == 0, done.stderr
    rows = read_csv(out)
    assert [r["configuration"] for r in rows] == [
        "[Ar] 3d6(5D) 4s1", "[He] 2s2 2p2(3P) 3p1", "[Ne] 3s1", "[Ar] 3d6(5D) 4s1"]
    assert rows[0]["fixes"] == "fill-core:[Ar]"
    assert rows[2]["fixes"] == "fill-core:1s2 2s2"
    assert rows[3]["fixes"].split(",") == ["repair-text", "fill-core:[Ar]"]


def test_the_parity_convention_is_decided_per_column(tmp_path: Path) -> None:
    # C III 2s2p 3P° and 2p2 3P (NIST ASD), written without parity marks as many tables do
    unmarked = write_csv(tmp_path / "unmarked.csv", ["configuration", "term", "J"], [
        ["1s2.2s2", "1S", "0"], ["1s2.2s.2p", "3P", "1"], ["1s2.2p2", "3P", "2"]])
    out = tmp_path / "out.csv"
    done = cli("normalize", unmarked, "-c", "configuration", "--term-column", "term",
               "--j-column", "J", "-o", out, "--summary-json", tmp_path / "s.json")
    assert done.returncode == 0, done.stderr
    assert "no row of 'term' writes an odd mark, so the column is read as unmarked" in \
        done.stdout
    assert [r["fixes"] for r in read_csv(out)] == ["", "parity-from-configuration", ""]
    assert json.loads((tmp_path / "s.json").read_text())["parity"] == "unmarked"
    # the same rows read as marked: the odd row fails, and the message does not call an
    # unmarked term "marked even"
    report = tmp_path / "r.csv"
    done = cli("check", unmarked, "-c", "configuration", "--term-column", "term",
               "--j-column", "J", "--parity", "marked", "-r", report)
    assert done.returncode == 1
    flagged = [r for r in read_csv(report) if r["status"] == "error"]
    assert [r["code"] for r in flagged] == ["parity-mismatch"]
    assert "has no odd mark, so it reads as even" in flagged[0]["message"]
    assert "marked even" not in flagged[0]["message"]
    # one odd mark anywhere in the column: the automatic convention reads it as marked
    mixed = write_csv(tmp_path / "mixed.csv", ["configuration", "term", "J"], [
        ["1s2.2s.2p", "3P*", "1"], ["1s2.2s.3p", "3P", "1"]])
    done = cli("check", mixed, "-c", "configuration", "--term-column", "term", "--j-column",
               "J", "-r", tmp_path / "r2.csv")
    assert done.returncode == 1 and "row 1 of 'term' writes an odd mark" in done.stdout
    assert [r["code"] for r in read_csv(tmp_path / "r2.csv")] == ["", "parity-mismatch"]


def test_the_parity_convention_holds_for_standard_input() -> None:
    # standard input cannot be read twice: the rows are held until the decision, none lost
    done = subprocess.run([*COMMAND, "check", "-", "--input-format", "csv", "-c",
                           "configuration", "--term-column", "term"],
                          input="configuration,term\n2s.2p,3P\n2p2,3P\n", capture_output=True,
                          text=True, check=False, timeout=120)
    assert done.returncode == 0, done.stderr
    assert "read as unmarked" in done.stdout and "rows read            2" in done.stdout


def test_an_invalid_row_names_fixes_that_were_recorded_not_rewritten(tmp_path: Path) -> None:
    # the parents of Fe II 3d6(5D)4s (NIST ASD) are recorded, not rewritten: the summary
    # says so instead of showing a repaired text that does not exist
    data = write_csv(tmp_path / "c.csv", ["configuration", "species"], [["3d6(5D)4s", "Fe"]])
    done = cli("check", data, "-c", "configuration", "-s", "species")
    assert done.returncode == 1
    assert "recorded parents:(5D)" in done.stdout
    assert "None" not in done.stdout
