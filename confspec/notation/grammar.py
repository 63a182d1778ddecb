"""The lark side: load ``configuration.lark``, build the LALR parser once, lazily.

The transformer runs inside the LALR parser (no tree is built, and errors raised here are
not wrapped), turning rules into the raw structures of :mod:`confspec.notation.syntax`.
"""

from __future__ import annotations

import re
import threading
from dataclasses import dataclass
from functools import cache
from importlib import resources
from typing import Any

from lark import Lark, Token, Transformer
from lark.exceptions import UnexpectedCharacters, UnexpectedEOF, UnexpectedInput, UnexpectedToken

from ..errors import ConfspecError, ConfspecSyntaxError
from ..physics import LETTER_TO_L
from .clean import unwrap_latex
from .scripts import FROM_SUPERSCRIPT
from .syntax import (
    Bare,
    Closed,
    Letter,
    Open,
    Piece,
    RawConfiguration,
    RawCore,
    Rel,
    Segment,
    SepKind,
    Sub,
    assemble_counted,
)

__all__ = ["GRAMMAR_NAME", "RawLevel", "grammar_text", "parse_configuration_raw",
           "parse_level_raw", "parse_species_raw", "parse_term_raw"]

GRAMMAR_NAME = "configuration.lark"


def grammar_text() -> str:
    """The grammar file, which ships inside this package."""
    return resources.files(__package__).joinpath(GRAMMAR_NAME).read_text(encoding="utf-8")


# Plain words for the terminals, so errors never show raw names such as NUM or $END.
_WORDS = {
    "NUM": "a number", "LETTER": "a subshell letter", "ELEMENT": "an element symbol",
    "ROMAN": "a Roman numeral", "CORE": "a core such as [Ar]", "SUP": "a superscript number",
    "SUP_CHARGE": "a superscript charge", "SUP_OPEN": "'<sup>'", "SUP_CLOSE": "'</sup>'",
    "CARET": "'^'", "LBRACE": "'{'", "RBRACE": "'}'", "LPAR": "'('", "RPAR": "')'",
    "DOLLAR": "'$'", "DASH": "'-'", "MINUS": "'−'", "PLUS": "'+'",
    "PUNCT": "a separator", "WS": "a space", "$END": "the end of the text",
    "UNDERSCORE": "a separator", "JFRAC": "j such as 1/2", "JMINUS": "'-' (j = l - 1/2)",
    "JUNDER": "'_' before j", "SUB_OPEN": "'<sub>'", "SUB_CLOSE": "'</sub>'",
    "XRAY": "an X-ray level such as L3", "ROMAN_LOWER": "a Roman numeral",
    "SUP_DIGITS_SIGN": "a superscript charge", "TERM": "a term such as 5D4",
    "PARENT": "a parent term such as (5D)", "UNCERTAIN": "'?'", "LABEL_SEP": "':' or '='",
    "EMPTY_PARENT": "", "SENIORITY": "a seniority such as (4)",
}


def _expected_words(names: set[str] | frozenset[str]) -> str:
    # an empty parent `()` only opens a body: LALR's merged states would list it anywhere
    words = sorted({_WORDS.get(name, name.lower()) for name in names} - {""})
    if not words:
        return "nothing more"
    return words[0] if len(words) == 1 else ", ".join(words[:-1]) + " or " + words[-1]


def _pos(token: Token) -> int:
    return int(token.start_pos or 0)


@dataclass(frozen=True)
class RawLevel:
    """A level designation before policy: label, configuration, parents, term, mark."""

    label: tuple[str, int, int, str] | None  # (symbol, position, charge, convention)
    configuration: RawConfiguration
    parents: tuple[tuple[int, str, int], ...]  # (items before it, text, position)
    term: tuple[str, int] | None
    uncertain: tuple[str, int] | None


@dataclass(frozen=True)
class _Gap:
    sep: tuple[SepKind, int] | None
    parent: Token | None


@dataclass(frozen=True)
class _Tail:
    term: tuple[str, int] | None
    uncertain: tuple[str, int] | None


