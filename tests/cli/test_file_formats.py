"""The text formats beyond CSV, end to end through ``confspec check`` and ``normalize``:
plain JSON (an array of records, or an object holding one), NIST ASD text exports (pipe
tables with a header block, rule lines, blank cells that repeat the row above and the
``Limit`` row), markdown pipe tables and reStructuredText simple and grid tables (the rules
of the reStructuredText specification, from memory); and the errors that name the format
options.

Every file here is written by the test itself, laid out as the formats are (the NIST layout:
"common practice, no source" beyond the NIST ASD output pages; the level energies are
illustrative, from memory). The real exports are read in ``test_real_exports.py``.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from .runner import cli, read_csv

REPORT_COLUMNS = ["row", "input", "status", "code", "message", "normalized", "fixes"]


def summary_json(path: Path) -> dict[str, object]:
    data: dict[str, object] = json.loads(path.read_text("utf-8"))
    return data


# ============================================================================ plain JSON
def test_json_array_of_records_round_trips_as_an_array(tmp_path: Path) -> None:
    source = tmp_path / "in.json"
    source.write_text('[\n  {"id": 1, "c": "1s2 2s1"},\n  {"id": 2, "c": "2p7"},\n'
                      '  {"id": 3, "c": "[Ar] 3d6 4s2", "extra": [1, 2]}\n]\n', "utf-8")
    out = tmp_path / "out.json"
    report = tmp_path / "report.json"
    done = cli("normalize", source, "-c", "c", "-o", out, "-r", report)
    assert done.returncode == 1, done.stderr
    assert "row 2 (line 3): '2p7'" in done.stdout  # the line of the record is kept
    rows = json.loads(out.read_text("utf-8"))
    assert isinstance(rows, list) and len(rows) == 3  # one output record per input record
    assert rows[0] == {"id": 1, "c": "[He] 2s1", "status": "ok", "code": None, "fixes": None}
    assert rows[1]["c"] == "2p7" and rows[1]["code"] == "pauli-limit"  # kept as it was
    assert rows[2]["extra"] == [1, 2] and "extra" not in rows[0]  # keys stay per record
    reported = json.loads(report.read_text("utf-8"))
    assert [r["row"] for r in reported] == [1, 2, 3]
    assert list(reported[0]) == REPORT_COLUMNS


def test_json_object_holding_the_records_keeps_its_shape(tmp_path: Path) -> None:
    source = tmp_path / "table.json"
    source.write_text(json.dumps({"source": "ours", "elements": [
        {"symbol": "Na", "conf": "1s2 2s2 2p6 3s1"}, {"symbol": "Fe", "conf": "3d6 4s2"}],
        "version": [1, 0]}, indent=1), "utf-8")
    out = tmp_path / "clean.json"
    done = cli("normalize", source, "-c", "conf", "-s", "symbol", "--fill-core", "-o", out)
    assert done.returncode == 0, done.stdout + done.stderr
    written = json.loads(out.read_text("utf-8"))
    assert list(written) == ["source", "elements", "version"]  # members in their order
    assert written["source"] == "ours" and written["version"] == [1, 0]
    assert [r["conf"] for r in written["elements"]] == ["[Ne] 3s1", "[Ar] 3d6 4s2"]
    assert written["elements"][1]["fixes"] == "fill-core:[Ar]"
    as_csv = tmp_path / "clean.csv"  # a tabular output: every key is known before row 1
    assert cli("normalize", source, "-c", "conf", "-o", as_csv).returncode == 0
    assert [r["symbol"] for r in read_csv(as_csv)] == ["Na", "Fe"]


def test_json_with_several_arrays_needs_the_records_key(tmp_path: Path) -> None:
    source = tmp_path / "two.json"
    source.write_text('{"ions": [{"c": "1s1"}], "atoms": [{"c": "1s2"}, {"c": "1s3"}],'
                      ' "tags": ["x"]}', "utf-8")
    done = cli("check", source, "-c", "c")
    assert done.returncode == 2
    assert "several arrays of records ('ions', 'atoms')" in done.stderr
    assert "--records-key" in done.stderr and "Traceback" not in done.stderr
    chosen = cli("check", source, "-c", "c", "--records-key", "atoms")
    assert chosen.returncode == 1  # 1s3 breaks the Pauli limit
    assert "rows read            2" in chosen.stdout
    out = tmp_path / "out.json"
    assert cli("normalize", source, "-c", "c", "--records-key", "atoms", "-o", out,
               "-q").returncode == 1
    written = json.loads(out.read_text("utf-8"))  # the other array is copied unchanged
    assert written["ions"] == [{"c": "1s1"}] and len(written["atoms"]) == 2


@pytest.mark.parametrize(("text", "options", "expected"), [
    ('[{"c": "1s2"},\n 7,\n {"c": "1s1"}]', [],
     "record 2 (line 2): a JSON number where a record (an object) was expected"),
    ('[{"c": "1s2"},\n {"c": ', [], "line 2, column 8: not valid JSON (Expecting value)"),
    ('"1s2"', [], "a JSON string at the top level"),
    ("", [], "the file is empty"),
    ('{"n": 1, "tags": ["a"]}', [], "holds no array of records (members: 'n', 'tags')"),
    ('{"a": [], "b": [{"c": "1s2"}]}', [], "several arrays of records ('a', 'b')"),
    ('{"n": 1}', ["--records-key", "n"], "the member 'n' holds a JSON number"),
    ('{"n": [{"c": "1s2"}]}', ["--records-key", "m"], "no member 'm' in the top-level"),
    ('[{"c": "1s2"}]', ["--records-key", "m"], "the file holds an array of records"),
    ('[{"c": "1s2"}] [', [], "text after the end of the top-level value"),
])
def test_bad_json_is_one_line_with_its_position(tmp_path: Path, text: str,
                                                 options: list[str], expected: str) -> None:
    source = tmp_path / "bad.json"
    source.write_text(text, "utf-8")
    done = cli("check", source, "-c", "c", *options)
    assert done.returncode == 2, done.stdout
    assert len(done.stderr.strip().splitlines()) == 1, done.stderr
    assert expected in done.stderr and "Traceback" not in done.stderr


def test_json_is_streamed_across_blocks_with_lines_kept(tmp_path: Path) -> None:
    # over 64 KiB, the reader's block: records and numbers are cut at block ends
    records = [{"id": i, "c": "[Ar] 3d6 4s2", "pad": "x" * (i % 97)} for i in range(4000)]
    records.append({"id": 4000, "c": "1s3", "weight": 12345678901234567890})
    source = tmp_path / "big.json"
    source.write_text("[\n" + ",\n".join(json.dumps(r) for r in records) + "\n]\n", "utf-8")
    summary = tmp_path / "summary.json"
    done = cli("check", source, "-c", "c", "--summary-json", summary, "--chunk-rows", "333")
    assert done.returncode == 1
    data = summary_json(summary)
    assert data["rows"] == 4001 and data["invalid"] == 1
    assert data["examples"] == [{  # type: ignore[comparison-overlap]
        "row": 4001, "line": 4002, "code": "pauli-limit",
        "message": "1s holds at most 2 electrons, not 3 (at character 3)", "value": "1s3",
        "fixes": []}]


def test_a_json_error_is_reported_without_reading_the_rest(tmp_path: Path) -> None:
    # the tail is not UTF-8: reading on past the error would report that instead
    source = tmp_path / "early.json"
    body = ",\n".join(json.dumps({"c": "1s2", "pad": "x" * 60}) for _ in range(3000))
    source.write_bytes(b'[{"c": 1s2},\n' + body.encode() + b"\xff\xfe]")
    done = cli("check", source, "-c", "c")
    assert done.returncode == 2
    assert "line 1, column 9: not valid JSON (Expecting ',' delimiter)" in done.stderr


def test_records_key_is_only_for_json(tmp_path: Path) -> None:
    source = tmp_path / "a.csv"
    source.write_text("c\n1s2\n", "utf-8")
    done = cli("check", source, "-c", "c", "--records-key", "x")
    assert done.returncode == 2
    assert "--records-key names the array of records in a plain JSON input" in done.stderr


# ====================================================================== NIST ASD text
# The layout of a NIST ASD level export ("common practice, no source": the ASD output
# pages): a full-width rule, the header, a rule with '|', groups of rows separated by a row
# of blank cells, blank Configuration/Term cells meaning "same as above", the Limit row.
NIST_LEVELS = """\
------------------------------------------------------------------------
Configuration     | Term   |   J |    g |        Level (eV)    | Reference
------------------|--------|-----|------|----------------------|-----------
                  |        |     |      |                      |
