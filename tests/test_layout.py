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
    if module in ("selector.cli", "selector.api", "selector.interactive", "selector.__main__"):
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
    """Every module's imports of the package's modules."""
    paths = {module_name(p): p for p in PACKAGE.rglob("*.py")}
    modules = set(paths)
    graph = {name: imports_of(path, modules) & modules for name, path in paths.items()}
    return graph


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


# Pipeline modules that hold names only (no step): outputs may import anything from them.
NAME_MODULES = ("selector.pipeline", "selector.pipeline.columns")
# The steps whose functions compute engineering (every other pipeline module, so a new step is
# covered the day it is added); outputs read their results instead.
COMPUTING_MODULES = tuple(
    sorted(m for m in (module_name(p) for p in (PACKAGE / "pipeline").rglob("*.py")) if m not in NAME_MODULES)
)
# Functions of those modules an output may still call, and why.
ALLOWED_CALLS = {
    # the explorer reruns the whole pipeline for a changed spec, exactly as `selector rank` does
    ("selector.pipeline.selection", "select"),
    # reading a screen the user typed (text to a Limit in stored units), to move its slider
    ("selector.pipeline.screen", "parse_limit"),
}


def output_imports_of_computing_names() -> list[tuple[str, str, str]]:
    """(output module, computing module, name) for every such import in selector/outputs."""
    found = []
    for path in sorted((PACKAGE / "outputs").rglob("*.py")):
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(node, ast.Import):
                found += [(module_name(path), a.name, "*") for a in node.names if a.name in COMPUTING_MODULES]
            elif isinstance(node, ast.ImportFrom) and node.level == 0:
                for alias in node.names:
                    if node.module in COMPUTING_MODULES:
                        found.append((module_name(path), node.module, alias.name))
                    elif f"{node.module}.{alias.name}" in COMPUTING_MODULES:
                        found.append((module_name(path), f"{node.module}.{alias.name}", "*"))
    return found


def test_outputs_import_no_computing_function():
    """No module under selector/outputs imports a function of a computing step.

    The rule: for every import in selector/outputs (at any depth, TYPE_CHECKING blocks
    included) of a name from a pipeline step (every module of selector/pipeline but the
    column names), the imported object must be a class (a dataclass result type such
    as RobustResult or Limit) or a value that is not callable (a constant such as REJECTED
    or EXCHANGE_LABELS); importing one of those modules whole is not allowed. The only
    functions allowed are those in ALLOWED_CALLS, each with its reason.
    """
    import importlib
    import inspect

    found = output_imports_of_computing_names()
    assert any(name == "RobustResult" for _, _, name in found), "the scan sees the studies' imports"
    for step in ("screen", "derive", "sizing", "rank", "tradeoff", "robust", "sandwich", "selection"):
        assert f"selector.pipeline.{step}" in COMPUTING_MODULES, step
    bad = []
    for src, module, name in found:
        if name == "*":
            bad.append(f"{src} imports the module {module}")
            continue
        value = getattr(importlib.import_module(module), name)
        if callable(value) and not inspect.isclass(value) and (module, name) not in ALLOWED_CALLS:
            bad.append(f"{src} imports the function {module}.{name}")
    assert not bad, "\n".join(bad)
