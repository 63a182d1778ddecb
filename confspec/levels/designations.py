"""Level designations: a configuration with parent terms, a term, J, a label and a mark.

``3d6(5D)4s 6D9/2``, ``Fe II 3d7(4F)4s4p(3P°) z6G°13/2``, ``Fe3+: [Ar] 3d5``. The grammar's
``level`` rule reads the shape; this module turns it into a frozen :class:`Level` and checks
that its parts agree: every parent is a term of the subconfiguration to its left, the final
term is reachable by coupling the parents with the electrons after them (or is a term of the
configuration), J lies in |L − S| … L + S, the parity mark matches the configuration, and
the electron count matches the species.
"""

from __future__ import annotations

import re
import warnings
from collections.abc import Sequence
from fractions import Fraction
from typing import Any

from pydantic import AliasChoices, BaseModel, ConfigDict, Field

from ..chemistry.terms import (
    TERM_STYLES,
    JKTerm,
    Term,
    jj_levels,
    make_term,
    read_term,
    seniority_terms,
    term_keys,
)
from ..errors import ConfspecError, ConfspecPhysicsError, ConfspecSyntaxError
from ..models import Configuration, Species
from ..notation.render import ORDER_KEYS, largest_core, style_of, token_text
from ..notation.scripts import j_text
from ..notation.syntax import RawItem
from ..physics import LETTER_TO_L, NOBLE_CORES, Parity, pauli_limit

__all__ = ["PARITY_CONVENTIONS", "Level", "ParentTerm", "has_odd_mark", "mark_parity",
           "parse_level", "read_level", "validate_level"]

#: How a table writes parity. ``marked``: a term without an odd mark (°) is even, as NIST
#: writes them. ``unmarked``: a term without a mark says nothing about parity (many tables
#: never mark odd terms), so only a written odd mark is checked, and the canonical text
#: gains the mark its configuration implies. The cleaning commands add ``auto``: a column
#: with no odd mark on any row is read as unmarked.
PARITY_CONVENTIONS = ("marked", "unmarked")


def read_term_token(token: str, position: int, text: str
                    ) -> tuple[Term | JKTerm, Fraction | None, str | None]:
    """(term without J, J, ordering letter) of one TERM or PARENT token of the grammar,
    read by the one term reader; J is checked later, with its own code."""
    inner = token[1:-1] if token.startswith("(") and token.endswith(")") else token
    offset = position + (1 if inner is not token else 0)
    if inner.startswith("$"):  # a term in LaTeX math: $^5D_4$
        inner, offset = inner[1:], offset + 1
    inner = inner.removesuffix("$")
    padded = " " * offset + inner
    try:
        term, J, prefix, _ = read_term(padded, offset)
    except ConfspecError as err:
        raise type(err)(err.code, err.message, position=err.position, text=text) from None
    return term, J, prefix


class ParentTerm(BaseModel):
    """An intermediate (parent) term and the subshells of the subconfiguration it closes."""

    model_config = ConfigDict(frozen=True, extra="forbid")

    term: Term
    subshells: tuple[str, ...] = Field(description="labels of the subconfiguration")
    ordering_letter: str | None = Field(
        default=None, validation_alias=AliasChoices("ordering_letter", "seniority"),
        description="NIST's configuration-ordering letter (a, b, z...), not Racah's seniority")

    @property
    def seniority(self) -> str | None:
        """Deprecated: the ordering letter; use ``ordering_letter``."""
        warnings.warn("ParentTerm.seniority is deprecated; it is the NIST ordering letter, "
                      "now ordering_letter", DeprecationWarning, stacklevel=2)
        return self.ordering_letter

    def __str__(self) -> str:
        return f"({self.ordering_letter or ''}{self.term})"