1s2.2s2           | 1S     |   0 |    1 |         0.00000      |
                  |        |     |      |                      |
1s2.2s.2p         | 3P*    |   0 |    1 |         6.49         |
                  |        |   1 |    3 |         6.50         |
                  |        |   2 |    5 |         6.50         |
                  |        |     |      |                      |
1s2.2p.(2P*).3s   | 3P*    |   1 |    3 |        38.2          |
                  |        |   2 |    5 |        38.2          |
------------------|--------|-----|------|----------------------|-----------
C IV (2s 2S<1/2>) | Limit  | --- |      |        47.9          |  ours
                  |        |     |      |                      |
1s2.2p.(2P*).4d   | 3D*    |   3 |    7 |        48.1          |
------------------------------------------------------------------------
"""
# the data rows: (line, configuration, term, J) as a reader must give them
NIST_ROWS = [(5, "1s2.2s2", "1S", "0"), (7, "1s2.2s.2p", "3P*", "0"),
             (8, "1s2.2s.2p", "3P*", "1"), (9, "1s2.2s.2p", "3P*", "2"),
             (11, "1s2.2p.(2P*).3s", "3P*", "1"), (12, "1s2.2p.(2P*).3s", "3P*", "2"),
             (14, "C IV (2s 2S<1/2>)", "Limit", "---"), (16, "1s2.2p.(2P*).4d", "3D*", "3")]


@pytest.fixture
def levels(tmp_path: Path) -> Path:
    path = tmp_path / "C_III.txt"
    path.write_text(NIST_LEVELS, "utf-8")
    return path


def test_nist_text_fills_blank_cells_and_says_so(levels: Path, tmp_path: Path) -> None:
    report = tmp_path / "report.csv"
    summary = tmp_path / "summary.json"
    done = cli("check", levels, "-c", "Configuration", "-r", report, "--summary-json", summary)
    assert done.returncode == 1, done.stderr  # the Limit row is flagged
    assert "rows read            8" in done.stdout  # rule lines and blank rows are not rows
    assert "filled               6  (blank cells repeating the row above" in done.stdout
    rows = read_csv(report)
    assert [r["input"] for r in rows] == [c for _, c, _, _ in NIST_ROWS]
    assert rows[2]["normalized"] == "[He] 2s1 2p1"  # 1s2.2s.2p, filled from the row above
    assert rows[2]["fixes"] == ("filled-from-above:Configuration,"
                                "filled-from-above:Term")
    assert rows[1]["fixes"] == ""  # written in full: nothing filled
    # the parent stays a record on the row: the configuration value is 2p 3s
    assert rows[5]["normalized"] == "[He] 2p1 3s1"
    assert rows[5]["fixes"] == ("filled-from-above:Configuration,filled-from-above:Term,"
                                "parents:(2P*)")
    data = summary_json(summary)
    assert data["filled_cells"] == 6 and data["blank_lines"] == 4
    assert data["fixes"]["filled-from-above"] == 6  # type: ignore[index]
    assert data["examples"][0]["line"] == 14  # type: ignore[index]


@pytest.mark.parametrize("mode", [
    ["-c", "Configuration"],
    ["-c", "Configuration", "--term-column", "Term", "--j-column", "J"],
    ["-c", "Configuration", "--level"],
])
def test_the_limit_row_is_the_series_limit_in_every_mode(levels: Path, tmp_path: Path,
                                                         mode: list[str]) -> None:
    report = tmp_path / "report.csv"
    done = cli("check", levels, *mode, "-r", report)
    assert done.returncode == 1, done.stderr
    rows = read_csv(report)
    assert len(rows) == len(NIST_ROWS)
    limit = rows[6]
    assert (limit["status"], limit["code"]) == ("error", "series-limit")
    assert "ionization limit" in limit["message"]
    assert "series-limit 1" in done.stdout.split("invalid rows by code")[1]


def test_nist_levels_check_terms_and_j_after_filling(levels: Path, tmp_path: Path) -> None:
    report = tmp_path / "report.csv"
    done = cli("check", levels, "-c", "Configuration", "--term-column", "Term",
               "--j-column", "J", "-r", report)
    assert done.returncode == 1
    rows = read_csv(report)
    assert [r["status"] for r in rows] == ["ok"] * 6 + ["error", "ok"]


def test_nist_text_normalize_writes_every_row_with_the_filled_cells(levels: Path,
                                                                    tmp_path: Path) -> None:
    out = tmp_path / "levels.csv"
    done = cli("normalize", levels, "-c", "Configuration", "-o", out)
    assert done.returncode == 1
    rows = read_csv(out)
    assert list(rows[0]) == ["Configuration", "Term", "J", "g", "Level (eV)", "Reference",
                             "status", "code", "fixes"]
    assert len(rows) == len(NIST_ROWS)
    assert [(r["Term"], r["J"]) for r in rows] == [(t, j) for _, _, t, j in NIST_ROWS]
    assert rows[3]["Configuration"] == "[He] 2s1 2p1" and rows[3]["g"] == "5"
    assert rows[6]["Configuration"] == "C IV (2s 2S<1/2>)"  # the limit row, as it was
    assert rows[6]["Reference"] == "ours" and rows[6]["code"] == "series-limit"


# The header of a NIST ASD line export: three lines, 'Lower level' spanning three columns,
# repeated (with 'Air' for 'Vac') further down ("common practice, no source").
NIST_LINES = """\
-----------------------------------------------------------------------------------
  Wavelength  |      Lower level      |      Upper level      |Type|   Ref.  |
              |-----------------------|-----------------------|    |         |
    Vac (nm)  | Conf.    | Term | J   | Conf.    | Term | J   |    |         |
