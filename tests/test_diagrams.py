"""Orbital box diagrams: text, SVG and HTML renderings, Hund's rule arrows, round trips."""

from __future__ import annotations

import re
import xml.etree.ElementTree as ET
from fractions import Fraction
from html.parser import HTMLParser
from pathlib import Path

import pytest
from hypothesis import given
from hypothesis import strategies as st

import confspec
from confspec import Configuration, ConfspecError, hund_ground_term, parse
from confspec.diagrams import box_diagram_html, box_diagram_svg, box_diagram_text
from confspec.physics import pauli_limit

from .property.strategies import configurations, relativistic_configurations

SVG = "{http://www.w3.org/2000/svg}"


@pytest.mark.parametrize(("text", "options", "diagram"), [
    # Ground configurations as NIST ASD lists them (ground levels of the neutral atoms).
    pytest.param("[Ar] 3d6 4s2", {}, "[Ar]  closed core, 18 electrons\n"
                                     "3d⁶   [↑↓][↑ ][↑ ][↑ ][↑ ]\n"
                                     "4s²   [↑↓]", id="Fe"),
    pytest.param("[Ar] 3d5 4s1", {}, "[Ar]  closed core, 18 electrons\n"
                                     "3d⁵   [↑ ][↑ ][↑ ][↑ ][↑ ]\n"
                                     "4s¹   [↑ ]", id="Cr-half-filled"),
    pytest.param("[Ar] 3d6 4s2", {"order": "filling"}, "[Ar]  closed core, 18 electrons\n"
                                                       "4s²   [↑↓]\n"
                                                       "3d⁶   [↑↓][↑ ][↑ ][↑ ][↑ ]",
                 id="Fe-filling-order"),
    pytest.param("1s2 2s2 2p4", {"core": "expand"}, "1s²   [↑↓]\n"
                                                          "2s²   [↑↓]\n"
                                                          "2p⁴   [↑↓][↑ ][↑ ]", id="O"),
    pytest.param("1s2 2s2 2p4", {}, "[He]  closed core, 2 electrons\n"
                                    "2s²   [↑↓]\n"
                                    "2p⁴   [↑↓][↑ ][↑ ]", id="O-core"),
    pytest.param("1s2 2s2 2p3", {"charset": "ascii"}, "[He]  closed core, 2 electrons\n"
                                                      "2s2   [^v]\n"
                                                      "2p3   [^ ][^ ][^ ]", id="N-ascii"),
    pytest.param("[Ne]", {}, "[He]  closed core, 2 electrons\n"
                             "2s²   [↑↓]\n"
                             "2p⁶   [↑↓][↑↓][↑↓]", id="core-only"),
    pytest.param("[Xe] 4f14 5d10 6s2", {}, "[Xe]  closed core, 54 electrons\n"
                                           "4f¹⁴  [↑↓][↑↓][↑↓][↑↓][↑↓][↑↓][↑↓]\n"
                                           "5d¹⁰  [↑↓][↑↓][↑↓][↑↓][↑↓]\n"
                                           "6s²   [↑↓]", id="Hg-wide-labels"),
    pytest.param("1s1 10s1", {}, "1s¹   [↑ ]\n10s¹  [↑ ]", id="two-digit-n"),
    pytest.param("1s1 2s2 2p6 3s1", {}, "1s¹   [↑ ]\n2s²   [↑↓]\n2p⁶   [↑↓][↑↓][↑↓]\n"
                                        "3s¹   [↑ ]", id="core-hole-no-full-core"),
    # relativistic subshells: 2j + 1 states m_j, one electron each, drawn as dots
    pytest.param("[Kr] 4d10 5s2 5p1/2^2 5p3/2^3", {}, "[Kr]    closed core, 36 electrons\n"
                                                       "4d¹⁰    [↑↓][↑↓][↑↓][↑↓][↑↓]\n"
                                                       "5s²     [↑↓]\n"
                                                       "5p1/2²  [●][●]\n"
                                                       "5p3/2³  [●][●][●][ ]", id="jj"),
    pytest.param("2p1/2^1", {"charset": "ascii"}, "2p1/2^1  [o][ ]", id="jj-ascii"),
])
def test_text_diagrams(text: str, options: dict[str, object], diagram: str) -> None:
    config = parse(text)
    assert config.boxes(**options) == diagram  # type: ignore[arg-type]
    assert box_diagram_text(text, **options) == diagram  # type: ignore[arg-type]


