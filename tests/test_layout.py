"""The package's import graph: no cycles, and imports point down the pipeline.

Read from the source with ``ast`` so imports inside functions count too; imports
under ``if TYPE_CHECKING:`` are for type checkers only and are left out.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parents[1] / "selector"

# Each layer may import only the layers listed for it (and itself).
ALLOWED = {
    "base": {"base"},
    "inputs": {"base", "inputs", "mechanics"},
    "mechanics": {"base", "inputs", "mechanics"},
    "pipeline": {"base", "inputs", "mechanics", "pipeline"},
    "outputs": {"base", "inputs", "mechanics", "pipeline", "outputs"},
    "entry": {"base", "inputs", "mechanics", "pipeline", "outputs", "entry"},
}


def module_name(path: Path) -> str:
    parts = list(path.relative_to(PACKAGE.parent).with_suffix("").parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def layer(module: str) -> str:
    parts = module.split(".")
    if len(parts) > 1 and parts[1] in ("inputs", "mechanics", "pipeline", "outputs"):
        return parts[1]
    if module in ("selector.cli", "selector.api", "selector.__main__"):
        return "entry"
    return "base"


def _is_type_checking(node: ast.If) -> bool:
    test = node.test
    return (isinstance(test, ast.Name) and test.id == "TYPE_CHECKING") or (
        isinstance(test, ast.Attribute) and test.attr == "TYPE_CHECKING"
    )


def _ours(module: str) -> bool:
    return module.split(".")[0] == "selector"


def imports_of(path: Path, modules: set[str]) -> set[str]:
    """Every selector module that ``path`` imports, at any depth in the file."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    found: set[str] = set()

    def visit(node: ast.AST) -> None:
        if isinstance(node, ast.If) and _is_type_checking(node):
            for child in node.orelse:
                visit(child)
            return
        if isinstance(node, ast.Import):
            found.update(a.name for a in node.names if _ours(a.name))
        elif (
            isinstance(node, ast.ImportFrom)
            and node.level == 0
            and (node.module or "").startswith("selector")
        ):
            for alias in node.names:
                sub = f"{node.module}.{alias.name}"
                found.add(sub if sub in modules else str(node.module))
        for child in ast.iter_child_nodes(node):
            visit(child)

    visit(tree)
    return found


def import_graph() -> dict[str, set[str]]:
    paths = {module_name(p): p for p in PACKAGE.rglob("*.py")}
    modules = set(paths)
    return {name: imports_of(path, modules) & modules for name, path in paths.items()}


def test_graph_sees_imports_inside_functions():
    graph = import_graph()
    # common practice, no source: the CLI imports the pipeline lazily, inside its commands
    assert "selector.api" in graph["selector.cli"]
    assert "selector.pipeline.selection" in graph["selector.api"]


def test_no_import_cycles():
    graph = import_graph()
    state: dict[str, int] = {}
    stack: list[str] = []

    def walk(node: str) -> None:
        state[node] = 1
        stack.append(node)
        for nxt in sorted(graph[node] - {node}):
            if state.get(nxt) == 1:
                cycle = [*stack[stack.index(nxt) :], nxt]
                pytest.fail("import cycle: " + " -> ".join(cycle))
            if nxt not in state:
                walk(nxt)
        stack.pop()
        state[node] = 2

    for name in sorted(graph):
        if name not in state:
            walk(name)


def test_imports_point_down_the_pipeline():
    bad = [
        f"{src} ({layer(src)}) imports {dst} ({layer(dst)})"
        for src, targets in import_graph().items()
        for dst in sorted(targets)
        if layer(dst) not in ALLOWED[layer(src)]
    ]
    assert not bad, "\n".join(bad)


def test_nothing_imports_the_cli():
    users = [src for src, targets in import_graph().items() if "selector.cli" in targets]
    assert users == ["selector.__main__"]
