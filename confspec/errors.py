"""One error hierarchy for everything confspec refuses.

Every error carries a stable kebab-case ``code`` (listed once, in :data:`ERROR_CODES`),
a human message, and where it applies the 0-based ``position`` in the input text.
``str(error)`` renders the message, the input and a caret under the offending character.
"""

from __future__ import annotations

import unicodedata
from dataclasses import dataclass

#: Every public function that reads text refuses a longer one with ``too-long`` before any
#: other work, so no input drives unbounded work (one cap for the whole library).
MAX_INPUT_LENGTH = 4096

__all__ = [
    "ERROR_CODES",
    "MAX_INPUT_LENGTH",
    "ConfspecError",
    "ConfspecPhysicsError",
    "ConfspecSyntaxError",
    "ConfspecTypeError",
    "ErrorCode",
]


@dataclass(frozen=True, slots=True)
class ErrorCode:
    """A documented error code: what triggers it and how to fix the data."""

    code: str
    kind: str  # "syntax" (notation) or "physics" (consistency)
    trigger: str
    fix: str


def _codes(*rows: tuple[str, str, str, str]) -> dict[str, ErrorCode]:
    table = {row[0]: ErrorCode(*row) for row in rows}
    assert len(table) == len(rows), "duplicate error code"
    return table


