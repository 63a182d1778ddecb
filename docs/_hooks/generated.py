"""mkdocs hook: tables and pictures of the site that are generated, never typed by hand.

A page asks for one with a marker on a line of its own, ``<!-- confspec:NAME ARGUMENT -->``,
and the hook replaces it while the site is built. The tables come from the code
(``ERROR_CODES``, ``DESCRIPTOR_DOCS``, the shipped data tables, the SQL function list) or
from the test corpus (the ``pytest.param`` tables of the tests and
``tests/corpus/malformed.tsv``), so the site cannot drift from what confspec does: every
generated row is checked against the library while it is rendered, and a mismatch, an
unknown marker or a missing test table stops the build. ``tests/test_docs.py`` runs the same
renderers.
"""

from __future__ import annotations

import ast
import html
import re
import unicodedata
from collections.abc import Callable, Iterable, Sequence
from fractions import Fraction
from pathlib import Path
from typing import Any

import confspec

ROOT = Path(__file__).resolve().parents[2]
TESTS = ROOT / "tests"
MARKER = re.compile(r"^<!-- confspec:([a-z-]+)(?: (.*?))? -->$", re.MULTILINE)


class DocsError(RuntimeError):
    """A generated table does not agree with the library, or a marker is wrong."""


# ---------------------------------------------------------------------------- helpers
def visible(text: str) -> str:
    """HTML for an input with its invisible characters shown: ␣ for an outer space,
    ⟨tab⟩, ⟨U+00A0⟩ ... for the rest."""
    out: list[str] = []
    stripped = text.strip(" ")
    lead = len(text) - len(text.lstrip(" "))
    trail = len(text) - len(text.rstrip(" ")) if stripped else 0
    for i, ch in enumerate(text):
        if ch == " " and (i < lead or i >= len(text) - trail):
            out.append('<span title="space">␣</span>')
        elif ch == "\t":
            out.append('<span title="tab">⟨tab⟩</span>')
        elif ch == "\n":
            out.append('<span title="line feed">⟨newline⟩</span>')
        elif ch != " " and (ch.isspace() or unicodedata.category(ch) in ("Cc", "Cf", "Zs")):
            name = unicodedata.name(ch, "control character").lower()
            out.append(f'<span title="{name}">⟨U+{ord(ch):04X}⟩</span>')
        else:
            out.append(html.escape(ch))
    return "<code>" + "".join(out) + "</code>"


def table(headers: Sequence[str], rows: Iterable[Sequence[str]]) -> str:
    """An HTML table (cells are HTML already); raw HTML keeps odd inputs intact."""
    head = "".join(f"<th>{h}</th>" for h in headers)
    body = "".join("<tr>" + "".join(f"<td>{cell}</td>" for cell in row) + "</tr>"
                   for row in rows)
    return f"<table>\n<thead><tr>{head}</tr></thead>\n<tbody>{body}</tbody>\n</table>"


def code(text: str) -> str:
    return f"<code>{html.escape(text)}</code>"


def _describe(test_id: str) -> str:
    return test_id.replace("-", " ")


# ---------------------------------------------------------------------------- test tables
def _literal(node: ast.expr, names: dict[str, ast.expr]) -> Any:
    """A literal, a module-level name, or a small expression on literals such as
    ``"2p110s1".replace("110", "1 10")`` (evaluated without builtins)."""
    if isinstance(node, ast.Name) and node.id in names:
        return _literal(names[node.id], names)
    try:
        return ast.literal_eval(node)
    except ValueError:
        expression = compile(ast.Expression(node), "<test table>", "eval")
        try:
            return eval(expression, {"__builtins__": {}}, {"Fraction": Fraction})
        except Exception as err:
            raise DocsError(f"cannot show the test parameter {ast.unparse(node)}") from err


