"""The documentation site never lies: every snippet runs, every generated table is in sync.

* ``pycon`` blocks are doctests, run here page by page (ELLIPSIS, NORMALIZE_WHITESPACE);
* ``python`` blocks are executed;
* ``console`` blocks are ``$ confspec ...`` commands, run through the CLI and compared with
  the output shown (``...`` elides);
* ``sql`` blocks run against SQLite with confspec's functions registered;
* ``sh`` blocks may only name make targets and extras that exist;
* the generated tables (error codes, notation, corpus) are rendered by the site's hook and
  checked against ``confspec.ERROR_CODES`` and the test tables themselves.

Every page runs in a fresh folder holding a copy of ``docs/examples``, so no snippet writes
into the repository.
"""

from __future__ import annotations

import contextlib
import doctest
import importlib.util
import io
import re
import shlex
import shutil
import sqlite3
import tomllib
from html.parser import HTMLParser
from pathlib import Path
from types import ModuleType

import pytest

import confspec

from . import test_reading, test_species

ROOT = Path(__file__).resolve().parent.parent
DOCS = ROOT / "docs"
PAGES = sorted(p for p in DOCS.rglob("*.md") if "_hooks" not in p.parts)
FLAGS = doctest.ELLIPSIS | doctest.NORMALIZE_WHITESPACE
FENCE = re.compile(r"^```(\w*)[^\n]*\n(.*?)^```\s*$", re.MULTILINE | re.DOTALL)


def _page_id(page: Path) -> str:
    return str(page.relative_to(DOCS))


def _blocks(page: Path, language: str) -> list[tuple[int, str]]:
    """(line number, body) of every fenced block in one language."""
    text = page.read_text(encoding="utf-8")
    return [(text[: m.start()].count("\n") + 1, m.group(2)) for m in FENCE.finditer(text)
            if m.group(1) == language]


def _hook() -> ModuleType:
    spec = importlib.util.spec_from_file_location("confspec_docs_hook",
                                                  DOCS / "_hooks" / "generated.py")
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


HOOK = _hook()


