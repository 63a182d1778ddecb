"""Whole published tables, as their users download them, through the public API and the CLI.

Each file in ``tests/published/`` is one well-known public table (periodic-table CSVs and
JSON, encyclopedia pages, NIST ASD ground-level and level exports, a handbook table, a
textbook appendix, a spreadsheet, a LaTeX paper table), reconstructed from memory: the
shape, the columns and the spelling of each source, with every row's value written as a
careful chemist expects it (``expect``, ``expect_term``) or the code of its refusal
(``expect_code``). See ``tests/published/README.md`` for the sources.

Every row must be read with the right value (canonical form; electron count against the
element or spectrum the table gives), refused rows must get a sensible code, the CLI report
must keep every row, and no traceback may appear. Rows confspec gets wrong today are strict
xfails whose reason names the gap; fixing one turns it into an XPASS, which fails the run
until the mark is removed.
"""

from __future__ import annotations

import contextlib
import csv
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import pytest

import confspec
from confspec import ConfspecError

from .cli.runner import cli, read_csv

HERE = Path(__file__).parent / "published"


@dataclass(frozen=True)
class Table:
    """One published table: the file, its columns, and how it is checked."""

    file: str
    column: str
    species: str | None = None
    term: str | None = None  # a term column (J inside it, or in ``j``)
    j: str | None = None
    excel: bool = False  # NIST ASD "CSV for Excel": every cell wrapped as ="..."

    @property
    def id(self) -> str:
        return f"{self.file.removesuffix('.csv')}:{self.column}"

    @property
    def level(self) -> bool:
        return self.term is not None


TABLES = [
    # PubChem periodic table CSV, ElectronConfiguration column (from memory)
    Table("pubchem_periodic_table.csv", "ElectronConfiguration", "Symbol"),
    # Wikipedia element infobox "Electron configuration" values (from memory)
    Table("wikipedia_infobox.csv", "electron_configuration", "symbol"),
    # Wikipedia "Electron configurations of the elements (data page)" (from memory)
    Table("wikipedia_data_page.csv", "Electron configuration", "Element"),
    # NIST ASD ionization energies: ground levels of the neutral atoms (from memory)
    Table("nist_asd_ground_levels_neutral.csv", "Ground Shells", "Sp. Name", "Ground Level"),
    # NIST ASD ionization energies: ground levels of Fe I to Fe XXVI (from memory)
    Table("nist_asd_ground_levels_fe_ions.csv", "Ground Shells", "Sp. Name", "Ground Level"),
    # CRC Handbook, ground states of the neutral atoms (from memory)
    Table("crc_handbook_ground_states.csv", "Ground-state configuration", "Element",
          "Ground level"),
    # A periodic-table JSON data set flattened to CSV: two configuration fields (from memory)
    Table("periodic_table_json.csv", "electron_configuration", "symbol"),
    Table("periodic_table_json.csv", "electron_configuration_semantic", "symbol"),
    # A Kaggle-style periodic-table CSV whose superscripts were flattened (from memory)
    Table("kaggle_periodic_table.csv", "Electron Configuration", "Symbol"),
    # A general-chemistry textbook appendix in Unicode superscripts (from memory)
    Table("textbook_appendix.csv", "Configuration", "Symbol"),
    # A textbook table of common ions (from memory)
    Table("textbook_common_ions.csv", "Electron configuration", "Ion"),
    # A hand-made spreadsheet exported from Excel (common practice, no source)
    Table("spreadsheet_excel_export.csv", "Configuration", "Species"),
    # NIST ASD level tables (Configuration, Term, J), one spectrum each (from memory)
    Table("nist_asd_levels_fe_i.csv", "Configuration", "Spectrum", "Term", "J"),
    Table("nist_asd_levels_fe_ii.csv", "Configuration", "Spectrum", "Term", "J"),
    Table("nist_asd_levels_c_i.csv", "Configuration", "Spectrum", "Term", "J"),
    Table("nist_asd_levels_ne_i.csv", "Configuration", "Spectrum", "Term", "J"),
    Table("nist_asd_levels_ar_ii.csv", "Configuration", "Spectrum", "Term", "J", excel=True),
    Table("nist_asd_levels_u_i.csv", "Configuration", "Spectrum", "Term", "J"),
    Table("nist_asd_levels_na_i.csv", "Configuration", "Spectrum", "Term", "J"),
    # A level table typeset in LaTeX in a journal paper (common practice, no source)
    Table("latex_paper_table.csv", "Configuration", "Ion", "Term", "J"),
]


def rows_of(table: Table) -> list[dict[str, str]]:
    with open(HERE / table.file, encoding="utf-8", newline="") as handle:
        return list(csv.DictReader(handle))


# ------------------------------------------------------------------------------ the gaps
LEADING_STAR = ("a leading '*' marking a predicted value ('*[Rn] 5f14 6d2 7s2', as the "
                "periodic-table JSON data set writes superheavies) is a syntax error; a "
                "trailing '*' is read as a note. Fix in _clean.py (notes at either end)")
