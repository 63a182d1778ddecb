"""The ``confspec`` command, end to end on files and SQLite (in this process; see ``runner``)."""

from __future__ import annotations

import csv
import gzip
import hashlib
import json
import os
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import pytest

import confspec

from .runner import COMMAND, cli, cli_process, read_csv, write_csv

REPORT_COLUMNS = ["row", "input", "status", "code", "message", "normalized", "fixes"]


def digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


# Rows for a small mixed table: (species, configuration, expected status without repairs)
MIXED = [
    ("Fe", "[Ar] 3d6 4s2", "ok"),
    ("Fe", "4s^2 3d^{6} [Ar]", "error"),  # core after the subshells
    ("Fe2+", "[Ar] 3d⁶", "ok"),
    ("Na", "1s22s22p63s1", "ok"),
    ("O2-", "1s2 2s2 2p7", "error"),
    ("Cu", "[ar]3d104s1", "ok"),
    ("Fe", "3d6 4s2", "error"),  # valence only
    ("Ne", "1S2 2S2 2P6", "error"),  # upper case
    ("Fe", "[Ar] 3dâ\x81¶ 4sÂ²", "error"),  # mojibake
    ("Xx", "1s2", "error"),
]


@pytest.fixture
def mixed(tmp_path: Path) -> Path:
    return write_csv(tmp_path / "mixed.csv", ["id", "species", "configuration"],
                     [[str(i), sp, cf] for i, (sp, cf, _) in enumerate(MIXED, 1)])


# ----------------------------------------------------------------------------- check
def test_check_summarizes_and_reports_every_row(mixed: Path, tmp_path: Path) -> None:
    report = tmp_path / "report.csv"
    done = cli("check", mixed, "--column", "configuration", "--species-column", "species",
               "--report", report)
    assert done.returncode == 1, done.stderr
    assert done.stderr == ""  # no progress display when stderr is not a terminal
    out = done.stdout
    assert "rows read           10" in out
    assert "valid                4 (40.0%)" in out
    assert "invalid              6" in out
    assert "pauli-limit 1" in out and "electron-count 1" in out
    # the first bad row, with its caret under the misplaced core
    assert "row 2 (line 3): '4s^2 3d^{6} [Ar]'" in out
    assert "          4s^2 3d^{6} [Ar]\n                      ^" in out
    rows = read_csv(report)
    assert list(rows[0]) == REPORT_COLUMNS
    assert [r["row"] for r in rows] == [str(i) for i in range(1, 11)]
    assert [r["input"] for r in rows] == [cf for _, cf, _ in MIXED]
    assert [r["status"] for r in rows] == [st for _, _, st in MIXED]
    assert rows[3]["normalized"] == "[Ne] 3s1"
    assert rows[4]["code"] == "pauli-limit"
    assert rows[4]["message"] == "2p holds at most 6 electrons, not 7 (at character 11)"
    assert rows[9]["code"] == "unknown-element"
    assert rows[9]["message"].startswith("species 'Xx': ")
    assert all(r["fixes"] == "" for r in rows)


def test_check_exit_0_when_all_valid(tmp_path: Path) -> None:
    data = write_csv(tmp_path / "good.csv", ["c"], [["[Ar] 3d6 4s2"], ["1s2"], ["[Xe] 6s1"]])
    done = cli("check", data, "-c", "c")
    assert done.returncode == 0, done.stdout + done.stderr
    assert "invalid              0" in done.stdout


def test_strict_flags_valid_but_non_canonical(tmp_path: Path) -> None:
    data = write_csv(tmp_path / "s.csv", ["c"], [["[Ar] 3d6 4s2"], ["[ar] 4s2 3d6"]])
    report = tmp_path / "r.csv"
    assert cli("check", data, "-c", "c", "-r", report).returncode == 0
    assert [r["status"] for r in read_csv(report)] == ["ok", "ok"]
    done = cli("check", data, "-c", "c", "--strict", "-r", report, "--overwrite")
    rows = read_csv(report)
    assert [r["code"] for r in rows] == ["", "non-canonical"]
    assert rows[1]["normalized"] == "[Ar] 3d6 4s2"
    assert done.returncode == 1


