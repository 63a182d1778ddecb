"""Cell noise around a value, removed before parsing, with every position kept.

Real tables wrap values in quotes or an Excel formula (``="2p6.3s"``), escape superscripts
as HTML entities (``1s&sup2;``), put the whole value in LaTeX math (``$1s^2 2s^1$``), leave
zero-width characters, soft hyphens and full-width digits from word processors, use en
dashes as separators, and append notes and footnote marks (``*``, ``†``, ``(est.)``,
``(predicted)``, ``[1]``). None of that is notation: it is removed here, and the note is
returned so a caller can keep it. Every character of the cleaned text remembers where it
stood in the original, so errors still point into the text the user wrote.
"""

from __future__ import annotations

import html
import re
import unicodedata
from collections.abc import Callable
from dataclasses import dataclass

from ..errors import ConfspecError

__all__ = ["Cleaned", "clean", "is_missing_marker", "remap"]

#: Cells that stand for "no value" in exported tables.
MISSING_MARKERS = frozenset({
    "nan", "NaN", "NAN", "None", "none", "NONE", "NULL", "null", "Null", "N/A", "n/a", "N/a",
    "#N/A", "NA", "n.a.", "-", "--", "—", "–", "?", "...", "…", "#VALUE!", "#REF!",
})

_ZERO_WIDTH = "\u200b\u200c\u200d\u2060\ufeff\u00ad"
_DASHES = {"–": "-", "—": "-", "‒": "-", "‐": "-", "‑": "-"}
_QUOTES = [('="', '"'), ('"', '"'), ("'", "'"), ("“", "”"), ("„", "“"), ("‘", "’"), ("«", "»"),
           ("`", "`")]
_NOTE_MARKS = "*†‡§¶#"
# what may stand inside a trailing "(...)" note; a numbered note "(12)" needs a space before
_NOTE_WORD = re.compile(r"\?|est\.?|estimated|pred\.?|predicted|calc\.?|calculated|theor\.?"
                        r"|theory|ground|ground state|approx\.?|tentative|[a-z]", re.IGNORECASE)
_NOTE_REFERENCE = re.compile(r"\d{1,3}|[a-z]|note\s*\w{1,4}|nb\s*\d{1,3}", re.IGNORECASE)
_NOTE_NUMBER = re.compile(r"\d{1,3}")


def trailing_note_start(text: str) -> int | None:
    """Where a run of trailing notes begins (``*``, ``†``, ``?``, ``(est.)``, ``(predicted)``,
    `` (2)``, ``[1]``, ``[a]``; spaced or attached, in any order), or None.

    A scan from the end that consumes at least one character per step and looks at most a
    short bracket back: linear in the text, whatever it holds.
    """
    end = len(text)
    while end and text[end - 1].isspace():
        end -= 1
    start = None
    while end:
        before = _one_note_before(text, end)
        if before is None:
            break
        end = before
        while end and text[end - 1].isspace():
            end -= 1
        start = end
    return start


def _one_note_before(text: str, end: int) -> int | None:
    """The start of one note that ends at ``end``, or None."""
    last = text[end - 1]
    if last in _NOTE_MARKS:
        while end and text[end - 1] in _NOTE_MARKS:
            end -= 1
        return end
    if last == "?":
        # a '?' straight after a subshell letter stands for a lost digit (`3d?`): not a note
        if end > 2 and text[end - 2] in "spdfghik^" and (text[end - 3].isdigit() or
                                                         text[end - 2] == "^"):
            return None
        return end - 1
    if last == ":" and end > 1 and not text[end - 2].isspace():
        return end - 1  # the opacity project's mark of a doubtful identification: '2s 4p:'
    pairs = {")": "(", "]": "["}
    if last not in pairs:
        return None
    opening = text.rfind(pairs[last], max(0, end - 16), end - 1)
    if opening < 0:
        return None
    inner = text[opening + 1: end - 1]
    if last == "]":
        return opening if _NOTE_REFERENCE.fullmatch(inner) else None
    if _NOTE_WORD.fullmatch(inner):
        return opening
    if _NOTE_NUMBER.fullmatch(inner) and opening and text[opening - 1].isspace():
        return opening  # a numbered note, only after a space: 2p(6) is not one
    return None


_TRAILING_PUNCT = re.compile(r"\s*[,;.]\s*$")
_ENTITY = re.compile(r"&(?:#\d{1,6}|#x[0-9a-fA-F]{1,6}|[A-Za-z][A-Za-z0-9]{1,10});")
_EXCEL_CELL = re.compile(r'="([^"]*)"')  # NIST's CSV for Excel, cells pasted together
_LEAD_NOTE = re.compile(r"\s*[*†‡]+\s*")
_DOLLAR = re.compile(r"\$")
_THIN_SPACE_AFTER_LETTER = re.compile(r"(?<=\b[a-z])\\,(?=\^)")  # 'a\,^5D'

