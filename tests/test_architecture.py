"""The import contract: layers, no cycles between packages, private names stay private.

Every import counts, including those made inside functions and under ``TYPE_CHECKING``:
a lazy import that closes a loop is still a loop. ``make lint`` runs this file.
"""

from __future__ import annotations

import ast
from collections import defaultdict
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1] / "confspec"

#: Inner to outer. A module may import its own layer or a lower one, never a higher one.
LAYERS: list[tuple[str, ...]] = [
    ("confspec.errors", "confspec.physics", "confspec.data"),
    ("confspec.notation",),
    ("confspec.models", "confspec.reading"),
    ("confspec.chemistry",),
    ("confspec.levels",),
    ("confspec.diagrams",),
    ("confspec.cleaning",),
    # the adapters, and the façade (confspec/__init__.py), which imports no adapter
    ("confspec.cli", "confspec.sql", "confspec.pandas", "confspec.dask", "confspec"),
]

#: Cycles allowed inside one package, each with its reason.
ALLOWED_CYCLES: dict[frozenset[str], str] = {
    frozenset({"confspec.models", "confspec.reading"}):
        "models accept notation text (pydantic validators) and reading builds models; both "
        "are the value core and neither reaches outward",
    frozenset({"confspec.notation.render", "confspec.notation.holes"}):
        "the hole writer renders through render(), and render_configuration() dispatches "
        "to it when a reference is given",
}


def _module_name(path: Path) -> str:
    parts = list(path.relative_to(ROOT.parent).with_suffix("").parts)
    if parts[-1] == "__init__":
        parts = parts[:-1]
    return ".".join(parts)


MODULES = {_module_name(p): p for p in ROOT.rglob("*.py")}


def _package(module: str) -> str:
    """The package a module belongs to: a subpackage, or the root for top-level modules."""
    path = MODULES[module]
    if path.name == "__init__.py":
        return module
    return module.rsplit(".", 1)[0]


def _imports(module: str) -> list[tuple[str, str | None, int]]:
    """(imported module, imported name or None, line) for every import in the module."""
    path = MODULES[module]
    tree = ast.parse(path.read_text(encoding="utf-8"))
    package = module if path.name == "__init__.py" else module.rsplit(".", 1)[0]
    found: list[tuple[str, str | None, int]] = []
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            found.extend((a.name, None, node.lineno) for a in node.names
                         if a.name.startswith("confspec"))
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package.split(".")[: len(package.split(".")) - node.level + 1]
                target = ".".join(base + ([node.module] if node.module else []))
            else:
                target = node.module or ""
            if not target.startswith("confspec"):
                continue
            for alias in node.names:
                sub = f"{target}.{alias.name}"
                if sub in MODULES:
                    found.append((sub, None, node.lineno))
                else:
                    found.append((target, alias.name, node.lineno))
    return found


def _best_name(module: str) -> str:
    names = [n for layer in LAYERS for n in layer
             if module == n or module.startswith(n + ".")]
    return max(names, key=len)


def _layer_of(module: str) -> int:
    name = _best_name(module)
    return next(i for i, layer in enumerate(LAYERS) if name in layer)


EDGES = {m: {t for t, _, _ in _imports(m) if t in MODULES and t != m} for m in MODULES}


@pytest.mark.parametrize("module", sorted(MODULES))
def test_inner_layers_never_import_outer_ones(module: str) -> None:
    mine = _layer_of(module)
    outward = [(t, line) for t, _, line in _imports(module)
               if t in MODULES and _layer_of(t) > mine]
    assert not outward, f"{module} imports outer layers: {outward}"


def _cycles(graph: dict[str, set[str]]) -> list[set[str]]:
    """Strongly connected components of more than one node (Tarjan)."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    on: set[str] = set()
    out: list[set[str]] = []
    counter = [0]

    def visit(v: str) -> None:
        index[v] = low[v] = counter[0]
        counter[0] += 1
        stack.append(v)
        on.add(v)
        for w in graph.get(v, ()):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            component = set()
            while True:
                w = stack.pop()
                on.discard(w)
                component.add(w)
                if w == v:
                    break
            if len(component) > 1:
                out.append(component)

    for v in sorted(graph):
        if v not in index:
            visit(v)
    return out


def test_no_cycles_between_packages() -> None:
    graph: dict[str, set[str]] = defaultdict(set)
    for module, targets in EDGES.items():
        if module == "confspec":
            continue  # the façade imports everything and nothing imports it back
        for target in targets:
            if target == "confspec":
                continue
            a, b = _package(module), _package(target)
            # top-level modules are rooms of their own
            a = module if a == "confspec" else a
            b = target if b == "confspec" else b
            if a != b:
                graph[a].add(b)
    cycles = [c for c in _cycles(graph) if frozenset(c) not in ALLOWED_CYCLES]
    assert not cycles, cycles


def test_cycles_inside_a_package_are_the_named_ones() -> None:
    graph = {m: {t for t in ts if t != "confspec"} for m, ts in EDGES.items()
             if m != "confspec"}
    found = {frozenset(c) for c in _cycles(graph)}
    assert found <= set(ALLOWED_CYCLES), found - set(ALLOWED_CYCLES)
    assert set(ALLOWED_CYCLES) <= found, "an allowed cycle is gone: remove it from the list"


@pytest.mark.parametrize("module", sorted(MODULES))
def test_private_names_stay_in_their_package(module: str) -> None:
    crossing = [(t, name, line) for t, name, line in _imports(module)
                if name is not None and name.startswith("_") and not name.startswith("__")
                and _package(t if t in MODULES else t.rsplit(".", 1)[0]) != _package(module)]
    private_modules = [(t, line) for t, _, line in _imports(module) if t in MODULES
                       and t.rsplit(".", 1)[-1].startswith("_") and not t.endswith("__init__")]
    assert not crossing, f"{module} imports private names of other packages: {crossing}"
    assert not private_modules, private_modules


@pytest.mark.parametrize("module", sorted(MODULES))
def test_all_lists_are_true(module: str) -> None:
    tree = ast.parse(MODULES[module].read_text(encoding="utf-8"))
    defined: set[str] = set()
    listed: list[str] | None = None
    for node in ast.walk(tree):
        if isinstance(node, (ast.FunctionDef, ast.ClassDef, ast.AsyncFunctionDef)):
            defined.add(node.name)
        elif isinstance(node, ast.Assign | ast.AnnAssign):
            targets = node.targets if isinstance(node, ast.Assign) else [node.target]
            for target in targets:
                if isinstance(target, ast.Name):
                    defined.add(target.id)
                    if target.id == "__all__" and node.value is not None:
                        listed = list(ast.literal_eval(node.value))
        elif isinstance(node, ast.ImportFrom | ast.Import):
            defined.update((a.asname or a.name).split(".")[0] for a in node.names)
    assert listed is not None, f"{module} has no __all__"
    missing = [name for name in listed if name not in defined]
    assert not missing, f"{module}.__all__ names what it does not define: {missing}"
    assert len(set(listed)) == len(listed), f"{module}.__all__ repeats a name"
