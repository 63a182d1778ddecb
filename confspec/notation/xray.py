"""IUPAC X-ray level names (K, L1–L3, M1–M5, N1–N7, ...) and their subshells.

Source: IUPAC nomenclature for X-ray spectroscopy, R. Jenkins, R. Manne, R. Robin,
C. Senemaud, Pure Appl. Chem. 63, 735 (1991), table of level designations (from memory):
the shell letter K, L, M, N, O, P, Q gives n = 1 … 7 and the index within a shell runs over
s1/2, p1/2, p3/2, d3/2, d5/2, f5/2, f7/2 (K, the 1s level, has no index). A combined edge
such as L2,3 names both j subshells of one nl subshell (here 2p).
"""

from __future__ import annotations

from fractions import Fraction

from pydantic import BaseModel, ConfigDict

from ..errors import MAX_INPUT_LENGTH, ConfspecSyntaxError
from ..physics import pauli_limit, subshell_label, subshell_parts

__all__ = ["XrayLevel", "xray_level", "xray_name"]

_SHELLS = "KLMNOPQ"
#: index within a shell -> (l, 2j)
_INDEX = {1: (0, 1), 2: (1, 1), 3: (1, 3), 4: (2, 3), 5: (2, 5), 6: (3, 5), 7: (3, 7)}
_PAIRS = {(2, 3): 1, (4, 5): 2, (6, 7): 3}


class XrayLevel(BaseModel):
    """A core level by its IUPAC name, with the subshell it names.

    >>> level = xray_level("L3")
    >>> level.subshell, level.j, level.capacity
    ('2p3/2', Fraction(3, 2), 4)
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    name: str
    n: int
    l: int
    j: Fraction | None  # None for a combined edge (both j subshells of nl)

    @property
    def j2(self) -> int:
        return 0 if self.j is None else int(2 * self.j)

    @property
    def subshell(self) -> str:
        """The subshell label: ``"2p3/2"``, or ``"2p"`` for ``L2,3``; ``"1s"`` for K."""
        return subshell_label(self.n, self.l, 0 if self.j is None or self.l == 0 else self.j2)

    @property
    def capacity(self) -> int:
        return pauli_limit(self.l, self.j2)

    def __str__(self) -> str:
        return self.name


def xray_level(name: str, *, text: str | None = None, position: int | None = None
               ) -> XrayLevel:
    """The level an IUPAC X-ray name denotes: ``K``, ``L1``, ``L3``, ``L2,3``, ``M5``, ``N7``."""
    if isinstance(name, str) and len(name) > MAX_INPUT_LENGTH:
        raise ConfspecSyntaxError(
            "too-long", f"{len(name)} characters is over the limit of {MAX_INPUT_LENGTH}",
            position=None, text=name[:60] + "…")
    raw = name.strip().replace(" ", "")
    problem = ConfspecSyntaxError(
        "unknown-xray-level", f"{name!r} is not an IUPAC X-ray level (K, L1–L3, M1–M5, "
        "N1–N7, O1–O7, P1–P7, Q1, or a pair such as L2,3)",
        position=position, text=text if text is not None else name)
    if not raw or raw[0] not in _SHELLS:
        raise problem
    n = _SHELLS.index(raw[0]) + 1
    index_text = raw[1:]
    if n == 1:
        if index_text not in ("", "1"):
            raise problem
        return XrayLevel(name="K", n=1, l=0, j=Fraction(1, 2))
    if "," in index_text:
        first, _, second = index_text.partition(",")
        if not (first.isascii() and first.isdigit() and second.isascii()
                and second.isdigit()):
            raise problem
        l_pair = _PAIRS.get((int(first), int(second)))
        if l_pair is None or l_pair >= n:
            raise problem
        return XrayLevel(name=f"{raw[0]}{first},{second}", n=n, l=l_pair, j=None)
    if not (index_text.isascii() and index_text.isdigit()) or int(index_text) not in _INDEX:
        raise problem
    l, j2 = _INDEX[int(index_text)]
    if l >= n:
        raise problem
    return XrayLevel(name=f"{raw[0]}{index_text}", n=n, l=l, j=Fraction(j2, 2))


def xray_name(subshell: str | tuple[int, int, Fraction | None]) -> str:
    """The IUPAC name of a subshell: ``"2p3/2"`` -> ``"L3"``, ``"1s"`` -> ``"K"``,
    ``"2p"`` -> ``"L2,3"``.

    >>> xray_name("3d5/2"), xray_name("1s"), xray_name("4f")
    ('M5', 'K', 'N6,7')
    """
    if isinstance(subshell, str):
        n, l, j2 = subshell_parts(subshell)
        j = Fraction(j2, 2) if j2 else None
    else:
        n, l, j = subshell
    if n > len(_SHELLS) or l > 3:
        raise ConfspecSyntaxError("unknown-xray-level", f"n = {n}, l = {l} has no IUPAC "
                                  "X-ray name", text=str(subshell))
    letter = _SHELLS[n - 1]
    if n == 1:
        return "K"
    if l == 0:
        return f"{letter}1"
    if j is None:
        first = 2 * l
        return f"{letter}{first},{first + 1}"
    j2 = int(2 * j)
    index = next(i for i, value in _INDEX.items() if value == (l, j2))
    return f"{letter}{index}"