# every code a configuration (and species) check can give, with an input that gives it
REACHABLE = [
    pytest.param("", "", "empty", id="empty"),
    pytest.param("1s" * 3000, "", "too-long", id="too-long"),
    pytest.param("[Ar] 3d6 % 4s2", "", "syntax", id="syntax"),
    pytest.param("2pâ\x81¶", "", "mojibake", id="mojibake"),
    pytest.param("1S2 2S2", "", "uppercase-subshell", id="uppercase-subshell"),
    pytest.param("2p110s1", "", "ambiguous-run-together", id="ambiguous-run-together"),
    pytest.param("[Ar] 3d?", "", "unknown-occupancy", id="unknown-occupancy"),
    pytest.param("2p-1 3s1", "", "ambiguous-hole", id="ambiguous-hole"),
    pytest.param("3d6 4s2 [Ar]", "", "misplaced-core", id="misplaced-core"),
    pytest.param("1s2 2d1", "", "invalid-subshell", id="invalid-subshell"),
    pytest.param("1s2 2s2 2p7", "", "pauli-limit", id="pauli-limit"),
    pytest.param("2p3 2p2", "", "duplicate-subshell", id="duplicate-subshell"),
    pytest.param("[Xx] 3s2", "", "unknown-core", id="unknown-core"),
    pytest.param("[Ar] 3p6 4s1", "", "core-overlap", id="core-overlap"),
    pytest.param("2p^-1 3s2", "", "hole-without-reference", id="hole-without-reference"),
    pytest.param("[He] 1s^-3", "", "hole-exceeds", id="hole-exceeds"),
    pytest.param("1s2", "Qq", "unknown-element", id="unknown-element"),
    pytest.param("1s1", "He3+", "impossible-charge", id="impossible-charge"),
    pytest.param("[Ar] 3d6", "Fe", "electron-count", id="electron-count"),
    pytest.param("[ar] 3d6 4s2", "Fe", "non-canonical", id="non-canonical"),
]
# codes that are not about a configuration cell, and why the CLI does not report them per row
NOT_ROW_CODES = {
    "unknown-option": "a usage error: argparse refuses an unknown --style/--core/--order",
    "term-syntax": "a standalone term symbol (parse_term), not a configuration cell",
    "invalid-term": "a standalone term symbol (parse_term), not a configuration cell",
    "parity-mismatch": "level columns (--level): reached in tests/cli/test_levels.py",
    "term-not-allowed": "level columns (--level): reached in tests/cli/test_levels.py",
    "j-not-allowed": "level columns (--level): reached in tests/cli/test_levels.py",
    "parent-not-allowed": "level columns (--level): reached in tests/cli/test_levels.py",
    "too-many-terms": "listing terms (confspec.terms), not a cell check",
    "jj-configuration": "LS terms of an nlj configuration (confspec.terms), not a cell check",
    "series-limit": "level columns: the 'Limit' row of a level table, reached in "
                    "tests/test_published_tables.py",
    "unknown-xray-level": "X-ray level names: not a configuration cell",
    "unknown-column": "a dataframe adapter's missing column: tests/adapters/test_cells.py",
    "number-too-large": "an n above 999: reached in tests/notation/test_bounds.py",
    "out-of-range": "a numeric argument of the hydrogen-like functions, not a cell",
    "scf-not-converged": "the SCF solver (confspec.scf), not a cell check",
    "scf-option": "the SCF solver's options, not a cell check",
    "scf-unavailable": "the SCF solver without numpy/scipy, not a cell check",
    "not-d-block": "a chemistry question (d-electron counts), not a cell check",
    "d-count-out-of-range": "a chemistry question (d-electron counts), not a cell check",
    "several-open-subshells": "seniority of one open subshell (confspec.seniority_terms), "
                              "not a cell check",
    "wrong-type": "a Python argument of the wrong type (tests/chemistry/test_argument_shapes.py); "
                  "cells are always text",
    "empty-subshell": "a shielding question, not a cell check",
    "no-reference-data": "a reference-table lookup, not a cell check",
}


