"""The per-row check: one cell (or a few) in, one :class:`Outcome` out.

A check is a picklable callable; :class:`ConfigurationCheck` reads a configuration (and a
species), :class:`LevelCheck` a level designation. Nothing here reads or writes files.
"""

from __future__ import annotations

import json
import math
from collections.abc import Sequence
from dataclasses import dataclass
from functools import lru_cache
from re import compile as re_compile
from typing import ClassVar, NamedTuple, Protocol

from ..errors import ConfspecError, ConfspecPhysicsError, ConfspecSyntaxError
from ..models import Configuration, Species
from ..notation.clean import clean
from ..notation.fastpath import fast_occupancies
from ..notation.read import written_parents
from ..notation.scripts import FROM_SUPERSCRIPT
from ..physics import implied_inner_subshells, subshell_label
from ..reading import MAX_INPUT_LENGTH, parse, parse_species
from ..reading import validate as validate_text

__all__ = [
    "MISSING",
    "Check",
    "ConfigurationCheck",
    "InputError",
    "Key",
    "LevelCheck",
    "Outcome",
    "cell_text",
    "first_line",
    "is_oversized",
    "repair_text_available",
    "writes_odd_parity",
]

class InputError(Exception):
    """Bad input or usage the user must fix: the CLI prints it on one line and exits 2."""


class _Missing:
    """A JSON Lines key that a row does not have (kept apart from an explicit null)."""

    _instance: ClassVar[_Missing | None] = None

    def __new__(cls) -> _Missing:
        if cls._instance is None:
            cls._instance = super().__new__(cls)
        return cls._instance

    def __repr__(self) -> str:
        return "MISSING"

    def __str__(self) -> str:  # a missing cell in a text output is an empty field
        return ""

    def __reduce__(self) -> str:
        return "MISSING"


MISSING = _Missing()


def first_line(err: BaseException) -> str:
    text = str(err).strip().splitlines()
    return text[0] if text else type(err).__name__



# ===================================================================== the per-row job
class Outcome(NamedTuple):
    """What one check found in one row (build it with :meth:`make`).

    ``normalized`` is the rewritten value when the input could be read (even when, in strict
    mode, it is flagged as non-canonical); ``checked`` is the text after repairs, when a
    repair changed it (the errors then refer to it). ``status``, ``code``, ``message`` and
    ``fixes_text`` are derived once here, because one outcome serves many rows.
    """

    errors: tuple[ConfspecError, ...]
    normalized: str | None
    fixes: tuple[str, ...]
    checked: str | None
    electrons: int | None
    status: str
    code: str | None
    message: str | None
    fixes_text: str | None
    rewritten: bool  # output rows carry `normalized` instead of the original value
    tail: tuple[str, str | None, str | None]  # (status, code, fixes_text) for output rows

    @classmethod
    def make(cls, errors: Sequence[ConfspecError], normalized: str | None = None,
             fixes: Sequence[str] = (), checked: str | None = None,
             electrons: int | None = None) -> Outcome:
        errors = tuple(errors)
        status, code = ("error", errors[0].code) if errors else ("ok", None)
        fixes_text = ",".join(fixes) if fixes else None
        return cls(errors, normalized, tuple(fixes), checked, electrons, status, code,
                   "; ".join(_one_line(e) for e in errors) if errors else None, fixes_text,
                   not errors and normalized is not None, (status, code, fixes_text))

    @property
    def ok(self) -> bool:
        return not self.errors


def _one_line(err: ConfspecError) -> str:
    where = f" (at character {err.position + 1})" if err.position is not None else ""
    return f"{err.message}{where}"


def _about_species(errors: list[ConfspecError], species: str | None, text: str
                   ) -> list[ConfspecError]:
    """Say 'species' in the messages of the errors that are about the species cell."""
    if species is None or species == text:
        return errors
    return [type(e)(e.code, f"species {species!r}: {e.message}", position=e.position,
                    text=e.text) if e.text == species else e for e in errors]