-----------------------------------------------------------------------------------
      97.7    | 2s2      | 1S   | 0   | 2s.2p    | 1P*  | 1   |    |    ours |
     117.5    | 2s.2p    | 3P*  | 1   | 2p2      | 3P   | 2   |    |         |
-----------------------------------------------------------------------------------
  Wavelength  |      Lower level      |      Upper level      |Type|   Ref.  |
              |-----------------------|-----------------------|    |         |
    Air (nm)  | Conf.    | Term | J   | Conf.    | Term | J   |    |         |
-----------------------------------------------------------------------------------
     229.7    | 2s.2p    | 1P*  | 1   | 2p2      | 1D   | 2   |    |         |
              |          |      | 1   | 2p2      | 1S   | 0   |    |         |
-----------------------------------------------------------------------------------
  Wavelength  |      Lower level      |      Upper level      |Type|   Ref.  |
              |-----------------------|-----------------------|    |         |
    Vac (nm)  | Conf.    | Term | J   | Conf.    | Term | J   |    |         |
-----------------------------------------------------------------------------------
   19011      | 2s.2p    | 3P*  | 1   | 2s.2p    | 3P*  | 2   | M1 |         |
-----------------------------------------------------------------------------------
"""


def test_nist_line_export_headers_span_columns_and_repeat(tmp_path: Path) -> None:
    source = tmp_path / "C_III_lines.txt"
    source.write_text(NIST_LINES, "utf-8")
    out = tmp_path / "lines.jsonl"
    done = cli("normalize", source, "-c", "Upper level Conf.", "-o", out)
    assert done.returncode == 0, done.stdout + done.stderr
    rows = [json.loads(line) for line in out.read_text("utf-8").splitlines()]
    assert list(rows[0])[:9] == [
        "Wavelength Vac (nm)", "Lower level Conf.", "Lower level Term", "Lower level J",
        "Upper level Conf.", "Upper level Term", "Upper level J", "Type", "Ref."]
    assert len(rows) == 5  # the repeated header blocks are not rows
    assert [r["Upper level Conf."] for r in rows] == [
        "2s1 2p1", "2p2", "2p2", "2p2", "2s1 2p1"]  # valence only, as written
    # rows under the 'Air' header say where their header is; the 'Vac' one again: nothing
    assert [r["fixes"] for r in rows] == [
        None, None, "header-line:9", "filled-from-above:Lower level Conf.,"
        "filled-from-above:Lower level Term,header-line:9", None]
    assert rows[3]["Lower level Conf."] == "2s.2p" and rows[3]["Lower level Term"] == "1P*"
    assert rows[0]["Ref."] == "ours" and rows[4]["Type"] == "M1"


def test_nist_text_fills_a_term_only_under_a_blank_configuration(tmp_path: Path) -> None:
    # a configuration written anew starts a new term: its blank term is not the one above
    source = tmp_path / "t.txt"
    source.write_text("Configuration | Term | J\n--------------|------|---\n"
                      "2s.2p         | 3P*  | 0\n"
                      "              |      | 1\n"
                      "2p2           |      | 2\n", "utf-8")
    out = tmp_path / "o.csv"
    cli("normalize", source, "-c", "Configuration", "-o", out)
    rows = read_csv(out)
    assert [(r["Configuration"], r["Term"]) for r in rows] == [
        ("2s1 2p1", "3P*"), ("2s1 2p1", "3P*"), ("2p2", "")]
    assert [r["fixes"] for r in rows][:2] == ["", "filled-from-above:Configuration,"
                                                  "filled-from-above:Term"]


def test_a_limit_line_without_cells_is_a_row(tmp_path: Path) -> None:
    source = tmp_path / "t.txt"
    source.write_text("Configuration | Term | J\n--------------|------|---\n"
                      "2s2           | 1S   | 0\n"
                      "Limit\n", "utf-8")
    report = tmp_path / "r.csv"
    done = cli("check", source, "-c", "Configuration", "-r", report)
    assert done.returncode == 1
    rows = read_csv(report)
    assert [(r["input"], r["code"]) for r in rows] == [("2s2", ""), ("Limit", "series-limit")]


@pytest.mark.parametrize(("text", "expected"), [
    ("a,b\n1s2,1s1\n", "line 1: not a pipe table (no '|' in its first line) as a NIST ASD "
                       "text export (nist-text) is; give another format with --input-format "
                       "(one of: csv, tsv,"),
    ("c | t\n---|---\n1s2 | 1S\n1s2 | 1S | x\n", "line 4: 3 fields where the header has 2"),
    ("c | t\n---|---\n1s2 | 1S\nsee the notes\n", "line 4: not a table row (no '|')"),
    ("", "the file is empty"),
])
def test_bad_nist_text_is_one_line_with_its_line(tmp_path: Path, text: str,
                                                 expected: str) -> None:
    source = tmp_path / "bad.txt"
    source.write_text(text, "utf-8")
    done = cli("check", source, "-c", "c")
    assert done.returncode == 2, done.stdout
    assert len(done.stderr.strip().splitlines()) == 1, done.stderr
    assert expected in done.stderr and "Traceback" not in done.stderr


def test_nist_text_under_another_extension_with_the_format_option(tmp_path: Path) -> None:
    source = tmp_path / "levels.dat"
    source.write_text(NIST_LEVELS, "utf-8")
    done = cli("check", source, "-c", "Configuration", "--input-format", "nist-text")
    assert "rows read            8" in done.stdout
    assert "cannot tell the format" in cli("check", source, "-c", "Configuration").stderr


# ========================================================================= markdown
MARKDOWN = """\
# Ground states

