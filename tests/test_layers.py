"""The pipeline's layers, read from the source itself (Python's ``ast``).

The contract that CI checks with import-linter (``lint-imports``, the
``[tool.importlinter]`` tables of pyproject.toml) is checked here a second
way, by walking every import statement of the package, those inside
functions included, so that a lazy import cannot hide a cycle:
- no module of ``parts/``, ``sky/``, ``projection/`` or ``geometry/``
  imports ``recipe/``, ``layout/`` or ``render/``;
- the graph of imports between kitgen's modules has no cycle (Tarjan's
  strongly connected components, Tarjan 1972, SIAM J. Comput. 1(2)).
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parent.parent / "kitgen"


def _module_name(path: Path) -> str:
    parts = path.relative_to(PACKAGE.parent).with_suffix("").parts
    return ".".join(parts[:-1] if parts[-1] == "__init__" else parts)


def _modules() -> dict[str, Path]:
    return {_module_name(p): p for p in PACKAGE.rglob("*.py")}


def _imports(name: str, path: Path, known) -> set[str]:
    """kitgen modules that ``name`` imports anywhere in its source."""
    is_package = path.name == "__init__.py"
    out = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            targets = [a.name for a in node.names]
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = name.split(".") if is_package else name.split(".")[:-1]
                base = base[: len(base) - (node.level - 1)]
                stem = ".".join(base + ([node.module] if node.module else []))
            else:
                stem = node.module or ""
            # ``from . import labels`` imports the submodule; a package's
            # own __init__ counts only where a name is no submodule of it.
            subs = [f"{stem}.{a.name}" for a in node.names]
            targets = [t for t in subs if t in known] or [stem]
        else:
            continue
        for target in targets:
            while target and target not in known:
                target = target.rpartition(".")[0]
            if target.startswith("kitgen") and target != name:
                out.add(target)
    return out


@pytest.fixture(scope="module")
def graph() -> dict[str, set[str]]:
    modules = _modules()
    return {name: _imports(name, path, modules) for name, path in modules.items()}


@pytest.mark.parametrize("low", ["kitgen.parts", "kitgen.sky", "kitgen.projection", "kitgen.geometry"])
def test_lower_layers_never_import_the_recipe_layout_or_renderers(graph, low):
    for name, targets in graph.items():
        if name == low or name.startswith(low + "."):
            bad = sorted(t for t in targets
                         if t.split(".")[1] in ("recipe", "layout", "render"))
            assert not bad, f"{name} imports {bad}"


def test_the_import_graph_has_no_cycle(graph):
    # The package's own __init__ modules are folded into the graph as
    # modules of their own; a module importing its package's __init__ is
    # an edge like any other.
    index, low, stack, on_stack, cycles = {}, {}, [], set(), []
    counter = [0]

    def visit(v):
        index[v] = low[v] = counter[0]
        counter[0] += 1
        stack.append(v)
        on_stack.add(v)
        for w in sorted(graph.get(v, ())):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on_stack:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            component = []
            while True:
                w = stack.pop()
                on_stack.discard(w)
                component.append(w)
                if w == v:
                    break
            if len(component) > 1:
                cycles.append(sorted(component))

    for v in sorted(graph):
        if v not in index:
            visit(v)
    assert not cycles, cycles


def test_the_walk_sees_imports_inside_functions(graph):
    # A check that the graph is not empty where it must not be: cli.py
    # imports the builder inside its command functions.
    assert "kitgen.kit" in graph["kitgen.cli"]
    assert "kitgen.plan.model" in graph["kitgen.parts.context"]
