"""The import map of sizer/ (docs/design.md, "Layers"): only the edge (render/, the cli* modules and
commands) imports render; the packages and top-level modules import one another without cycles; no
module is over MAX_LINES lines. Walks the source with ast, so lazy imports inside functions count."""

from __future__ import annotations

import ast
from pathlib import Path

SIZER = Path(__file__).resolve().parent.parent / "sizer"
MAX_LINES = 500  # lines of one module, at most (common practice: a module one reader can hold)


def module_name(path: Path) -> str:
    """sizer.checks.local for sizer/checks/local.py; sizer.render for sizer/render/__init__.py."""
    parts = path.relative_to(SIZER.parent).with_suffix("").parts
    return ".".join(parts[:-1] if parts[-1] == "__init__" else parts)


def modules() -> dict[str, Path]:
    return {module_name(path): path for path in sorted(SIZER.rglob("*.py"))}


def imported(path: Path, known: set[str]) -> set[str]:
    """The sizer modules `path` imports anywhere in it (`from sizer import api` names sizer.api)."""
    found: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            found |= {alias.name for alias in node.names if alias.name.startswith("sizer")}
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0 and node.module.startswith("sizer"):
            found.add(node.module)
            found |= {f"{node.module}.{alias.name}" for alias in node.names if f"{node.module}.{alias.name}" in known}
    return found


def node_of(module: str) -> str:
    """The layer a module belongs to: its subpackage (sizer.checks), or itself for a top-level module."""
    parts = module.split(".")
    return ".".join(parts[:2])


def import_graph() -> dict[str, set[str]]:
    """Layer -> the layers it imports (the package's own __init__, sizer, left out: it only re-exports)."""
    found = modules()
    graph: dict[str, set[str]] = {}
    for name, path in found.items():
        if name == "sizer":
            continue
        targets = {node_of(target) for target in imported(path, set(found)) if target != "sizer"}
        graph.setdefault(node_of(name), set()).update(targets - {node_of(name)})
    return graph


def cycles(graph: dict[str, set[str]]) -> list[list[str]]:
    """The strongly connected components of more than one layer (Tarjan's algorithm)."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    found: list[list[str]] = []

    def visit(node: str) -> None:
        index[node] = low[node] = len(index)
        stack.append(node)
        for target in sorted(graph.get(node, ())):
            if target not in index:
                visit(target)
                low[node] = min(low[node], low[target])
            elif target in stack:
                low[node] = min(low[node], index[target])
        if low[node] == index[node]:
            component = []
            while True:
                member = stack.pop()
                component.append(member)
                if member == node:
                    break
            if len(component) > 1:
                found.append(sorted(component))

    for node in sorted(graph):
        if node not in index:
            visit(node)
    return found


def is_edge(module: str) -> bool:
    """render/, the cli* modules and commands: the modules that may show things."""
    return module.startswith("sizer.render") or module.startswith("sizer.cli") or module == "sizer.commands"


def test_only_the_edge_imports_render() -> None:
    found = modules()
    offenders = sorted(name for name, path in found.items()
                       if not is_edge(name) and any(target.startswith("sizer.render") for target in imported(path, set(found))))
    assert offenders == []


def test_no_import_cycles_between_layers() -> None:
    assert cycles(import_graph()) == []


def test_the_cycle_finder_finds_a_cycle() -> None:
    assert cycles({"a": {"b"}, "b": {"c"}, "c": {"a"}, "d": {"a"}}) == [["a", "b", "c"]]
    assert cycles({"a": {"b"}, "b": set()}) == []


def test_no_module_is_over_the_line_limit() -> None:
    long = {name: count for name, path in modules().items() if (count := len(path.read_text(encoding="utf-8").splitlines())) > MAX_LINES}
    assert long == {}
