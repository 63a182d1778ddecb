"""LS term symbols: the Term model, reading term text, every term of a configuration, Hund.

Terms of a configuration come from (ML, MS) microstate-count tables: one table per open
subshell, built by a small dynamic programme over its 2l + 1 orbitals, then combined by
convolution. The number of terms with (L, S) is the standard second difference
N(L, S) − N(L+1, S) − N(L, S+1) + N(L+1, S+1) over the non-negative quadrant. Nothing is
enumerated over the product of microstates, so ``4f7 5d1 6s1`` takes milliseconds.

Conventions (common practice, no source unless named): term letters S P D F G H I K L M N O
Q R T U V for L = 0, 1, 2, ... (J skipped); odd parity marked ``°``; J written as an
integer or as ``n/2``.
"""

from __future__ import annotations

import math
from collections import defaultdict
from collections.abc import Iterable
from fractions import Fraction
from functools import cache
from typing import TYPE_CHECKING, Any

from pydantic import BaseModel, ConfigDict, Field, model_validator
from pydantic_core import PydanticCustomError

from ..errors import ConfspecError, ConfspecPhysicsError, ConfspecSyntaxError
from ..notation.scripts import (
    SUBSCRIPT_DIGITS,
    SUPERSCRIPT_DIGITS,
    TO_SUBSCRIPT,
    TO_SUPERSCRIPT,
    j_text,
)
from ..physics import Parity, pauli_limit
from ..reading import as_configuration

if TYPE_CHECKING:
    from ..models import Configuration

__all__ = ["TERM_LETTERS", "JKTerm", "Term", "allowed_j", "hund_ground_term", "jj_levels",
           "parse_term", "terms"]

#: Term letters for L = 0, 1, 2, ... (j is skipped). Larger L is written ``[L]``, e.g. ``2[17]``.
TERM_LETTERS = "SPDFGHIKLMNOQRTUV"
_LETTER_TO_L = {letter: L for L, letter in enumerate(TERM_LETTERS)}

_MAX_TERM_TEXT = 200




