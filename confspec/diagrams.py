"""Orbital box diagrams: one box per orbital, up and down arrows for the electrons' spins.

Three renderings of one layout: unicode (or ASCII) text for terminals, SVG and HTML for
notebooks and web pages. Within a subshell the electrons follow Hund's first rule: one
spin-up electron in each box first (boxes from m_l = +l on the left to −l on the right),
then the spin-down partners from the left; so ``3d6`` is ``[↑↓][↑ ][↑ ][↑ ][↑ ]``.
Subshells come in shell order (n, then l: the canonical order) or filling order (Madelung),
and the largest full noble-gas core can be collapsed to its symbol. A relativistic subshell
nlj (``2p3/2``) has 2j + 1 states m_j, each holding one electron: it is drawn as 2j + 1
cells filled from m_j = +j with a dot, ``[●][●][ ][ ]``, since its electrons carry no
separate spin arrow. Renderers only read the model.
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass
from html import escape
from typing import TYPE_CHECKING

from .models import provide
from .notation.render import CORE_MODES, ORDERS, check_option, condensing_core
from .notation.scripts import TO_SUPERSCRIPT
from .physics import NOBLE_CORES, filling_key, shell_key, subshell_label
from .reading import as_configuration

if TYPE_CHECKING:
    from .models import Configuration

__all__ = ["CHARSETS", "FORMS", "box_diagram", "box_diagram_html", "box_diagram_svg",
           "box_diagram_text", "orbital_spins"]

#: Renderings of :func:`box_diagram`.
FORMS = ("text", "svg", "html")
#: Character sets of the text rendering.
CHARSETS = ("unicode", "ascii")

_ARROWS = {"unicode": ("↑", "↓"), "ascii": ("^", "v")}
_DOTS = {"unicode": "●", "ascii": "o"}


def orbital_spins(l: int, electrons: int) -> list[tuple[bool, bool]]:
    """(spin up, spin down) for each of the 2l + 1 orbitals, m_l = +l first, by Hund's
    first rule: every orbital gets a spin-up electron before any is paired.

    >>> orbital_spins(1, 4)
    [(True, True), (True, False), (True, False)]
    """
    orbitals = 2 * l + 1
    if not 0 <= electrons <= 2 * orbitals:
        raise ValueError(f"{electrons} electrons do not fit in {orbitals} orbitals")
    up = min(electrons, orbitals)
    down = electrons - up
    return [(i < up, i < down) for i in range(orbitals)]


@dataclass(frozen=True, slots=True)
class _Row:
    n: int
    l: int
    j2: int  # twice j for a relativistic subshell, 0 for nl
    electrons: int

    @property
    def label(self) -> str:
        base = subshell_label(self.n, self.l)
        return f"{base}{self.j2}/2" if self.j2 else base

    @property
    def spins(self) -> list[tuple[bool, bool]]:
        """nl: (up, down) per orbital; nlj: (occupied, False) per m_j state."""
        if self.j2:
            return [(i < self.electrons, False) for i in range(self.j2 + 1)]
        return orbital_spins(self.l, self.electrons)


@dataclass(frozen=True, slots=True)
class _Layout:
    core: str | None
    core_electrons: int
    rows: tuple[_Row, ...]


def _core_mode(core: str, collapse_core: bool | None) -> bool:
    """Whether to condense the core; ``collapse_core`` is the deprecated old spelling."""
    if collapse_core is not None:
        warnings.warn("collapse_core= is deprecated; use core='condense' or core='expand', "
                      "as Configuration.format does", DeprecationWarning, stacklevel=3)
        return collapse_core
    check_option("core", core, CORE_MODES)
    return core == "condense"


def _layout(config: Configuration, order: str, collapse_core: bool) -> _Layout:
    check_option("order", order, ORDERS)
    core = condensing_core(config.occupancies) if collapse_core else None
    inside = {(n, l) for n, l, _ in NOBLE_CORES[core]} if core else set()
    key = filling_key if order == "filling" else shell_key
    rows = sorted((_Row(s.n, s.l, s.j2, s.electrons) for s in config.subshells
                   if (s.n, s.l) not in inside), key=lambda r: (key(r.n, r.l), r.j2))
    core_electrons = sum(e for _, _, e in NOBLE_CORES[core]) if core else 0
    return _Layout(core, core_electrons, tuple(rows))


def _core_note(layout: _Layout) -> str:
    return f"closed core, {layout.core_electrons} electrons"


# ---------------------------------------------------------------------------- text
def box_diagram_text(config: Configuration | str, *, order: str = "shell",
                     core: str = "condense", collapse_core: bool | None = None,
                     charset: str = "unicode") -> str:
    """The diagram as lines of text: one line per subshell, ``[↑↓]`` per orbital.

    ``charset="ascii"`` writes ``[^v]`` for terminals without unicode. No trailing newline.

    >>> print(box_diagram_text("[Ar] 3d6 4s2"))
    [Ar]  closed core, 18 electrons
    3d⁶   [↑↓][↑ ][↑ ][↑ ][↑ ]
    4s²   [↑↓]
    >>> print(box_diagram_text("1s2 2s2 2p3", core="expand", charset="ascii"))
    1s2   [^v]
    2s2   [^v]
    2p3   [^ ][^ ][^ ]
    """
    check_option("charset", charset, CHARSETS)
    layout = _layout(as_configuration(config), order, _core_mode(core, collapse_core))
    up, down = _ARROWS[charset]
    dot = _DOTS[charset]

    def label(row: _Row) -> str:
        count = str(row.electrons)
        if charset == "unicode":
            return row.label + count.translate(TO_SUPERSCRIPT)
        return row.label + ("^" if row.j2 else "") + count

    def cell(row: _Row, first: bool, second: bool) -> str:
        if row.j2:
            return f"[{dot if first else ' '}]"
        return f"[{up if first else ' '}{down if second else ' '}]"

    labels = [label(row) for row in layout.rows]
    width = max([len(text) for text in labels] + [4]) + 2  # "[Ar]" and "4f¹⁴" are 4 wide
    lines = []
    if layout.core:
        lines.append(f"[{layout.core}]".ljust(width) + _core_note(layout))
    for row, text in zip(layout.rows, labels, strict=True):
        boxes = "".join(cell(row, u, d) for u, d in row.spins)
        lines.append(text.ljust(width) + boxes)
    return "\n".join(lines) if lines else "(no electrons)"


# ---------------------------------------------------------------------------- SVG
_BOX = 30  # box side in SVG user units (px)
_ROW_GAP = 10
_LABEL_WIDTH = 64
_PAD = 8
_FONT = "DejaVu Sans, Helvetica, Arial, sans-serif"
# DejaVu Sans advances: at most 0.63 em for the letters and digits we write, 0.69 em bold
# (common practice: the font's own metrics, rounded up); superscripts count as full digits
_EM_ADVANCE, _EM_ADVANCE_BOLD = 0.63, 0.69


def _text_width(text: str, size: float, *, bold: bool = False) -> float:
    """An upper estimate of the rendered width of one line of text, in px."""
    return len(text) * size * (_EM_ADVANCE_BOLD if bold else _EM_ADVANCE)


def _svg_arrow(x: float, top: float, bottom: float, pointing_up: bool) -> str:
    """A shaft with a filled head; drawn as paths so no font is needed for the arrows."""
    head, half = 7.0, 4.0
    if pointing_up:
        tip, base = top, top + head
        shaft = f"M{x:g} {bottom:g}V{base:g}"
    else:
        tip, base = bottom, bottom - head
        shaft = f"M{x:g} {top:g}V{base:g}"
    return (f'<path d="{shaft}" stroke="currentColor" stroke-width="2"/>'
            f'<path d="M{x - half:g} {base:g}L{x:g} {tip:g}L{x + half:g} {base:g}Z" '
            f'fill="currentColor"/>')


def _svg_label(x: float, y: float, row: _Row) -> str:
    base = subshell_label(row.n, row.l)
    j = f'<tspan dy="5" font-size="11">{row.j2}/2</tspan><tspan dy="-12" font-size="11">' \
        if row.j2 else '<tspan dy="-7" font-size="11">'
    return f'<text x="{x:g}" y="{y:g}" font-size="16">{base}{j}{row.electrons}</tspan></text>'


def box_diagram_svg(config: Configuration | str, *, order: str = "shell",
                    core: str = "condense", collapse_core: bool | None = None,
                    caption: str | None = None) -> str:
    """The diagram as a standalone SVG document (colours follow the surrounding text).

    ``caption`` is written above the boxes, e.g. the configuration in unicode notation.

    >>> svg = box_diagram_svg("1s2 2s2 2p2", core="expand")
    >>> svg.startswith("<svg") and svg.count("<rect") == 5 and svg.count("<path") == 12
    True
    """
    configuration = as_configuration(config)
    layout = _layout(configuration, order, _core_mode(core, collapse_core))
    widest = max((len(row.spins) for row in layout.rows), default=0)
    label_width = max([_LABEL_WIDTH + (20 if any(row.j2 for row in layout.rows) else 0)]
                      + [_text_width(f"{row.label}{row.electrons}", 16) + 12
                         for row in layout.rows])
    label_width = round(label_width)
    # the width fits the widest of: the box rows, the core line and the caption
    contents = [label_width + widest * _BOX, 120.0]
    if layout.core:
        contents.append(label_width + _text_width(_core_note(layout), 13))
    if caption:
        contents.append(_text_width(caption, 16, bold=True))
    width = round(_PAD * 2 + max(contents))
    y = _PAD
    body: list[str] = []
    if caption:
        body.append(f'<text x="{_PAD}" y="{y + 16}" font-size="16" font-weight="bold">'
                    f"{escape(caption)}</text>")
        y += 28
    if layout.core:
        body.append(f'<text x="{_PAD}" y="{y + 20}" font-size="16">[{layout.core}]</text>'
                    f'<text x="{_PAD + label_width}" y="{y + 20}" font-size="13" '
                    f'fill-opacity="0.7">{_core_note(layout)}</text>')
        y += _BOX + _ROW_GAP
    if not layout.rows and not layout.core:
        body.append(f'<text x="{_PAD}" y="{y + 20}" font-size="14">(no electrons)</text>')
        y += _BOX + _ROW_GAP
    for row in layout.rows:
        body.append(_svg_label(_PAD, y + 21, row))
        x0 = _PAD + label_width
        for i, (up, down) in enumerate(row.spins):
            x = x0 + i * _BOX
            body.append(f'<rect x="{x}" y="{y}" width="{_BOX}" height="{_BOX}" fill="none" '
                        f'stroke="currentColor" stroke-width="1.5"/>')
            if row.j2:
                if up:  # one electron in this m_j state
                    body.append(f'<circle cx="{x + _BOX / 2:g}" cy="{y + _BOX / 2:g}" r="6"/>')
                continue
            if up:
                body.append(_svg_arrow(x + _BOX * 0.33, y + 4, y + _BOX - 4, True))
            if down:
                body.append(_svg_arrow(x + _BOX * 0.67, y + 4, y + _BOX - 4, False))
        y += _BOX + _ROW_GAP
    height = y - _ROW_GAP + _PAD
    title = escape(caption or configuration.format(style="unicode") or "no electrons")
    return (f'<svg xmlns="http://www.w3.org/2000/svg" width="{width}" height="{height}" '
            f'viewBox="0 0 {width} {height}" role="img" font-family="{_FONT}" '
            f'fill="currentColor"><title>Orbital box diagram: {title}</title>'
            + "".join(body) + "</svg>")


# ---------------------------------------------------------------------------- HTML
_HTML_BOX = ("display:inline-block;width:1.9em;height:1.5em;line-height:1.5em;"
             "text-align:center;border:1px solid currentColor;margin-right:-1px;"
             "font-family:DejaVu Sans,Arial,sans-serif")
_HTML_LABEL = "display:inline-block;min-width:3.5em;padding-right:0.3em"
# the boxes overlap by their 1px borders (margin-right:-1px), so a row is 1px wider than its
# boxes add up to: the padding keeps the last border inside a shrink-to-fit container
_HTML_ROW = "margin:0.2em 0;white-space:nowrap;padding-right:1px"


def box_diagram_html(config: Configuration | str, *, order: str = "shell",
                     core: str = "condense", collapse_core: bool | None = None) -> str:
    """The diagram as an HTML fragment with inline styles (no stylesheet, no script).

    >>> html = box_diagram_html("[He] 2s1")
    >>> html.count("↑"), html.count("↓")
    (1, 0)
    """
    layout = _layout(as_configuration(config), order, _core_mode(core, collapse_core))
    # an inline block is as wide as its widest row, so the rows never overflow it; inside a
    # narrower notebook cell it scrolls instead of spilling over
    lines = ['<div class="confspec-boxes" style="display:inline-block;max-width:100%;'
             'overflow-x:auto;vertical-align:top">']
    if layout.core:
        lines.append(f'<div style="{_HTML_ROW}"><span style="{_HTML_LABEL}">[{layout.core}]'
                     f'</span> <span style="opacity:0.7">{_core_note(layout)}</span></div>')
    if not layout.rows and not layout.core:
        lines.append(f'<div style="{_HTML_ROW}">(no electrons)</div>')
    for row in layout.rows:
        if row.j2:
            cells = ["●" if used else "&nbsp;" for used, _ in row.spins]
            label = (f"{subshell_label(row.n, row.l)}<sub>{row.j2}/2</sub>"
                     f"<sup>{row.electrons}</sup>")
        else:
            cells = [("↑" if up else "") + ("↓" if down else "") or "&nbsp;"
                     for up, down in row.spins]
            label = f"{row.label}<sup>{row.electrons}</sup>"
        boxes = "".join(f'<span style="{_HTML_BOX}">{content}</span>' for content in cells)
        lines.append(f'<div style="{_HTML_ROW}"><span style="{_HTML_LABEL}">{label}</span> '
                     f"{boxes}</div>")
    lines.append("</div>")
    return "".join(lines)


# ---------------------------------------------------------------------------- entry point
def box_diagram(config: Configuration | str, *, form: str = "text", order: str = "shell",
                core: str = "condense", collapse_core: bool | None = None,
                charset: str = "unicode") -> str:
    """One entry point for the three renderings (``form``: text, svg or html)."""
    check_option("diagram form", form, FORMS)
    check_option("charset", charset, CHARSETS)
    if form == "svg":
        configuration = as_configuration(config)
        return box_diagram_svg(configuration, order=order, core=core, collapse_core=collapse_core,
                               caption=configuration.format(style="unicode", order=order)
                               or None)
    if form == "html":
        return box_diagram_html(config, order=order, core=core, collapse_core=collapse_core)
    return box_diagram_text(config, order=order, core=core, collapse_core=collapse_core,
                            charset=charset)


# Configuration.boxes() and the notebook pictures call these without importing this module
provide("box_diagram", box_diagram)
provide("box_diagram_html", box_diagram_html)