@dataclass(frozen=True)
class _Marked:
    """The pieces of a run and the seniority written after it (``3d6(4)``)."""

    pieces: tuple[Piece, ...]
    mark: Token


class _ToRaw(Transformer[Token, Any]):
    """Rule callbacks named after the grammar's rules and aliases.

    One instance is embedded in each LALR parser; the text being parsed and its offset
    (leading whitespace stripped before parsing) come from a thread-local context.
    """

    _context = threading.local()

    @property
    def text(self) -> str:
        return str(self._context.text)

    @property
    def offset(self) -> int:
        return int(self._context.offset)

    def _at(self, token: Token) -> int:
        return _pos(token) + self.offset

    # -- configuration ---------------------------------------------------------------
    def configuration(self, children: list[Any]) -> RawConfiguration:
        core = children[0] if children and isinstance(children[0], RawCore) else None
        body = children[-1] if children and isinstance(children[-1], RawConfiguration) else None
        if body is None:
            return RawConfiguration(core, ())
        return RawConfiguration(core, body.items, body.parents)

    def bracket_core(self, children: list[Token]) -> RawCore:
        token = children[0]
        inner = str(token)[1:-1]
        inner = unwrap_latex(inner)
        return RawCore(inner.strip(), self._at(token), True)

    def bare_core(self, children: list[Token]) -> RawCore:
        return RawCore(str(children[0]), self._at(children[0]), False)

    def body(self, children: list[Any]) -> RawConfiguration:
        """Segments with separators and parent terms between them (parents: the number of
        items written before each, so a level can find every parent's scope)."""
        segments: list[Segment] = []
        seps: list[tuple[SepKind, int]] = []
        parent_after: list[tuple[int, str, int]] = []  # (segments so far, text, position)
        for child in children:
            if isinstance(child, Token):  # `()` before the first subshell, or a last parent
                parent_after.append((len(segments), str(child), self._at(child)))
            elif isinstance(child, _Gap):
                if child.parent is not None:
                    parent_after.append((len(segments), str(child.parent),
                                         self._at(child.parent)))
                seps.append(child.sep if child.sep is not None else
                            ("punct", self._at(child.parent) if child.parent else 0))
            elif isinstance(child, _Marked):  # a run that ends in a seniority `3d6(4)`
                segments.append(child.pieces)
                parent_after.append((len(segments), str(child.mark), self._at(child.mark)))
            elif isinstance(child, tuple) and isinstance(child[0], str):
                continue  # a separator next to `()` or before the last parent
            else:
                segments.append(child)
        config, counts = assemble_counted(None, segments, seps, self.text)
        parents = tuple((counts[k], text, pos) for k, text, pos in parent_after)
        return RawConfiguration(None, config.items, parents)

    def run_seniority(self, children: list[Any]) -> _Marked:
        return _Marked(self.run([*children[:-2], [children[-2]]]), children[-1])

    def run(self, children: list[Any]) -> tuple[Piece, ...]:
        num, letter = children[0], children[1]
        pieces: list[Piece] = [Sub(str(num), self._at(num), str(letter))]
        for part in children[2:]:
            pieces.extend(part)
        return tuple(pieces)

    def relativistic(self, children: list[Any]) -> Rel:
        num, letter, (j2, j_sign) = children[0], children[1], children[2]
        occupancy = children[3] if len(children) > 3 else None
        return Rel(str(num), self._at(num), str(letter), j2, j_sign, occupancy)

    def xray(self, children: list[Any]) -> Rel:
        token, occupancy = children[0], children[1]
        from ..physics import SUBSHELL_LETTERS
        from .xray import xray_level

        level = xray_level(str(token), text=self.text, position=self._at(token))
        return Rel(str(level.n), self._at(token), SUBSHELL_LETTERS[level.l],
                   level.j2 if level.l else 0, 0, occupancy)

    def j_fraction(self, children: list[Token]) -> tuple[int, int]:
        token = next(c for c in children if c.type == "JFRAC")
        top, bottom = str(token).split("/")
        if bottom != "2" or int(top) % 2 == 0:
            raise ConfspecSyntaxError(
                "syntax", f"j = {token} is not a half-integer such as 1/2 or 3/2",
                position=self._at(token), text=self.text)
        return int(top), 0

    def j_minus(self, children: list[Token]) -> tuple[int, int]:
        return 0, -1

    def j_plus(self, children: list[Token]) -> tuple[int, int]:
        return 0, 1

    def rel_occ(self, children: list[Any]) -> Closed:
        result: Closed = children[0]
        return result

    def occ_caret_open(self, children: list[Any]) -> Closed:
        return self._closed(children[1])

    def bare_count(self, children: list[Token]) -> Bare:
        return Bare(str(children[0]), self._at(children[0]))

    def open_link(self, children: list[Any]) -> list[Piece]:
        return [children[0], Letter(str(children[1]), self._at(children[1]))]

    def superscript_link(self, children: list[Token]) -> list[Piece]:
        token, letter = children
        if str(letter).lower() not in LETTER_TO_L:  # `2p⁶⁶⁶x`: a stray letter, not a split
            raise ConfspecSyntaxError("syntax", f"unexpected {str(letter)!r} after a superscript",
                                      position=self._at(letter), text=self.text)
        raw = str(token)
        digits = raw.lstrip("⁺⁻").translate(FROM_SUPERSCRIPT)
        return [Open(digits, self._at(token) + len(raw) - len(digits), raw.startswith("⁻")),
                Letter(str(letter), self._at(letter))]

    def closed_link(self, children: list[Any]) -> list[Piece]:
        num = children[1]
        return [children[0], Sub(str(num), self._at(num), str(children[2]))]

    def tail(self, children: list[Any]) -> list[Piece]:
        return [children[0]]

    def open_plain(self, children: list[Token]) -> Open:
        return Open(str(children[0]), self._at(children[0]))

    def open_caret(self, children: list[Token]) -> Open:
        return Open(str(children[1]), self._at(children[1]), caret=True)

    def open_caret_signed(self, children: list[Any]) -> Open:
        sign, num = children[1], children[2]
        return Open(str(num), self._at(num), negative=str(sign) != "+", caret=True)

    def _closed(self, signed: tuple[int, bool, int]) -> Closed:
        value, negative, pos = signed
        return Closed(value, pos, negative)

    def occ_braced(self, children: list[Any]) -> Closed:
        return self._closed(children[2])

    def occ_caret_paren(self, children: list[Any]) -> Closed:
        return self._closed(children[2])

    def occ_paren(self, children: list[Any]) -> Closed:
        return self._closed(children[1])

    def occ_html(self, children: list[Any]) -> Closed:
        return self._closed(children[1])

    def occ_math(self, children: list[Any]) -> Closed:
        return self._closed(next(c for c in children if isinstance(c, tuple)))

    def occ_superscript(self, children: list[Token]) -> Closed:
        token = children[0]
        raw = str(token)
        negative = raw.startswith("⁻")
        digits = raw.lstrip("⁺⁻").translate(FROM_SUPERSCRIPT)
        return Closed(int(digits), self._at(token), negative)

    def signed(self, children: list[Any]) -> tuple[int, bool, int]:
        num = children[-1]
        negative = len(children) == 2 and str(children[0]) != "+"
        return int(str(num)), negative, self._at(num)

    def sign(self, children: list[Token]) -> Token:
        return children[0]

    def sep_space(self, children: list[Token]) -> tuple[SepKind, int]:
        return ("space", self._at(children[0]))

    def sep_punct(self, children: list[Token]) -> tuple[SepKind, int]:
        token = next(c for c in children if c.type in ("PUNCT", "UNDERSCORE"))
        return ("punct", self._at(token))

    def sep_dash(self, children: list[Token]) -> tuple[SepKind, int]:
        token = next(c for c in children if c.type == "DASH")
        return ("dash", self._at(token))

    # -- level designations -----------------------------------------------------------
    def level(self, children: list[Any]) -> RawLevel:
        label = children[0] if isinstance(children[0], tuple) else None
        body: RawLevel = children[-1]
        return RawLevel(label, body.configuration, body.parents, body.term, body.uncertain)

    def level_bare_core(self, children: list[Any]) -> RawLevel:
        """``Ne 2p5 3s`` (a bracketless noble-gas core) or ``Na 3s 2S1/2`` (a species
        written before its configuration without a colon): a noble-gas symbol is a core,
        unless the configuration lies inside that core; any other symbol names the species."""
        from ..physics import LETTER_TO_L, NOBLE_CORES

        token, body = children[0], children[-1]
        symbol = str(token)
        inside = {(n, l) for n, l, _ in NOBLE_CORES.get(symbol, ())}
        written = {(i.n, LETTER_TO_L.get(i.letter.lower(), -1)) for i in body.configuration.items}
        if symbol in NOBLE_CORES and not (written & inside):
            core = RawCore(symbol, self._at(token), False)
            return RawLevel(None, RawConfiguration(core, body.configuration.items),
                            body.parents, body.term, body.uncertain)
        return RawLevel((symbol, self._at(token), 0, "none"), body.configuration,
                        body.parents, body.term, body.uncertain)

    def level_symbol_core(self, children: list[Any]) -> RawLevel:
        """``Cu [Ar] 3d10 4s1``: a species symbol, then a bracketed core."""
        token = children[0]
        core_token = next(c for c in children if isinstance(c, Token) and c.type == "CORE")
        body = children[-1] if isinstance(children[-1], RawLevel) else None
        tail = children[-1] if isinstance(children[-1], _Tail) else None
        inner = unwrap_latex(str(core_token)[1:-1]).strip()
        core = RawCore(inner, self._at(core_token), True)
        items = body.configuration.items if body is not None else ()
        end: RawLevel | _Tail | None = body or tail
        return RawLevel((str(token), self._at(token), 0, "none"), RawConfiguration(core, items),
                        body.parents if body else (), end.term if end else None,
                        end.uncertain if end else None)

    def level_body(self, children: list[Any]) -> RawLevel:
        core_token = children[0] if isinstance(children[0], Token) else None
        body = children[-1] if isinstance(children[-1], RawLevel) else RawLevel(
            None, RawConfiguration(None, ()), (), None, None)
        tail = children[-1] if isinstance(children[-1], _Tail) else None
        if tail is not None:
            body = RawLevel(None, body.configuration, (), tail.term, tail.uncertain)
        if core_token is None:
            return body
        inner = str(core_token)[1:-1]
        inner = unwrap_latex(inner)
        core = RawCore(inner.strip(), self._at(core_token), True)
        return RawLevel(None, RawConfiguration(core, body.configuration.items), body.parents,
                        body.term, body.uncertain)

    def label(self, children: list[Any]) -> tuple[str, int, int, str]:
        element = children[0]
        charge = next((c for c in children if isinstance(c, tuple)), (0, "none"))
        return str(element), self._at(element), charge[0], charge[1]

    def spectrum_label(self, children: list[Any]) -> tuple[str, int, int, str]:
        element = children[0]
        numeral = next(c for c in children[1:] if isinstance(c, Token) and c.type == "ROMAN")

        value = _roman(str(numeral), self._at(numeral), self.text)
        return str(element), self._at(element), value - 1, "spectrum"

    def lbody(self, children: list[Any]) -> RawLevel:
        tail = children[-1] if children and isinstance(children[-1], _Tail) else None
        config = self.body(children[:-1] if tail is not None else children)
        return RawLevel(None, RawConfiguration(None, config.items), config.parents,
                        tail.term if tail else None, tail.uncertain if tail else None)

    def gap_plain(self, children: list[Any]) -> _Gap:
        return _Gap(children[0], None)

    def gap_parent(self, children: list[Any]) -> _Gap:
        parent = next(c for c in children if isinstance(c, Token))
        seps = [c for c in children if isinstance(c, tuple)]
        return _Gap(seps[-1] if seps else None, parent)

    def level_tail(self, children: list[Any]) -> _Tail:
        term = next((c for c in children if isinstance(c, tuple)), None)
        mark = next((c for c in children if isinstance(c, Token) and c.type == "UNCERTAIN"),
                    None)
        return _Tail(term, None if mark is None else (str(mark), self._at(mark)))

    def term_text(self, children: list[Token]) -> tuple[str, int]:
        return str(children[0]), self._at(children[0])

    def term(self, children: list[Token]) -> tuple[str, int]:
        return str(children[0]), self._at(children[0])

    # -- species ----------------------------------------------------------------------
    def species(self, children: list[Any]) -> tuple[str, int, int, str]:
        symbol = children[0]
        charge = children[-1] if isinstance(children[-1], tuple) else (0, "none")
        return str(symbol), self._at(symbol), charge[0], charge[1]

    def charge_plain(self, children: list[Any]) -> tuple[int, str]:
        return next(c for c in children if isinstance(c, int)), "charge"

    def charge_superscript(self, children: list[Token]) -> tuple[int, str]:
        raw = str(children[0])
        digits = "".join(ch for ch in raw if ch not in "⁺⁻").translate(FROM_SUPERSCRIPT)
        signs = [ch for ch in raw if ch in "⁺⁻"]
        if not signs:  # ⁰: neutral
            return 0, "charge"
        if digits and len(signs) > 1:
            raise ConfspecSyntaxError("syntax", "a charge has one sign",
                                      position=self._at(children[0]), text=self.text)
        size = int(digits) if digits else len(signs)
        return (-size if signs[0] == "⁻" else size), "charge"

    def charge_number_superscript(self, children: list[Token]) -> tuple[int, str]:
        signs = str(children[1])
        if len(signs) != 1 or signs not in "⁺⁻":
            raise ConfspecSyntaxError("syntax", "write the charge as 3+ or ³⁺",
                                      position=self._at(children[1]), text=self.text)
        size = int(str(children[0]))
        return (size if signs == "⁺" else -size), "charge"

    def charge_superscript_sign(self, children: list[Token]) -> tuple[int, str]:
        raw = str(children[0])
        size = int(raw[:-1].translate(FROM_SUPERSCRIPT))
        return (size if raw[-1] == "+" else -size), "charge"

    def charge_bare_number(self, children: list[Token]) -> tuple[int, str]:
        if str(children[0]).strip("0"):
            raise ConfspecSyntaxError(
                "syntax", f"a charge needs a sign: write {children[0]}+ or {children[0]}-",
                position=self._at(children[0]) + len(str(children[0])), text=self.text)
        return 0, "charge"

    def roman(self, children: list[Token]) -> Token:
        token = children[0]
        return Token("ROMAN", str(token).upper(), token.start_pos)

    def charge_oxidation(self, children: list[Any]) -> tuple[int, str]:
        return children[1], "oxidation"

    def charge_spectrum(self, children: list[Token]) -> tuple[int, str]:
        value = _roman(str(children[0]), self._at(children[0]), self.text)
        if value < 1:  # pragma: no cover - the lexer admits no empty numeral
            raise ConfspecSyntaxError("syntax", "a spectrum number starts at I",
                                      position=self._at(children[0]), text=self.text)
        return value - 1, "spectrum"

    def charge_number_sign(self, children: list[Any]) -> int:
        return _signed(int(str(children[0])), children[1])

    def charge_sign_number(self, children: list[Any]) -> int:
        return _signed(int(str(children[1])), children[0])

    def charge_signs(self, children: list[Any]) -> int:
        kinds = {str(c) == "+" for c in children}
        if len(kinds) > 1:
            raise ConfspecSyntaxError("syntax", "a charge mixes '+' and '-'",
                                      position=self._at(children[0]), text=self.text)
        return _signed(len(children), children[0])

    def oxidation_roman(self, children: list[Any]) -> int:
        numeral = children[-1]
        value = _roman(str(numeral), self._at(numeral), self.text)
        return _signed(value, children[0]) if len(children) == 2 else value

    def oxidation_number(self, children: list[Any]) -> int:
        value = int(str(children[-1]))
        return _signed(value, children[0]) if len(children) == 2 else value

    def oxidation_number_sign(self, children: list[Any]) -> int:
        return _signed(int(str(children[0])), children[1])