def test_every_error_code_is_reachable(tmp_path: Path) -> None:
    rows = [[str(i), p.values[1], p.values[0]] for i, p in enumerate(REACHABLE, 1)]
    data = write_csv(tmp_path / "codes.csv", ["id", "species", "configuration"], rows)
    report = tmp_path / "codes.jsonl"
    done = cli("check", data, "-c", "configuration", "-s", "species", "--strict", "-r", report)
    assert done.returncode == 1
    found = [json.loads(line)["code"] for line in report.read_text("utf-8").splitlines()]
    assert found == [p.values[2] for p in REACHABLE]
    covered = set(found) | set(NOT_ROW_CODES)
    assert covered == set(confspec.ERROR_CODES), "classify each new error code here"


def test_unknown_option_is_a_usage_error(mixed: Path, tmp_path: Path) -> None:
    done = cli("normalize", mixed, "-c", "configuration", "-o", tmp_path / "o.csv",
               "--style", "fancy")
    assert done.returncode == 2
    assert "invalid choice: 'fancy'" in done.stderr
    assert len(done.stderr.strip().splitlines()) == 1


# ----------------------------------------------------------------------------- normalize
def test_normalize_keeps_every_row_in_order_and_flags_bad_ones(mixed: Path,
                                                               tmp_path: Path) -> None:
    before = digest(mixed)
    out = tmp_path / "out.csv"
    done = cli("normalize", mixed, "-c", "configuration", "-s", "species", "-o", out)
    assert done.returncode == 1
    assert digest(mixed) == before  # the input is never modified
    rows = read_csv(out)
    assert list(rows[0]) == ["id", "species", "configuration", "status", "code", "fixes"]
    assert [r["id"] for r in rows] == [str(i) for i in range(1, 11)]
    by_id = {r["id"]: r for r in rows}
    assert by_id["3"]["configuration"] == "[Ar] 3d6"
    assert by_id["4"]["configuration"] == "[Ne] 3s1"
    assert by_id["6"]["configuration"] == "[Ar] 3d10 4s1"
    # unreadable or inconsistent rows keep their text, flagged; nothing is repaired silently
    for key, (_, text, status) in zip(by_id, MIXED, strict=True):
        assert by_id[key]["status"] == status
        if status == "error":
            assert by_id[key]["configuration"] == text
            assert by_id[key]["code"]
    assert all(r["fixes"] == "" for r in rows)
    assert [p.name for p in tmp_path.iterdir() if p.name.startswith(".")] == []


@pytest.mark.parametrize(("flag", "row_id", "fixed", "fix"), [
    pytest.param("--fill-core", "7", "[Ar] 3d6 4s2", "fill-core:[Ar]", id="fill-core"),
    pytest.param("--accept-uppercase", "8", "[He] 2s2 2p6", "accept-uppercase", id="uppercase"),
    pytest.param("--repair-text", "9", "[Ar] 3d6 4s2", "repair-text", id="repair-text"),
])
def test_repairs_are_applied_only_on_request_and_recorded(
        mixed: Path, tmp_path: Path, flag: str, row_id: str, fixed: str, fix: str) -> None:
    out, report = tmp_path / "out.csv", tmp_path / "report.csv"
    done = cli("normalize", mixed, "-c", "configuration", "-s", "species", "-o", out, flag,
               "-r", report)
    assert done.returncode == 1
    rows = {r["id"]: r for r in read_csv(out)}
    assert rows[row_id]["configuration"] == fixed
    assert rows[row_id]["status"] == "ok"
    assert rows[row_id]["fixes"] == fix
    assert [r["fixes"] for r in rows.values() if r["id"] != row_id] == [""] * 9
    assert read_csv(report)[int(row_id) - 1]["fixes"] == fix
    assert "repaired             1" in done.stdout