class Check(Protocol):
    """A per-row validator: reads the cells of ``roles`` (in that order), returns an Outcome.

    Implementations are frozen dataclasses so they pickle into worker processes; their
    result must depend only on the cells (the job caches it by them).
    """

    roles: ClassVar[tuple[str, ...]]

    def __call__(self, *cells: str | None) -> Outcome: ...


def cell_text(value: object) -> str | None:
    """A cell as text for a check: None for null, missing and NaN; bytes decoded as UTF-8."""
    if value is None or value is MISSING:
        return None
    if isinstance(value, str):
        return value
    if isinstance(value, float) and math.isnan(value):
        return None
    if isinstance(value, bytes | bytearray | memoryview):
        return bytes(value).decode("utf-8", errors="replace")
    if isinstance(value, dict | list):
        return json.dumps(value, ensure_ascii=False)
    try:  # pandas.NA and friends refuse bool()
        if value != value:  # NaN-like
            return None
    except TypeError:
        return None
    return str(value)


def is_oversized(key: object) -> bool:
    """A key (a cell, or a tuple of cells) with a cell over the input cap: it is answered
    ``too-long`` without parsing and never cached, so memory does not grow with cell size."""
    if type(key) is str:
        return len(key) > MAX_INPUT_LENGTH
    if type(key) is tuple:
        return any(type(c) is str and len(c) > MAX_INPUT_LENGTH for c in key)
    return False


def _too_long(cells: Sequence[str | None]) -> Outcome | None:
    """The ``too-long`` outcome of the first over-long cell (the first role, or another)."""
    for index, cell in enumerate(cells):
        if cell is not None and len(cell) > MAX_INPUT_LENGTH:
            what = "" if index == 0 else "species " if index == 1 else "term/J cell: "
            return Outcome.make([ConfspecSyntaxError(
                "too-long", f"{what}{len(cell):,} characters is over the limit of "
                f"{MAX_INPUT_LENGTH:,}", position=None, text=cell[:60] + "…")])
    return None


_NOBLE_GASES = ("He", "Ne", "Ar", "Kr", "Xe", "Rn", "Og")


@lru_cache(maxsize=1)
def _cores() -> tuple[tuple[str, int, frozenset[tuple[int, int]]], ...]:
    """(symbol, electrons, subshells) of each noble-gas core, read through the library."""
    out = []
    for symbol in _NOBLE_GASES:
        config = parse(f"[{symbol}]")
        out.append((symbol, config.electron_count,
                    frozenset((s.n, s.l) for s in config.subshells)))
    return tuple(out)


@lru_cache(maxsize=4096)
def _species(text: str) -> Species:
    return parse_species(text)


def _repair_text(text: str) -> str:
    try:
        import ftfy
    except ImportError:  # the CLI checks before it starts; this guards other callers
        raise InputError("--repair-text needs ftfy: pip install 'confspec[tables]'") from None
    fixed: str = ftfy.fix_text(text)
    return fixed


def repair_text_available() -> bool:
    try:
        import ftfy  # noqa: F401
    except ImportError:
        return False
    return True


@dataclass(frozen=True, kw_only=True)
class _Options:
    """What every check shares: strictness, upper case, and the notation to write."""

    strict: bool = False
    accept_uppercase: bool = False
    style: str = "plain"
    core: str = "condense"
    order: str = "shell"

    def __post_init__(self) -> None:
        # refuse an unknown style early, with the library's own error
        parse("1s1").format(style=self.style, core=self.core, order=self.order)