_TEX_GROUP_RM = re.compile(r"\{\\rm\s+([^{}]*)\}")
#: The LaTeX text commands that wrap a value or a part of it (\mathrm{[Ar]}, \text{Fe}): the
#: one rule for them, used by the cleaning step and the grammar's core tokens alike.
LATEX_COMMANDS = "mathrm|textrm|text|rm|mathit"
LATEX_WRAPPER = re.compile(rf"\\(?:{LATEX_COMMANDS})\s*\{{([^{{}}]*)\}}")


def unwrap_latex(text: str) -> str:
    """``\\mathrm{Ar}`` -> ``Ar``: the text commands of :data:`LATEX_COMMANDS` removed."""
    return LATEX_WRAPPER.sub(r"\1", text)


_SPACED_SUPERSCRIPT = re.compile(r"(?<=[a-z]) (?=[⁰¹²³⁴⁵⁶⁷⁸⁹⁻⁺])")


@dataclass(frozen=True)
class Cleaned:
    """The cleaned text, where each of its characters came from, and any note removed."""

    text: str
    origin: tuple[int, ...] | None  # original index of each character (None: unchanged)
    note: str | None

    def position(self, at: int | None, original: str) -> int | None:
        if at is None or self.origin is None:
            return at
        if at < len(self.origin):
            return self.origin[at]
        return (self.origin[-1] + 1) if self.origin else len(original)


def is_missing_marker(text: str) -> bool:
    return text.strip() in MISSING_MARKERS


class _Builder:
    """Characters with their original positions."""

    def __init__(self, text: str) -> None:
        self.chars = list(text)
        self.origin = list(range(len(text)))

    @property
    def text(self) -> str:
        return "".join(self.chars)

    def keep(self, start: int, end: int) -> None:
        self.chars, self.origin = self.chars[start:end], self.origin[start:end]

    def replace(self, pattern: re.Pattern[str], repl: str | None = None,
                convert: dict[str, str] | None = None) -> None:
        text = self.text
        chars: list[str] = []
        origin: list[int] = []
        last = 0
        for match in pattern.finditer(text):
            chars += self.chars[last:match.start()]
            origin += self.origin[last:match.start()]
            new = repl if repl is not None else (convert or {}).get(match.group(), "")
            if convert is None and repl is None:
                new = html.unescape(match.group())
            chars += list(new)
            origin += [self.origin[match.start()]] * len(new)
            last = match.end()
        chars += self.chars[last:]
        origin += self.origin[last:]
        self.chars, self.origin = chars, origin


def clean(text: str, *, notes: bool = True) -> Cleaned:
    """Remove cell noise; the result's ``origin`` maps back into ``text``. ``notes=False``
    keeps trailing marks (a level designation's ``2P*`` and ``?`` are its own)."""
    simple = text.strip()
    if not _needs_cleaning(simple):
        return Cleaned(text, None, None)
    build = _Builder(text)
    lead = len(text) - len(text.lstrip())
    build.keep(lead, lead + len(simple))
    if build.text.count('="') > 1:  # several Excel-wrapped cells pasted together
        _drop_wrappers(build, _EXCEL_CELL)
    _unwrap(build)
    build.replace(_ENTITY)
    for pattern in (LATEX_WRAPPER, _TEX_GROUP_RM):  # \mathrm{[Ar]} -> [Ar], {\rm o} -> o
        _drop_wrappers(build, pattern)
    if any(ch in _ZERO_WIDTH for ch in build.chars):
        build.replace(re.compile(f"[{_ZERO_WIDTH}]"), " ")  # an invisible separator
    if any("\uff01" <= ch <= "\uff5e" for ch in build.chars):
        build.replace(re.compile("[\uff01-\uff5e]"), convert={
            chr(c): unicodedata.normalize("NFKC", chr(c)) for c in range(0xFF01, 0xFF5F)})
    if any(ch in _DASHES for ch in build.chars):
        build.replace(re.compile("[–—‒‐‑]"), convert=_DASHES)
    note = None
    lead_note = _LEAD_NOTE.match(build.text) if notes else None
    if lead_note is not None and lead_note.end() < len(build.text):
        note = lead_note.group().strip()  # '*[Rn] 5f14 6d2 7s2': a mark for "predicted"
        build.keep(lead_note.end(), len(build.chars))
    if "$" in build.text:  # LaTeX math, whole or in pieces: the dollars are not notation
        build.replace(_DOLLAR, "")
    if "\\," in build.text:  # a LaTeX thin space between parts of a level: a space
        build.replace(_THIN_SPACE_AFTER_LETTER, " ")
    found = trailing_note_start(build.text) if notes else None
    if found is not None and found > 0:
        note = build.text[found:].strip()
        build.keep(0, found)
    punct = _TRAILING_PUNCT.search(build.text)
    if punct is not None and punct.start() > 0:
        build.keep(0, punct.start())
    build.replace(_SPACED_SUPERSCRIPT, "")
    _unwrap(build)
    cleaned = build.text.strip()
    if cleaned == text:
        return Cleaned(text, None, note)
    start = len(build.text) - len(build.text.lstrip())
    build.keep(start, start + len(cleaned))
    return Cleaned(build.text, tuple(build.origin), note)


