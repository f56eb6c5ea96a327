"""The face × core chart of the sandwich pairs."""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np

from selector.inputs.spec import load_spec
from selector.outputs.charts.sandwich import pairs_chart
from selector.pipeline.selection import select

HATCH = Path(__file__).parents[2] / "examples" / "walkway-hatch.toml"


def test_cells_hold_the_objective_of_each_pair_and_the_best_is_marked():
    selection = select(load_spec(HATCH))
    fig = pairs_chart(selection)
    heat, marker = fig.data[0], fig.data[1]
    best = selection.sandwich.feasible.iloc[0]
    assert heat.y[0] == best["face_name"] and heat.x[0] == best["core_name"]
    assert math.isclose(10 ** heat.z[0][0], best["mass"], rel_tol=1e-9)
    assert (marker.x[0], marker.y[0]) == (best["core_name"], best["face_name"])
    infeasible = selection.sandwich.pairs[~selection.sandwich.pairs["feasible"]].iloc[0]
    i, j = list(heat.y).index(infeasible["face_name"]), list(heat.x).index(infeasible["core_name"])
    assert np.isnan(heat.z[i][j])
    assert "Preliminary selection only" in fig.layout.annotations[0].text


def test_rank_writes_the_pairs_chart_to_html(tmp_path):
    from click.testing import CliRunner

    from selector.cli import cli

    out = tmp_path / "pairs.html"
    result = CliRunner().invoke(cli, ["rank", str(HATCH), "-o", str(out)], catch_exceptions=False)
    assert result.exit_code == 0, result.output
    text = out.read_text(encoding="utf-8")
    assert "best pair" in text and "Preliminary selection only" in text