class Term(BaseModel):
    """An LS term, optionally with its J: ``5D4``, ``2P°1/2``, ``4S°3/2``, ``3P``.

    >>> t = parse_term("2P°1/2")
    >>> t.multiplicity, t.L, t.parity, t.J, t.S
    (2, 1, 'odd', Fraction(1, 2), Fraction(1, 2))
    >>> str(Term(multiplicity=5, L=2, J=4))
    '5D4'
    """

    # A later level-designation layer may add an optional seniority/ordering prefix
    # (``a``, ``z``, ``(2D)``) as a further field with an empty default; equality of the
    # fields below must keep meaning "same LS term".
    model_config = ConfigDict(frozen=True, extra="forbid")

    multiplicity: int = Field(ge=1, description="2S + 1")
    L: int = Field(ge=0, description="total orbital angular momentum quantum number")
    parity: Parity = "even"
    J: Fraction | None = Field(default=None, description="total angular momentum, if known")

    @model_validator(mode="before")
    @classmethod
    def _from_text(cls, data: Any) -> Any:
        if isinstance(data, str):
            try:
                term = parse_term(data)
            except ConfspecError as err:
                raise PydanticCustomError(err.code, "{message}", {"message": err.message}
                                          ) from None
            if not isinstance(term, Term):
                raise PydanticCustomError("term-syntax", "a jK term is not an LS term")
            return {"multiplicity": term.multiplicity, "L": term.L, "parity": term.parity,
                    "J": term.J}
        return data

    @model_validator(mode="after")
    def _check_j(self) -> Term:
        problem = _j_problem(self.multiplicity, self.L, self.J)
        if problem is not None:
            raise PydanticCustomError("invalid-term", "{message}", {"message": problem})
        return self

    # -- derived quantities --------------------------------------------------------------
    @property
    def S(self) -> Fraction:
        """Total spin: (multiplicity − 1) / 2."""
        return Fraction(self.multiplicity - 1, 2)

    @property
    def letter(self) -> str:
        """``"D"`` for L = 2; ``"[17]"`` beyond the letters in use."""
        orbital = self.L
        return TERM_LETTERS[orbital] if orbital < len(TERM_LETTERS) else f"[{orbital}]"

    @property
    def is_odd(self) -> bool:
        return self.parity == "odd"

    @property
    def weight(self) -> int:
        """Statistical weight: 2J + 1 for a level, (2S + 1)(2L + 1) for a whole term."""
        if self.J is not None:
            return int(2 * self.J + 1)
        return self.multiplicity * (2 * self.L + 1)

    def allowed_j(self) -> tuple[Fraction, ...]:
        """|L − S|, |L − S| + 1, ..., L + S."""
        return _j_values(self.multiplicity, self.L)

    def with_j(self, J: Fraction | int | str | None) -> Term:
        """The same term with a (validated) J."""
        return Term(multiplicity=self.multiplicity, L=self.L, parity=self.parity,
                    J=None if J is None else Fraction(J))

    def without_j(self) -> Term:
        return make_term(self.multiplicity, self.L, self.parity, None)

    @property
    def sort_key(self) -> tuple[int, int, int, Fraction]:
        """Conventional listing order: high multiplicity first, then high L, then J."""
        return (-self.multiplicity, -self.L, self.is_odd,
                Fraction(-1) if self.J is None else self.J)

    # -- notation ------------------------------------------------------------------------
    def format(self, style: str = "plain") -> str:
        """``plain`` 2P°1/2, ``ascii`` 2Po1/2, ``unicode`` ²P°₁/₂, ``latex``
        ^{2}P^{\\circ}_{1/2}, ``html`` <sup>2</sup>P<sup>o</sup><sub>1/2</sub>.

        Every style reads back with :func:`parse_term`.
        """
        mult, letter = str(self.multiplicity), self.letter
        j = "" if self.J is None else j_text(self.J)
        if style == "plain":
            return f"{mult}{letter}{'°' if self.is_odd else ''}{j}"
        if style == "ascii":
            return f"{mult}{letter}{'o' if self.is_odd else ''}{j}"
        if style == "unicode":
            return (mult.translate(TO_SUPERSCRIPT) + letter + ("°" if self.is_odd else "")
                    + j.translate(TO_SUBSCRIPT))
        if style == "latex":
            return (f"^{{{mult}}}\\mathrm{{{letter}}}" + ("^{\\circ}" if self.is_odd else "")
                    + (f"_{{{j}}}" if j else ""))
        if style == "html":
            return (f"<sup>{mult}</sup>{letter}" + ("<sup>o</sup>" if self.is_odd else "")
                    + (f"<sub>{j}</sub>" if j else ""))
        raise ConfspecSyntaxError(
            "unknown-option", f"unknown term style {style!r}; use one of: "
            + ", ".join(TERM_STYLES))

    def __format__(self, spec: str) -> str:
        return self.format(spec) if spec else str(self)

    def __str__(self) -> str:
        return self.format()

    def __repr__(self) -> str:
        return f"Term('{self}')"

    def _repr_latex_(self) -> str:
        return "$" + self.format("latex") + "$"


TERM_STYLES = ("plain", "ascii", "unicode", "latex", "html")