_NOISE = re.compile(
    "^\\s*[*†‡]|\\$|^[=\"'“„‘«`]|\\\\(?:" + LATEX_COMMANDS + ")"
    "|[&–—‒\u200b\u200c\u200d\u2060\ufeff\u00ad\uff01-\uff5e]"
    "|[*†‡§¶#?),;.:\\]]\\s*$|(?<=[a-z]) (?=[⁰¹²³⁴⁵⁶⁷⁸⁹⁻⁺])")


def _drop_wrappers(build: _Builder, pattern: re.Pattern[str]) -> None:
    """Keep group 1 of every match and drop the rest of it (one closing character)."""
    for match in reversed(list(pattern.finditer(build.text))):
        inner_end = match.end() - 1
        build.chars[inner_end:match.end()] = []
        build.origin[inner_end:match.end()] = []
        build.chars[match.start():match.start(1)] = []
        build.origin[match.start():match.start(1)] = []


def _needs_cleaning(text: str) -> bool:
    return bool(text) and _NOISE.search(text) is not None


def _unwrap(build: _Builder) -> None:
    """Drop an Excel ``="…"`` wrapper or its text-forcing apostrophe, surrounding quotes,
    or ``$…$`` around the value."""
    if build.text.startswith("'") and not build.text.endswith("'"):
        build.keep(1, len(build.chars))  # Excel's apostrophe that forces a cell to text
    for _ in range(3):
        text = build.text
        for opening, closing in [*_QUOTES, ("$", "$")]:
            if len(text) > len(opening) + len(closing) and text.startswith(opening) \
                    and text.endswith(closing) and (
                        opening != "$" or text.count("$") == 2):
                build.keep(len(opening), len(text) - len(closing))
                break
        else:
            return


def remap(err: ConfspecError, original: str, cleaned: Cleaned) -> ConfspecError:
    """The same error, pointing into the text as the user wrote it."""
    if cleaned.origin is None or err.text is None:
        return err
    return type(err)(err.code, err.message, position=cleaned.position(err.position, original),
                     text=original)


def drop(cleaned: Cleaned, spans: list[tuple[int, int]]) -> Cleaned:
    """``cleaned`` without the character spans given (positions still map back)."""
    if not spans:
        return cleaned
    text = cleaned.text
    origin = cleaned.origin or tuple(range(len(text)))
    keep = [i for i in range(len(text)) if not any(a <= i < b for a, b in spans)]
    return Cleaned("".join(text[i] for i in keep), tuple(origin[i] for i in keep), cleaned.note)


_FORBIDDEN_OR_SMILES = re.compile(r"^\[([^\[\]]+)\]$")
_STATE = re.compile(r"\s*\((?:g|aq|s|l|gas|cr)\)\s*$")
_MASS_BEFORE = re.compile(r"^(?:\^\{\d{1,3}\}|\^\d{1,3}|[⁰¹²³⁴⁵⁶⁷⁸⁹]{1,3}|\d{1,3})(?=[A-Z])")
_MASS_AFTER = re.compile(r"^([A-Z][a-z]?)-(\d{1,3})$")


def species_noise(cleaned: Cleaned, z_of: Callable[[str], int | None]) -> Cleaned:
    """Drop what a species cell may carry besides element and charge: the brackets of a
    forbidden line ``[O III]`` or a SMILES atom ``[Fe+3]``, a physical state ``(g)``/``(aq)``,
    and a mass number (``⁴⁰Ca⁺``, ``171Yb+``, ``Yb-171``; the electrons do not depend on it)."""
    text = cleaned.text
    spans: list[tuple[int, int]] = []
    whole = _FORBIDDEN_OR_SMILES.match(text)
    if whole:
        spans += [(0, 1), (len(text) - 1, len(text))]
    state = _STATE.search(text)
    if state and state.start() > 0:
        spans.append((state.start(), state.end()))
    body_start = 1 if whole else 0
    mass = _MASS_BEFORE.match(text[body_start:])
    if mass:
        spans.append((body_start, body_start + mass.end()))
    after = _MASS_AFTER.match(text)
    if after:
        z = z_of(after.group(1))
        if z is not None and int(after.group(2)) >= max(z, 2):
            spans.append((after.end(1), after.end(2)))
    return drop(cleaned, spans)
