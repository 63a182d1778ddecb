"""Superscript and subscript digits and the writing of J: the one table of each.

Readers translate superscripts back to ASCII digits; writers go the other way. Unicode
superscript digits are not all in one block (¹²³ are Latin-1), so every use goes through
these tables rather than code-point arithmetic.
"""

from __future__ import annotations

from fractions import Fraction

__all__ = ["FROM_SUPERSCRIPT", "SUBSCRIPT_DIGITS", "SUPERSCRIPT_DIGITS", "TO_SUBSCRIPT",
           "TO_SUPERSCRIPT", "j_text"]

SUPERSCRIPT_DIGITS = "⁰¹²³⁴⁵⁶⁷⁸⁹"
SUBSCRIPT_DIGITS = "₀₁₂₃₄₅₆₇₈₉"
#: ASCII digits and signs to superscripts (``"2+"`` -> ``"²⁺"``).
TO_SUPERSCRIPT = str.maketrans("0123456789+-", SUPERSCRIPT_DIGITS + "⁺⁻")
#: ASCII digits to subscripts.
TO_SUBSCRIPT = str.maketrans("0123456789", SUBSCRIPT_DIGITS)
#: Superscript digits back to ASCII digits.
FROM_SUPERSCRIPT = str.maketrans(SUPERSCRIPT_DIGITS, "0123456789")


def j_text(J: Fraction) -> str:
    """J as the trade writes it: ``4``, ``9/2``.

    >>> j_text(Fraction(9, 2)), j_text(Fraction(4))
    ('9/2', '4')
    """
    return str(J.numerator) if J.denominator == 1 else f"{J.numerator}/{J.denominator}"