class JKTerm(BaseModel):
    """A level in jK (J1K) coupling, as NIST ASD writes the noble gases: ``2[3/2]°2``.

    The core's J1 couples with the outer electron's l to K; K couples with the outer spin s
    to J. ``multiplicity`` is 2s + 1 of the outer electron(s).

    >>> t = parse_term("2[3/2]°2")
    >>> t.K, t.J, t.parity, [str(j) for j in t.allowed_j()]
    (Fraction(3, 2), Fraction(2, 1), 'odd', ['1', '2'])
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    multiplicity: int = Field(ge=1, description="2s + 1 of the outer electron(s)")
    K: Fraction = Field(description="J1 + l of the outer electron, coupled")
    parity: Parity = "even"
    J: Fraction | None = None

    @model_validator(mode="after")
    def _check_j(self) -> JKTerm:
        if self.J is not None and self.J not in self.allowed_j():
            raise PydanticCustomError("invalid-term", "J must be K ± s")
        return self

    @property
    def S(self) -> Fraction:
        return Fraction(self.multiplicity - 1, 2)

    @property
    def is_odd(self) -> bool:
        return self.parity == "odd"

    def allowed_j(self) -> tuple[Fraction, ...]:
        """|K − s| … K + s."""
        low, high = abs(self.K - self.S), self.K + self.S
        return tuple(low + k for k in range(int(high - low) + 1))

    def without_j(self) -> JKTerm:
        return JKTerm.model_construct(multiplicity=self.multiplicity, K=self.K,
                                      parity=self.parity, J=None)

    def format(self, style: str = "plain") -> str:
        K = j_text(self.K)
        j = "" if self.J is None else j_text(self.J)
        mark = ("°" if style in ("plain", "unicode") else "o") if self.is_odd else ""
        if style == "latex":
            return f"^{{{self.multiplicity}}}[{K}]" + ("^{o}" if self.is_odd else "") + (
                f"_{{{j}}}" if j else "")
        if style == "html":
            return f"<sup>{self.multiplicity}</sup>[{K}]" + (
                "<sup>o</sup>" if self.is_odd else "") + (f"<sub>{j}</sub>" if j else "")
        if style not in TERM_STYLES:
            raise ConfspecSyntaxError("unknown-option", f"unknown term style {style!r}")
        return f"{self.multiplicity}[{K}]{mark}{j}"

    def __str__(self) -> str:
        return self.format()

    def __repr__(self) -> str:
        return f"JKTerm('{self}')"


def _j_values(multiplicity: int, L: int) -> tuple[Fraction, ...]:
    S = Fraction(multiplicity - 1, 2)
    low, high = abs(L - S), L + S
    return tuple(low + k for k in range(int(high - low) + 1))


def _j_problem(multiplicity: int, L: int, J: Fraction | None) -> str | None:
    if J is None:
        return None
    if J < 0 or J.denominator not in (1, 2):
        return f"J = {J} is not a non-negative integer or half-integer"
    allowed = _j_values(multiplicity, L)
    if J not in allowed:
        S = Fraction(multiplicity - 1, 2)
        shown = ", ".join(j_text(j) for j in allowed)
        return (f"J = {j_text(J)} is impossible for L = {L}, S = {j_text(S)}: "
                f"J runs over |L − S| … L + S = {shown}")
    return None


_TERM_CACHE: dict[tuple[int, int, str, Fraction | None], Term] = {}


def make_term(multiplicity: int, L: int, parity: Parity, J: Fraction | None) -> Term:
    """An interned Term for values already known to be consistent."""
    key = (multiplicity, L, parity, J)
    term = _TERM_CACHE.get(key)
    if term is None:
        term = Term.model_construct(multiplicity=multiplicity, L=L, parity=parity, J=J)
        if len(_TERM_CACHE) < 100_000:
            _TERM_CACHE[key] = term
    return term


# ---------------------------------------------------------------------------- reading
class _Scanner:
    """A tiny cursor over the term text that keeps source positions for errors."""

    def __init__(self, text: str, start: int, end: int) -> None:
        self.text, self.pos, self.end = text, start, end

    def rest(self) -> str:
        return self.text[self.pos:self.end]

    def take(self, *options: str) -> str | None:
        for option in options:
            if self.rest().startswith(option):
                self.pos += len(option)
                return option
        return None

    def digits(self, alphabet: str = "0123456789") -> str:
        """A run of digits of ``alphabet`` as ASCII digits; more than three (a value above
        999: no multiplicity, L, J or K is that large) is refused."""
        start = self.pos
        while self.pos < self.end and self.text[self.pos] in alphabet:
            self.pos += 1
        if self.pos - start > 3:
            raise ConfspecSyntaxError(
                "number-too-large", f"{self.text[start:self.pos]!r} is too large for a term's "
                "multiplicity, L or J", position=start, text=self.text)
        return "".join(str(alphabet.index(ch)) for ch in self.text[start:self.pos])

    def fail(self, message: str, at: int | None = None) -> ConfspecSyntaxError:
        return ConfspecSyntaxError("term-syntax", message,
                                   position=self.pos if at is None else at, text=self.text)


_PARITY_LETTERS = ("E", "O")
_ODD_MARKS = ("^{\\circ}", "^\\circ", "^{o}", "^{°}", "^{*}", "<sup>o</sup>", "<sup>°</sup>",
              "<sup>*</sup>", "^o", "^°", "^*", "°", "º", "ᵒ", "⁰", "o", "*")


def _multiplicity(scan: _Scanner) -> int:
    start = scan.pos
    if scan.take("^{"):
        value = scan.digits()
        if not value or not scan.take("}"):
            raise scan.fail("expected the multiplicity 2S+1 as ^{digits}")
    elif scan.take("<sup>"):
        value = scan.digits()
        if not value or not scan.take("</sup>"):
            raise scan.fail("expected the multiplicity 2S+1 as <sup>digits</sup>")
    elif scan.take("^"):
        value = scan.digits()
    elif scan.rest()[:1] in SUPERSCRIPT_DIGITS and scan.rest()[:1]:
        value = scan.digits(SUPERSCRIPT_DIGITS)
    else:
        value = scan.digits()
    if not value:
        raise scan.fail("a term starts with its multiplicity 2S+1, as in 2P°1/2 or 5D4",
                        at=start)
    if int(value) < 1:
        raise ConfspecPhysicsError("invalid-term", "the multiplicity 2S+1 is at least 1",
                                   position=start, text=scan.text)
    return int(value)


def _orbital(scan: _Scanner) -> int:
    start = scan.pos
    if scan.take("\\mathrm{"):
        L = _orbital(scan)
        if not scan.take("}"):
            raise scan.fail("expected '}' after the term letter")
        return L
    if scan.take("["):
        value = scan.digits()
        if not value or not scan.take("]"):
            raise scan.fail("expected L as a number in brackets, e.g. [17]")
        return int(value)
    letter = scan.rest()[:1]
    if letter in _LETTER_TO_L:
        scan.pos += 1
        return _LETTER_TO_L[letter]
    if letter == "J":
        raise scan.fail("J is not a term letter (the letters skip it: ... H I K L ...)")
    if letter.upper() in _LETTER_TO_L and letter:
        raise scan.fail(f"term letters are upper case: {letter.upper()!r}, not {letter!r} "
                        f"(lower case names a subshell)", at=start)
    if not letter:
        raise scan.fail("the term ends too early; expected a term letter (S P D F G H ...)")
    raise scan.fail(f"unexpected {letter!r}; expected a term letter (S P D F G H I K ...)")


def _j(scan: _Scanner) -> tuple[Fraction, int] | None:
    start = scan.pos
    if scan.rest()[:1] == " " and (scan.rest()[1:2].isdigit() or scan.rest()[1:2] in "½<["):
        scan.pos += 1  # Term and J columns pasted into one cell: '5D 4'
    close = ""
    if scan.take("_{"):
        close = "}"
    elif scan.take("_("):
        close = ")"  # J in parentheses: ^2S_(1/2)
    elif scan.take("<sub>"):
        close = "</sub>"
    elif scan.take("<"):
        close = ">"  # NIST's ASCII output writes J in angle brackets: 5D<4>
    elif scan.take("["):
        close = "]"  # a tentative J, bracketed in NIST level tables: 5D [3]
    elif scan.take("_"):
        pass
    if scan.rest()[:1] and scan.rest()[:1] in SUBSCRIPT_DIGITS:
        alphabet = SUBSCRIPT_DIGITS
    else:
        alphabet = "0123456789"
    number_at = scan.pos
    if scan.take("½"):
        value = Fraction(1, 2)
    else:
        top = scan.digits(alphabet)
        if not top:
            if scan.pos != start:
                raise scan.fail("expected J after '_'")
            return None
        bottom = "1"
        if scan.take("/", "⁄"):
            bottom = scan.digits(alphabet) or scan.digits()
            if not bottom:
                raise scan.fail("expected the denominator of J, as in 3/2")
        elif scan.rest()[:2] in (".5", ".0") and not scan.rest()[2:3].isdigit():
            bottom = "2" if scan.take(".5") else "1"  # a decimal J: 4.5 is 9/2
            if bottom == "1":
                scan.take(".0")
            top = str(2 * int(top) + 1) if bottom == "2" else top
        if int(bottom) == 0:
            raise ConfspecPhysicsError("invalid-term", "J has a zero denominator",
                                       position=number_at, text=scan.text)
        value = Fraction(int(top), int(bottom))
    if close and not scan.take(close):
        raise scan.fail(f"expected {close!r} after J")
    if scan.rest()[:1] == "," and scan.rest()[1:2].isdigit():
        while scan.take(","):  # '5/2,3/2': fine structure not resolved, so no single J
            scan.digits()
            if scan.take("/"):
                scan.digits()
        return None
    return value, number_at


def read_term(text: str, start: int = 0, end: int | None = None
              ) -> tuple[Term | JKTerm, Fraction | None, str | None, int | None]:
    """(term without J, J, ordering letter, position of J) of ``text[start:end]``.

    J is returned unchecked, so that a level check can name an impossible J with its own
    code. One reader for every term confspec reads: standalone, in a level designation, and
    in a table's term column.
    """
    scan = _Scanner(text, start, len(text) if end is None else end)
    prefix = None
    rest = scan.rest()
    if len(rest) > 2 and rest[0] in "abcdefghijklmnopqrstuvwxyz" and (
            rest[1].isdigit() or rest[1] in SUPERSCRIPT_DIGITS or rest[1] in "^<"
            or (rest[1] == " " and (rest[2].isdigit() or rest[2] in SUPERSCRIPT_DIGITS
                                    or rest[2] in "^<"))):
        prefix = rest[0]  # NIST ordering letter: a5D, z 7P°
        scan.pos += 2 if rest[1] == " " else 1
    multiplicity = _multiplicity(scan)
    K = _jk_bracket(scan)
    L = _orbital(scan) if K is None else 0
    odd = scan.take(*_ODD_MARKS) is not None
    if not odd and K is None:  # the opacity project's parity letters: 3PE even, 3PO odd
        odd = scan.take(*_PARITY_LETTERS) == "O"
    found = _j(scan)
    if not odd and found is not None:
        odd = scan.take(*_ODD_MARKS) is not None  # parity written after J: 2P1/2°
    if scan.pos != scan.end:
        raise scan.fail(f"unexpected {scan.text[scan.pos]!r} after the term; expected "
                        "a parity mark (°, o, *) or J")
    J, j_at = found if found is not None else (None, None)
    parity: Parity = "odd" if odd else "even"
    if K is not None:
        return (JKTerm.model_construct(multiplicity=multiplicity, K=K, parity=parity, J=None),
                J, prefix, j_at)
    return make_term(multiplicity, L, parity, None), J, prefix, j_at


def _jk_bracket(scan: _Scanner) -> Fraction | None:
    """K of a jK-coupling term, written in brackets as a half-integer: 2[3/2]."""
    rest = scan.rest()
    close = rest.find("]")
    if not rest.startswith("[") or close < 0 or "/" not in rest[:close]:
        return None
    top, _, bottom = rest[1:close].partition("/")
    if not (top.isascii() and top.isdigit() and len(top) <= 3 and bottom == "2"):
        raise scan.fail("K of a jK term is a half-integer such as [3/2]")
    scan.pos += close + 1
    return Fraction(int(top), 2)


def parse_ls_term(text: str) -> Term:
    """Like :func:`parse_term`, for code that needs an LS term (a jK term is refused)."""
    term = parse_term(text)
    if not isinstance(term, Term):
        raise ConfspecSyntaxError("term-syntax", f"{text!r} is a jK-coupling term, not an LS "
                                  "term", position=0, text=text)
    return term


def parse_term(text: str) -> Term | JKTerm:
    """Read a term symbol: ``5D4``, ``2P°1/2``, ``^{2}P^{o}_{1/2}``, ``2Po1/2``, ``2P*1/2``,
    ``²P°₁/₂``, ``<sup>2</sup>P<sup>o</sup><sub>1/2</sub>``, ``5D<4>``, ``5D 4``, ``$^5D_4$``,
    ``4F4.5``, or without J (``3P``). A NIST ordering letter (``a 5D``, ``z7P°``) is read
    and dropped: it orders levels, it is not part of the term.

    Odd parity may be marked ``°``, ``o``, ``*`` (also as a superscript); no mark means
    even. Errors are :class:`~confspec.ConfspecError` with code ``term-syntax`` (the
    notation) or ``invalid-term`` (J impossible for L and S).

    >>> str(parse_term("^{2}P^{o}_{1/2}")), str(parse_term("2P*1/2")), str(parse_term("a 5D 4"))
    ('2P°1/2', '2P°1/2', '5D4')
    """
    if not isinstance(text, str):
        raise TypeError(f"a term must be a str, not {type(text).__name__}")
    if len(text) > _MAX_TERM_TEXT:
        raise ConfspecSyntaxError("too-long", f"{len(text)} characters is too long for a term",
                                  text=text[:60] + "…")
    from ..notation.clean import Cleaned, clean, remap

    cleaned = clean(text, notes=False)
    work = cleaned.text
    if "$" in work:  # LaTeX math around the whole term or its parts: $^5$D$_4$
        keep = [i for i, ch in enumerate(work) if ch != "$"]
        origin = cleaned.origin or tuple(range(len(work)))
        cleaned = Cleaned("".join(work[i] for i in keep), tuple(origin[i] for i in keep),
                          cleaned.note)
        work = cleaned.text
    stripped = work.strip()
    if not stripped:
        raise ConfspecSyntaxError("empty", "the term is empty", position=0, text=text)
    start = len(work) - len(work.lstrip())
    try:
        term, J, _, j_at = read_term(work, start, start + len(stripped))
        if isinstance(term, JKTerm):
            if J is not None and J not in term.allowed_j():
                raise ConfspecPhysicsError(
                    "invalid-term", f"J = {j_text(J)} is impossible for K = {j_text(term.K)}"
                    f", s = {j_text(term.S)}: J is K ± s", position=j_at, text=work)
            return term if J is None else JKTerm.model_construct(
                multiplicity=term.multiplicity, K=term.K, parity=term.parity, J=J)
        problem = _j_problem(term.multiplicity, term.L, J)
        if problem is not None:
            raise ConfspecPhysicsError("invalid-term", problem, position=j_at, text=work)
    except ConfspecError as err:
        raise remap(err, text, cleaned) from None
    return term if J is None else make_term(term.multiplicity, term.L, term.parity, J)


def _as_term(term: Term | JKTerm | str) -> Term | JKTerm:
    return parse_term(term) if isinstance(term, str) else term


def allowed_j(term: Term | JKTerm | str) -> list[Fraction]:
    """The J values of a term, |L − S| … L + S; each level has weight 2J + 1.

    >>> [str(j) for j in allowed_j("3P")]
    ['0', '1', '2']
    """
    return list(_as_term(term).allowed_j())


# ---------------------------------------------------------------------------- all terms
Table = dict[tuple[int, int], int]  # (ML, 2·MS) -> number of microstates


@cache
def subshell_table(l: int, electrons: int) -> Table:
    """Microstate counts by (ML, 2MS) for l^electrons, by a pass over the 2l + 1 orbitals.

    Each orbital takes no electron, one (spin up or down) or two (paired); the table for k
    electrons equals the table for the complementary number of holes.
    """
    capacity = pauli_limit(l)
    k = min(electrons, capacity - electrons)
    states: dict[tuple[int, int, int], int] = {(0, 0, 0): 1}
    for m in range(-l, l + 1):
        nxt: dict[tuple[int, int, int], int] = defaultdict(int)
        for (e, ML, MS2), count in states.items():
            nxt[(e, ML, MS2)] += count
            if e + 1 <= k:
                nxt[(e + 1, ML + m, MS2 + 1)] += count
                nxt[(e + 1, ML + m, MS2 - 1)] += count
            if e + 2 <= k:
                nxt[(e + 2, ML + 2 * m, MS2)] += count
        states = nxt
    return {(ML, MS2): c for (e, ML, MS2), c in states.items() if e == k}


def _convolve(a: Table, b: Table) -> Table:
    out: Table = defaultdict(int)
    for (ml1, ms1), c1 in a.items():
        for (ml2, ms2), c2 in b.items():
            out[(ml1 + ml2, ms1 + ms2)] += c1 * c2
    return dict(out)


def _open(configuration: Configuration) -> list[tuple[int, int]]:
    """(l, electrons) of each open nl subshell (nlj subshells of one nl are summed)."""
    return [(l, e) for _, l, e in configuration.occupancies if e < pauli_limit(l)]


def microstate_count(configuration: Configuration | str) -> int:
    """Number of microstates: the product of C(capacity, k) over the subshells (2(2l+1)
    for nl, 2j+1 for nlj)."""
    config = as_configuration(configuration)
    return math.prod(math.comb(s.capacity, s.electrons) for s in config.subshells)


def _ls_only(config: Configuration) -> Configuration:
    """Refuse nlj input in LS functions: summing j-subshells into nl would invent states."""
    if config.is_relativistic:
        raise ConfspecPhysicsError(
            "jj-configuration", f"{config} has nlj subshells; LS terms would lose their j "
            "(use jj_levels() for the J levels, or write the subshells as nl)")
    return config


def term_multiplicities(configuration: Configuration | str | Iterable[tuple[int, int]]
                        ) -> dict[tuple[int, int], int]:
    """How often each (2S+1, L) occurs among the LS terms of a configuration (or of a list
    of open (l, electrons) subshells): counts for configurations too large to list.

    >>> term_multiplicities("3d2")[(1, 2)]  # 1D occurs once in d2
    1
    """
    open_subshells = _open(as_configuration(configuration)) if isinstance(
        configuration, (str, BaseModel)) else configuration
    table: Table = {(0, 0): 1}
    for l, electrons in open_subshells:
        table = _convolve(table, subshell_table(l, electrons))
    counts: dict[tuple[int, int], int] = {}
    for (ML, MS2), n in table.items():
        if ML < 0 or MS2 < 0:
            continue
        repeats = (n - table.get((ML + 1, MS2), 0) - table.get((ML, MS2 + 2), 0)
                   + table.get((ML + 1, MS2 + 2), 0))
        if repeats:
            counts[(MS2 + 1, ML)] = repeats
    return counts


#: terms() refuses to list more terms than this (several open f and g subshells have
#: millions); term_multiplicities() gives the counts of any configuration.
MAX_LISTED_TERMS = 200_000


def terms(configuration: Configuration | str) -> list[Term]:
    """Every LS term of a configuration, repeated terms listed as often as they occur.

    Listed by multiplicity (high first), then L (high first); J is left open (see
    :func:`allowed_j`). Closed shells give ``1S``.

    >>> [str(t) for t in terms("2p2")]
    ['3P', '1D', '1S']
    >>> [str(t) for t in terms("3d3")]
    ['4F', '4P', '2H', '2G', '2F', '2D', '2D', '2P']
    """
    config = _ls_only(as_configuration(configuration))
    parity = config.parity
    counts = _cached_counts(tuple(sorted(_open(config))))
    total = sum(counts.values())
    if total > MAX_LISTED_TERMS:
        raise ConfspecPhysicsError(
            "too-many-terms", f"{config} has {total:,} LS terms; listing them would exhaust "
            f"memory (limit {MAX_LISTED_TERMS:,}); use term_multiplicities() for the counts")
    out: list[Term] = []
    for (multiplicity, L), repeats in sorted(counts.items(), key=lambda kv: (-kv[0][0],
                                                                            -kv[0][1])):
        out.extend([make_term(multiplicity, L, parity, None)] * repeats)
    return out


def term_keys(configuration: Configuration | str) -> set[tuple[int, int]]:
    """The distinct (2S, L) of a configuration's terms, without listing repeats (cheap even
    when a configuration has millions of terms)."""
    config = as_configuration(configuration)
    return {(multiplicity - 1, L)
            for multiplicity, L in _cached_counts(tuple(sorted(_open(config))))}


@cache
def _cached_counts(open_subshells: tuple[tuple[int, int], ...]) -> dict[tuple[int, int], int]:
    return term_multiplicities(open_subshells)


# ---------------------------------------------------------------------------- Hund
def _hund_subshell(l: int, electrons: int) -> tuple[int, int]:
    """(ML, 2MS) of Hund's microstate: spin-up electrons from m = +l down, then spin-down."""
    orbitals = 2 * l + 1
    up = min(electrons, orbitals)
    down = electrons - up
    ML = sum(range(l, l - up, -1)) + sum(range(l, l - down, -1))
    return ML, up - down