_ROMAN_VALUES = {"I": 1, "V": 5, "X": 10, "L": 50, "C": 100}
_ROMAN_RE = re.compile(r"^C?(?:XC|XL|L?X{0,3})(?:IX|IV|V?I{0,3})$")


def _roman(numeral: str, position: int, text: str) -> int:
    if not numeral or not _ROMAN_RE.match(numeral):
        raise ConfspecSyntaxError("syntax", f"{numeral!r} is not a Roman numeral",
                                  position=position, text=text)
    total = 0
    for a, b in zip(numeral, numeral[1:] + " ", strict=True):
        value = _ROMAN_VALUES[a]
        total += -value if b != " " and _ROMAN_VALUES[b] > value else value
    return total


def _signed(value: int, sign: Token) -> int:
    return value if str(sign) == "+" else -value


@cache
def _parser(start: str) -> Lark:
    # One parser per start rule, built on first use; the transformer runs inside it.
    return Lark(grammar_text(), parser="lalr", lexer="contextual", start=start,
                propagate_positions=False, maybe_placeholders=False, transformer=_ToRaw())


def _strip(text: str) -> tuple[str, int]:
    stripped = text.lstrip()
    offset = len(text) - len(stripped)
    return stripped.rstrip(), offset


_CORE_SHAPE = re.compile(r"\[[^\[\]]{0,24}\]")


