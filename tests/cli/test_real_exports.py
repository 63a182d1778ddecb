"""The text formats on real public files: NIST ASD text exports (pipe tables), a markdown
table and plain JSON, read from ``../shared/real-world/`` (provenance in its
``PROVENANCE.md``) at test time and never copied into this repository.

The folder is there in CI and absent from a fresh clone: the tests then skip, saying so.
Every expected count and value below was checked by hand in the file named beside it.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from .runner import cli

REAL = Path(__file__).resolve().parents[3] / "shared" / "real-world"

pytestmark = pytest.mark.skipif(
    not (REAL / "PROVENANCE.md").exists(),
    reason=f"the real-world corpus is not here ({REAL}); it lives beside the repository "
           "(CI has it), and its files are never copied into the repository")


def _rows(path: Path) -> list[dict[str, object]]:
    return [json.loads(line) for line in path.read_text("utf-8").splitlines()]


def _data_lines(path: Path, header_lines: int) -> int:
    """Lines of a NIST ASD text export that hold a row, counted apart from the reader: a
    line with '|' and some text that is not only dashes, less the header lines."""
    count = 0
    for line in path.read_text("utf-8").splitlines():
        cells = line.split("|")
        if len(cells) > 1 and any(c.strip() and set(c.strip()) != {"-"} for c in cells):
            count += 1
    return count - header_lines


def test_nist_level_export_c_iii(tmp_path: Path) -> None:
    source = REAL / "aq_c3_nistlevel.txt"  # kouui/AtomicQuery, C_III.NistLevel
    out = tmp_path / "c3.jsonl"
    summary = tmp_path / "summary.json"
    done = cli("normalize", source, "-c", "Configuration", "-o", out, "--summary-json",
               summary)
    assert done.returncode == 1, done.stderr  # the Limit row only
    rows = _rows(out)
    # PROVENANCE.md: 201 level rows, one of them the Limit row; one header line
    assert len(rows) == 201 == _data_lines(source, header_lines=1)
    data = json.loads(summary.read_text("utf-8"))
    assert data["by_code"] == {"series-limit": 1}
    # 104 rows leave both Configuration and Term blank (counted by hand with awk)
    assert data["filled_cells"] == 208 and data["fixes"]["filled-from-above"] == 208
    assert data["examples"][0]["line"] == 210  # 'C IV (2s 2S<1/2>) | Limit' is line 210
    assert list(rows[0])[:7] == ["Configuration", "Term", "J", "g", "Level (eV)",
                                 "Uncertainty (eV)", "Reference"]
    by_level = {(r["Level (eV)"], r["J"]): r for r in rows}
    # line 7: J = 1 of 1s2.2s.2p 3P*, its Configuration and Term cells blank
    second = by_level[("6.495625", "1")]
    assert (second["Configuration"], second["Term"]) == ("[He] 2s1 2p1", "3P*")
    assert second["fixes"] == "filled-from-above:Configuration,filled-from-above:Term"
    limit = by_level[("47.88778", "---")]
    assert (limit["Configuration"], limit["Term"], limit["code"]) == (
        "C IV (2s 2S<1/2>)", "Limit", "series-limit")
    assert limit["Reference"] == "L876c191"
    # line 213, after the Limit row: J = 2 of 1s2.2p.(2P*).4d 3D*, filled from line 212
    after = by_level[("48.0683", "2")]
    assert after["Configuration"] == "[He] 2p1 4d1" and after["Term"] == "3D*"
    levels = cli("check", source, "-c", "Configuration", "--term-column", "Term",
                 "--j-column", "J", "--summary-json", tmp_path / "levels.json")
    assert levels.returncode == 1
    assert json.loads((tmp_path / "levels.json").read_text("utf-8"))["by_code"][
        "series-limit"] == 1


def test_nist_line_export_o_v(tmp_path: Path) -> None:
    source = REAL / "aq_o5_nistline.txt"  # kouui/AtomicQuery, O_V.NistLine
    out = tmp_path / "o5.jsonl"
    done = cli("normalize", source, "-c", "Upper level Conf.", "-o", out)
    assert done.returncode == 0, done.stdout + done.stderr
    rows = _rows(out)
    # PROVENANCE.md: 385 line rows; three header blocks of three lines each
    assert len(rows) == 385 == _data_lines(source, header_lines=9)
    assert list(rows[0])[:11] == [
        "Ritz Wavelength Vac AA", "Rel. Int.", "Aki (s^-1)", "Acc.", "Ei Ek (eV) (eV)",
        "Lower level Conf.", "Lower level Term", "Lower level J", "Upper level Conf.",
        "Upper level Term", "Upper level J"]
    first = rows[0]  # line 7: 114.358 A, 1s2.2s2 1S 0 - 1s2.2s.8p 1P* 1
    assert first["Ritz Wavelength Vac AA"] == "114.358"
    assert first["Lower level Conf."] == "1s2.2s2" and first["Upper level Term"] == "1P*"
    assert first["Upper level Conf."] == "[He] 2s1 8p1"
    assert first["TP Ref."] == "T5633"
    # the block headed 'Air AA' (line 345) holds 96 rows (lines 349-464, counted by hand)
    under_air = [r for r in rows if "header-line:345" in str(r["fixes"])]
    assert len(under_air) == 96
    assert under_air[0]["Ritz Wavelength Vac AA"] == "2695.30"  # line 350


def test_markdown_table_of_neon_ground_states(tmp_path: Path) -> None:
    source = REAL / "mat_neon_ground_states.md"  # jayprophit/Materials-Atlas-Table-Codex---MAT
    out = tmp_path / "ne.jsonl"
    done = cli("normalize", source, "-c", "Ground configuration", "-o", out)
    assert done.returncode == 0, done.stdout + done.stderr
    rows = _rows(out)
    assert len(rows) == 10  # Ne I ... Ne X, the one table of the page
    assert [r["Spectrum"] for r in rows][:2] == ["Ne I", "Ne II"]
    assert rows[1]["Ground level"] == "2P*<3/2>"  # written 2P*&lt;3/2&gt; in the file
    assert rows[9]["Ground configuration"] == "1s1"  # Ne X: 1s


def test_plain_json_periodic_table(tmp_path: Path) -> None:
    source = REAL / "ptjson.json"  # Bowserinator/Periodic-Table-JSON, {"elements": [...]}
    out = tmp_path / "pt.json"
    done = cli("normalize", source, "-c", "electron_configuration_semantic", "-s", "symbol",
               "-o", out)
    assert done.returncode == 1  # element 119, 'Uue', is no element confspec knows
    written = json.loads(out.read_text("utf-8"))
    assert list(written) == ["elements"] and len(written["elements"]) == 119
    by_symbol = {e["symbol"]: e for e in written["elements"]}
    assert by_symbol["Fe"]["electron_configuration_semantic"] == "[Ar] 3d6 4s2"
    assert by_symbol["Cu"]["electron_configuration_semantic"] == "[Ar] 3d10 4s1"
    assert by_symbol["Uue"]["code"] == "unknown-element"
    assert by_symbol["Fe"]["name"] == "Iron"  # the other fields come through unchanged


def test_rst_simple_tables_of_spex_notation(tmp_path: Path) -> None:
    source = REAL / "spex2_notation.rst"  # spex-xray/spex-help, 8 simple tables
    out = tmp_path / "spex.jsonl"
    done = cli("normalize", source, "-c", "Lower level", "-o", out)
    assert done.returncode == 1
    rows = _rows(out)
    # 332 lines between the tables' header and closing borders, 45 of them a notation
    # alone (counted by hand; PROVENANCE.md says 285 and 41)
    assert len(rows) == 332
    assert sum(1 for r in rows if r["code"] == "empty") == 45
    assert list(rows[0])[:5] == ["Notation", "Lower level", "Term", "Upper level",
                                 "Term (2)"]
    first = rows[0]  # line 18: Mg1  2p6 3s2  1S0  3s 4p  1P1
    assert (first["Notation"], first["Lower level"], first["Term (2)"]) == (
        "Mg1", "2p6 3s2", "1P1")
    cut = next(r for r in rows if r["Notation"] == "Si1A")  # line 100: the cut-off 's2 3p2'
    assert cut["Lower level"] == "s2 3p2" and cut["code"] == "syntax"
    wide = next(r for r in rows if r["Notation"] == "P4B(80.160A)")  # fills its column
    assert wide["Lower level"] == "3s2 3p3" and wide["Term"] == "2D3/2"