def test_cases(path: Path, test_name: str) -> list[tuple[tuple[Any, ...], dict[str, Any]]]:
    """The rows of ``@pytest.mark.parametrize`` on ``test_name`` in a test file, read with
    ``ast`` (the test module is not imported): ``[(values, keywords), ...]`` where the
    keywords of a ``pytest.param(...)`` or ``case(...)`` row hold its ``id`` (and ``gap``)."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    names = {t.id: node.value for node in tree.body if isinstance(node, ast.Assign)
             for t in node.targets if isinstance(t, ast.Name)}
    for node in tree.body:
        if not (isinstance(node, ast.FunctionDef) and node.name == test_name):
            continue
        for deco in node.decorator_list:
            if not (isinstance(deco, ast.Call) and ast.unparse(deco.func).endswith(
                    "mark.parametrize")):
                continue
            items = deco.args[1]
            if isinstance(items, ast.Name):
                items = names[items.id]
            if not isinstance(items, ast.List | ast.Tuple):
                raise DocsError(f"{path.name}::{test_name}: parameters are not a list")
            single = isinstance(deco.args[0], ast.Constant) and "," not in str(
                deco.args[0].value)
            rows: list[tuple[tuple[Any, ...], dict[str, Any]]] = []
            for item in items.elts:
                keywords: dict[str, Any] = {}
                if isinstance(item, ast.Call) and ast.unparse(item.func).split(".")[-1] in (
                        "param", "case"):
                    args = item.args
                    keywords = {kw.arg: _literal(kw.value, names) for kw in item.keywords
                                if kw.arg in ("id", "gap")}
                elif isinstance(item, ast.Tuple) and not single:
                    args = item.elts
                else:
                    args = [item]
                rows.append((tuple(_literal(a, names) for a in args), keywords))
            return rows
    raise DocsError(f"no parametrized test {test_name!r} in {path.name}")


def test_params(path: Path, test_name: str) -> list[tuple[tuple[Any, ...], str | None]]:
    """``[(values, id), ...]`` of a parametrized test (see :func:`test_cases`)."""
    return [(values, keywords.get("id")) for values, keywords in test_cases(path, test_name)]


def corpus_rows() -> list[tuple[str, str, int]]:
    """(code, input, line number) of tests/corpus/malformed.tsv, escapes decoded."""
    rows = []
    path = TESTS / "corpus" / "malformed.tsv"
    for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
        if not line or line.startswith("#"):
            continue
        code_, _, text = line.partition("\t")
        text = text.replace("\\t", "\t").replace("\\n", "\n").replace("\\r", "\r")
        text = re.sub(r"\\u([0-9a-fA-F]{4})", lambda m: chr(int(m.group(1), 16)), text)
        if text == "@LONG@":
            text = "1s2 " * 1100
        rows.append((code_, text, number))
    return rows


def _shown_input(text: str) -> str:
    if not text:
        return "<em>(empty text)</em>"
    if len(text) > 80:
        return f"{visible(text[:24])} … ({len(text):,} characters)"
    return visible(text)


# ---------------------------------------------------------------------------- renderers
def _call_text(function: str, args: tuple[Any, ...], kwargs: dict[str, Any]) -> str:
    parts = [repr(a) for a in args] + [f"{k}={v!r}" for k, v in kwargs.items()]
    return f"{function}({', '.join(parts)})"


def _code_of(function: str, args: tuple[Any, ...], kwargs: dict[str, Any]) -> str | None:
    """The code the call reports: the first problem of a validate-like function, or the
    code of the error it raises."""
    target = getattr(confspec, function)
    try:
        result = target(*args, **kwargs)
    except confspec.ConfspecError as err:
        return str(err.code)
    if isinstance(result, list) and result:
        return str(result[0].code)
    return None


#: Calls for codes that no test table reaches by a single input; checked when rendered.
_EXTRA_EXAMPLES: dict[str, tuple[str, tuple[Any, ...], dict[str, Any]]] = {
    "electron-count": ("validate", ("[Ar] 3d6 4s2",), {"species": "Fe2+"}),
    "non-canonical": ("validate", ("4s2 3d6",), {"strict": True}),
    "no-reference-data": ("effective_charge", ("Xe", "5p"), {"model": "clementi-raimondi"}),
}


def error_examples() -> dict[str, tuple[str, tuple[Any, ...], dict[str, Any]]]:
    """One example call per code, the first found in: the malformed corpus, then the error
    tables of the species, term, d-count, shielding and level tests, then the extras."""
    found: dict[str, tuple[str, tuple[Any, ...], dict[str, Any]]] = {}
    for code_, text, _line in corpus_rows():
        found.setdefault(code_, ("validate", (text,), {}))
    for code_, call in _EXTRA_EXAMPLES.items():
        found.setdefault(code_, call)
    # (test file, test, function called, the code when the table has no code column)
    tables: list[tuple[str, str, str, str | None]] = [
        ("test_species.py", "test_species_errors", "parse_species", None),
        ("chemistry/test_terms.py", "test_term_errors_have_codes_and_positions", "parse_term",
         None),
        ("chemistry/test_ground.py", "test_d_count_errors", "d_electron_count", None),
        ("chemistry/test_shielding.py", "test_shielding_errors", "effective_charge", None),
        ("levels/test_designations.py", "test_consistency_problems", "validate_level", None),
        ("levels/test_designations.py", "test_unknown_xray_levels", "xray_level",
         "unknown-xray-level"),
    ]
    for file, test, function, fixed in tables:
        if not (TESTS / file).exists() or not hasattr(confspec, function):
            continue
        for values, _id in test_params(TESTS / file, test):
            first, code_ = values[0], fixed or values[1]
            if isinstance(code_, list):
                code_ = code_[0]
            call = (function, (), first) if isinstance(first, dict) else (function, (first,), {})
            found.setdefault(code_, call)
    return found


def render_error_codes(_: str) -> str:
    """Every code of ``confspec.ERROR_CODES``, with an example from the tests."""
    examples = error_examples()
    rows = []
    for name, info in confspec.ERROR_CODES.items():
        example = examples.get(name)
        shown = "—"
        if example is not None:
            function, args, kwargs = example
            if _code_of(function, args, kwargs) != name:
                raise DocsError(f"the example {_call_text(*example)} does not give {name}")
            if function == "validate" and not kwargs:
                shown = _shown_input(args[0])
            else:
                shown = code(_call_text(function, args, kwargs))
        rows.append((f'<code id="{name}">{name}</code>', info.kind, html.escape(info.trigger),
                     html.escape(info.fix), shown))
    return table(["code", "kind", "what triggers it", "how to fix the data",
                  "example (from the tests)"], rows)


def render_malformed_corpus(_: str) -> str:
    """The whole malformed-input corpus, each input re-checked against its code."""
    rows = []
    for code_, text, line in corpus_rows():
        problems = confspec.validate(text)
        if not problems or problems[0].code != code_:
            raise DocsError(f"malformed.tsv line {line}: {text!r} does not give {code_}")
        where = problems[0].position
        rows.append((_shown_input(text), f'<a href="#{code_}">{code_}</a>',
                     "—" if where is None else str(where), html.escape(problems[0].message)))
    return (f"<details><summary>All {len(rows)} malformed inputs of the test corpus</summary>"
            "\n\n" + table(["input", "code", "position", "message"], rows) + "\n\n</details>")


def _configuration_rows(path: Path, test: str, expected: Callable[[tuple[Any, ...]], str]
                        ) -> list[tuple[str, str, str]]:
    rows = []
    for values, test_id in test_params(path, test):
        text, want = values[0], expected(values)
        got = confspec.normalize(text)
        if got != want:
            raise DocsError(f"{path.name}::{test}: {text!r} reads as {got!r}, not {want!r}")
        rows.append((visible(text), code(got), _describe(test_id or "")))
    return rows


def render_spellings(_: str) -> str:
    """Input → canonical output, from the parse tests (every row re-checked here)."""
    sodium = _configuration_rows(TESTS / "test_reading.py",
                                 "test_every_spelling_gives_the_same_value",
                                 lambda _values: "[Ne] 3s1")
    canonical = _configuration_rows(TESTS / "test_reading.py", "test_canonical_form",
                                    lambda values: str(values[1]))
    return table(["input", "canonical output", "what it shows"], sodium + canonical)


def render_relativistic_spellings(_: str) -> str:
    path = TESTS / "notation" / "test_relativistic.py"
    rows = _configuration_rows(path, "test_spellings_of_one_relativistic_configuration",
                               lambda _values: "2p1/2^2 2p3/2^3")
    return table(["input", "canonical output", "what it shows"], rows)


def render_species_spellings(_: str) -> str:
    rows = []
    for (text, symbol, charge), test_id in test_params(TESTS / "test_species.py",
                                                       "test_species_spellings"):
        species = confspec.parse_species(text)
        if (species.symbol, species.charge) != (symbol, charge):
            raise DocsError(f"{text!r} reads as {species}, not {symbol} {charge:+d}")
        rows.append((visible(text), code(str(species)), f"{charge:+d}" if charge else "0",
                     code(species.format("spectrum")), _describe(test_id or "")))
    return table(["input", "species", "charge", "spectrum label", "what it shows"], rows)


def render_term_spellings(_: str) -> str:
    rows = []
    for (text, canonical), test_id in test_params(TESTS / "chemistry" / "test_terms.py",
                                                  "test_term_spellings"):
        got = str(confspec.parse_term(text))
        if got != canonical:
            raise DocsError(f"term {text!r} reads as {got!r}, not {canonical!r}")
        rows.append((visible(text), code(got), _describe(test_id or "")))
    return table(["input", "canonical term", "what it shows"], rows)


def render_level_spellings(_: str) -> str:
    """Level designations, from the level tests (every row re-checked here)."""
    rows = []
    levels = TESTS / "levels" / "test_designations.py"
    for (text, config, term, J, parents), test_id in test_params(levels,
                                                                 "test_level_spellings"):
        level = confspec.parse_level(text)
        if level.configuration != confspec.parse(config) or str(level.term) != term \
                or level.J != J or [str(p) for p in level.parents] != parents:
            raise DocsError(f"level {text!r} reads as {level}, not as its test says")
        rows.append((visible(text), code(str(level)), code(term),
                     html.escape(" ".join(parents)) or "—", _describe(test_id or "")))
    return table(["input", "canonical level", "term", "parents", "what it shows"], rows)


# ---------------------------------------------------------------------------- real world
def _refusal(function: Callable[[str], Any], text: str, code_: str,
             position: int | None = None) -> str | None:
    """None when ``function(text)`` is refused with the code (and position), else what
    happened instead."""
    try:
        result = function(text)
    except confspec.ConfspecError as err:
        if err.code != code_:
            return f"refused with {err.code}"
        if position is not None and err.position != position:
            return f"refused at position {err.position}"
        return None
    return f"read as {result}"


def _level_reading(values: tuple[Any, ...]) -> str | None:
    text, configuration, term, species = values
    try:
        level = confspec.parse_level(text)
    except confspec.ConfspecError as err:
        return f"refused with {err.code}"
    got = (str(level.configuration), None if level.term is None else str(level.term),
           None if level.species is None else str(level.species))
    return None if got == (configuration, term, species) else f"read as {level}"


def _read_as(function: Callable[[str], Any], text: str, canonical: str) -> str | None:
    try:
        got = str(function(text))
    except confspec.ConfspecError as err:
        return f"refused with {err.code}"
    return None if got == canonical else f"read as {got!r}"


#: The tables of tests/test_real_world.py: (test, heading, columns, cells of a row, check).
_REAL_WORLD: list[tuple[str, str, list[str], Callable[[tuple[Any, ...]], list[str]],
                        Callable[[tuple[Any, ...]], str | None]]] = [
    ("test_configuration_is_read", "Configurations that are read", ["canonical"],
     lambda v: [code(v[1])], lambda v: _read_as(confspec.parse, v[0], v[1])),
    ("test_configuration_is_refused", "Configurations that are refused", ["code", "position"],
     lambda v: [code(v[1]), "—" if v[2] is None else str(v[2])],
     lambda v: _refusal(confspec.parse, v[0], v[1], v[2])),
    ("test_species_is_read", "Species that are read", ["species"],
     lambda v: [code(v[1])], lambda v: _read_as(confspec.parse_species, v[0], v[1])),
    ("test_species_is_refused", "Species that are refused", ["code", "position"],
     lambda v: [code(v[1]), "—" if v[2] is None else str(v[2])],
     lambda v: _refusal(confspec.parse_species, v[0], v[1], v[2])),
    ("test_term_is_read", "Terms that are read", ["term"],
     lambda v: [code(v[1])], lambda v: _read_as(confspec.parse_term, v[0], v[1])),
    ("test_term_is_refused", "Terms that are refused", ["code", "position"],
     lambda v: [code(v[1]), "—" if v[2] is None else str(v[2])],
     lambda v: _refusal(confspec.parse_term, v[0], v[1], v[2])),
    ("test_level_is_read", "Level designations that are read",
     ["configuration", "term", "species"],
     lambda v: [code(v[1]), code(v[2]) if v[2] else "—", code(v[3]) if v[3] else "—"],
     _level_reading),
    ("test_level_is_refused", "Level designations that are refused", ["code"],
     lambda v: [code(v[1])], lambda v: _refusal(confspec.parse_level, v[0], v[1])),
]


def render_real_world(_: str) -> str:
    """The real-world corpus of ``tests/test_real_world.py``, table by table, and its known
    gaps. Every row is checked: a row that the tests expect to work must work; a documented
    gap (marked ``xfail(strict=True)`` in the tests) is listed as a gap while it still fails
    and with the working rows once it is closed."""
    path = TESTS / "test_real_world.py"
    parts: list[str] = []
    gaps: list[tuple[str, ...]] = []
    for test, heading, columns, cells, check in _REAL_WORLD:
        rows = []
        for values, keywords in test_cases(path, test):
            problem = check(values)
            gap = keywords.get("gap")
            if gap and problem is not None:  # a closed gap is shown as working: it does
                gaps.append((visible(values[0]), heading.lower().replace(" that are", ","),
                             html.escape(gap)))
                continue
            if problem is not None:
                raise DocsError(f"{test} {keywords.get('id')}: {values[0]!r} {problem}")
            rows.append((visible(values[0]), *cells(values),
                         _describe(str(keywords.get("id") or ""))))
        parts.append(f"<details><summary>{heading} ({len(rows)})</summary>\n\n"
                     + table(["input", *columns, "case"], rows) + "\n\n</details>")
    parts.append(f"<details><summary>Known gaps ({len(gaps)})</summary>\n\n"
                 + table(["input", "table", "what confspec does not do yet"], gaps)
                 + "\n\n</details>")
    return "\n\n".join(parts)


def render_styles(_: str) -> str:
    """Output styles, from the formatting tests (iron, [Ar] 3d6 4s2)."""
    iron = confspec.parse("[Ar] 3d6 4s2")
    rows = []
    for (options, text), test_id in test_params(TESTS / "notation" / "test_render.py",
                                                "test_styles"):
        got = iron.format(**options)
        if got != text:
            raise DocsError(f"format({options}) gives {got!r}, not {text!r}")
        call = ", ".join(f"{k}={v!r}" for k, v in options.items())
        rows.append((code(f"format({call})"), code(got), _describe(test_id or "")))
    return table(["call", "output", "style"], rows)


def render_madelung_exceptions(_: str) -> str:
    """Neutral atoms whose shipped ground configuration is not the Madelung filling."""
    from confspec.physics import madelung_fill

    rows = []
    for Z in range(1, 119):
        level = confspec.ground_level(confspec.Element.model_validate(Z).symbol)
        rule = confspec.Configuration.from_occupancies(madelung_fill(Z))
        if level.configuration != rule:
            moved = ", ".join(str(e) for e in confspec.excitations(level.configuration, rule))
            rows.append((str(Z), level.species.symbol, code(str(level.configuration)),
                         code(str(rule)), html.escape(moved), level.provenance))
    return table(["Z", "atom", "ground configuration", "Madelung filling",
                  "electrons moved from the Madelung filling", "provenance"], rows)


def render_clementi_raimondi(_: str) -> str:
    """Outermost-electron Zeff, Z = 1–36: Clementi–Raimondi beside Slater's rules."""
    rows = []
    for Z in range(1, 119):
        symbol = confspec.Element.model_validate(Z).symbol
        values = confspec.descriptors(symbol)
        fitted = values["zeff_clementi_raimondi"]
        if fitted is None:
            continue
        slater = values["zeff_slater"]
        from confspec.physics import subshell_label

        label = subshell_label(int(values["outer_n"] or 0), int(values["outer_l"] or 0))
        rows.append((str(Z), symbol, label, f"{fitted:.4f}", f"{slater:.2f}",
                     f"{float(slater or 0) - float(fitted):+.2f}"))
    return table(["Z", "atom", "outermost subshell", "Clementi–Raimondi Z<sub>eff</sub>",
                  "Slater Z<sub>eff</sub>", "Slater − C–R"], rows)