def test_uppercase_repair_cannot_turn_a_term_into_a_configuration(tmp_path: Path) -> None:
    # '5D4' is Fe's ground term pasted into the wrong column: read as 5d4 it has 4 electrons
    data = write_csv(tmp_path / "t.csv", ["species", "c"], [["Fe", "5D4"]])
    report = tmp_path / "r.csv"
    cli("check", data, "-c", "c", "-s", "species", "--accept-uppercase", "-r", report)
    (row,) = read_csv(report)
    assert (row["status"], row["code"], row["fixes"]) == ("error", "electron-count",
                                                          "accept-uppercase")


@pytest.mark.parametrize("style,expected", [
    pytest.param("unicode", "[Ar] 3d⁶ 4s²", id="unicode"),
    pytest.param("latex", r"[\mathrm{Ar}]\,3d^{6}\,4s^{2}", id="latex"),
    pytest.param("caret", "[Ar] 3d^6 4s^2", id="caret"),
])
def test_normalize_style_options(tmp_path: Path, style: str, expected: str) -> None:
    data = write_csv(tmp_path / "x.csv", ["c"], [["4s2 3d6 1s2 2s2 2p6 3s2 3p6"]])
    out = tmp_path / "x.out.csv"
    assert cli("normalize", data, "-c", "c", "-o", out, "--style", style).returncode == 0
    assert read_csv(out)[0]["c"] == expected
    assert cli("normalize", data, "-c", "c", "-o", out, "--core", "expand",
               "--order", "filling", "--overwrite").returncode == 0
    assert read_csv(out)[0]["c"] == "1s2 2s2 2p6 3s2 3p6 4s2 3d6"


FORMATS = ["csv", "tsv", "jsonl", "parquet", "csv.gz"]


def _write_input(path: Path, fmt: str, rows: list[tuple[str, str]]) -> None:
    if fmt in ("csv", "csv.gz"):
        text = "id,c\n" + "".join(f'{i},"{c}"\n' for i, c in rows)
        if fmt == "csv.gz":
            path.write_bytes(gzip.compress(text.encode("utf-8")))
        else:
            path.write_text(text, "utf-8")
    elif fmt == "tsv":
        path.write_text("id\tc\n" + "".join(f"{i}\t{c}\n" for i, c in rows), "utf-8")
    elif fmt == "jsonl":
        path.write_text("".join(json.dumps({"id": i, "c": c}) + "\n" for i, c in rows), "utf-8")
    else:
        import pyarrow as pa
        import pyarrow.parquet as pq

        pq.write_table(pa.table({"id": [int(i) for i, _ in rows], "c": [c for _, c in rows]}),
                       path, row_group_size=7)


def _read_output(path: Path, fmt: str) -> list[dict[str, object]]:
    if fmt in ("csv", "csv.gz"):
        text = gzip.decompress(path.read_bytes()).decode() if fmt == "csv.gz" else \
            path.read_text("utf-8")
        return list(csv.DictReader(text.splitlines()))
    if fmt == "tsv":
        return list(csv.DictReader(path.read_text("utf-8").splitlines(), dialect="excel-tab"))
    if fmt == "jsonl":
        return [json.loads(line) for line in path.read_text("utf-8").splitlines()]
    import pyarrow.parquet as pq

    return list(pq.read_table(path).to_pylist())


ROWS = [(str(i), c) for i, c in enumerate(
    ["[Ar] 3d6 4s2", "1s2 2s2 2p7", "1s22s22p6", "", "[Ne] 2p^-1 3s2", "Fe", "3d 6 4s 2"] * 5,
    1)]