def test_the_empty_configuration_says_so() -> None:
    assert Configuration().boxes() == "(no electrons)"
    assert "(no electrons)" in Configuration().boxes("svg")
    assert "(no electrons)" in Configuration().boxes("html")


@pytest.mark.parametrize("options", [
    pytest.param({"order": "energy"}, id="order"),
    pytest.param({"charset": "emoji"}, id="charset"),
    pytest.param({"form": "png"}, id="form"),
])
def test_unknown_options_are_refused(options: dict[str, str]) -> None:
    with pytest.raises(ConfspecError) as info:
        parse("[Ar] 3d6 4s2").boxes(**options)  # type: ignore[arg-type]
    assert info.value.code == "unknown-option"


def test_text_input_errors_are_confspec_errors() -> None:
    with pytest.raises(ConfspecError) as info:
        box_diagram_text("2p7")
    assert info.value.code == "pauli-limit"
    # an atomic number stands for the ground configuration (Mo: [Kr] 4d5 5s1, NIST ASD)
    assert box_diagram_text(42) == box_diagram_text("[Kr] 4d5 5s1")
    with pytest.raises(TypeError):  # our wrong-type error is also a TypeError
        box_diagram_text(4.2)  # type: ignore[arg-type]


# -- Hund's rule ---------------------------------------------------------------------------
def _read_row(boxes: str) -> list[tuple[bool, bool]]:
    return [(cell[0] == "↑", cell[1] == "↓") for cell in re.findall(r"\[(..)\]", boxes)]


@pytest.mark.parametrize("l", [0, 1, 2, 3])
def test_every_occupancy_follows_hund(l: int) -> None:
    """Parallel spins first, one per box, then pairing from the left; and the arrows give
    the ML and MS of Hund's ground term as computed independently by hund_ground_term."""
    for k in range(1, pauli_limit(l) + 1):
        config = Configuration.from_occupancies([(4, l, k)])
        cells = _read_row(config.boxes().split(None, 1)[1])
        ups = [u for u, _ in cells]
        downs = [d for _, d in cells]
        orbitals = 2 * l + 1
        assert len(cells) == orbitals
        assert sum(ups) == min(k, orbitals) and sum(downs) == max(0, k - orbitals)
        assert ups == sorted(ups, reverse=True) and downs == sorted(downs, reverse=True)
        assert all(u for u, d in cells if d), "a down arrow only pairs an up arrow"
        # boxes run m_l = +l ... −l from the left
        ML = sum(m * (u + d) for m, (u, d) in zip(range(l, -l - 1, -1), cells, strict=True))
        MS = Fraction(sum(ups) - sum(downs), 2)
        term = hund_ground_term(config)
        assert (term.L, term.S) == (ML, MS), (k, str(term))
        assert sum(u != d for u, d in cells) == config.unpaired_electrons


def _read_text_diagram(text: str) -> Configuration:
    """Read a text diagram back: the core, then count the arrows (or dots) of each row."""
    tokens: list[str] = []
    for line in text.splitlines():
        label, rest = line.split(None, 1)
        if label.startswith("["):
            tokens.append(label)
            continue
        match = re.fullmatch(r"(\d+[a-z](?:\d+/2)?)[⁰¹²³⁴⁵⁶⁷⁸⁹]+", label)
        assert match, label
        electrons = rest.count("↑") + rest.count("↓") + rest.count("●")
        tokens.append(f"{match[1]}^{electrons}")
    return parse(" ".join(tokens))


@given(configurations(), st.sampled_from(["shell", "filling"]),
       st.sampled_from(["condense", "expand"]))
def test_the_text_diagram_reads_back_to_the_same_configuration(
        config: Configuration, order: str, core: str) -> None:
    assert _read_text_diagram(config.boxes(order=order, core=core)) == config