@dataclass(frozen=True, kw_only=True)
class ConfigurationCheck(_Options):
    """Validate a configuration cell (against a species cell when given) and rewrite it.

    Repairs run only when asked for and only on a value that fails without them, in this
    order: ``repair_text`` (undo mojibake with ftfy), ``accept_uppercase`` (read '2P6' as
    '2p6'), ``fill_core`` (add the noble-gas core a valence-only spelling leaves out, when
    that makes the electron count of the species right). Each one applied is named in
    :attr:`Outcome.fixes`.
    """

    roles: ClassVar[tuple[str, ...]] = ("configuration", "species")

    fill_core: bool = False
    repair_text: bool = False

    def __call__(self, *cells: str | None) -> Outcome:
        configuration = cells[0] if cells else None
        species = cells[1] if len(cells) > 1 else None
        original = configuration
        if configuration is None:
            return Outcome.make(validate_text(""))
        oversized = _too_long(cells)  # before any scan of the text, the fast path included
        if oversized is not None:
            return oversized
        species = species.strip() if species is not None and species.strip() else None
        text = configuration
        if species is None:
            occupancies = fast_occupancies(text)  # a common, valid spelling: nothing to repair
            if occupancies is not None:
                fast = Configuration.from_shell_order(occupancies)
                written = fast.format(style=self.style, core=self.core, order=self.order)
                split = run_together_splits(text)
                if self.strict and written != text:  # canonical in the chosen notation
                    return Outcome.make([ConfspecPhysicsError(
                        "non-canonical", f"valid, but the canonical spelling is {written!r}",
                        position=None, text=text)], written, split, None, fast.electron_count)
                return Outcome.make((), written, split, None, fast.electron_count)
        fixes: list[str] = []
        spectrum = None if species is None else _RUN_TOGETHER_SPECTRUM.fullmatch(species)
        if spectrum is not None:
            # 'FeIII': the spectrum Fe III with its space lost (read so, and said so)
            fixes.append(f"spectrum:{spectrum.group(1)} {spectrum.group(2)}")
        upper = False
        config, errors = self._read(text, species, upper)
        if errors and self.repair_text:
            repaired = _repair_text(text)
            if repaired != text:
                text = repaired
                fixes.append("repair-text")
                config, errors = self._read(text, species, upper)
        if errors and self.accept_uppercase and errors[0].code == "uppercase-subshell":
            config2, errors2 = self._read(text, species, True)
            if not errors2 or errors2[0].code != "uppercase-subshell":
                upper, config, errors = True, config2, errors2
                fixes.append("accept-uppercase")
        if (errors and self.fill_core and species is not None and config is not None
                and [e.code for e in errors] == ["electron-count"]):
            filled = self._fill_core(text, config, species, upper)
            if filled is not None:
                added, text, config = filled
                errors = []
                fixes.append(f"fill-core:{added}")
        if config is not None:
            note = clean(text).note
            if note is not None:  # a footnote or provenance mark is kept, not dropped
                fixes.append(f"note:{note}")
            parents = written_parents(text)
            if parents:  # coupling is notation: the value drops it, the row keeps a record
                fixes.append(f"parents:{' '.join(parents)}")
            fixes.extend(run_together_splits(text))
        normalized = None if config is None else config.format(
            style=self.style, core=self.core, order=self.order)
        if self.strict and not errors and config is not None:
            canonical = normalized  # the canonical spelling in the chosen style, core, order
            if canonical != original:
                how = f"valid after {', '.join(fixes)}, but" if fixes else "valid, but"
                errors = [ConfspecPhysicsError(
                    "non-canonical", f"{how} the canonical spelling is {canonical!r}",
                    position=None, text=original)]
        return Outcome.make(errors, normalized if config is not None else None, fixes,
                            text if text != original else None,
                            None if config is None else config.electron_count)

    @staticmethod
    def _read(text: str, species: str | None, upper: bool
              ) -> tuple[Configuration | None, list[ConfspecError]]:
        """The configuration (None if unreadable) and every problem of the text.

        The common case (valid) costs one cached parse; only failures pay for
        :func:`confspec.validate` collecting all problems.
        """
        try:
            kind = _species(species) if species is not None else None
        except ConfspecError:
            return _config_only(text, upper), _about_species(
                validate_text(text, species, accept_uppercase=upper), species, text)
        try:
            config = parse(text, accept_uppercase=upper)
        except ConfspecError as err:
            if kind is None or err.code != "hole-without-reference":
                return None, validate_text(text, kind, accept_uppercase=upper)
            try:
                config = parse(text, reference=kind, accept_uppercase=upper)
            except ConfspecError:
                return None, validate_text(text, kind, accept_uppercase=upper)
        if kind is not None and config.electron_count != kind.electron_count:
            return config, validate_text(text, kind, accept_uppercase=upper)
        return config, []

    def _fill_core(self, text: str, config: Configuration, species: str, upper: bool
                   ) -> tuple[str, str, Configuration] | None:
        kind = _species(species)
        deficit = kind.electron_count - config.electron_count
        written = {(s.n, s.l) for s in config.subshells}
        for symbol, electrons, subshells in _cores():
            if electrons != deficit or written & subshells:
                continue
            candidate = f"[{symbol}] {text.strip()}"
            filled, errors = self._read(candidate, species, upper)
            if filled is not None and not errors:
                return f"[{symbol}]", candidate, filled
        # level tables also leave out closed subshells below the written ones: Na 2p6.3s
        inner = implied_inner_subshells(written, deficit)
        if inner:
            config = Configuration.from_checked([*inner, *config.occupancies])
            return " ".join(f"{subshell_label(n, l)}{e}" for n, l, e in inner), str(
                config), config
        return None