Some prose | with a pipe, not a table.

| Spectrum | Ground configuration | Ground level |
|---|---|---:|
| Ne II | 2s2.2p5 | 2P*&lt;3/2&gt; |
| Ne VII | 1s2.2s2 | 1S0 |

More prose.

| Spectrum | Ground configuration | Ground level |
|:--|:-:|--|
| Ne X | 1s | 2S\\|1/2 |
"""


def test_markdown_tables_are_read_with_entities_decoded(tmp_path: Path) -> None:
    source = tmp_path / "neon.md"
    source.write_text(MARKDOWN, "utf-8")
    report = tmp_path / "report.csv"
    out = tmp_path / "out.csv"
    done = cli("normalize", source, "-c", "Ground configuration", "-o", out, "-r", report)
    assert done.returncode == 0, done.stdout + done.stderr
    rows = read_csv(out)
    assert [r["Spectrum"] for r in rows] == ["Ne II", "Ne VII", "Ne X"]
    # NIST leaves out the closed 1s2 of Ne II: read as written (no species given)
    assert [r["Ground configuration"] for r in rows] == ["2s2 2p5", "[He] 2s2", "1s1"]
    assert rows[0]["Ground level"] == "2P*<3/2>"  # &lt; &gt; as a markdown reader shows
    assert rows[2]["Ground level"] == "2S|1/2"  # an escaped pipe is a character
    levels = cli("check", source, "-c", "Ground configuration", "--term-column",
                 "Ground level", "--fail-on", "never")
    assert "rows read            3" in levels.stdout


def test_markdown_tables_with_other_columns_are_refused(tmp_path: Path) -> None:
    source = tmp_path / "two.md"
    source.write_text("| a | c |\n|---|---|\n| 1 | 1s2 |\n\n| b | c |\n|---|---|\n"
                      "| 2 | 1s1 |\n", "utf-8")
    done = cli("check", source, "-c", "c")
    assert done.returncode == 2
    assert "line 5: a second table with other columns" in done.stderr


# ================================================================ reStructuredText
RST = """\
Ground states
=============