def render_slater_disagreement(_: str) -> str:
    """Slater's rules against the shipped Clementi–Raimondi values, per subshell kind: the
    very numbers every Slater result's caution quotes."""
    from confspec.chemistry.shielding import slater_disagreement

    rows = [(d.kind, str(d.count), f"{d.median:.0%}" if d.count else "—",
             f"{d.largest:.0%}" if d.count else "—") for d in slater_disagreement().values()]
    return table(["electrons", "subshells compared", "median gap", "largest gap"], rows)


def render_orbital_energy_vs_ionization(_: str) -> str:
    """The orbital-energy descriptors beside the published first ionization energies: why
    they are named orbital energies (the test in test_descriptors.py pins the ratios)."""
    rows = []
    for symbol in ("H", "He", "Li", "C", "N", "O", "Ne", "Na", "Mg", "Al", "Ar", "K",
                   "Ca", "Ti", "Fe", "Cu", "Zn", "Ga", "Kr"):
        d = confspec.descriptors(symbol)
        ie = float(d["ionization_energy_ev"] or 0)
        slater = -float(d["orbital_energy_slater_ev"] or 0)
        fitted = d["orbital_energy_clementi_raimondi_ev"]
        cr = "—" if fitted is None else f"{-float(fitted):.2f} ({-float(fitted) / ie:.2f}×)"
        rows.append((symbol, f"{ie:.3f}", f"{slater:.2f} ({slater / ie:.2f}×)", cr))
    return table(["atom", "measured IE1 / eV (NIST ASD)", "−orbital_energy_slater_ev",
                  "−orbital_energy_clementi_raimondi_ev"], rows)