@pytest.mark.parametrize("fmt", FORMATS)
def test_rows_in_equal_rows_out_for_every_format(tmp_path: Path, fmt: str) -> None:
    source = tmp_path / f"in.{fmt}"
    _write_input(source, fmt, ROWS)
    out = tmp_path / f"out.{fmt}"
    report = tmp_path / "report.csv"
    done = cli("normalize", source, "-c", "c", "-o", out, "-r", report, "--chunk-rows", "4")
    assert done.returncode == 1, done.stderr
    rows = _read_output(out, fmt)
    assert len(rows) == len(ROWS) == len(read_csv(report))
    assert [str(r["id"]) for r in rows] == [i for i, _ in ROWS]
    assert [r["c"] for r in rows[:7]] == ["[Ar] 3d6 4s2", "1s2 2s2 2p7", "[He] 2s2 2p6",
                                          "",
                                          "[He] 2s2 2p5 3s2", "Fe", "3d6 4s2"]
    if fmt == "parquet":  # the input's integer column keeps its type
        import pyarrow.parquet as pq

        assert str(pq.read_schema(out).field("id").type) == "int64"
    check = cli("check", source, "-c", "c", "-r", report, "--overwrite")
    assert check.returncode == 1
    assert f"rows read   {len(ROWS):>10,}" in check.stdout


def test_jsonl_rows_keep_their_own_keys(tmp_path: Path) -> None:
    source = tmp_path / "in.jsonl"
    source.write_text('{"c": "1s22s1", "a": 1}\n\n{"c": "2p7"}\n{"c": "1s2", "b": [1, 2]}\n',
                      "utf-8")
    out = tmp_path / "out.jsonl"
    cli("normalize", source, "-c", "c", "-o", out)
    rows = [json.loads(line) for line in out.read_text("utf-8").splitlines()]
    assert rows == [
        {"c": "[He] 2s1", "a": 1, "status": "ok", "code": None, "fixes": None},
        {"c": "2p7", "status": "error", "code": "pauli-limit", "fixes": None},
        {"c": "1s2", "b": [1, 2], "status": "ok", "code": None, "fixes": None}]
    as_csv = tmp_path / "out.csv"
    cli("normalize", source, "-c", "c", "-o", as_csv)
    assert [r["a"] for r in read_csv(as_csv)] == ["1", "", ""]
    assert read_csv(as_csv)[2]["b"] == "[1, 2]"


def test_an_existing_output_survives_a_failed_run(tmp_path: Path) -> None:
    source = tmp_path / "bad.csv"
    source.write_text("c\n" + "1s2\n" * 50 + '"unterminated\n', "utf-8")
    out = tmp_path / "out.csv"
    out.write_text("precious\n", "utf-8")
    done = cli("normalize", source, "-c", "c", "-o", out, "--chunk-rows", "10")
    assert done.returncode == 2
    assert out.read_text("utf-8") == "precious\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["bad.csv", "out.csv"]


def test_output_may_not_be_the_input(mixed: Path) -> None:
    before = digest(mixed)
    done = cli("normalize", mixed, "-c", "configuration", "-o", mixed)
    assert done.returncode == 2
    assert "never modified" in done.stderr
    assert digest(mixed) == before


# ----------------------------------------------------------------------------- bad input
def _bad_inputs(tmp_path: Path) -> dict[str, tuple[list[str], str]]:
    good = write_csv(tmp_path / "good.csv", ["a", "c"], [["1", "1s2"]])
    latin = tmp_path / "latin.csv"
    latin.write_bytes(b"c\n1s2\n1s2\n3d\xb6\n")
    quote = tmp_path / "quote.csv"
    quote.write_text('c\n1s2\n"1s2"x\n', "utf-8")
    ragged = tmp_path / "ragged.csv"
    ragged.write_text("a,c\n1,1s2\n2,1s2,extra\n", "utf-8")
    jsonl = tmp_path / "broken.jsonl"
    jsonl.write_text('{"c": "1s2"}\n{"c": \n', "utf-8")
    notparquet = tmp_path / "fake.parquet"
    notparquet.write_text("hello", "utf-8")
    db = tmp_path / "x.db"
    sqlite3.connect(db).execute("CREATE TABLE t (c TEXT)").connection.commit()
    empty = tmp_path / "empty.csv"
    empty.write_text("", "utf-8")
    return {
        "missing-file": (["check", str(tmp_path / "nope.csv"), "-c", "c"], "no such file"),
        "missing-column": (["check", str(good), "-c", "config"],
                           "no column 'config'"),
        "encoding": (["check", str(latin), "-c", "c"], "line 4: not readable as utf-8-sig"),
        "malformed-quote": (["check", str(quote), "-c", "c"], "line 3: malformed CSV"),
        "ragged-row": (["check", str(ragged), "-c", "c"], "line 3: 3 fields where the header"),
        "bad-json": (["check", str(jsonl), "-c", "c"], "line 2: not valid JSON"),
        "not-parquet": (["check", str(notparquet), "-c", "c"], "not a readable Parquet file"),
        "unknown-table": (["check", str(db), "--table", "nope", "-c", "c"],
                          "no table 'nope'; tables: t"),
        "no-table-option": (["check", str(db), "-c", "c"], "needs --table"),
        "unknown-extension": (["check", str(tmp_path / "good.xlsx"), "-c", "c"],
                              "cannot tell the format"),
        "empty-file": (["check", str(empty), "-c", "c"], "the file is empty"),
        "missing-db": (["check", f"sqlite:///{tmp_path / 'none.db'}", "-t", "t", "-c", "c"],
                       "no such database file"),
        "normalize-without-output": (["normalize", str(good), "-c", "c"], "give an output"),
        "missing-option": (["check", str(good)], "the following arguments are required"),
    }