#: Every code confspec can report. The docs' error table is generated from this mapping.
ERROR_CODES: dict[str, ErrorCode] = _codes(
    ("empty", "syntax", "The text is empty or only whitespace.",
     "Fill the cell, or treat empty cells as missing before validating."),
    ("too-long", "syntax", "The text is longer than the input limit (MAX_INPUT_LENGTH, "
     "4,096 characters), which every function that reads text checks first.",
     "A configuration is short; the cell probably holds something else."),
    ("unknown-column", "syntax",
     "A column named for the check is not in the dataframe.",
     "Name a column the frame has (the message lists them)."),
    ("number-too-large", "syntax",
     "A number that drives work is beyond its bound: a principal number n above 999 (above "
     "100 for the hydrogen-like functions), or a term's multiplicity, L, J or K above 999.",
     "Real data never needs such numbers; the cell probably holds something else."),
    ("out-of-range", "physics",
     "A numeric argument is outside the range the function accepts (a negative radius, a "
     "non-positive nuclear charge or length scale).",
     "Pass a value in the documented range."),
    ("syntax", "syntax", "The text does not follow the configuration or species notation.",
     "Read the caret and the expected tokens; see the notation reference."),
    ("mojibake", "syntax", "UTF-8 text was decoded as Latin-1/Windows-1252 (e.g. '2pâ¶', '1sÂ²').",
     "Re-read the file as UTF-8, or use the CLI's --repair-text."),
    ("uppercase-subshell", "syntax",
     "A subshell letter is upper case ('2P6'); it could be a term symbol such as '5D4'.",
     "Write subshell letters in lower case, or pass accept_uppercase=True when the column "
     "holds no term symbols."),
    ("ambiguous-run-together", "syntax",
     "Text without separators ('2p110s1') can be split into subshells in more than one way, "
     "or only in an unusual way.",
     "Put spaces between subshells."),
    ("ambiguous-hole", "syntax",
     "A plain dash before a number ('2p-1') may be a separator or a hole.",
     "Write holes with an explicit marker: '2p^-1', '2p^{-1}', '2p⁻¹' or '2p(-1)'."),
    ("misplaced-core", "syntax",
     "A noble-gas core appears after the first subshell (often two configurations in one cell).",
     "Keep one configuration per cell, with the core first."),
    ("invalid-subshell", "physics",
     "A subshell that cannot exist: n < 1, l ≥ n ('2d', '1p'), or an unknown letter ('3j').",
     "Check the principal number and the letter (s p d f g h i k ...; j is skipped)."),
    ("pauli-limit", "physics",
     "More electrons than the subshell holds: 2(2l+1) for nl ('2p7', '3d11').",
     "Correct the occupancy."),
    ("duplicate-subshell", "physics", "The same subshell is written twice ('2p3 2p2').",
     "Write each subshell once, with its total occupancy."),
    ("unknown-core", "physics",
     "A bracketed core that is not a noble gas ('[Xx]', '[Fe]').",
     "Use [He], [Ne], [Ar], [Kr], [Xe], [Rn] or [Og]."),
    ("core-overlap", "physics",
     "An occupancy for a subshell the core already fills ('[Ar] 3p6 4s1'), written without "
     "a hole marker.",
     "Drop the subshell, or write the change as a hole ('[Ar] 3p^-1 4s2')."),
    ("hole-without-reference", "physics",
     "A hole ('2p^-1') with no core or reference species that fills that subshell.",
     "Give the core ('[Ne] 2p^-1') or the species the hole refers to."),
    ("hole-exceeds", "physics",
     "A hole removes more electrons than the subshell holds ('[He] 1s^-3').",
     "Correct the hole count."),
    ("unknown-element", "physics", "The element symbol is not one of Z = 1–118.",
     "Check the symbol's spelling and letter case ('Fe', not 'FE')."),
    ("impossible-charge", "physics",
     "The charge leaves a negative number of electrons ('He3+') or is beyond −4.",
     "Correct the charge."),
    ("electron-count", "physics",
     "The configuration does not hold Z − charge electrons for the species of the record.",
     "Correct the configuration or the species."),
    ("non-canonical", "physics",
     "Strict mode only: the text is valid but not written in the canonical notation.",
     "Store the canonical spelling given in the message (confspec normalize)."),
    ("unknown-occupancy", "syntax",
     "A '?' stands where an occupancy belongs ('[Ar] 3d?'): an export lost the digit. It is "
     "never read as one electron.",
     "Recover the count from the source table; a '?' after a space ('3d6 ?') is a note."),
    ("unknown-option", "syntax",
     "A formatting option (style, core, order) that confspec does not know.",
     "Use one of the documented values."),
    # -- chemistry layer: term symbols, ground states, shielding -------------------------
    ("term-syntax", "syntax",
     "A term symbol that does not read as multiplicity, letter, optional parity mark and "
     "optional J ('2p1/2', 'P2', '2J').",
     "Write it like 2P°1/2, 5D4, 2Po1/2 or ^{2}P^{o}_{1/2}; term letters are upper case."),
    ("invalid-term", "physics",
     "A term whose J is impossible for its L and S (outside |L−S|…L+S, or integer where "
     "it must be half-integer: '2P1'), or a multiplicity of 0.",
     "Check J against the multiplicity and the letter (confspec.allowed_j lists them)."),
    ("not-d-block", "physics",
     "A ligand-field d-electron count asked for an element outside groups 3–12.",
     "Use d_electron_count only for transition metals; use ground_state for others."),
    ("d-count-out-of-range", "physics",
     "Group number minus oxidation state falls outside 0–10 (e.g. Ti(V)).",
     "Check the oxidation state."),
    ("empty-subshell", "physics",
     "Effective charge asked for a subshell that holds no electron in the configuration.",
     "Pass configuration= with an electron in that subshell (e.g. '[Ar] 3d1' for K)."),
    ("no-reference-data", "physics",
     "A published table has no value for the request (Clementi–Raimondi: neutral ground-state "
     "atoms Z = 1–36, occupied subshells only).",
     "Use model='slater', or ask for a tabulated atom and subshell."),
    ("too-many-terms", "physics",
     "terms() was asked to list the terms of a configuration that has more than 200,000 of "
     "them (several open f or g subshells).",
     "Use term_multiplicities() for the count of each (2S+1, L)."),
    ("jj-configuration", "physics",
     "An LS-coupling function (terms, hund_ground_term) was given a configuration with nlj "
     "subshells ('2p3/2^1'), whose j would be lost by LS coupling.",
     "Use confspec.jj_levels() for the J levels, or write the subshells as nl."),
    ("several-open-subshells", "physics",
     "seniority_terms() was given a configuration with more than one open subshell; "
     "seniority belongs to the terms of a single l^w.",
     "Pass each open subshell alone ('3d3', not '3d3 4s1')."),
    # -- level designations: configuration + term + J ------------------------------------
    ("term-not-allowed", "physics",
     "The term is not an LS term of the configuration ('2p2 1P'), or cannot be reached by "
     "coupling the parent terms with the electrons after them ('3d6(5D)4s 8D').",
     "Check the term against confspec.terms(configuration) and the parents."),
    ("parent-not-allowed", "physics",
     "A parent term that the subconfiguration to its left cannot have ('3d6(4S)').",
     "Check the parent against confspec.terms() of that subconfiguration."),
    ("j-not-allowed", "physics",
     "J outside |L − S| … L + S for the term ('3P3').",
     "Correct J or the term (confspec.allowed_j lists the values)."),
    ("parity-mismatch", "physics",
     "The parity mark disagrees with the configuration's parity ('2p 2P' without °, "
     "'3d 2D°').",
     "Mark odd terms with °, o or *; the parity is that of the sum of l over all electrons."),
    ("series-limit", "syntax",
     "A level table's ionization-limit row ('Limit') where a level is expected.",
     "Nothing to fix: drop limit rows before checking levels, or keep them as they are."),
    ("unknown-xray-level", "syntax",
     "An IUPAC X-ray level name that does not exist ('L4', 'K2', 'M6').",
     "Use K, L1–L3, M1–M5, N1–N7, O1–O7, P1–P7, Q1, or a combined edge such as L2,3."),
    # -- SCF (spherically averaged LDA) calculations -------------------------------------
    ("scf-not-converged", "physics",
     "The self-consistent field did not converge, or an occupied orbital is not bound in "
     "LDA (most anions: H-, O2-); the message gives the reason and the residual reached.",
     "Check the configuration (a highly excited or very negative ion may have no bound "
     "LDA solution); for a slow case raise max_iterations or lower mixing."),
    ("scf-option", "syntax",
     "An SCF option outside its range (tolerances, iterations, mixing, grid), or an SCF "
     "request that cannot be met (a ΔSCF between two elements, nothing to compare).",
     "Use the documented ranges of confspec.scf; compare configurations of one element."),
    ("scf-unavailable", "physics",
     "An SCF calculation was asked for but numpy or scipy is not installed.",
     "Install the extra: pip install \"confspec[scf]\"."),
    ("wrong-type", "syntax",
     "An argument is of a type the function does not take: text functions take a str; a "
     "species is a Species, an Element, a species string or an atomic number; a "
     "configuration is a Configuration, its notation text, or a species standing for its "
     "ground state. The error is also a TypeError.",
     "Pass one of the types the message lists (a NULL or NaN cell is missing data, not a "
     "value: drop or fill it first)."),
)