def render_descriptors(_: str) -> str:
    from confspec.chemistry.descriptors import DESCRIPTOR_DOCS

    return table(["key", "meaning"], [(code(k), html.escape(v))
                                      for k, v in DESCRIPTOR_DOCS.items()])


def render_sources(_: str) -> str:
    """Every source named in the shipped data tables: how many rows cite it, with which
    status, how many were transcribed from memory and not yet checked, and how many were
    transcribed from memory and then checked against a real published table by a test
    (their note says against which)."""
    from confspec.data import read_table

    rows = []
    for path in sorted((ROOT / "confspec" / "data").glob("*.csv")):
        counts: dict[tuple[str, str], list[int]] = {}
        for row in read_table(path.name):
            key = (row["source"], row.get("status") or "")
            seen = counts.setdefault(key, [0, 0, 0])
            note = row.get("note") or ""
            seen[0] += 1
            if note.startswith("from memory"):
                seen[2 if "checked against" in note else 1] += 1
        for (source, status), (count, unchecked, checked) in counts.items():
            rows.append((code(path.name), html.escape(source), status or "—", str(count),
                         str(unchecked), str(checked)))
    return table(["table", "source", "status", "rows", "from memory, not yet checked",
                  "from memory, checked against a real table"], rows)


def render_sql_functions(_: str) -> str:
    from confspec.sql import FUNCTIONS

    return table(["function", "arguments", "returns"],
                 [(code(name), str(arity), html.escape(what))
                  for name, (arity, what) in FUNCTIONS.items()])