BAD = ["missing-file", "missing-column", "encoding", "malformed-quote", "ragged-row",
       "bad-json", "not-parquet", "unknown-table", "no-table-option", "unknown-extension",
       "empty-file", "missing-db", "normalize-without-output", "missing-option"]


@pytest.mark.parametrize("case", BAD)
def test_bad_input_is_one_line_and_exit_2(tmp_path: Path, case: str) -> None:
    (tmp_path / "good.xlsx").write_text("x", "utf-8")
    args, expected = _bad_inputs(tmp_path)[case]
    done = cli(*args)
    assert done.returncode == 2, done.stdout + done.stderr
    assert "Traceback" not in done.stderr
    assert len(done.stderr.strip().splitlines()) == 1, done.stderr
    assert expected in done.stderr
    assert done.stdout == ""


# ----------------------------------------------------------------------------- SQLite
def test_sqlite_round_trip_new_table_and_in_place(mixed: Path, tmp_path: Path) -> None:
    db = tmp_path / "atoms.db"
    url = f"sqlite:///{db}"
    done = cli("normalize", mixed, "-c", "configuration", "-s", "species", "-o", url,
               "--output-table", "atoms", "--fill-core")
    assert done.returncode == 1, done.stderr
    con = sqlite3.connect(db)
    rows = con.execute("SELECT id, configuration, status, fixes FROM atoms ORDER BY rowid"
                       ).fetchall()
    assert [r[0] for r in rows] == [str(i) for i in range(1, 11)]
    assert rows[6][1:] == ("[Ar] 3d6 4s2", "ok", "fill-core:[Ar]")
    con.close()

    again = cli("normalize", mixed, "-c", "configuration", "-o", url, "--output-table", "atoms")
    assert again.returncode == 2 and "exists already" in again.stderr

    check = cli("check", url, "-t", "atoms", "-c", "configuration", "-s", "species")
    assert check.returncode == 1 and "rows read           10" in check.stdout

    copy = cli("normalize", url, "-t", "atoms", "-c", "configuration", "-o", url,
               "--status-column", "s2", "--code-column", "c2", "--fixes-column", "f2",
               "--style", "unicode")
    assert copy.returncode == 1, copy.stderr
    con = sqlite3.connect(db)
    assert con.execute("SELECT count(*) FROM atoms_normalized").fetchone() == (10,)
    assert con.execute("SELECT configuration FROM atoms_normalized WHERE id = '1'"
                       ).fetchone() == ("[Ar] 3d⁶ 4s²",)
    con.close()

    inplace = cli("normalize", db, "-t", "atoms", "-c", "configuration",
                  "--in-place-column", "canonical", "--style", "caret")
    assert inplace.returncode == 1, inplace.stderr
    con = sqlite3.connect(db)
    cols = [r[1] for r in con.execute("PRAGMA table_info(atoms)")]
    assert cols[-4:] == ["canonical", "canonical_status", "canonical_code", "canonical_fixes"]
    got = dict(con.execute("SELECT id, canonical FROM atoms").fetchall())
    assert got["1"] == "[Ar] 3d^6 4s^2" and got["5"] == "1s2 2s2 2p7"
    con.close()

    clash = cli("normalize", db, "-t", "atoms", "-c", "configuration",
                "--in-place-column", "canonical")
    assert clash.returncode == 2 and "exists already" in clash.stderr


