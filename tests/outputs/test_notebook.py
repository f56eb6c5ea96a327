"""A Selection in Jupyter: its inline view, its chart, and the example notebook.

The example notebook is run without a Jupyter kernel: nbformat reads it, and each code
cell is compiled and executed in one shared namespace, the value of a cell's last
expression kept as IPython would display it (``_repr_html_`` called where it exists).
"""

from __future__ import annotations

import ast
import math
import subprocess
import sys
from pathlib import Path

import nbformat
import plotly.graph_objects as go
import pytest

from selector import load_spec, select, spec_from_dict
from selector.inputs.properties import PROPERTIES
from selector.inputs.spec import EXAMPLES
from selector.outputs.notebook import NOTEBOOK_ROWS
from selector.pipeline.selection import CAUTION

NOTEBOOK = Path(__file__).resolve().parents[2] / "examples" / "kayak-rack-arm.ipynb"


def run_cells(path: Path) -> tuple[list[object], dict[str, object]]:
    """Execute a notebook's code cells in order, kernel-free; return each cell's shown value."""
    notebook = nbformat.read(path, as_version=4)
    nbformat.validate(notebook)
    namespace: dict[str, object] = {"__name__": "__main__"}
    shown: list[object] = []
    for number, cell in enumerate(c for c in notebook.cells if c.cell_type == "code"):
        tree = ast.parse(cell.source, filename=f"{path.name} cell {number}")
        last = tree.body[-1] if tree.body and isinstance(tree.body[-1], ast.Expr) else None
        body = tree.body[:-1] if last is not None else tree.body
        exec(compile(ast.Module(body=body, type_ignores=[]), f"cell {number}", "exec"), namespace)
        if last is not None:
            shown.append(eval(compile(ast.Expression(last.value), f"cell {number}", "eval"), namespace))
        else:
            shown.append(None)
    return shown, namespace


@pytest.fixture(scope="module")
def notebook_run():
    return run_cells(NOTEBOOK)


def test_example_notebook_runs_and_shows_the_selection(notebook_run):
    shown, namespace = notebook_run
    selection = namespace["selection"]
    views = [v._repr_html_() for v in shown if hasattr(v, "_repr_html_") and not isinstance(v, go.Figure)]
    assert any(CAUTION in v for v in views), "the Selection's view carries the caution"
    figures = [v for v in shown if isinstance(v, go.Figure)]
    assert len(figures) == 2 and all(len(f.data) > 0 for f in figures)
    assert selection.tradeoff is not None and len(selection.tradeoff.front) >= 1


def test_example_notebook_states_the_caution_and_stores_no_outputs():
    notebook = nbformat.read(NOTEBOOK, as_version=4)
    markdown = " ".join(c.source for c in notebook.cells if c.cell_type == "markdown")
    assert "Preliminary selection only" in markdown and "licensed" in markdown
    assert "illustrative" in markdown.lower()
    assert all(not c.get("outputs") for c in notebook.cells if c.cell_type == "code")


def _typical(row, symbol: str) -> float:
    prop = PROPERTIES[symbol]
    return math.sqrt(row[prop.low] * row[prop.high]) * prop.si_factor


def test_notebook_leader_checks_by_hand(notebook_run):
    """The leading arm, re-checked with the textbook cantilever formulas."""
    selection = notebook_run[1]["selection"]
    best = selection.shortlist.iloc[0]
    d, t = best["dimensions"]["d"], best["dimensions"]["t"]
    inner = d - 2 * t
    second_moment = math.pi * (d**4 - inner**4) / 64  # thin tube I, common practice, no source
    force, length = 200.0, 0.45
    # Roark's Formulas for Stress and Strain, 8th ed., Table 8.1 case 1a (from memory):
    # tip deflection of an end-loaded cantilever F·L³/(3·E·I)
    deflection = force * length**3 / (3 * _typical(best, "E") * second_moment)
    # bending stress at the root M·c/I with M = F·L, c = d/2 (common practice, no source)
    stress = force * length * (d / 2) / second_moment
    strength_use = 2.0 * stress / _typical(best, "sigma_y")
    stiffness_use = deflection / 4e-3
    assert max(strength_use, stiffness_use) == pytest.approx(1.0, rel=1e-3)
    governing = "strength" if strength_use > stiffness_use else "stiffness"
    assert best["governing"] == governing
    assert best["utilisation"]["stiffness"] == pytest.approx(stiffness_use, rel=1e-3)
    assert d > 10 * 1e-3 and t >= 1e-3, "a tube a workshop can buy and weld"  # common practice, no source


def _boom():
    return select(load_spec(EXAMPLES / "camera-dolly-boom.toml"))


def test_repr_html_shows_top_rows_governing_and_caution():
    selection = _boom()
    text = selection._repr_html_()
    assert CAUTION in text
    assert text.count("<tr>") == 1 + min(NOTEBOOK_ROWS, len(selection.shortlist))
    leader = selection.table.set_index("id").loc[selection.shortlist["id"].iloc[0], "short_name"]
    assert f"<td>{leader}</td>" in text
    assert "governing constraint of the 10 shown: stiffness" in text


def test_repr_html_escapes_the_title_and_shows_an_unsized_ranking():
    spec = spec_from_dict(
        {
            "title": "<script>alert(1)</script> rod",
            "part": {"function": "tie"},
            "objective": {"minimize": "mass"},
            "constraint": [{"type": "stiffness"}],
        }
    )
    text = select(spec)._repr_html_()
    assert "<script>alert" not in text and "&lt;script&gt;" in text
    assert "ranked by merit index" in text and "governing" not in text
    assert CAUTION in text


def test_chart_returns_a_figure_of_the_asked_axes():
    fig = _boom().chart(x="rho", y="E")
    assert isinstance(fig, go.Figure)
    assert "Density" in fig.layout.xaxis.title.text and "Young" in fig.layout.yaxis.title.text


def test_sandwich_view_and_chart_show_the_pairs():
    selection = select(load_spec(EXAMPLES / "walkway-hatch.toml"))
    text = selection._repr_html_()
    assert "face × core pairs ranked by mass" in text and "solid parts for the same spec" in text
    assert CAUTION in text
    fig = selection.chart()
    assert isinstance(fig.data[0], go.Heatmap)


def test_importing_the_pipeline_loads_no_output():
    code = (
        "import sys, selector.pipeline.selection; "
        "print(sorted(m for m in sys.modules if m.startswith('selector.outputs')))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]"