#: a symbol with its Roman numeral run on ('FeIII', 'CII'): read as a spectrum
_RUN_TOGETHER_SPECTRUM = re_compile(r"([A-Z][a-z]?)([IVXLC]+)")
_SUPERSCRIPT_DIGITS = "⁰¹²³⁴⁵⁶⁷⁸⁹"
#: one run of subshells written without separators in which the occupancy digits of a
#: subshell run into the principal number of the next (``1s22s22p6``, ``5d16s2``, ``5d¹⁶s²``)
_RUN = re_compile(rf"[0-9]+[spdfghik](?:[0-9{_SUPERSCRIPT_DIGITS}]*[spdfghik])*"
                  rf"[0-9{_SUPERSCRIPT_DIGITS}]*")
_SPLIT = re_compile(rf"([spdfghik])(?=([0-9]{{2,}}|[{_SUPERSCRIPT_DIGITS}]{{2,}})[spdfghik])")


@lru_cache(maxsize=4096)
def run_together_splits(text: str) -> tuple[str, ...]:
    """A ``run-together:`` fix entry per run whose digits were split into an occupancy that
    leaves its subshell open and the next principal number (``5d16s2``: 5d1 6s2, where the
    digits could also be a 5d10 that lost its 0, or 5d 16s2): the single-digit convention
    chose, and the row says so. Closed subshells run together (``1s22s22p6``) leave no
    doubt and no entry."""
    if len(text) > 512 or _SPLIT.search(text) is None:  # most cells: no digits run on
        return ()
    out = []
    for match in _RUN.finditer(text):
        if not any(_open_split(split.group(1), split.group(2))
                   for split in _SPLIT.finditer(match.group())):
            continue
        try:
            out.append(f"run-together:{parse(match.group()).format(core='expand')}")
        except ConfspecError:
            out.append(f"run-together:{match.group()}")
    return tuple(out)


def _open_split(letter: str, digits: str) -> bool:
    """Whether the occupancy the split leaves (all digits but the last) is below the
    subshell's capacity."""
    from ..physics import LETTER_TO_L, pauli_limit

    occupancy = int(digits[:-1].translate(FROM_SUPERSCRIPT))
    return occupancy < pauli_limit(LETTER_TO_L[letter])


_J_DECIMAL = re_compile(r"^\s*(\d+)\.5\s*$")
_J_WHOLE = re_compile(r"^\s*(\d+)\.0*\s*$")


def _j_text(cell: str) -> str:
    """J as a level table writes it: ``4``, ``9/2``, a decimal ``4.5`` read as 9/2, a
    tentative ``[3]``, or ``5/2,3/2`` for unresolved fine structure (no single J: "")."""
    cell = clean(cell, notes=False).text.strip().rstrip("?").strip()
    if cell.startswith("[") and cell.endswith("]"):
        cell = cell[1:-1].strip()  # NIST brackets a tentative J
    if "," in cell:
        return ""
    decimal = _J_DECIMAL.match(cell)
    if decimal:
        return f"{2 * int(decimal.group(1)) + 1}/2"
    whole = _J_WHOLE.match(cell)
    if whole:  # a float column: 4.0
        return whole.group(1)
    return cell.strip()