A title's underline is no table.

=======  ==========  =====
Species  Config      Term
=======  ==========  =====
Na       [Ne] 3s1    2S
Fe       [Ar] 3d6
         4s2         5D
Cu
=======  ==========  =====

+---------+------------+------+
| Species | Config     | Term |
+=========+============+======+
| Ne      | [He] 2s2   | 1S   |
|         | 2p6        |      |
+---------+------------+------+
| Xx      | 1s3        |      |
+---------+------------+------+
"""


def test_rst_simple_and_grid_tables_are_one_table(tmp_path: Path) -> None:
    source = tmp_path / "ground.rst"
    source.write_text(RST, "utf-8")
    out = tmp_path / "out.csv"
    summary = tmp_path / "summary.json"
    done = cli("normalize", source, "-c", "Config", "-s", "Species", "-o", out,
               "--summary-json", summary)
    assert done.returncode == 1
    rows = read_csv(out)
    # a line with a blank first column continues the row above (reStructuredText's rule);
    # a multi-line grid cell is joined the same way
    assert [(r["Species"], r["Config"], r["Term"]) for r in rows] == [
        ("Na", "[Ne] 3s1", "2S"), ("Fe", "[Ar] 3d6 4s2", "5D"), ("Cu", "", ""),
        ("Ne", "[He] 2s2 2p6", "1S"), ("Xx", "1s3", "")]
    assert [r["code"] for r in rows] == ["", "", "empty", "", "unknown-element"]
    examples = summary_json(summary)["examples"]
    assert [e["line"] for e in examples] == [12, 21]  # type: ignore[union-attr]


@pytest.mark.parametrize(("text", "expected"), [
    ("=====  =====\nc      d\n=====  =====\n1s2    a\n2s1 xx b\n=====  =====\n",
     "line 5: text in the gap after column 1 (at column 6)"),
    ("+----+----+\n| c  | d  |\n+====+====+\n| 1s2     |\n+----+----+\n",
     "line 4: a grid table line whose '|' do not line up"),
    ("Just prose.\n", "no reStructuredText table"),
    ("=====  =====\nc      d\n=====  =====\n1s2    a\n", "is not closed by a border line"),
    ("=====  =====\nc      d\n=====  =====\n1s2    a\n=====  =====\n\n"
     "=====  =====\nc      e\n=====  =====\n1s2    a\n=====  =====\n",
     "line 7: a table with other columns ('c', 'e') than the first ('c', 'd')"),
])
def test_bad_rst_is_one_line_with_its_line(tmp_path: Path, text: str, expected: str) -> None:
    source = tmp_path / "bad.rst"
    source.write_text(text, "utf-8")
    done = cli("check", source, "-c", "c")
    assert done.returncode == 2, done.stdout
    assert len(done.stderr.strip().splitlines()) == 1, done.stderr
    assert expected in done.stderr and "Traceback" not in done.stderr


def test_rst_table_without_header_names_its_columns(tmp_path: Path) -> None:
    source = tmp_path / "plain.rst"
    source.write_text("=====  =====\n1s2    a\n2s1    b\n=====  =====\n", "utf-8")
    done = cli("check", source, "-c", "column 1")
    assert done.returncode == 0, done.stderr
    assert "rows read            2" in done.stdout


# ============================================================ the format options, named
def test_an_unknown_extension_names_the_formats_and_the_option(tmp_path: Path) -> None:
    source = tmp_path / "table.xlsx"
    source.write_text("x", "utf-8")
    done = cli("check", source, "-c", "c")
    assert done.returncode == 2
    assert "give it with --input-format (one of: csv, tsv, jsonl, json, parquet, nist-text, " \
           "markdown, rst)" in done.stderr
    good = tmp_path / "good.csv"
    good.write_text("c\n1s2\n", "utf-8")
    out = cli("normalize", good, "-c", "c", "-o", tmp_path / "out.xlsx")
    assert "give it with --output-format (one of: csv, tsv, jsonl, json, parquet)" in out.stderr
    report = cli("check", good, "-c", "c", "-r", tmp_path / "report.xlsx")
    assert "give it with --report-format" in report.stderr
    text = cli("normalize", good, "-c", "c", "-o", tmp_path / "out.txt")
    assert text.returncode == 2
    assert "nist-text (.txt) is read, not written" in text.stderr
    # every option named in these messages exists
    assert "--input-format" in cli("check", "--help").stdout
    assert "--output-format" in cli("normalize", "--help").stdout
    assert "--report-format" in cli("check", "--help").stdout


@pytest.mark.parametrize("name", ["levels.txt", "levels.md", "levels.rst", "levels.json"])
def test_chunk_size_changes_nothing(tmp_path: Path, name: str) -> None:
    # the reader's state (the row above, the header, the table) crosses chunk boundaries
    source = tmp_path / name
    text = {"levels.txt": NIST_LEVELS, "levels.md": MARKDOWN, "levels.rst": RST,
            "levels.json": json.dumps({"rows": [{"Config": c} for _, c, _, _ in NIST_ROWS]})}
    source.write_text(text[name], "utf-8")
    column = {"levels.txt": "Configuration", "levels.md": "Ground configuration"}.get(
        name, "Config")
    outputs = []
    for size in ("1", "3", "1000"):
        out = tmp_path / f"out-{size}.jsonl"
        summary = tmp_path / f"summary-{size}.json"
        cli("normalize", source, "-c", column, "-o", out, "--chunk-rows", size,
            "--summary-json", summary)
        data = summary_json(summary)
        data.pop("seconds")
        data.pop("output")
        outputs.append((out.read_text("utf-8"), data))
    assert outputs[0] == outputs[1] == outputs[2]
    assert outputs[0][0].count("\n") == outputs[0][1]["rows"] > 0