APOSTROPHE = ("Excel's text-forcing apostrophe ('1s1, '[Ar] 3d6 4s2) left in an exported cell "
              "is a syntax error; expected it dropped like quotes. Fix in _clean.py")
LIMIT = ("the ionization-limit row of a NIST level table ('Fe II (6D<9/2>)' | 'Limit' | '') "
         "is refused as a malformed value: the API gives 'syntax' (\"unexpected '(6D<9/2>)'; "
         "expected ':' or '='\"), the CLI 'term-syntax' ('a term starts with its "
         "multiplicity'); expected it recognised as the series limit (a dedicated code, or "
         "the row kept and marked). Fix in _levels.py (label + parent + Limit) and LevelCheck")
J_WITHOUT_TERM = ("a J cell without a term (NIST lists many U I levels by J alone) is refused "
                  "as j-not-allowed ('J is given without a term'); the configuration is valid "
                  "and J can be checked against it alone. Fix in LevelCheck (_tables.py)")
BRACKET_J = ("a J in square brackets (NIST ASD marks a tentative J as [3]) is refused as "
             "term-syntax in the J column; via the API the joined text even reads [3] as a "
             "misplaced core. Fix in _tables._j_text and the level grammar")
MERGED_J = ("NIST writes unresolved fine structure as a J cell '5/2,3/2'; refused as "
            "term-syntax; expected the term read without J (or with the J set kept). Fix in "
            "_tables._j_text / _levels.py")
LATEX_LEVEL = ("a configuration wrapped whole in LaTeX math and followed by its term "
               "('$4s$ $^2S$ 1/2', '$3d^64s^2$ $a\\,^5D$ 4') is refused at the first '$' by "
               "parse_level, although parse_level('$4s$') and parse_level('4s $^2S$') are read. "
               "Fix in _clean.py (math wrappers per space-separated piece) / the level rule")
LATEX_TERM_CELL = ("with --term-column, a term cell in LaTeX math ('$^5D$', '$^2P^o$') is "
                   "term-syntax ('a term starts with its multiplicity') although "
                   "confspec.parse_term reads it: _tables._term_cell uses read_term without the "
                   "cleaning parse_term applies. Fix in _tables._term_cell")
LATEX_LETTER = ("an ordering letter and a LaTeX thin space in a term ('$a\\,^5D$', "
                "'$z\\,^6D^{\\rm o}$') are refused even by parse_term; '{\\rm o}' for the "
                "parity mark too. Fix in the TERM terminal / _terms.read_term")
LATEX_PARENT = ("a parent term in LaTeX math inside a configuration ('$3d^7(^4F)4s$') is "
                "refused ('unexpected (', even without the $...$). Fix in the PARENT terminal")
EXCEL_TERM = ("NIST ASD 'CSV for Excel' wraps every cell as =\"...\"; the wrapper is removed "
              "from the configuration cell but not from the Term and J cells, so every row is "
              "term-syntax ('a term starts with its multiplicity'). Fix in _tables._term_cell "
              "and _tables._j_text (the cell cleaning _clean.py applies)")
EXCEL_JOIN = ("the NIST 'CSV for Excel' cells pasted together ('=\"3s2.3p5\" =\"2P*\" "
              "=\"3/2\"') are a syntax error: the =\"...\" wrapper is stripped only around a "
              "whole value. Fix in _clean.py")
UNCERTAIN_TERM_CELL = ("a NIST ground-level cell with the uncertainty mark ('3F2 ?', the "
                       "superheavy rows) is term-syntax in the term column ('unexpected ' ' "
                       "after the term'), although parse_level reads '[Rn]5f14.6d2.7s2 3F2 ?'. "
                       "Fix in _tables._term_cell (UNCERTAIN after the term)")

# (table id, row index, path) -> gap; path is "api" or "cli"
GAPS: dict[tuple[str, int, str], str] = {}


def _mark(table_id: str, indices: range | list[int], reason: str,
          paths: tuple[str, ...] = ("api", "cli")) -> None:
    for index in indices:
        for path in paths:
            GAPS[(table_id, index, path)] = (
                f"{GAPS[(table_id, index, path)]} + {reason}"
                if (table_id, index, path) in GAPS else reason)




def gap(table: Table, index: int, path: str) -> str | None:
    return GAPS.get((table.id, index, path))


# ----------------------------------------------------------------------- the API checks
def level_text(table: Table, row: dict[str, str]) -> str:
    """The row's cells pasted together as a practitioner pastes them: 'config term J'."""
    text = row[table.column].strip()
    term = (row[table.term or ""] or "").strip()
    j = (row[table.j] or "").strip() if table.j else ""
    if term:
        return " ".join(part for part in (text, term, j) if part)
    return text