def hund_ground_term(configuration: Configuration | str) -> Term:
    """The ground term by Hund's three rules, with J.

    1. largest S; 2. largest L for that S; 3. J = |L − S| when the open subshell(s) are at
    most half full, J = L + S when more than half full.

    Convention for several open subshells (ours, stated so results are reproducible): the
    first two rules take each open subshell at its own Hund term and add the spins and
    orbital momenta (this is exactly the largest S, then largest L, among all terms of the
    configuration); the third rule counts the open electrons together against half the
    summed capacity of the open subshells (``4f7 5d1``: 8 of 24, so J = |L − S|, giving
    ``9D°2`` as measured for Gd). Closed shells give ``1S0``.

    >>> str(hund_ground_term("[Ar] 3d6 4s2")), str(hund_ground_term("[Xe] 4f7 5d1 6s2"))
    ('5D4', '9D°2')
    """
    config = _ls_only(as_configuration(configuration))
    ML = MS2 = electrons = capacity = 0
    for l, k in _open(config):
        ml, ms2 = _hund_subshell(l, k)
        ML, MS2 = ML + ml, MS2 + ms2
        electrons, capacity = electrons + k, capacity + pauli_limit(l)
    S = Fraction(MS2, 2)
    J = abs(ML - S) if 2 * electrons <= capacity else ML + S
    return make_term(MS2 + 1, ML, config.parity, J)


