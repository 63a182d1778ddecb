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

from dataclasses import dataclass
from html import escape
from typing import TYPE_CHECKING

from ._format import ORDERS, _option, largest_core
from ._physics import NOBLE_CORES, filling_key, shell_key, subshell_label
from ._terms import _as_configuration

if TYPE_CHECKING:
    from ._models import Configuration

__all__ = ["CHARSETS", "FORMS", "box_diagram", "box_diagram_html", "box_diagram_svg",
           "box_diagram_text", "orbital_spins"]

#: Renderings of :func:`box_diagram`.
FORMS = ("text", "svg", "html")
#: Character sets of the text rendering.
CHARSETS = ("unicode", "ascii")

_SUPERSCRIPTS = str.maketrans("0123456789", "⁰¹²³⁴⁵⁶⁷⁸⁹")
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


def _layout(config: Configuration, order: str, collapse_core: bool) -> _Layout:
    _option("order", order, ORDERS)
    core = largest_core(config.occupancies) if collapse_core else None
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
                     collapse_core: bool = True, charset: str = "unicode") -> str:
    """The diagram as lines of text: one line per subshell, ``[↑↓]`` per orbital.

    ``charset="ascii"`` writes ``[^v]`` for terminals without unicode. No trailing newline.

    >>> print(box_diagram_text("[Ar] 3d6 4s2"))
    [Ar]  closed core, 18 electrons
    3d⁶   [↑↓][↑ ][↑ ][↑ ][↑ ]
    4s²   [↑↓]
    >>> print(box_diagram_text("1s2 2s2 2p3", collapse_core=False, charset="ascii"))
    1s2   [^v]
    2s2   [^v]
    2p3   [^ ][^ ][^ ]
    """
    _option("charset", charset, CHARSETS)
    layout = _layout(_as_configuration(config), order, collapse_core)
    up, down = _ARROWS[charset]
    dot = _DOTS[charset]

    def label(row: _Row) -> str:
        count = str(row.electrons)
        if charset == "unicode":
            return row.label + count.translate(_SUPERSCRIPTS)
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
                    collapse_core: bool = True, caption: str | None = None) -> str:
    """The diagram as a standalone SVG document (colours follow the surrounding text).

    ``caption`` is written above the boxes, e.g. the configuration in unicode notation.

    >>> svg = box_diagram_svg("1s2 2s2 2p2", collapse_core=False)
    >>> svg.startswith("<svg") and svg.count("<rect") == 5 and svg.count("<path") == 12
    True
    """
    configuration = _as_configuration(config)
    layout = _layout(configuration, order, collapse_core)
    widest = max((len(row.spins) for row in layout.rows), default=0)
    label_width = _LABEL_WIDTH + (20 if any(row.j2 for row in layout.rows) else 0)
    width = _PAD * 2 + label_width + max(widest * _BOX, 190)
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
_HTML_LABEL = "display:inline-block;min-width:3.5em"
_HTML_ROW = "margin:0.2em 0;white-space:nowrap"


def box_diagram_html(config: Configuration | str, *, order: str = "shell",
                     collapse_core: bool = True) -> str:
    """The diagram as an HTML fragment with inline styles (no stylesheet, no script).

    >>> html = box_diagram_html("[He] 2s1")
    >>> html.count("↑"), html.count("↓")
    (1, 0)
    """
    layout = _layout(_as_configuration(config), order, collapse_core)
    lines = ['<div class="confspec-boxes">']
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
                collapse_core: bool = True, charset: str = "unicode") -> str:
    """One entry point for the three renderings (``form``: text, svg or html)."""
    _option("diagram form", form, FORMS)
    _option("charset", charset, CHARSETS)
    if form == "svg":
        configuration = _as_configuration(config)
        return box_diagram_svg(configuration, order=order, collapse_core=collapse_core,
                               caption=configuration.format(style="unicode", order=order)
                               or None)
    if form == "html":
        return box_diagram_html(config, order=order, collapse_core=collapse_core)
    return box_diagram_text(config, order=order, collapse_core=collapse_core, charset=charset)