@given(relativistic_configurations(), st.sampled_from(["shell", "filling"]))
def test_relativistic_diagrams_read_back_too(config: Configuration, order: str) -> None:
    text = config.boxes(order=order)
    assert _read_text_diagram(text) == config
    for line in text.splitlines():  # one cell per m_j state: 2j + 1 of them
        match = re.match(r"\d+[a-z](\d+)/2", line)
        if match:
            assert line.count("[") == int(match[1]) + 1


# -- SVG ----------------------------------------------------------------------------------
def _svg_arrows(root: ET.Element) -> list[tuple[float, float, float]]:
    """(x, tip y, base y) of each arrow head, read from the head triangles."""
    heads = []
    for path in root.iter(f"{SVG}path"):
        d = path.get("d", "")
        if path.get("fill") == "currentColor" and d.endswith("Z"):
            (_, base), (x, tip), _ = [tuple(map(float, p.split()))
                                     for p in re.findall(r"[ML]([\d.\-]+ [\d.\-]+)", d)]
            heads.append((x, tip, base))
    return heads


@pytest.mark.parametrize(("text", "boxes", "up", "down"), [
    pytest.param("[Ar] 3d6 4s2", 6, 6, 2, id="Fe"),
    pytest.param("1s2 2s2 2p3", 4, 4, 1, id="N-core-collapsed"),
    pytest.param("[Xe] 4f7 5d1 6s2", 13, 9, 1, id="Gd"),
])
def test_svg_is_well_formed_with_one_box_per_orbital(text: str, boxes: int, up: int,
                                                      down: int) -> None:
    config = parse(text)
    svg = config._repr_svg_()
    assert svg == config.boxes("svg")
    root = ET.fromstring(svg)
    assert root.tag == f"{SVG}svg" and root.get("role") == "img"
    title = root.find(f"{SVG}title")
    assert title is not None and config.format(style="unicode") in (title.text or "")
    assert len(root.findall(f"{SVG}rect")) == boxes
    heads = _svg_arrows(root)
    assert sum(tip < base for _, tip, base in heads) == up  # tip above the base: up
    assert sum(tip > base for _, tip, base in heads) == down
    # an up arrow sits in the left half of its box, a down arrow in the right half
    lefts = sorted(float(r.get("x", 0)) for r in root.findall(f"{SVG}rect"))
    width = float(root.findall(f"{SVG}rect")[0].get("width", 0))
    for x, tip, base in heads:
        box = max(left for left in lefts if left <= x)
        assert (x - box < width / 2) == (tip < base)


def test_svg_escapes_its_caption_and_renders_in_any_order() -> None:
    svg = box_diagram_svg("[Ar] 3d6 4s2", caption="<Fe & co>", order="filling")
    root = ET.fromstring(svg)
    texts = ["".join(t.itertext()) for t in root.iter(f"{SVG}text")]
    assert texts[0] == "<Fe & co>"
    assert [t for t in texts if t[:1].isdigit()] == ["4s2", "3d6"]


# -- HTML ---------------------------------------------------------------------------------
class _Cells(HTMLParser):
    def __init__(self) -> None:
        super().__init__()
        self.depth = 0
        self.cells: list[str] = []
        self._in_cell = False

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        self.depth += 1
        self._in_cell = "border:1px" in (dict(attrs).get("style") or "")
        if self._in_cell:
            self.cells.append("")

    def handle_endtag(self, tag: str) -> None:
        self.depth -= 1
        self._in_cell = False

    def handle_data(self, data: str) -> None:
        if self._in_cell:
            self.cells[-1] += data


def test_html_has_one_cell_per_orbital_and_balanced_tags() -> None:
    html = box_diagram_html("[Ar] 3d6 4s2")
    reader = _Cells()
    reader.feed(html)
    assert reader.depth == 0
    assert reader.cells == ["↑↓", "↑", "↑", "↑", "↑", "↑↓"]


def test_notebook_html_shows_the_canonical_text_and_the_boxes() -> None:
    config = parse("[Ar] 4s2 3d6")
    html = config._repr_html_()
    assert config.format(style="html") in html
    assert box_diagram_html(config) in html