# ---------------------------------------------------------------------------- jj coupling
def _m_table(j2: int, electrons: int) -> dict[int, int]:
    """Counts of 2M over the ways to put ``electrons`` into the 2j + 1 states of one
    j-subshell (each m holds at most one electron: Pauli, common practice, no source)."""
    states: dict[tuple[int, int], int] = {(0, 0): 1}
    for m2 in range(-j2, j2 + 1, 2):
        nxt: dict[tuple[int, int], int] = defaultdict(int)
        for (e, M2), count in states.items():
            nxt[(e, M2)] += count
            if e < electrons:
                nxt[(e + 1, M2 + m2)] += count
        states = nxt
    return {M2: c for (e, M2), c in states.items() if e == electrons}


def jj_levels(configuration: Configuration | str) -> dict[Fraction, int]:
    """How many levels of each J a configuration has, coupling every subshell by its own
    angular momentum: nlj subshells by their j states, nl subshells by their (ML, MS) states.

    This is why ``6p1/2^2`` has a single J = 0 level, and ``6p1/2 6p3/2`` only J = 1, 2
    (the sum over J of (2J + 1) × count equals the number of microstates).

    >>> {str(J): n for J, n in jj_levels("6p1/2^1 6p3/2^1").items()}
    {'1': 1, '2': 1}
    >>> jj_levels("6p1/2^2")
    {Fraction(0, 1): 1}
    """
    config = as_configuration(configuration)
    table: dict[int, int] = {0: 1}
    for s in config.subshells:
        if s.j is not None:
            part = _m_table(s.j2, s.electrons)
        else:
            part = defaultdict(int)
            for (ML, MS2), c in subshell_table(s.l, s.electrons).items():
                part[2 * ML + MS2] += c
        out: dict[int, int] = defaultdict(int)
        for a, ca in table.items():
            for b, cb in part.items():
                out[a + b] += ca * cb
        table = out
    return {Fraction(M2, 2): table[M2] - table.get(M2 + 2, 0)
            for M2 in sorted(table) if M2 >= 0 and table[M2] - table.get(M2 + 2, 0)}
