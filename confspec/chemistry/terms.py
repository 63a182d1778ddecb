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

from ..errors import (
    ConfspecError,
    ConfspecPhysicsError,
    ConfspecSyntaxError,
    ConfspecTypeError,
)
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
    from ..models import Configuration, Subshell

__all__ = ["TERM_LETTERS", "JJLevel", "JKTerm", "SeniorityTerm", "Term", "allowed_j",
           "hund_ground_term", "jj_levels", "jj_terms", "parse_term", "seniority_terms",
           "terms"]

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


def _subshell_pairs(pairs: object) -> list[tuple[int, int]]:
    """(l, electrons) pairs as given, or the wrong-type error naming what is expected."""
    try:
        out = [(int(l), int(w)) for l, w in pairs]  # type: ignore[attr-defined]
    except (TypeError, ValueError):
        raise ConfspecTypeError(
            "wrong-type", "expected a configuration, a species or (l, electrons) pairs, not "
            f"{type(pairs).__name__}") from None
    for l, w in out:
        if l > 20:  # the term letters end long before; the work grows with l
            raise ConfspecSyntaxError("number-too-large", f"l = {l} is beyond the l = 20 "
                                      "that term tables reach", text=str((l, w)))
        if l < 0 or not 0 <= w <= pauli_limit(l):
            raise ConfspecPhysicsError("pauli-limit", f"a subshell with l = {l} cannot hold "
                                       f"{w} electrons", text=str((l, w)))
    return out


def term_multiplicities(configuration: Configuration | str | Iterable[tuple[int, int]]
                        ) -> dict[tuple[int, int], int]:
    """How often each (2S+1, L) occurs among the LS terms of a configuration (or of a list
    of open (l, electrons) subshells): counts for configurations too large to list.

    >>> term_multiplicities("3d2")[(1, 2)]  # 1D occurs once in d2
    1
    """
    open_subshells = _open(as_configuration(configuration)) if isinstance(
        configuration, (str, int, BaseModel)) else _subshell_pairs(configuration)
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


def _m_counts(s: Subshell) -> dict[int, int]:
    """Counts of 2M over the states of one subshell: by its j states for nlj, by its (ML, MS)
    states (2M = 2ML + 2MS) for nl."""
    if s.j is not None:
        return _m_table(s.j2, s.electrons)
    part: dict[int, int] = defaultdict(int)
    for (ML, MS2), c in subshell_table(s.l, s.electrons).items():
        part[2 * ML + MS2] += c
    return dict(part)


def _j_counts(table: dict[int, int]) -> dict[Fraction, int]:
    """Levels of each J from counts of 2M: N(J) = n(M = J) − n(M = J + 1)."""
    return {Fraction(M2, 2): table[M2] - table.get(M2 + 2, 0)
            for M2 in sorted(table) if M2 >= 0 and table[M2] - table.get(M2 + 2, 0)}