def _syntax_error(err: UnexpectedInput, text: str, offset: int, what: str) -> ConfspecError:
    if isinstance(err, UnexpectedToken):
        token = err.token
        if token.type == "$END":
            return ConfspecSyntaxError(
                "syntax", f"the {what} ends too early; expected {_expected_words(err.expected)}",
                position=len(text.rstrip()), text=text)
        position = _pos(token) + offset
        if token.type == "CORE" and what in ("configuration", "level designation"):
            return ConfspecSyntaxError(
                "misplaced-core", f"core {token!s} after the first subshell: only one core, "
                "at the start (are two configurations in this cell?)",
                position=position, text=text)
        return ConfspecSyntaxError(
            "syntax", f"unexpected {str(token)!r}; expected {_expected_words(err.expected)}",
            position=position, text=text)
    if isinstance(err, UnexpectedCharacters):
        position = int(err.pos_in_stream or 0) + offset
        char = text[position] if position < len(text) else ""
        allowed = set(err.allowed or ())
        if char == "[" and "CORE" not in allowed and _CORE_SHAPE.match(text, position) \
                and what in ("configuration", "level designation"):
            return ConfspecSyntaxError(
                "misplaced-core", "a core after the first subshell: only one core, at the start "
                "(are two configurations in this cell?)", position=position, text=text)
        return ConfspecSyntaxError(
            "syntax", f"unexpected character {char!r}; expected {_expected_words(allowed)}",
            position=position, text=text)
    if isinstance(err, UnexpectedEOF):
        return ConfspecSyntaxError(
            "syntax", f"the {what} ends too early; expected {_expected_words(set(err.expected))}",
            position=len(text.rstrip()), text=text)
    return ConfspecSyntaxError("syntax", str(err), text=text)  # pragma: no cover


def _run(start: str, text: str, what: str) -> Any:
    stripped, offset = _strip(text)
    context = _ToRaw._context
    context.text, context.offset = text, offset
    try:
        return _parser(start).parse(stripped)
    except UnexpectedInput as err:
        raise _syntax_error(err, text, offset, what) from None


def parse_configuration_raw(text: str) -> RawConfiguration:
    """Text to :class:`RawConfiguration` through the grammar (raises ConfspecSyntaxError)."""
    result: RawConfiguration = _run("configuration", text, "configuration")
    return result


def parse_level_raw(text: str) -> RawLevel:
    """Text to :class:`RawLevel` through the grammar's ``level`` rule."""
    result: RawLevel = _run("level", text, "level designation")
    return result


def parse_term_raw(text: str) -> tuple[str, int]:
    """The term token of ``text`` (the grammar's ``term`` rule) and its position."""
    result: tuple[str, int] = _run("term", text, "term")
    return result


def parse_species_raw(text: str) -> tuple[str, int, int, str]:
    """Text to (symbol, symbol position, charge, convention) through the grammar."""
    result: tuple[str, int, int, str] = _run("species", text, "species")
    return result