@pytest.fixture
def in_examples(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """A fresh working folder with a copy of docs/examples."""
    shutil.copytree(DOCS / "examples", tmp_path, dirs_exist_ok=True)
    monkeypatch.chdir(tmp_path)
    return tmp_path


def test_there_are_pages_and_each_is_in_the_nav() -> None:
    nav = (ROOT / "mkdocs.yml").read_text(encoding="utf-8")
    assert len(PAGES) >= 9
    for page in PAGES:
        assert f": {_page_id(page)}" in nav, f"{_page_id(page)} is not in the mkdocs nav"


# ---------------------------------------------------------------------------- snippets
@pytest.mark.parametrize("page", PAGES, ids=_page_id)
def test_doctests_of_the_page(page: Path, in_examples: Path) -> None:
    text = page.read_text(encoding="utf-8")
    test = doctest.DocTestParser().get_doctest(text, {}, _page_id(page), str(page), 0)
    out = io.StringIO()
    runner = doctest.DocTestRunner(optionflags=FLAGS)
    runner.run(test, out=out.write)
    assert runner.failures == 0, out.getvalue()


@pytest.mark.parametrize("page", PAGES, ids=_page_id)
def test_every_python_block_runs(page: Path, in_examples: Path) -> None:
    for line, body in _blocks(page, "pycon"):
        assert ">>> " in body, f"{_page_id(page)}:{line}: a pycon block without >>> prompts"
    for line, body in _blocks(page, "python"):
        code = compile(body, f"{_page_id(page)}:{line}", "exec")
        exec(code, {"__name__": "__docs__"})


def _run_cli(argv: list[str]) -> str:
    from confspec.cli import main

    out = io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(out):
        main(argv)
    return out.getvalue()


@pytest.mark.parametrize("page", PAGES, ids=_page_id)
def test_every_console_command_prints_what_the_page_shows(page: Path, in_examples: Path
                                                          ) -> None:
    checker = doctest.OutputChecker()
    for line, body in _blocks(page, "console"):
        commands = re.split(r"^\$ ", body, flags=re.MULTILINE)
        assert commands[0] == "", f"{_page_id(page)}:{line}: a console block starts with $"
        for chunk in commands[1:]:
            command, _, expected = chunk.partition("\n")
            argv = shlex.split(command)
            assert argv[0] == "confspec", f"{_page_id(page)}:{line}: only confspec runs here"
            got = _run_cli(argv[1:])
            assert checker.check_output(expected, got, FLAGS), (
                f"{_page_id(page)}:{line}: $ {command}\n--- page ---\n{expected}"
                f"--- confspec printed ---\n{got}")


@pytest.mark.parametrize("page", PAGES, ids=_page_id)
def test_every_sql_block_runs(page: Path, in_examples: Path) -> None:
    from confspec.sql import register

    for line, body in _blocks(page, "sql"):
        con = sqlite3.connect(":memory:")
        register(con)
        try:
            con.executescript(body)
        except sqlite3.Error as err:  # pragma: no cover - the message is the report
            pytest.fail(f"{_page_id(page)}:{line}: {err}")


@pytest.mark.parametrize("page", PAGES, ids=_page_id)
def test_shell_blocks_name_only_real_targets_and_extras(page: Path) -> None:
    makefile = (ROOT / "Makefile").read_text(encoding="utf-8")
    targets = set(re.findall(r"^([a-z][a-z-]*):", makefile, flags=re.MULTILINE))
    pyproject = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    extras = set(pyproject["project"]["optional-dependencies"])
    for line, body in _blocks(page, "sh"):
        for command in body.splitlines():
            command = command.split("#", 1)[0].strip()
            if not command:
                continue
            if command.startswith("make "):
                assert command.split()[1] in targets, f"{_page_id(page)}:{line}: {command}"
                continue
            match = re.fullmatch(r'python -m pip install(?: -e)? "?\.\[([a-z,]+)\]"?', command)
            assert match, f"{_page_id(page)}:{line}: cannot check {command!r}"
            assert set(match[1].split(",")) <= extras, f"{_page_id(page)}:{line}: {command}"


# ---------------------------------------------------------------------------- generated
class _Table(HTMLParser):
    """Rows of the generated HTML tables, cell text only."""

    def __init__(self) -> None:
        super().__init__()
        self.rows: list[list[str]] = []
        self.ids: list[str] = []
        self._cell: list[str] | None = None

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        if tag == "tr":
            self.rows.append([])
        elif tag == "td":
            self._cell = []
        elif tag == "code" and dict(attrs).get("id"):
            self.ids.append(str(dict(attrs)["id"]))

    def handle_endtag(self, tag: str) -> None:
        if tag == "td" and self._cell is not None:
            self.rows[-1].append("".join(self._cell))
            self._cell = None

    def handle_data(self, data: str) -> None:
        if self._cell is not None:
            self._cell.append(data)


def _rows(rendered: str) -> tuple[list[list[str]], list[str]]:
    table = _Table()
    table.feed(rendered)
    return [row for row in table.rows if row], table.ids


@pytest.mark.parametrize("page", PAGES, ids=_page_id)
def test_every_marker_of_the_page_renders(page: Path) -> None:
    text = page.read_text(encoding="utf-8")
    rendered = HOOK.expand(text)
    assert "<!-- confspec:" not in rendered


def test_the_error_table_lists_exactly_the_codes_of_the_library() -> None:
    rows, ids = _rows(HOOK.render_error_codes(""))
    assert ids == list(confspec.ERROR_CODES)
    for row, (code, info) in zip(rows, confspec.ERROR_CODES.items(), strict=True):
        assert row[0] == code and row[1] == info.kind
        assert row[2] == info.trigger and row[3] == info.fix
    page = (DOCS / "error-codes.md").read_text(encoding="utf-8")
    assert "<!-- confspec:error-codes -->" in page


def _param_values(function: object) -> list[tuple[object, ...]]:
    marks = [m for m in getattr(function, "pytestmark", []) if m.name == "parametrize"]
    return [tuple(p.values) for p in marks[0].args[1]]


def _shown(cell: str) -> str:
    """Undo the markers of invisible characters the hook puts into an input cell."""
    cell = cell.replace("␣", " ").replace("⟨tab⟩", "\t").replace("⟨newline⟩", "\n")
    return re.sub(r"⟨U\+([0-9A-F]{4})⟩", lambda m: chr(int(m[1], 16)), cell)


def test_the_notation_table_is_the_parse_test_table() -> None:
    """Every row of the parse tests is on the site, and every site row parses as shown."""
    tests = test_reading
    expected = [(str(v[0]), "[Ne] 3s1") for v in
                _param_values(tests.test_every_spelling_gives_the_same_value)]
    expected += [(str(v[0]), str(v[1])) for v in _param_values(tests.test_canonical_form)]
    rows, _ = _rows(HOOK.render_spellings(""))
    assert [(_shown(r[0]), r[1]) for r in rows] == expected
    for text, canonical in expected:
        assert confspec.normalize(text) == canonical
    page = (DOCS / "notation.md").read_text(encoding="utf-8")
    for marker in ("spellings", "species-spellings", "term-spellings", "styles",
                   "relativistic-spellings", "level-spellings"):
        assert f"<!-- confspec:{marker} -->" in page


def test_the_species_table_is_the_species_test_table() -> None:
    tests = test_species
    expected = _param_values(tests.test_species_spellings)
    rows, _ = _rows(HOOK.render_species_spellings(""))
    assert len(rows) == len(expected)
    for row, (text, symbol, charge) in zip(rows, expected, strict=True):
        assert _shown(row[0]) == text
        species = confspec.parse_species(row[1])
        assert (species.symbol, species.charge) == (symbol, charge)


def test_the_real_world_tables_hold_every_case() -> None:
    """Every case of tests/test_real_world.py is on the site: as a working row or a gap."""
    from . import test_real_world

    rendered = HOOK.render_real_world("")
    rows, _ = _rows(rendered)
    expected = 0
    for test, *_ in HOOK._REAL_WORLD:
        expected += len(_param_values(getattr(test_real_world, test)))
    assert len(rows) == expected
    shown = {_shown(row[0]) for row in rows}
    for test, *_ in HOOK._REAL_WORLD:
        for values in _param_values(getattr(test_real_world, test)):
            assert str(values[0]) in shown, (test, values[0])
    assert "<!-- confspec:real-world -->" in (DOCS / "notation.md").read_text(encoding="utf-8")


def test_the_corpus_table_is_the_whole_corpus() -> None:
    rows, _ = _rows(HOOK.render_malformed_corpus(""))
    corpus = HOOK.corpus_rows()
    assert len(rows) == len(corpus) >= 200
    assert [r[1] for r in rows] == [code for code, _, _ in corpus]


def test_a_wrong_marker_stops_the_build() -> None:
    with pytest.raises(HOOK.DocsError):
        HOOK.expand("<!-- confspec:error-codez -->")


def test_visible_markers_round_trip() -> None:
    for text in ["  1s2 ", "1s2\t2s2", "\ufeff1s2", "1s2\u00a0", "1s2\u20092s2", "a\nb"]:
        cell = re.sub(r"<[^>]+>", "", HOOK.visible(text))
        import html

        assert _shown(html.unescape(cell)) == text


# ---------------------------------------------------------------------------- figures
def test_the_figures_script_draws_every_plot(tmp_path: Path) -> None:
    spec = importlib.util.spec_from_file_location("make_figures",
                                                  ROOT / "scripts" / "make_figures.py")
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    with contextlib.redirect_stdout(io.StringIO()):
        assert module.main(["--out", str(tmp_path)]) == 0
    names = sorted(p.name for p in tmp_path.iterdir())
    assert names == ["radial-densities.png", "scf-radial-densities.png", "slater-4s-3d.png",
                     "zeff-outermost.png"]
    for path in tmp_path.iterdir():
        head = path.read_bytes()[:24]
        assert head[:8] == b"\x89PNG\r\n\x1a\n"
        width, height = int.from_bytes(head[16:20], "big"), int.from_bytes(head[20:24], "big")
        assert width >= 1000 and height >= 600
    pages = "".join(p.read_text(encoding="utf-8") for p in PAGES)
    for name in names:
        assert f"figures/{name}" in pages, f"{name} is drawn but not shown on any page"


def test_the_api_page_documents_every_public_name() -> None:
    page = (DOCS / "api.md").read_text(encoding="utf-8")
    documented = set(re.findall(r"^::: confspec\.(\w+)", page, flags=re.MULTILINE))
    missing = sorted(set(confspec.__all__) - documented)
    assert not missing, f"add to docs/api.md: {missing}"