class JJLevel(BaseModel):
    """A level in jj coupling: the J of each open subshell, coupled in the written order.

    Each open subshell has its own angular momentum J_i (an nlj subshell its j states; an
    open nl subshell taken whole, its J values as an LS subshell has them); J_1 and J_2
    couple to J_12, J_12 with J_3 to J_123, and so on to J. Written as level tables write
    jj levels: ``(1/2,3/2)2`` for two open subshells, with the odd mark after the bracket
    (``(3/2,1/2)°1``); the J alone (``2``) for one open subshell (or none); and, our
    convention for three or more, the intermediate J after each bracket:
    ``((1/2,3/2)1,1/2)3/2``.

    >>> level = JJLevel(subshell_j=(Fraction(1, 2), Fraction(3, 2)), J=2, parity="odd")
    >>> str(level), level.weight
    ('(1/2,3/2)°2', 5)
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    subshell_j: tuple[Fraction, ...] = Field(
        description="J_i of each open subshell, in the order they couple")
    intermediate: tuple[Fraction, ...] = Field(
        default=(), description="J_12, J_123, ...: the coupled J before each further subshell "
        "(empty for at most two open subshells)")
    J: Fraction = Field(description="total angular momentum")
    parity: Parity = "even"

    @model_validator(mode="after")
    def _check_coupling(self) -> JJLevel:
        problem = _jj_problem(self.subshell_j, self.intermediate, self.J)
        if problem is not None:
            raise PydanticCustomError("invalid-term", "{message}", {"message": problem})
        return self

    @property
    def weight(self) -> int:
        """Statistical weight 2J + 1."""
        return int(2 * self.J + 1)

    @property
    def is_odd(self) -> bool:
        return self.parity == "odd"

    def format(self, style: str = "plain") -> str:
        """``plain`` (1/2,3/2)°2, ``ascii`` (1/2,3/2)o2, ``latex`` (1/2,3/2)^{\\circ}_{2},
        ``html`` (1/2,3/2)<sup>o</sup><sub>2</sub>."""
        marks = {"plain": ("°", "{}"), "ascii": ("o", "{}"), "latex": ("^{\\circ}", "_{{{}}}"),
                 "html": ("<sup>o</sup>", "<sub>{}</sub>")}
        if style not in marks:
            raise ConfspecSyntaxError(
                "unknown-option", f"unknown jj level style {style!r}; use one of: "
                + ", ".join(marks))
        mark, j_template = marks[style]
        j = j_template.format(j_text(self.J))
        if len(self.subshell_j) < 2:
            return j
        coupled = f"({j_text(self.subshell_j[0])},{j_text(self.subshell_j[1])})"
        for inner, outer in zip(self.intermediate, self.subshell_j[2:], strict=True):
            coupled = f"({coupled}{j_text(inner)},{j_text(outer)})"
        return coupled + (mark if self.is_odd else "") + j

    def __format__(self, spec: str) -> str:
        return self.format(spec) if spec else str(self)

    def __str__(self) -> str:
        return self.format()

    def __repr__(self) -> str:
        return f"JJLevel('{self}')"


def _jj_problem(subshell_j: tuple[Fraction, ...], intermediate: tuple[Fraction, ...],
                J: Fraction) -> str | None:
    """Why a chain of J couplings is impossible (triangle rule at each step), or None."""
    for value in (*subshell_j, *intermediate, J):
        if value < 0 or value.denominator not in (1, 2):
            return f"{value} is not a non-negative integer or half-integer"
    if len(intermediate) != max(len(subshell_j) - 2, 0):
        return (f"{len(subshell_j)} open subshells need {max(len(subshell_j) - 2, 0)} "
                f"intermediate J values, not {len(intermediate)}")
    if not subshell_j:
        return None if J == 0 else "a configuration without open subshells has J = 0"
    if len(subshell_j) == 1:
        return None if subshell_j[0] == J else "with one open subshell, J is its J"
    chain = (subshell_j[0], *intermediate, J)
    for left, added, result in zip(chain[:-1], subshell_j[1:], chain[1:], strict=True):
        if not abs(left - added) <= result <= left + added or (left + added - result
                                                                ).denominator != 1:
            return (f"{j_text(left)} and {j_text(added)} cannot couple to {j_text(result)}: "
                    f"the result runs over |J1 − J2| … J1 + J2")
    return None


def jj_terms(configuration: Configuration | str) -> dict[JJLevel, int]:
    """Every level of a configuration in jj coupling, with how often each arises.

    The open subshells couple in the written order (closed subshells add nothing): an nlj
    subshell with its J_i values (``6p3/2^2``: 0 and 2), an open nl subshell taken whole
    with the J values of its LS levels (``3d2``: 0 twice, 1, 2 twice, 3, 4), which counts
    the states correctly without splitting it into j components. A level repeats when a
    subshell has one J_i more than once (``4f7/2^4`` has J_i = 2 and 4 twice each); the sum
    over the levels of count × (2J + 1) is the number of microstates.

    No lowest level is given: Hund's rules have no general analogue in jj coupling (see the
    jj coupling section of the chemistry docs).

    >>> {str(level): n for level, n in jj_terms("2p1/2^1 3d3/2^1").items()}
    {'(1/2,3/2)°1': 1, '(1/2,3/2)°2': 1}
    >>> [str(level) for level in jj_terms("6p3/2^2")]
    ['0', '2']
    """
    config = as_configuration(configuration)
    groups = [s for s in config.subshells if 0 < s.electrons < s.capacity]
    State = tuple[tuple[Fraction, ...], tuple[Fraction, ...], Fraction]
    states: dict[State, int] = {((), (), Fraction(0)): 1}
    for index, subshell in enumerate(groups):
        own = _j_counts(_m_counts(subshell))
        following: dict[State, int] = defaultdict(int)
        for (js, inner, J), count in states.items():
            for j, repeats in own.items():
                if index == 0:
                    following[((j,), (), j)] += count * repeats
                    continue
                chain = (*inner, J) if index >= 2 else inner
                low = abs(J - j)
                for step in range(int(J + j - low) + 1):
                    following[((*js, j), chain, low + step)] += count * repeats
        states = following
        if len(states) > MAX_LISTED_TERMS:
            raise ConfspecPhysicsError(
                "too-many-terms", f"{config} has more than {MAX_LISTED_TERMS:,} distinct jj "
                "levels; use jj_levels() for the count of each J")
    parity = config.parity
    return {JJLevel.model_construct(subshell_j=js, intermediate=inner, J=J, parity=parity): n
            for (js, inner, J), n in sorted(states.items())}


# ---------------------------------------------------------------------------- seniority
class SeniorityTerm(BaseModel):
    """An LS term of l^w with Racah's seniority v: the number of electrons not coupled in
    pairs to ¹S, i.e. the w at which the term first appears in l^v (Racah 1943).

    ``index`` numbers terms that repeat with the same (v, S, L), as 2H twice at v = 3 in
    f3 (Nielson & Koster tell them apart by Racah's W and U labels; we number them 1, 2,
    ... in our own order); it is None when (v, S, L) is unique. Written with the seniority
    after the term: ``2D (v=3)``, ``2H (v=3, 2)``.

    >>> [str(t) for t in seniority_terms("3d3") if t.term.L == 2]
    ['2D (v=1)', '2D (v=3)']
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    term: Term = Field(description="the LS term, without J")
    seniority: int = Field(ge=0, description="Racah's seniority v")
    index: int | None = Field(default=None, ge=1,
                              description="1, 2, ... when (v, S, L) repeats; else None")

    def format(self, style: str = "plain") -> str:
        """``plain`` 2D (v=3), ``latex`` {}^{2}_{3}\\mathrm{D} (the seniority as a left
        subscript, as in Racah's papers; a repeat index follows in parentheses)."""
        extra = "" if self.index is None else f", {self.index}"
        if style == "plain":
            return f"{self.term} (v={self.seniority}{extra})"
        if style == "latex":
            mark = "^{\\circ}" if self.term.is_odd else ""
            repeat = "" if self.index is None else f"({self.index})"
            return (f"{{}}^{{{self.term.multiplicity}}}_{{{self.seniority}}}"
                    f"\\mathrm{{{self.term.letter}}}{mark}{repeat}")
        raise ConfspecSyntaxError(
            "unknown-option", f"unknown seniority term style {style!r}; use one of: plain, "
            "latex")

    def __format__(self, spec: str) -> str:
        return self.format(spec) if spec else str(self)

    def __str__(self) -> str:
        return self.format()

    def __repr__(self) -> str:
        return f"SeniorityTerm('{self}')"