@dataclass(frozen=True, kw_only=True)
class LevelCheck(_Options):
    """Validate a level designation (``3d6(5D)4s 6D9/2``) and rewrite it canonically.

    With ``term_column`` the configuration cell holds only the configuration and the term
    (and ``J``, from its own cell or written in the term) is joined to it before the check;
    the output then rewrites only the configuration. The consistency codes
    (term-not-allowed, parent-not-allowed, j-not-allowed, parity-mismatch, electron-count)
    are reported per row like every other code.
    """

    roles: ClassVar[tuple[str, ...]] = ("level", "species", "term", "j")

    term_column: bool = False
    #: how the table writes parity (``confspec.levels.PARITY_CONVENTIONS``); the CLI's
    #: ``auto`` picks one per column before the run
    parity: str = "marked"
    fill_core: bool = False
    repair_text: bool = False

    def __post_init__(self) -> None:
        from ..levels.designations import validate_level

        super().__post_init__()
        validate_level("1s", parity=self.parity)  # an unknown convention is refused early

    def __call__(self, *cells: str | None) -> Outcome:
        text, species, term, j = (*cells, None, None, None, None)[:4]
        oversized = _too_long(cells)  # before any scan of the text
        if oversized is not None:
            return oversized
        if text is None or not text.strip():
            return Outcome.make(validate_text(text or ""))
        outcome = self._check(text, species, term, j)
        if outcome.errors and self.repair_text:
            repaired = _repair_text(text)
            if repaired != text:
                again = self._check(repaired, species, term, j)
                if not again.errors or again.code != outcome.code:
                    return Outcome.make(again.errors, again.normalized,
                                        ("repair-text", *again.fixes), again.checked or repaired,
                                        again.electrons)
        return outcome

    def _check(self, text: str, species: str | None, term: str | None, j: str | None
               ) -> Outcome:
        from ..levels.designations import parse_level, read_level, validate_level

        species = species.strip() if species is not None and species.strip() else None
        level_text = text
        fixes: list[str] = []
        config_text = clean(text, notes=False).text.strip()
        if term is not None and term.strip():
            cleaned = clean(text)  # a mark in the configuration cell is a note, not syntax
            if cleaned.note is not None:
                config_text = cleaned.text.strip()
                fixes.append(f"note:{cleaned.note}")
            term_text = _term_cell(term, j)
            if isinstance(term_text, ConfspecError):
                return Outcome.make([term_text])
            level_text = f"{config_text} {term_text}"
        elif j is not None and j.strip() and _j_text(j):
            # a level listed by J alone: J must be half-integer exactly for an odd number of
            # electrons (closed shells left unwritten hold an even number)
            j_value = _j_text(j)
            if not _J_TEXT.fullmatch(j_value):
                return Outcome.make([ConfspecSyntaxError(
                    "term-syntax", f"J column: {j.strip()!r} is not a J such as 4, 9/2 or 4.5",
                    position=0, text=j.strip())])
            if not validate_level(level_text, species, accept_uppercase=self.accept_uppercase,
                                  parity=self.parity):
                electrons = parse_level(level_text, parity=self.parity
                                        ).configuration.electron_count
                if ("/" in j_value) != (electrons % 2 == 1):
                    return Outcome.make([ConfspecPhysicsError(
                        "j-not-allowed", f"J = {j_value} is impossible for {electrons} electrons"
                        ": J is half-integer exactly when the electron count is odd",
                        position=None, text=text)])
        problems = validate_level(level_text, species, accept_uppercase=self.accept_uppercase,
                                  parity=self.parity)
        if problems and level_text != text:
            # problems of the joined term point at the term cell, not past the configuration
            problems = [p if p.position is None or p.position <= len(config_text) else
                        type(p)(p.code, f"term {level_text[len(config_text) + 1:]!r}: "
                                f"{p.message}", position=len(config_text), text=text)
                        for p in problems]
        if problems:
            return Outcome.make(problems, checked=level_text if level_text != text else None)
        level, marks = read_level(level_text, accept_uppercase=self.accept_uppercase,
                                  parity=self.parity)
        fixes.extend(marks)
        if self.fill_core and species is not None:
            filled = _fill_inner(level.configuration, _species(species))
            if filled is not None:
                added, config = filled
                fixes.append(f"fill-core:{added}")
                parents = level.parents
                if parents and not added.startswith("["):
                    # inner subshells outside a core join the first group, where a closed
                    # subshell leaves the parent term as it is (NIST writes 2s2.2p2(3P).3p)
                    had = {t.label for t in level.configuration.subshells}
                    inner = tuple(s.label for s in config.subshells if s.label not in had)
                    parents = (parents[0].model_copy(
                        update={"subshells": inner + parents[0].subshells}), *parents[1:])
                level = level.model_copy(update={"configuration": config, "parents": parents})
        if self.term_column:  # the term stays in its own column; parents stay here
            bare = level.model_copy(update={"term": None, "seniority": None, "uncertain": None})
            normalized = bare.format(self.style, core=self.core, order=self.order)
        else:
            normalized = level.format(self.style, core=self.core, order=self.order)
        errors: list[ConfspecError] = []
        if self.strict and normalized != text:
            errors.append(ConfspecPhysicsError(
                "non-canonical", f"valid, but the canonical spelling is {normalized!r}",
                position=None, text=text))
        return Outcome.make(errors, normalized, fixes,
                            level_text if level_text != text else None,
                            level.configuration.electron_count)


