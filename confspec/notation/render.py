"""One renderer for every notation, driven by small per-style records of templates.

Ordering and core handling are independent of markup: the renderer picks the core and the
order, then hands each token to the style's templates. Unknown options are a clear error.
"""

from __future__ import annotations

import warnings
from collections.abc import Callable, Iterable
from dataclasses import dataclass

from ..errors import ConfspecSyntaxError
from ..physics import (
    CORES_LARGEST_FIRST,
    NOBLE_CORES,
    Occupancy,
    filling_key,
    pauli_limit,
    shell_key,
    subshell_label,
)
from .scripts import TO_SUPERSCRIPT

__all__ = ["CORE_MODES", "DEPRECATED_STYLES", "EMPTY_TOKEN", "ORDERS", "ORDER_KEYS",
           "SPECIES_STYLES", "STYLES", "Style", "check_option", "condensing_core",
           "current_style", "largest_core", "options_from_spec", "register_style", "render",
           "render_configuration", "render_species", "roman", "style_of", "token_text"]


@dataclass(frozen=True, slots=True)
class Style:
    """How one notation writes a core, a subshell with its count, and the gaps between."""

    name: str
    count: Callable[[int], str]  # occupancy (negative for a hole) -> text after nl
    separator: str
    core: str  # template with {symbol}
    after_core: str  # between the core and the first subshell
    j: str = "{j}"  # template for j of a relativistic subshell (j as "3/2")
    j_count: Callable[[int], str] | None = None  # occupancy after nlj (default: caret form)


def _plain(k: int) -> str:
    return str(k) if k >= 0 else f"^-{-k}"


def _caret(k: int) -> str:
    return f"^{k}" if k >= 0 else f"^-{-k}"


def _unicode(k: int) -> str:
    return str(k).translate(TO_SUPERSCRIPT)


def _latex(k: int) -> str:
    return f"^{{{k}}}"


def _html(k: int) -> str:
    return f"<sup>{k}</sup>"


def _nist_asd(k: int) -> str:
    """NIST ASD's ground-shells spelling writes a single electron without its 1 (3s)."""
    return "" if k == 1 else _plain(k)


_STYLES: dict[str, Style] = {}


def register_style(style: Style) -> None:
    """Add a notation; an existing name is never overwritten."""
    if style.name in _STYLES:
        raise ValueError(f"a style named {style.name!r} exists already")
    _STYLES[style.name] = style
    if "_CORE_HEAD" in globals():  # styles registered after import get their caches too
        _TOKEN_TEXT_BY_STYLE[style.name] = {}
        _CORE_HEAD[style.name] = {symbol: style.core.format(symbol=symbol)
                                  for symbol in NOBLE_CORES}


for _style in (
    Style("plain", _plain, " ", "[{symbol}]", " "),
    Style("caret", _caret, " ", "[{symbol}]", " "),
    Style("unicode", _unicode, " ", "[{symbol}]", " ", j_count=_unicode),
    Style("latex", _latex, r"\,", r"[\mathrm{{{symbol}}}]", r"\,", j="_{{{j}}}",
          j_count=_latex),
    Style("html", _html, " ", "[{symbol}]", " ", j="<sub>{j}</sub>", j_count=_html),
    # the NIST Atomic Spectra Database convention: subshells joined by dots, [Ne].3s
    Style("nist-asd", _nist_asd, ".", "[{symbol}]", "."),
):
    register_style(_style)

STYLES = tuple(_STYLES)
#: Old style names kept for one release, with their new names.
DEPRECATED_STYLES = {"dotted": "nist-asd"}


def current_style(style: str) -> str:
    """The style's name, warning for a deprecated one (``dotted`` is now ``nist-asd``)."""
    new = DEPRECATED_STYLES.get(style)
    if new is None:
        return style
    warnings.warn(f"the style {style!r} is deprecated; use {new!r}", DeprecationWarning,
                  stacklevel=3)
    return new
CORE_MODES = ("condense", "expand")
ORDERS = ("shell", "filling")
ORDER_KEYS = {"shell": shell_key, "filling": filling_key}


def check_option(kind: str, value: str, allowed: Iterable[str]) -> None:
    """Refuse an option value that is not one of ``allowed`` (code ``unknown-option``)."""
    allowed = tuple(allowed)
    if value not in allowed:
        raise ConfspecSyntaxError(
            "unknown-option", f"unknown {kind} {value!r}; use one of: " + ", ".join(allowed))


def _quads(occupancies: Iterable[tuple[int, ...]]) -> list[tuple[int, int, int, int]]:
    return [(o[0], o[1], 0, o[2]) if len(o) == 3 else (o[0], o[1], o[2], o[3])
            for o in occupancies]