def render_boxes(argument: str) -> str:
    """An orbital box diagram as inline SVG: ``<!-- confspec:boxes [Ar] 3d6 4s2 -->``;
    options after ``;``, e.g. ``... ; order=filling``."""
    text, _, options = argument.partition(";")
    kwargs: dict[str, Any] = {}
    for item in options.split():
        key, _, value = item.partition("=")
        kwargs[key] = value
    svg = confspec.parse(text.strip()).boxes("svg", **kwargs)
    return f'<div class="confspec-boxes">{svg}</div>'


RENDERERS: dict[str, Callable[[str], str]] = {
    "error-codes": render_error_codes,
    "malformed-corpus": render_malformed_corpus,
    "spellings": render_spellings,
    "relativistic-spellings": render_relativistic_spellings,
    "species-spellings": render_species_spellings,
    "term-spellings": render_term_spellings,
    "level-spellings": render_level_spellings,
    "real-world": render_real_world,
    "styles": render_styles,
    "madelung-exceptions": render_madelung_exceptions,
    "clementi-raimondi": render_clementi_raimondi,
    "slater-disagreement": render_slater_disagreement,
    "descriptors": render_descriptors,
    "orbital-energy-vs-ionization": render_orbital_energy_vs_ionization,
    "sources": render_sources,
    "sql-functions": render_sql_functions,
    "boxes": render_boxes,
}


def expand(markdown: str) -> str:
    """Replace every marker; an unknown one is an error (a typo must not vanish)."""

    def one(match: re.Match[str]) -> str:
        name, argument = match.group(1), match.group(2) or ""
        renderer = RENDERERS.get(name)
        if renderer is None:
            raise DocsError(f"unknown marker confspec:{name}")
        return renderer(argument)

    return MARKER.sub(one, markdown)


def on_page_markdown(markdown: str, **_: Any) -> str:
    """mkdocs event: expand the markers of one page."""
    return expand(markdown)