def _fill_inner(config: Configuration, kind: Species) -> tuple[str, Configuration] | None:
    """The closed inner subshells a level table leaves unwritten, added (as a noble-gas core
    when they are one): ``3d6(5D)4s`` of Fe II gains [Ar]."""
    written = {(s.n, s.l) for s in config.subshells}
    inner = implied_inner_subshells(written, kind.electron_count - config.electron_count)
    if not inner:
        return None
    full = Configuration.from_checked([*inner, *config.occupancies])
    for symbol, _, subshells in _cores():
        if subshells == {(n, l) for n, l, _ in inner}:
            return f"[{symbol}]", full
    return " ".join(f"{subshell_label(n, l)}{e}" for n, l, e in inner), full


def writes_odd_parity(cell: object, *, term_cell: bool) -> bool:
    """Whether one cell of a level or term column carries an odd-parity mark: the
    automatic parity convention reads a column without any as unmarked."""
    from ..levels.designations import has_odd_mark

    if not isinstance(cell, str) or not cell.strip() or len(cell) > MAX_INPUT_LENGTH:
        return False
    if not term_cell:
        return has_odd_mark(cell)
    token = _term_cell(cell, None)
    return isinstance(token, str) and has_odd_mark(token.rstrip(" ?"), term_only=True)


def _term_cell(term: str, j: str | None) -> str | ConfspecError:
    """The term cell (and J cell) read on their own, written back as one term token, or
    the problem located in the cell it came from."""
    from ..chemistry.terms import read_term

    cell = clean(term, notes=False).text.strip()
    query = cell.endswith("?")
    cell = cell.rstrip("?").strip()
    if cell.lower() == "limit":
        return ConfspecSyntaxError(
            "series-limit", "this row is the ionization limit of the table ('Limit'), not a "
            "level; nothing to check", position=0, text=term.strip())
    try:
        parsed, j_in_term, prefix, _ = read_term(cell)
    except ConfspecError as err:
        code = "term-syntax" if err.code == "syntax" else err.code
        return type(err)(code, f"term column: {err.message}", position=err.position, text=cell)
    if j is not None and j.strip() and j_in_term is None:
        j_text = _j_text(j)
        if j_text and not _J_TEXT.fullmatch(j_text):
            return ConfspecSyntaxError(
                "term-syntax", f"J column: {j.strip()!r} is not a J such as 4, 9/2 or 4.5",
                position=0, text=j.strip())
    else:
        j_text = "" if j_in_term is None else (
            str(j_in_term) if j_in_term.denominator == 1 else f"{j_in_term.numerator}/2")
    return f"{prefix or ''}{parsed}{j_text}" + (" ?" if query else "")


_J_TEXT = re_compile(r"\d+(?:/2)?")


def _config_only(text: str, upper: bool) -> Configuration | None:
    try:
        return parse(text, accept_uppercase=upper)
    except ConfspecError:
        return None


Key = tuple[str | None, ...] | str | None  # the cells of a row's roles (one role: the cell)