def _display_width(text: str) -> int:
    return sum(2 if unicodedata.east_asian_width(ch) in "WF" else 1 for ch in text)


def _printable(text: str) -> str:
    """Replace control characters one-for-one so the caret stays aligned."""
    return "".join(" " if ch == "\t" else ("?" if unicodedata.category(ch) == "Cc" else ch)
                   for ch in text)


class ConfspecError(ValueError):
    """The root of every error confspec raises on bad input."""

    kind = "error"

    def __init__(self, code: str, message: str, *, position: int | None = None,
                 text: str | None = None) -> None:
        if code not in ERROR_CODES:  # pragma: no cover - a programming error, caught by tests
            raise KeyError(f"undocumented error code {code!r}")
        self.code = code
        self.message = message
        self.position = position
        self.text = text
        super().__init__(self.render())

    def render(self) -> str:
        """Message, then the input with a caret under the offending character."""
        head = f"{self.message} [{self.code}]"
        if self.text is None:
            return head
        shown = self.text if len(self.text) <= 200 else self.text[:200] + "…"
        lines = [head, "    " + _printable(shown)]
        if self.position is not None and self.position <= len(shown):
            lines.append("    " + " " * _display_width(_printable(shown[: self.position])) + "^")
        return "\n".join(lines)

    def __reduce__(self) -> tuple[object, ...]:  # picklable across processes (CLI --jobs)
        return (_rebuild, (type(self), self.code, self.message, self.position, self.text))

    def __repr__(self) -> str:
        return f"{type(self).__name__}({self.code!r}, {self.message!r}, position={self.position})"


def _rebuild(cls: type[ConfspecError], code: str, message: str, position: int | None,
             text: str | None) -> ConfspecError:
    return cls(code, message, position=position, text=text)


class ConfspecSyntaxError(ConfspecError):
    """The notation itself is wrong: parsing stops at the first such problem."""

    kind = "syntax"


class ConfspecPhysicsError(ConfspecError):
    """The notation is readable but the content is impossible or inconsistent."""

    kind = "physics"


class ConfspecTypeError(ConfspecSyntaxError, TypeError):
    """An argument of the wrong type (``wrong-type``): both our error, with its code, and
    the ``TypeError`` Python code expects."""