# -- pictures that fit (every subshell up to g: 9 boxes) --------------------------------
LONGEST_ROWS = ["[Xe] 4f7 5d1 6s2", "[Og] 5g9 8s2", "[Og] 5g18",
                "[Xe] 4f14 5d10 6s2 6p1/2^2 6p3/2^1", "[Rn] 5f14 6d10 7s2 7p6 8s2 5g1",
                "1s2 2s2 2p6 3s2 3p6 3d10 4s2 4p6 4d10 4f14 5s2 5p6 5d10 5f14 5g18"]


@pytest.mark.parametrize("text", LONGEST_ROWS)
def test_the_svg_is_as_wide_as_its_widest_line(text: str) -> None:
    import re

    from confspec.diagrams import _text_width

    config = confspec.parse(text)
    svg = config.boxes("svg")
    width = float(re.search(r'width="([0-9.]+)"', svg).group(1))  # type: ignore[union-attr]
    right_edges = [float(x) + float(w) for x, w in
                   re.findall(r'<rect x="([0-9.]+)" y="[0-9.]+" width="([0-9.]+)"', svg)]
    assert max(right_edges) <= width
    caption = config.format(style="unicode")
    assert _text_width(caption, 16, bold=True) <= width


def test_the_html_view_is_an_inline_block_as_wide_as_its_rows() -> None:
    html = confspec.parse("[Og] 5g9 8s2").boxes("html")
    assert 'class="confspec-boxes" style="display:inline-block;max-width:100%;' \
           'overflow-x:auto' in html
    assert html.count("white-space:nowrap") == 3  # the core line and two rows never wrap


@pytest.mark.slow  # starts a browser
def test_the_views_fit_their_containers_in_a_real_browser(tmp_path: Path) -> None:
    import json
    import shutil
    import subprocess

    browser = shutil.which("chromium") or shutil.which("chromium-browser")
    if browser is None:
        pytest.skip("no headless Chromium here (Debian package 'chromium')")
    cells = []
    for theme, colour, background in (("light", "#111", "#fff"), ("dark", "#eee", "#1e1e1e")):
        for text in LONGEST_ROWS:
            config = confspec.parse(text)
            for view in (config._repr_html_(), config._repr_svg_()):
                # a shrink-to-fit box that clips, as notebook output areas are (flex items)
                cells.append(f'<div style="display:flex;width:760px"><div class="cell" '
                             f'data-theme="{theme}" style="color:{colour};background:'
                             f'{background};flex:0 1 auto;overflow:hidden">{view}</div></div>')
    script = """<script>
      const out = [];
      for (const cell of document.querySelectorAll('.cell')) {
        const view = cell.firstElementChild;
        const inner = view.querySelector('.confspec-boxes') || view;
        const box = inner.getBoundingClientRect();
        let right = box.right;
        for (const el of inner.querySelectorAll('*')) {
          right = Math.max(right, el.getBoundingClientRect().right);
        }
        out.push([cell.dataset.theme, box.right, right, inner.scrollWidth, inner.clientWidth]);
      }
      document.body.setAttribute('data-result', JSON.stringify(out));
    </script>"""
    page = tmp_path / "boxes.html"
    page.write_text("<html><body>" + "".join(cells) + script + "</body></html>", "utf-8")
    done = subprocess.run(
        [browser, "--headless", "--no-sandbox", "--disable-gpu", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync",
         f"--user-data-dir={tmp_path / 'profile'}", "--dump-dom", page.as_uri()],
        capture_output=True, text=True, timeout=120, check=True)
    found = re.search(r'data-result="([^"]*)"', done.stdout)
    assert found is not None, done.stdout[-500:]
    result = json.loads(found.group(1).replace("&quot;", '"'))
    assert len(result) == 4 * len(LONGEST_ROWS)
    for theme, container_right, content_right, scroll, client in result:
        assert content_right <= container_right + 0.01, (theme, container_right, content_right)
        assert scroll <= client, (theme, scroll, client)