def test_sqlite_rollback_leaves_no_table(tmp_path: Path) -> None:
    source = tmp_path / "bad.csv"
    source.write_text("c\n" + "1s2\n" * 30 + "1s2,extra\n", "utf-8")
    db = tmp_path / "out.db"
    sqlite3.connect(db).close()
    done = cli("normalize", source, "-c", "c", "-o", db, "--output-table", "t",
               "--chunk-rows", "5")
    assert done.returncode == 2
    con = sqlite3.connect(db)
    assert con.execute("SELECT name FROM sqlite_master").fetchall() == []
    con.close()


# ----------------------------------------------------------------------------- running
@pytest.mark.slow
def test_jobs_give_the_same_output(tmp_path: Path) -> None:
    values = [f"[Ar] 3d{i % 11} 4s{i % 3}" if i % 7 else f"2p{i % 9}" for i in range(3000)]
    source = write_csv(tmp_path / "many.csv", ["c"], [[v] for v in values])
    one, two = tmp_path / "one.csv", tmp_path / "two.csv"
    # a worker pool is started from a real process, as a user's shell would start it
    assert cli_process("normalize", source, "-c", "c", "-o", one,
                       "--chunk-rows", "100").returncode == 1
    assert cli_process("normalize", source, "-c", "c", "-o", two, "--chunk-rows", "100",
                       "--jobs", "2", "--cache-size", "5").returncode == 1
    assert one.read_bytes() == two.read_bytes()


def test_progress_only_when_asked_or_on_a_terminal(mixed: Path) -> None:
    quiet = cli("check", mixed, "-c", "configuration")
    assert quiet.stderr == ""
    loud = cli("check", mixed, "-c", "configuration", "--progress", "always")
    assert "rows" in loud.stderr and "rows read" not in loud.stderr


# ----------------------------------------------------------------------------- show, ground
def test_show_valid_configuration() -> None:
    done = cli("show", "[ar] 4s^2 3d^{6}", "--species", "Fe")
    assert done.returncode == 0
    out = done.stdout
    for expected in ("canonical      [Ar] 3d6 4s2", "expanded       1s2 2s2 2p6 3s2 3p6 3d6 4s2",
                     "unicode        [Ar] 3d⁶ 4s²", "electrons      26",
                     "electron count matches", "<- this configuration", "measured",
                     "Hund term      5D4", "Slater's rules", "no problems"):
        assert expected in out, expected
    # Slater's rules for Fe 3d: S = 5 × 0.35 + 18 × 1.00 = 19.75 (Slater, Phys. Rev. 36, 57 (1930))
    assert "3d   Z_eff =   6.25   S =  19.75" in out


def test_show_problems_with_carets_exit_1() -> None:
    done = cli("show", "1s2 2s2 2p7 3d11")
    assert done.returncode == 1
    assert "2p holds at most 6 electrons, not 7 [pauli-limit]\n      1s2 2s2 2p7 3d11\n" \
           "                ^" in done.stdout
    assert "3d holds at most 10 electrons, not 11" in done.stdout


def test_ground_with_provenance() -> None:
    done = cli("ground", "Fe", "Fe III", "Fe7+", "Qq")
    assert done.returncode == 1
    lines = done.stdout.splitlines()
    # NIST ASD ground levels: Fe [Ar] 3d6 4s2 5D4, Fe2+ [Ar] 3d6 5D4 (from memory)
    assert lines[0].split() == ["Fe", "[Ar]", "3d6", "4s2", "5D4"]
    assert lines[1].strip().startswith("measured; source: NIST")
    assert lines[2].split() == ["Fe2+", "[Ar]", "3d6", "5D4"]
    assert lines[5].strip().startswith("rule;")
    assert "'Qq' is not an element symbol [unknown-element]" in done.stdout