_CORE_SETS = [(symbol, frozenset(NOBLE_CORES[symbol]),
               frozenset((n, l) for n, l, _ in NOBLE_CORES[symbol]),
               max(NOBLE_CORES[symbol]))  # the outermost subshell: a quick necessary test
              for symbol in CORES_LARGEST_FIRST]


def largest_core(occupancies: Iterable[Occupancy]) -> str | None:
    """The largest noble-gas core whose subshells are all full in the configuration."""
    have = set(occupancies)
    for symbol, core, _, outermost in _CORE_SETS:
        if outermost in have and core <= have:
            return symbol
    return None


#: The spelling of the empty configuration (a bare nucleus such as H⁺ or He²⁺): ``1s0``,
#: which reads back, where an empty text would not.
EMPTY_TOKEN = (1, 0, 0, 0)


def condensing_core(occupancies: Iterable[Occupancy]) -> str | None:
    """The core that condensed output writes: the largest noble-gas core that leaves at
    least one subshell written, so a closed shell is never its own core (neon is
    ``[He] 2s2 2p6``, helium ``1s2``), as published tables write them."""
    have = set(occupancies)
    for symbol, core, _, outermost in _CORE_SETS:
        if outermost in have and core <= have and len(have) > len(core):
            return symbol
    return None


_CORE_INSIDE = {symbol: inside for symbol, _, inside, _ in _CORE_SETS}


def render(occupancies: Iterable[tuple[int, ...]] | list[tuple[int, int, int, int]], *,
           style: str = "plain", core: str = "condense", order: str = "shell",
           changes: Iterable[tuple[int, ...]] = (), core_symbol: str | None = None,
           split_j: bool = False) -> str:
    """Render occupancies, (n, l, electrons) or (n, l, 2j, electrons). ``changes`` are extra
    tokens such as holes (negative counts), ``core_symbol`` forces a core (used when
    writing holes against a reference), ``split_j`` writes full nl subshells as their two
    j subshells."""
    fmt = _STYLES.get(style)
    if fmt is None and style in DEPRECATED_STYLES:
        fmt = _STYLES[current_style(style)]
    if fmt is None or core not in CORE_MODES or order not in ORDERS:
        check_option("style", style, _STYLES)
        check_option("core", core, CORE_MODES)
        check_option("order", order, ORDERS)
        raise AssertionError("unreachable")  # pragma: no cover
    occ = occupancies if isinstance(occupancies, list) and (
        not occupancies or len(occupancies[0]) == 4) else _quads(occupancies)
    if core_symbol is not None:
        symbol: str | None = core_symbol
    elif core == "condense":
        # j parts never look like a full core subshell: a full pair is merged into nl, and
        # one part holds fewer than 2(2l + 1) electrons
        symbol = condensing_core([(n, l, e) for n, l, _, e in occ if e])
    else:
        symbol = None
    inside = _CORE_INSIDE[symbol] if symbol else frozenset()
    tokens = [t for t in occ if (t[0], t[1]) not in inside and t[3]]
    if split_j:
        tokens = [part for t in tokens for part in _split(t)]
    if changes:
        tokens.extend(_quads(changes))
    if order == "filling" or changes:
        key = ORDER_KEYS[order]
        tokens.sort(key=lambda t: (key(t[0], t[1]), t[2], t[3] >= 0))
    else:  # shell order is the model's own order: (n, l, 2j)
        tokens.sort()
    cache = _TOKEN_TEXT_BY_STYLE[fmt.name]
    body = fmt.separator.join([cache.get(t) or _cached_style_token(fmt, t, cache)
                               for t in tokens])
    if symbol is None:
        return body or _token(fmt, *EMPTY_TOKEN)
    head = fmt.core.format(symbol=symbol)
    return head + fmt.after_core + body if body else head


def _render_shell(quads: list[tuple[int, int, int, int]], fmt: Style, core: str) -> str:
    """The common case of :func:`render`: a model's own subshells (already in shell
    order) in shell order, no holes, no j splitting."""
    symbol = None
    if core == "condense":
        have = {(n, l, e) for n, l, _, e in quads}
        for name, core_set, _, outermost in _CORE_SETS:
            if outermost in have and core_set <= have and len(have) > len(core_set):
                symbol = name
                break
    cache = _TOKEN_TEXT_BY_STYLE[fmt.name]
    if symbol is None:
        return fmt.separator.join([cache.get(t) or _cached_style_token(fmt, t, cache)
                                   for t in quads]) or _token(fmt, *EMPTY_TOKEN)
    inside = _CORE_INSIDE[symbol]
    body = fmt.separator.join([cache.get(t) or _cached_style_token(fmt, t, cache)
                               for t in quads if (t[0], t[1]) not in inside])
    head = _CORE_HEAD[fmt.name][symbol]
    return head + fmt.after_core + body if body else head