def check_api(table: Table, row: dict[str, str]) -> None:
    species = (row[table.species] or None) if table.species else None
    expect, code = row["expect"], row["expect_code"]
    text = level_text(table, row) if table.level else row[table.column]
    if code == "limit":
        problems = confspec.validate_level(text, species=species)
        assert problems, "the limit row was accepted as a level"
        assert "limit" in f"{problems[0].code} {problems[0].message}".lower(), problems[0]
        return
    if code:
        validate = confspec.validate_level if table.level else confspec.validate
        problems = validate(text, species=species)
        assert problems and problems[0].code == code, [p.code for p in problems]
        return
    if table.level:
        level = confspec.parse_level(text)
        assert str(level.configuration) == expect
        expect_term = row["expect_term"] or None
        assert (None if level.term is None else str(level.term)) == expect_term
        assert confspec.validate_level(text, species=species) == []
    else:
        assert str(confspec.parse(text)) == expect
        assert confspec.validate(text, species=species) == []


def api_params() -> list[Any]:
    params = []
    for table in TABLES:
        for index, row in enumerate(rows_of(table)):
            reason = gap(table, index, "api")
            marks = [pytest.mark.xfail(strict=True, reason=reason)] if reason else []
            params.append(pytest.param(table, index, row, marks=marks,
                                       id=f"{table.id}:{index}:{row[table.column]}"))
    return params


@pytest.mark.parametrize(("table", "index", "row"), api_params())
def test_row_through_the_api(table: Table, index: int, row: dict[str, str]) -> None:
    check_api(table, row)


# ----------------------------------------------------------------------- the CLI checks
_REPORTS: dict[str, tuple[list[dict[str, str]], str]] = {}


def unwrap(cell: str) -> str:
    return cell[2:-1] if cell.startswith('="') and cell.endswith('"') else cell


@pytest.fixture(scope="module")
def reports(tmp_path_factory: pytest.TempPathFactory) -> dict[str, tuple[list[dict[str, str]],
                                                                          str]]:
    """One ``confspec check`` run per table, on the file as published."""
    if not _REPORTS:
        folder = tmp_path_factory.mktemp("published")
        for number, table in enumerate(TABLES):
            report = folder / f"report{number}.csv"
            args: list[str | Path] = ["check", HERE / table.file, "-c", table.column]
            if table.species:
                args += ["-s", table.species]
            if table.term:
                args += ["--term-column", table.term]
            if table.j:
                args += ["--j-column", table.j]
            done = cli(*args, "-r", report)
            assert done.returncode in (0, 1), done.stderr
            _REPORTS[table.id] = (read_csv(report), done.stdout + done.stderr)
    return _REPORTS


@pytest.mark.parametrize("table", [pytest.param(t, id=t.id) for t in TABLES])
def test_cli_keeps_every_row_and_never_crashes(
        reports: dict[str, tuple[list[dict[str, str]], str]], table: Table) -> None:
    rows, output = reports[table.id]
    assert "Traceback" not in output
    assert [int(r["row"]) for r in rows] == list(range(1, len(rows_of(table)) + 1))  # none lost
    for got, row in zip(rows, rows_of(table), strict=True):
        assert got["input"] in (row[table.column], unwrap(row[table.column]))


def cli_params() -> list[Any]:
    params = []
    for table in TABLES:
        for index, row in enumerate(rows_of(table)):
            reason = gap(table, index, "cli")
            marks = [pytest.mark.xfail(strict=True, reason=reason)] if reason else []
            params.append(pytest.param(table, index, marks=marks,
                                       id=f"{table.id}:{index}:{row[table.column]}"))
    return params


@pytest.mark.parametrize(("table", "index"), cli_params())
def test_row_through_the_cli(reports: dict[str, tuple[list[dict[str, str]], str]],
                             table: Table, index: int) -> None:
    row = rows_of(table)[index]
    got = reports[table.id][0][index]
    expect, code = row["expect"], row["expect_code"]
    if code == "limit":
        assert got["status"] == "error"
        assert "limit" in f"{got['code']} {got['message']}".lower(), got
    elif code:
        assert (got["status"], got["code"]) == ("error", code), got
    else:
        assert (got["status"], got["code"]) == ("ok", ""), got
        normalized = got["normalized"]
        if table.level:  # the term stays in its own column; parents stay in this one
            assert str(confspec.parse_level(normalized).configuration) == expect
        else:
            assert normalized == expect


def test_every_table_has_enough_rows() -> None:
    files = {t.file for t in TABLES}
    assert len(files) >= 15
    for table in TABLES:
        rows = rows_of(table)
        assert len(rows) >= 10, table.file
        for row in rows:
            assert row["expect"] or row["expect_code"], (table.file, row)


def test_errors_never_escape_as_foreign_exceptions() -> None:
    # every cell of every table, through every public reader: a ConfspecError or a value
    for table in TABLES:
        for row in rows_of(table):
            for cell in row.values():
                for reader in (confspec.parse, confspec.parse_level, confspec.parse_species,
                               confspec.parse_term):
                    with contextlib.suppress(ConfspecError):
                        reader(cell or "")  # a foreign exception fails the test