def test_codes_lists_every_code() -> None:
    done = cli("codes")
    assert done.returncode == 0
    for code in confspec.ERROR_CODES:
        assert f"\n{code}  (" in "\n" + done.stdout


# ----------------------------------------------------------------------------- processes
@pytest.mark.slow
def test_the_installed_entry_point_runs() -> None:
    # the console script of pyproject.toml ([project.scripts] confspec = _confspec_launch:run)
    done = cli_process("--version")
    assert (done.returncode, done.stdout, done.stderr) == (
        0, f"confspec {confspec.__version__}\n", ""), COMMAND
    codes = cli_process("codes")
    assert codes.returncode == 0 and codes.stdout == cli("codes").stdout


@pytest.mark.slow
@pytest.mark.skipif(not Path("/proc/self/status").exists(), reason="needs Linux /proc")
@pytest.mark.parametrize("delay", [0.0, 0.01, 0.03, 0.1, 0.2, 0.4])
@pytest.mark.parametrize("sig", [signal.SIGINT, signal.SIGTERM, signal.SIGHUP])
def test_a_signal_during_start_up_stops_with_one_line(sig: signal.Signals, delay: float) -> None:
    # issue 11, point 4: the console script's launcher handles the three stop signals before
    # confspec is imported, so a signal at any moment of start-up ends the run with one line.
    # The moments count from the launcher's first step, seen in /proc as SIGHUP being caught
    # (Python itself never catches it); the interpreter's own start-up before that, a few
    # milliseconds, is out of any program's hands.
    process = subprocess.Popen([*COMMAND, "codes"], stdout=subprocess.PIPE,
                               stderr=subprocess.PIPE, text=True, stdin=subprocess.DEVNULL)
    deadline = time.monotonic() + 30
    while time.monotonic() < deadline and not _catches(process.pid, signal.SIGHUP):
        time.sleep(0.0005)
    time.sleep(delay)
    process.send_signal(sig)
    out, err = process.communicate(timeout=60)
    assert "Traceback" not in err, err
    if process.returncode == 0:  # the command finished first
        assert out == cli("codes").stdout
    else:
        assert process.returncode == 128 + sig, (process.returncode, err)
        assert err.count("\n") == 1 and f"stopped by {sig.name}" in err, err


def _catches(pid: int, sig: signal.Signals) -> bool:
    """Whether process ``pid`` has a handler for ``sig`` (the SigCgt mask of /proc)."""
    try:
        status = Path(f"/proc/{pid}/status").read_text()
    except OSError:
        return True  # it has ended: nothing to wait for
    mask = next(line.split()[1] for line in status.splitlines() if line.startswith("SigCgt"))
    return bool(int(mask, 16) >> (int(sig) - 1) & 1)


@pytest.mark.slow
def test_python_m_confspec_cli_runs() -> None:
    done = subprocess.run([sys.executable, "-m", "confspec.cli", "--version"],
                          capture_output=True, text=True, check=False, timeout=120,
                          stdin=subprocess.DEVNULL)
    assert (done.returncode, done.stdout) == (0, f"confspec {confspec.__version__}\n"), \
        done.stderr
    usage = subprocess.run([sys.executable, "-m", "confspec.cli", "check"], capture_output=True,
                           text=True, check=False, timeout=120, stdin=subprocess.DEVNULL)
    assert usage.returncode == 2 and "Traceback" not in usage.stderr


@pytest.mark.slow
def test_import_confspec_stays_light() -> None:
    script = ("import sys, confspec\n"
              "heavy = ['pandas', 'pyarrow', 'ftfy', 'sqlalchemy', 'duckdb', 'dask', 'rich',"
              " 'distributed', 'psycopg', 'numpy', 'lark']\n"
              "print([m for m in heavy if m in sys.modules])\n")
    done = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True,
                          check=True, env={**os.environ, "PYTHONWARNINGS": "error"})
    assert done.stdout.strip() == "[]"