_TOKEN_TEXT_BY_STYLE: dict[str, dict[tuple[int, int, int, int], str]] = {
    name: {} for name in _STYLES}
_CORE_HEAD = {name: {symbol: style.core.format(symbol=symbol) for symbol in NOBLE_CORES}
              for name, style in _STYLES.items()}


def _cached_style_token(fmt: Style, t: tuple[int, int, int, int],
                        cache: dict[tuple[int, int, int, int], str]) -> str:
    text = _token(fmt, *t)
    if len(cache) < 100_000:
        cache[t] = text
    return text


def _split(token: tuple[int, int, int, int]) -> list[tuple[int, int, int, int]]:
    n, l, j2, e = token
    if j2 or l == 0 or e != pauli_limit(l):
        return [token]
    return [(n, l, 2 * l - 1, 2 * l), (n, l, 2 * l + 1, 2 * l + 2)]


def style_of(name: str) -> Style:
    """The style record of a name (deprecated names map to their new ones), or plain's for
    a name that is not a configuration style (such as a term-only style)."""
    return _STYLES.get(current_style(name)) or _STYLES["plain"]


def token_text(style: Style, n: int, l: int, j2: int, count: int) -> str:
    """One subshell with its occupancy in a style: ``3d6``, ``3d^{6}``, ``2p3/2^2``."""
    return _token(style, n, l, j2, count)


def _token(fmt: Style, n: int, l: int, j2: int, count: int) -> str:
    if not j2:
        return f"{subshell_label(n, l)}{fmt.count(count)}"
    j_count = fmt.j_count or _caret
    return f"{subshell_label(n, l)}{fmt.j.format(j=f'{j2}/2')}{j_count(count)}"


def render_configuration(quads: list[tuple[int, int, int, int]], *, style: str = "plain",
                         core: str = "condense", order: str = "shell",
                         reference: Iterable[tuple[int, int, int, int]] | None = None,
                         split_j: bool = False) -> str:
    """Render a model's subshells, (n, l, 2j, electrons) in shell order; with ``reference``
    (subshells of the same form), as holes relative to it (see :mod:`confspec.notation.holes`)."""
    style = current_style(style)
    if reference is None:
        if order == "shell" and not split_j and style in _STYLES and core in CORE_MODES:
            return _render_shell(quads, _STYLES[style], core)
        return render(quads, style=style, core=core, order=order, split_j=split_j)
    # holes render through this module's render(): a cycle inside the notation package
    from .holes import render_with_holes

    return render_with_holes(quads, reference, style=style, core=core, order=order)


def options_from_spec(spec: str) -> dict[str, str]:
    """``f"{c:unicode}"``, ``f"{c:latex,expand,filling}"``: any of style, core, order."""
    options: dict[str, str] = {}
    for word in spec.replace(":", ",").split(","):
        word = word.strip()
        if not word:
            continue
        for kind, allowed in (("style", STYLES), ("core", CORE_MODES), ("order", ORDERS)):
            if word in allowed:
                options[kind] = word
                break
        else:
            raise ConfspecSyntaxError(
                "unknown-option", f"unknown format option {word!r}; styles: {', '.join(STYLES)}; "
                f"core: {', '.join(CORE_MODES)}; order: {', '.join(ORDERS)}")
    return options


_ROMAN = ((100, "C"), (90, "XC"), (50, "L"), (40, "XL"), (10, "X"), (9, "IX"), (5, "V"),
          (4, "IV"), (1, "I"))


def roman(value: int) -> str:
    out = []
    for size, numeral in _ROMAN:
        while value >= size:
            out.append(numeral)
            value -= size
    return "".join(out)


SPECIES_STYLES = ("plain", "unicode", "latex", "html", "spectrum", "oxidation")


def render_species(symbol: str, q: int, style: str = "plain") -> str:
    """A species as text: ``Fe2+``, ``Fe²⁺``, ``Fe^{2+}``, ``Fe<sup>2+</sup>``, ``Fe III``,
    ``Fe(III)``."""
    check_option("species style", style, SPECIES_STYLES)
    size = "" if abs(q) == 1 else str(abs(q))
    sign = "+" if q > 0 else "-"
    if style == "spectrum":
        return f"{symbol} {roman(q + 1)}" if q >= 0 else f"{symbol}{size}{sign}"
    if style == "oxidation":
        if q == 0:
            return f"{symbol}(0)"
        return f"{symbol}({'-' if q < 0 else ''}{roman(abs(q))})"
    if q == 0:
        return symbol
    charge = f"{size}{sign}"
    if style == "unicode":
        return symbol + charge.translate(TO_SUPERSCRIPT)
    if style == "latex":
        return f"{symbol}^{{{charge}}}"
    if style == "html":
        return f"{symbol}<sup>{charge}</sup>"
    return symbol + charge