class Level(BaseModel):
    """A level designation: configuration, parents, term, J, species and uncertainty.

    >>> level = parse_level("Fe II 3d6(5D)4s 6D9/2")
    >>> str(level.configuration), str(level.term), level.J, level.statistical_weight
    ('3d6 4s1', '6D9/2', Fraction(9, 2), 10)
    >>> str(level.species), [str(p) for p in level.parents]
    ('Fe+', ['(5D)'])
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    configuration: Configuration
    term: Term | JKTerm | None = None
    ordering_letter: str | None = Field(
        default=None, validation_alias=AliasChoices("ordering_letter", "seniority"),
        description="NIST's configuration-ordering letter (a6D, z7P°), not Racah's seniority")
    parents: tuple[ParentTerm, ...] = ()
    uncertain: str | None = Field(default=None, description="'?' or 'predicted'")
    species: Species | None = None

    @property
    def seniority(self) -> str | None:
        """Deprecated: the ordering letter; use ``ordering_letter``."""
        warnings.warn("Level.seniority is deprecated; it is the NIST ordering letter, now "
                      "ordering_letter", DeprecationWarning, stacklevel=2)
        return self.ordering_letter

    @property
    def J(self) -> Fraction | None:
        return None if self.term is None else self.term.J

    @property
    def parity(self) -> Parity:
        """The parity of the configuration (the term's mark must agree)."""
        return self.configuration.parity

    @property
    def statistical_weight(self) -> int | None:
        """2J + 1, when J is known."""
        return None if self.J is None else int(2 * self.J + 1)

    def format(self, style: str = "plain", core: str = "condense", order: str = "shell") -> str:
        """The canonical designation; styles plain, latex, html (and every configuration
        style for the configuration part). Reads back with :func:`parse_level`."""
        fmt = style_of(style)
        config_style = fmt.name
        if self.species is not None and \
                self.configuration.electron_count != self.species.electron_count:
            # closed inner subshells left unwritten (as level tables do) are read only when
            # no core is written: a core here would make the text fail its electron count
            core = "expand"
        parts: list[str] = []
        if self.species is not None:
            sp = self.species
            parts.append(f"{sp.format('spectrum')} " if sp.charge >= 0 else f"{sp}: ")
        subs = {s.label: s for s in self.configuration.subshells}
        if not self.parents:
            body = self.configuration.format(style=config_style, core=core, order=order)
        else:
            grouped = {label for parent in self.parents for label in parent.subshells}
            rest = [s for s in self.configuration.subshells if s.label not in grouped]
            # A parent covers every subshell written since the previous one, so a subshell
            # outside every group can only stand in the core or after the last group
            # (3d6(5D) 4s1): anywhere else it would join a group when the text is read back.
            symbol = largest_core([(s.n, s.l, s.electrons) for s in rest if not s.j2]) \
                if core == "condense" else None
            inside = {(n, l) for n, l, _ in NOBLE_CORES[symbol]} if symbol else set()
            after = sorted((s for s in rest if (s.n, s.l) not in inside),
                           key=lambda s: (ORDER_KEYS[order](s.n, s.l), s.j2))
            pieces = [fmt.core.format(symbol=symbol)] if symbol else []
            for parent in self.parents:
                tokens = [token_text(fmt, s.n, s.l, s.j2, s.electrons)
                          for s in (subs[label] for label in parent.subshells if label in subs)]
                pieces.append(fmt.separator.join(tokens) + str(parent))
            pieces += [token_text(fmt, s.n, s.l, s.j2, s.electrons) for s in after]
            body = fmt.separator.join(pieces)
        parts.append(body)
        if self.term is not None:
            parts.append(" " + (self.ordering_letter or "") + _term_text(self.term, style))
        if self.uncertain is not None:
            parts.append(" ?" if self.uncertain == "?" else " (predicted)")
        return "".join(parts)

    def __str__(self) -> str:
        return self.format()

    def __repr__(self) -> str:
        return f"Level('{self}')"


def _term_text(term: Term | JKTerm, style: str) -> str:
    """The term in the level's style: the term's own writer, for every style it has."""
    return term.format(style if style in TERM_STYLES else "plain")


# ---------------------------------------------------------------------------- reading
_LIMIT = re.compile(r"\bLimit\b", re.IGNORECASE)
_LOST_OCCUPANCY = re.compile(r"(?<![0-9A-Za-z])([0-9]{1,2}[spdfghik])\^?\?")
_SPACED_LABEL_CHARGE = re.compile(r"^[A-Z][a-z]?( )(?:\d*[+\-−]+|[+\-−]\d+)\s*[:=]")


def _read(text: str, *, accept_uppercase: bool = False
          ) -> tuple[Level | None, list[ConfspecError], dict[str, Any]]:
    """Clean, parse and resolve; problems point into ``text`` as written."""
    from ..notation.clean import clean, drop, remap
    from ..notation.read import precheck

    original = precheck(text, "level designation")
    limit = _LIMIT.search(original)
    if limit is not None:
        raise ConfspecSyntaxError(
            "series-limit", "this is the ionization limit of a level table ('Limit'), not a "
            "level; nothing to check", position=limit.start(), text=original)
    cleaned = clean(original, notes=False)
    helium = _HELIUM_LABEL.fullmatch(cleaned.text.strip())
    if helium is not None:
        return _read_helium_label(helium, original, accept_uppercase)
    spaced = _SPACED_LABEL_CHARGE.match(cleaned.text)  # 'Fe 2+: [Ar] 3d6'
    if spaced:
        cleaned = drop(cleaned, [spaced.span(1)])
    try:
        level, problems, context = _read_clean(cleaned.text, accept_uppercase)
    except ConfspecError as err:
        raise remap(err, original, cleaned) from None
    context["remap"] = lambda err: remap(err, original, cleaned)
    return level, [remap(p, original, cleaned) for p in problems], context


#: the label helium-like tables give a singly excited level: n, then the term of 1s nl
#: (``2^3S_1``, ``1^1S_0``, ``3^1P``), where l is the term's L
_HELIUM_LABEL = re.compile(r"([0-9]{1,2})\s*\^\s*\{?([13])\}?([SPDFGHIK])"
                           r"(?:\s*_?\s*\{?([0-9]{1,2})\}?)?")


def _read_helium_label(label: re.Match[str], original: str, accept_uppercase: bool
                       ) -> tuple[Level | None, list[ConfspecError], dict[str, Any]]:
    """``n^(2S+1)L_J`` of a two-electron spectrum, read as the level 1s nl (1s2 for n = 1)
    with that term. The label carries no parity mark: the parity is that of l = L."""
    from ..chemistry.terms import TERM_LETTERS

    n, multiplicity, letter, J = label.groups()
    L = TERM_LETTERS.index(letter)
    config = "1s2" if n == "1" else f"1s1 {n}{'spdfghik'[L]}1"
    expanded = f"{config} {multiplicity}{letter}{'°' if L % 2 else ''}{J or ''}"

    def point(err: ConfspecError) -> ConfspecError:
        return type(err)(err.code, f"{err.message} (the label reads as {expanded!r})",
                         position=0, text=original)

    try:
        level, problems, context = _read_clean(expanded, accept_uppercase)
    except ConfspecError as err:
        raise point(err) from None
    context.update(remap=point, helium_label=expanded)
    return level, [point(p) for p in problems], context


def _read_clean(text: str, accept_uppercase: bool
                ) -> tuple[Level | None, list[ConfspecError], dict[str, Any]]:
    from ..notation.grammar import parse_level_raw
    from ..notation.resolve import resolve
    from ..reading import parse_species

    lost = _LOST_OCCUPANCY.search(text) if "?" in text else None
    if lost is not None:  # `3d? 2D`: a digit an export lost, never one electron
        raise ConfspecSyntaxError(
            "unknown-occupancy", f"'?' stands where the electron count of {lost.group(1)} "
            "belongs (a digit lost in an export); the value cannot be read",
            position=lost.end() - 1, text=text)
    raw = parse_level_raw(text)
    problems: list[ConfspecError] = []
    occupancies, errors = resolve(raw.configuration, text, accept_uppercase=accept_uppercase)
    problems.extend(errors)
    species = None
    if raw.label is not None:
        symbol, position, charge, _ = raw.label
        try:
            species = parse_species(symbol + (f"{abs(charge)}{'+' if charge > 0 else '-'}"
                                              if charge else ""))
        except ConfspecError as err:
            problems.append(type(err)(err.code, err.message, position=position, text=text))
    config = Configuration.from_checked(occupancies)
    items = raw.configuration.items
    parents: list[tuple[ParentTerm, int]] = []
    seniorities: list[str] = []
    scopes: list[str] = []
    start = 0
    for end, token, position in raw.parents:
        if token == "()":  # an empty parent before the first subshell: nothing coupled yet
            continue
        if token[1:-1].isdigit():  # a seniority alone, `3d6(4)`: checked, not a term
            problems.extend(_seniority_problems(items[start:end], int(token[1:-1]),
                                                position, text))
            continue
        parent_term, parent_j, prefix = read_term_token(token, position, text)
        if isinstance(parent_term, JKTerm):
            raise ConfspecSyntaxError("term-syntax", "a parent term is an LS term such as (2P°3/2)",
                                      position=position, text=text)
        if parent_j is not None and parent_j not in parent_term.without_j().allowed_j() and \
                parent_j.denominator == 1 and len(items[start:end]) == 1 and \
                not _seniority_problems(items[start:end], int(parent_j), position, text):
            # not a J of the term but a possible seniority: the opacity project's 3d5(6S5)
            seniorities.append(token)
            problems.extend(_term_seniority_problems(items[start], parent_term, int(parent_j),
                                                     position, text))
            parent_j = None
        if parent_j is not None and parent_j not in parent_term.without_j().allowed_j():
            raise ConfspecPhysicsError(
                "j-not-allowed", f"J = {j_text(parent_j)} is outside |L − S| … L + S for the "
                f"parent {parent_term.without_j()}: "
                + ", ".join(j_text(j) for j in parent_term.without_j().allowed_j()),
                position=position, text=text)
        labels = []
        for item in items[start:end]:
            label = _item_label(item, config)
            if label is not None and label not in labels:
                labels.append(label)
        if not parents and len(labels) > 1 and _couples_last_only(config, labels, parent_term):
            labels = labels[-1:]
            scopes.append(token)
        parents.append((ParentTerm.model_construct(
            term=parent_term if parent_j is None else make_term(
                parent_term.multiplicity, parent_term.L, parent_term.parity, parent_j),
            subshells=tuple(labels), ordering_letter=prefix), position))
        start = end
    term: Term | JKTerm | None = None
    J: Fraction | None = None
    seniority: str | None = None
    term_at: int | None = None
    if raw.term is not None:
        token, term_at = raw.term
        term, J, seniority = read_term_token(token, term_at, text)
    uncertain = None
    if raw.uncertain is not None:
        uncertain = "?" if raw.uncertain[0] == "?" else "predicted"
    context = {"text": text, "term_at": term_at, "J": J, "parents": parents,
               "core_written": raw.configuration.core is not None,
               "seniorities": seniorities, "scopes": scopes}
    if problems and any(p.code in ("unknown-element", "impossible-charge") for p in problems):
        return None, problems, context
    level = Level.model_construct(
        configuration=config, term=term if J is None else _with_j(term, J),
        ordering_letter=seniority,
        parents=tuple(p for p, _ in parents), uncertain=uncertain, species=species)
    return level, problems, context


def _couples_last_only(config: Configuration, labels: list[str], term: Term | JKTerm) -> bool:
    """The opacity project's reading of ``3p5 3d4(3F4)``: a parent that is no term of all
    the subshells before it but is one of the last alone couples that subshell only (the
    NIST reading, a parent of everything written before it, is tried first)."""
    if isinstance(term, JKTerm):
        return False
    subs = {s.label: s for s in config.subshells}
    key = (term.multiplicity - 1, term.L)

    def keys(chosen: list[str]) -> set[tuple[int, int]]:
        return term_keys(Configuration.from_checked(
            [(s.n, s.l, s.j2, s.electrons) for s in (subs[x] for x in chosen if x in subs)]))

    return key not in keys(labels) and key in keys(labels[-1:])


def _seniority_problems(items: Sequence[RawItem], v: int, position: int, text: str
                        ) -> list[ConfspecError]:
    """Racah's seniority v written alone after one subshell (``3d6(4)``): possible when
    v ≤ the electrons w, v ≤ 2(2l+1) − w and v ≡ w (mod 2)."""
    if len(items) != 1:
        return [ConfspecSyntaxError(
            "parent-not-allowed", "a seniority written alone, such as (4), follows one "
            "subshell", position=position, text=text)]
    item = items[0]
    l = LETTER_TO_L.get(item.letter.lower())
    if l is None:
        return []  # not a subshell letter: the configuration's own check names it
    w = item.count if item.count is not None else 1
    if v <= w and v <= pauli_limit(l) - w and (w - v) % 2 == 0:
        return []
    possible = [str(s) for s in range(min(w, pauli_limit(l) - w), -1, -2)][::-1]
    return [ConfspecPhysicsError(
        "parent-not-allowed", f"seniority {v} is impossible for {item.n}{item.letter}{w}; "
        f"possible: {', '.join(possible)}", position=position, text=text)]


def _term_seniority_problems(item: RawItem, term: Term, v: int, position: int, text: str
                             ) -> list[ConfspecError]:
    """A seniority written after a parent term (``3d5(4P3)``) must be one that term has in
    that subshell: 4P of d5 has v = 3 only (Racah's rule, computed by seniority_terms)."""
    w = item.count if item.count is not None else 1
    subshell = f"{item.n}{item.letter.lower()}{w}"
    try:
        found = sorted({t.seniority for t in seniority_terms(subshell)
                        if (t.term.multiplicity, t.term.L) == (term.multiplicity, term.L)})
    except ConfspecError:
        return []  # the subshell itself is wrong: the configuration's check names it
    if not found or v in found:
        return []  # a term the subshell lacks is reported as parent-not-allowed later
    return [ConfspecPhysicsError(
        "parent-not-allowed", f"the parent {term.without_j()} of {subshell} has seniority "
        + " or ".join(str(s) for s in found) + f", not {v}", position=position, text=text)]


def _with_j(term: Term | JKTerm | None, J: Fraction) -> Term | JKTerm | None:
    if term is None:
        return None
    if isinstance(term, JKTerm):
        return JKTerm.model_construct(multiplicity=term.multiplicity, K=term.K,
                                      parity=term.parity, J=J)
    return make_term(term.multiplicity, term.L, term.parity, J)


def _item_label(item: Any, config: Configuration) -> str | None:
    from ..physics import LETTER_TO_L

    l = LETTER_TO_L.get(item.letter.lower())
    if l is None:
        return None
    j2 = 2 * l + item.j_sign if item.j_sign else item.j2
    for sub in config.subshells:
        if sub.n == item.n and sub.l == l and (not j2 or sub.j2 in (0, j2)):
            return sub.label
    return f"{item.n}{item.letter.lower()}"  # emptied by a hole: keep the written label


def parse_level(text: str, *, accept_uppercase: bool = False, parity: str = "marked"
                ) -> Level:
    """Read a level designation; raise the first problem (see :func:`validate_level`).
    With ``parity="unmarked"`` an unmarked term takes the parity of its configuration.

    >>> str(parse_level("3d7(4F)4s4p(3P°) z6G°13/2"))
    '3d7(4F) 4s1 4p1(3P°) z6G°13/2'
    >>> str(parse_level("2p 2P3/2", parity="unmarked"))
    '2p1 2P°3/2'
    """
    return read_level(text, accept_uppercase=accept_uppercase, parity=parity)[0]


def read_level(text: str, *, accept_uppercase: bool = False, parity: str = "marked"
               ) -> tuple[Level, tuple[str, ...]]:
    """:func:`parse_level`, with the names of what the reading added to the text as
    written (``parity-from-configuration`` when the unmarked convention gave a term its
    odd mark), so a cleaning job can record it."""
    unmarked = _convention(parity)
    level, problems, context = _read(text, accept_uppercase=accept_uppercase)
    if level is not None and not problems:
        problems = [context["remap"](p) for p in _consistency(level, context, None, unmarked)]
    if problems:
        raise problems[0]
    assert level is not None
    added = (*(("helium-label",) if "helium_label" in context else ()),
             *(f"parent-seniority:{token}" for token in context.get("seniorities", ())),
             *(f"parent-of-last-subshell:{token}" for token in context.get("scopes", ())))
    if unmarked:
        marked = mark_parity(level)
        if marked != level:
            return marked, (*added, "parity-from-configuration")
    return level, added


def has_odd_mark(text: str, *, term_only: bool = False) -> bool:
    """Whether a level designation (or, with ``term_only``, a term) writes an odd-parity
    mark anywhere: what the automatic convention looks for in a column."""
    try:
        if term_only:
            return read_term(text)[0].parity == "odd"
        level, _, context = _read(text)
    except ConfspecError:
        return False
    if level is None or "helium_label" in context:  # the label's parity is implied
        return False
    terms = [level.term, *(p.term for p in level.parents)]
    return any(t is not None and t.parity == "odd" for t in terms)


def _convention(parity: str) -> bool:
    """True for the unmarked convention; an unknown name is refused."""
    if parity not in PARITY_CONVENTIONS:
        raise ConfspecSyntaxError(
            "unknown-option", f"unknown parity convention {parity!r}; use one of: "
            + ", ".join(PARITY_CONVENTIONS), position=None, text=parity)
    return parity == "unmarked"


def mark_parity(level: Level) -> Level:
    """The level with every term and parent that carries no odd mark given the parity its
    subshells imply (the unmarked convention: ``2p 2P`` is ``2p 2P°``)."""
    subs = {s.label: s for s in level.configuration.subshells}
    parents: list[ParentTerm] = []
    grouped: list[str] = []
    for parent in level.parents:
        group = Configuration.from_checked([(s.n, s.l, s.j2, s.electrons) for s in (
            subs[label] for label in parent.subshells if label in subs)])
        grouped.extend(parent.subshells)
        left = Configuration.from_checked([(s.n, s.l, s.j2, s.electrons) for s in (
            subs[label] for label in grouped if label in subs)])
        key = (parent.term.multiplicity - 1, parent.term.L)
        implied = group.parity if key in term_keys(group) else left.parity
        parents.append(parent.model_copy(update={"term": _with_parity(parent.term, implied)})
                       if parent.term.parity == "even" else parent)
    term = level.term
    if term is not None and term.parity == "even":
        term = _with_parity(term, level.configuration.parity)
    return level.model_copy(update={"term": term, "parents": tuple(parents)})


def _with_parity(term: Any, parity: Parity) -> Any:
    if isinstance(term, JKTerm):
        return JKTerm.model_construct(multiplicity=term.multiplicity, K=term.K, parity=parity,
                                      J=term.J)
    return make_term(term.multiplicity, term.L, parity, term.J)


def _parity_problem(term: Term | JKTerm, what: str, parity: Parity, unmarked: bool,
                    position: int | None, text: str, why: str = ""
                    ) -> ConfspecError | None:
    """A term whose parity disagrees with its subshells; an unmarked term under the
    unmarked convention gives no parity, and a message never calls it "marked"."""
    if term.parity == parity or (unmarked and term.parity == "even"):
        return None
    if term.parity == "odd":
        message = f"{term} is marked odd (°), but {what} has even parity{why}"
    else:
        message = (f"{term} has no odd mark, so it reads as even, but {what} has odd parity"
                   f"{why}; mark odd terms with °, or read the table with the unmarked "
                   "parity convention")
    return ConfspecPhysicsError("parity-mismatch", message, position=position, text=text)


def validate_level(level: Level | str, species: Species | str | None = None, *,
                   accept_uppercase: bool = False, parity: str = "marked"
                   ) -> list[ConfspecError]:
    """Every problem of a level designation: configuration physics, term-not-allowed,
    parent-not-allowed, j-not-allowed, parity-mismatch and electron-count.

    >>> [p.code for p in validate_level("2p2 1P")]
    ['term-not-allowed']
    >>> [p.code for p in validate_level("3d6(5D)4s 8D")]
    ['term-not-allowed']
    >>> validate_level("3d6(5D)4s 6D9/2")
    []

    ``parity`` is the table's convention (:data:`PARITY_CONVENTIONS`): under ``unmarked``,
    ``2p 2P`` passes (no mark, no parity given) while ``2s 2S°`` still fails.
    """
    from ..reading import as_species

    unmarked = _convention(parity)
    problems: list[ConfspecError] = []
    kind: Species | None = None
    if species is not None:
        try:
            kind = as_species(species)
        except ConfspecError as err:
            problems.append(err)
    if isinstance(level, Level):
        context: dict[str, Any] = {"text": str(level), "term_at": None, "J": level.J,
                                   "parents": [(p, None) for p in level.parents]}
        parsed: Level | None = level
    else:
        try:
            parsed, found, context = _read(level, accept_uppercase=accept_uppercase)
        except ConfspecError as err:
            return [*problems, err]
        problems.extend(found)
        if found:
            return problems  # the parts cannot be compared with a broken configuration
    if parsed is None:
        return problems
    where = context.get("remap", lambda err: err)
    problems.extend(where(p) for p in _consistency(parsed, context, kind, unmarked))
    return problems


def _consistency(level: Level, context: dict[str, Any], species: Species | None,
                 unmarked: bool = False) -> list[ConfspecError]:
    text = context["text"]
    problems: list[ConfspecError] = []
    config = level.configuration
    subs = {s.label: s for s in config.subshells}
    allowed_final: set[tuple[int, int]] | None = None
    coupled: set[tuple[int, int]] | None = None  # (2S, L) reachable so far
    grouped: list[str] = []
    for parent, position in context["parents"]:
        group = Configuration.from_checked(
            [(s.n, s.l, s.j2, s.electrons) for s in (subs[label] for label in
                                                      parent.subshells if label in subs)])
        grouped.extend(parent.subshells)
        own = term_keys(group)
        key = (parent.term.multiplicity - 1, parent.term.L)
        so_far = own if coupled is None else _couple(coupled, own)
        cumulative = coupled is not None and key not in own and key in so_far
        if key not in own and not cumulative:
            problems.append(ConfspecPhysicsError(
                "parent-not-allowed", f"parent term {parent.term.without_j()} is not a term of "
                f"{group or 'its subconfiguration'} ("
                + ", ".join(_term_names(own, group.parity)) + ")"
                + ("" if coupled is None else ", nor a coupled term of everything to its left ("
                   + ", ".join(_term_names(so_far, group.parity)) + ")"),
                position=position, text=text))
        else:
            left = Configuration.from_checked([(s.n, s.l, s.j2, s.electrons) for s in (
                subs[label] for label in grouped if label in subs)])
            parity = left.parity if cumulative else group.parity
            wrong = _parity_problem(parent.term, str(left if cumulative else group), parity,
                                    unmarked, position, text)
            if wrong is not None:
                problems.append(type(wrong)(wrong.code, "parent term " + wrong.message,
                                            position=position, text=text))
        # a parent after the first either closes its own group (3d7(4F)4s4p(3P°): 3P° of
        # 4s4p, coupled next) or names the coupled term of all before it (3d6(5D)4s(6D))
        coupled = {key} if coupled is None or cumulative else _couple(coupled, {key})
    if coupled is not None:
        rest = Configuration.from_checked(
            [(s.n, s.l, s.j2, s.electrons) for s in config.subshells if s.label not in grouped])
        allowed_final = _couple(coupled, term_keys(rest))
    term, J = level.term, context["J"]
    if isinstance(term, JKTerm):
        problems.extend(_jk_problems(level, term, J, context, unmarked))
    elif term is not None:
        key = (term.multiplicity - 1, term.L)
        if config.is_relativistic:
            # nlj subshells: the LS term is only a label (S and L are no quantum numbers of
            # a jj-coupled level), so only J is checked, against the J values of the
            # configuration in jj coupling; the label's own |L − S| … L + S check stays
            problems.extend(_jj_j_problems(config, J, context["term_at"], text))
        elif key not in (allowed_final := term_keys(config) if allowed_final is None
                         else allowed_final):
            how = ("by coupling its parents with the electrons after them" if level.parents
                   else "as a term of " + str(config))
            problems.append(ConfspecPhysicsError(
                "term-not-allowed", f"{term.without_j()} cannot arise {how}; possible: "
                + ", ".join(_term_names(allowed_final, config.parity)),
                position=context["term_at"], text=text))
        if J is not None and J not in term.without_j().allowed_j():
            problems.append(ConfspecPhysicsError(
                "j-not-allowed", f"J = {j_text(J)} is outside |L − S| … L + S for "
                f"{term.without_j()}: "
                + ", ".join(j_text(j) for j in term.without_j().allowed_j()),
                position=context["term_at"], text=text))
        wrong = _parity_problem(term, str(config), config.parity, unmarked,
                                context["term_at"], text, " (the sum of l is "
                                f"{sum(s.l * s.electrons for s in config.subshells)})")
        if wrong is not None:
            problems.append(wrong)
    kind = species or level.species
    if kind is not None and config.electron_count != kind.electron_count and (
            context.get("core_written") or _implied_core(config, kind.electron_count) is None):
        problems.append(ConfspecPhysicsError(
            "electron-count", f"{config} holds {config.electron_count} electrons; {kind} has "
            f"{kind.electron_count} (Z − charge)", position=None, text=text))
    return problems


def _jk_problems(level: Level, term: JKTerm, J: Fraction | None, context: dict[str, Any],
                 unmarked: bool) -> list[ConfspecError]:
    """jK coupling (NIST noble-gas levels, 2p5(2P°3/2)3s 2[3/2]°2): the core's J1 couples
    with l of the outer electrons to K, and K with their spin s to J."""
    text, at = context["text"], context["term_at"]
    config = level.configuration
    problems: list[ConfspecError] = []
    grouped = [label for parent in level.parents for label in parent.subshells]
    open_labels = [s.label for s in config.open_subshells]
    if level.parents:
        outer_labels = [s.label for s in config.subshells if s.label not in grouped]
        core_js = {level.parents[-1].term.J} if level.parents[-1].term.J is not None else set(
            level.parents[-1].term.allowed_j())
    else:  # no parent written: the last open subshell is the outer electron
        outer_labels = open_labels[-1:]
        core = Configuration.from_checked([(s.n, s.l, s.j2, s.electrons) for s in config.subshells
                                       if s.label not in outer_labels])
        core_js = set()
        for two_s, L in term_keys(core):
            S = Fraction(two_s, 2)
            core_js.update(abs(L - S) + k for k in range(int(L + S - abs(L - S)) + 1))
    outer = Configuration.from_checked([(s.n, s.l, s.j2, s.electrons) for s in config.subshells
                                    if s.label in outer_labels])
    keys = term_keys(outer)
    spins = {Fraction(two_s, 2) for two_s, _ in keys}
    possible_k = {abs(j1 - L) + k for j1 in core_js for _, L in keys
                  for k in range(int(j1 + L - abs(j1 - L)) + 1)}
    if term.K not in possible_k or term.S not in spins:
        problems.append(ConfspecPhysicsError(
            "term-not-allowed", f"{term.without_j()} cannot arise in jK coupling of {config}: K "
            "runs over " + ", ".join(j_text(k) for k in sorted(possible_k)) + " and 2s + 1 over "
            + ", ".join(str(int(2 * s + 1)) for s in sorted(spins)), position=at, text=text))
    if J is not None and J not in term.allowed_j():
        problems.append(ConfspecPhysicsError(
            "j-not-allowed", f"J = {j_text(J)} is not K ± s for {term.without_j()}: "
            + ", ".join(j_text(j) for j in term.allowed_j()), position=at, text=text))
    wrong = _parity_problem(term, str(config), config.parity, unmarked, at, text)
    return problems if wrong is None else [*problems, wrong]


def _jj_j_problems(config: Configuration, J: Fraction | None, at: int | None, text: str
                   ) -> list[ConfspecError]:
    """J of a level whose configuration has nlj subshells, against its jj levels."""
    if J is None:
        return []
    possible = jj_levels(config)
    if J in possible:
        return []
    return [ConfspecPhysicsError(
        "j-not-allowed", f"J = {j_text(J)} is not a J of {config} in jj coupling: "
        + ", ".join(j_text(j) for j in possible), position=at, text=text)]


def _implied_core(config: Configuration, electrons: int) -> tuple[tuple[int, int, int], ...] | None:
    """The closed inner subshells that level tables leave unwritten (``Fe II 3d6(5D)4s``:
    [Ar]; ``Na I 2p6.3s``: 1s2 2s2), if they make the electron count right."""
    from ..physics import implied_inner_subshells

    written = {(s.n, s.l) for s in config.subshells}
    return implied_inner_subshells(written, electrons - config.electron_count)


def _couple(a: set[tuple[int, int]], b: set[tuple[int, int]]) -> set[tuple[int, int]]:
    """Vector coupling of (2S, L) sets: S and L each run from |x1 − x2| to x1 + x2."""
    out = set()
    for s1, l1 in a:
        for s2, l2 in b:
            for s in range(abs(s1 - s2), s1 + s2 + 1, 2):
                for L in range(abs(l1 - l2), l1 + l2 + 1):
                    out.add((s, L))
    return out


def _term_names(keys: set[tuple[int, int]], parity: Parity) -> list[str]:
    mark = "°" if parity == "odd" else ""
    return [f"{s + 1}{make_term(s + 1, L, parity, None).letter}{mark}"
            for s, L in sorted(keys, key=lambda k: (-k[0], -k[1]))]