@cache
def _seniority_counts(l: int, electrons: int) -> dict[tuple[int, int, int], int]:
    """(v, 2S+1, L) -> count for l^electrons: the terms of seniority v are those of l^v
    not already in l^(v−2), counted with repeats (Racah 1943; common practice). A subshell
    more than half full has the seniorities of its holes."""
    w = min(electrons, pauli_limit(l) - electrons)
    out: dict[tuple[int, int, int], int] = {}
    for v in range(w % 2, w + 1, 2):
        new = term_multiplicities([(l, v)])
        old = term_multiplicities([(l, v - 2)]) if v >= 2 else {}
        for (multiplicity, L), n in new.items():
            fresh = n - old.get((multiplicity, L), 0)
            if fresh < 0:  # cannot happen: l^(v−2) × ¹S pair embeds in l^v
                raise AssertionError(f"seniority count below zero for l = {l}, v = {v}")
            if fresh:
                out[(v, multiplicity, L)] = fresh
    return out


def seniority_terms(configuration: Configuration | str) -> list[SeniorityTerm]:
    """The LS terms of a configuration with one open subshell, each with its seniority.

    Computed, not tabulated: count(l^w, v) = count(l^v) − count(l^(v−2)) for v ≤ w,
    v ≡ w (mod 2), v ≤ min(w, 4l + 2 − w). Listed in the order of :func:`terms` (high
    multiplicity, then high L), low seniority first within one (S, L), so that
    ``[t.term for t in seniority_terms(c)] == terms(c)``. Closed shells give ``1S (v=0)``.
    Several open subshells (each would carry its own seniority) are refused with
    ``several-open-subshells``; nlj subshells with ``jj-configuration``.

    >>> [str(t) for t in seniority_terms("2p2")]
    ['3P (v=2)', '1D (v=2)', '1S (v=0)']
    """
    config = _ls_only(as_configuration(configuration))
    open_subshells = _open(config)
    if len(open_subshells) > 1:
        raise ConfspecPhysicsError(
            "several-open-subshells", f"{config} has {len(open_subshells)} open subshells; "
            "seniority belongs to the terms of one l^w (take each open subshell alone)")
    if not open_subshells:
        return [SeniorityTerm.model_construct(term=make_term(1, 0, config.parity, None),
                                              seniority=0, index=None)]
    l, electrons = open_subshells[0]
    counts = _seniority_counts(l, electrons)
    out: list[SeniorityTerm] = []
    for (v, multiplicity, L), n in sorted(counts.items(),
                                          key=lambda kv: (-kv[0][1], -kv[0][2], kv[0][0])):
        term = make_term(multiplicity, L, config.parity, None)
        out.extend(SeniorityTerm.model_construct(term=term, seniority=v,
                                                 index=None if n == 1 else k + 1)
                   for k in range(n))
    return out
