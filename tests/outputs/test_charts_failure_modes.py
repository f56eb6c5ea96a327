"""The chart of a Selection draws the index line of fracture, fatigue and frequency constraints."""

from __future__ import annotations

import math
import tomllib

import pytest
from click.testing import CliRunner

from selector.cli import cli
from selector.errors import InputError
from selector.inputs.materials import load_materials
from selector.inputs.spec import spec_from_dict
from selector.outputs.charts import chart_for_selection, property_chart
from selector.pipeline.selection import select

BEAM = """
title = "Chart of a failure-mode index"
[part]
function = "beam"
support = "cantilever"
load = "end"
length = "0.5 m"
force = "300 N"
[section]
shape = "rectangle"
free = "scale"
b = "10 mm"
h = "30 mm"
[objective]
minimize = "mass"
"""

CONSTRAINTS = {
    "fracture": 'type = "fracture"\ncrack_length = "1 mm"\nsafety_factor = 2',
    "fatigue R=-1": 'type = "fatigue"\nload_ratio = -1\nsafety_factor = 2',
    "fatigue R=0": 'type = "fatigue"\nload_ratio = 0\nsafety_factor = 2',
    "frequency": 'type = "frequency"\nmin_frequency = "200 Hz"',  # governs every part (40 Hz: strength)
}

# Beam of given span, mass objective, scale free (Ashby, Materials Selection in Mechanical
# Design, index table — from memory): a strength-like limit gives X^(2/3)/rho, so on log axes
# of rho and X a line of constant index has slope 3/2; the natural frequency gives E^(1/2)/rho,
# slope 2.
EXPECTED = {
    "fracture": ("K_IC", 1.5),
    "fatigue R=-1": ("sigma_e", 1.5),
    "fatigue R=0": ("sigma_R", 1.5),
    "frequency": ("E", 2.0),
}


def selection_led_by(kind: str):
    text = BEAM + "[[constraint]]\n" + CONSTRAINTS[kind] + '\n[[constraint]]\ntype = "strength"\n'
    return select(spec_from_dict(tomllib.loads(text)), load_materials())


def lines(fig):
    return [t for t in fig.data if t.meta and t.meta.get("role") == "index-line"]


@pytest.mark.parametrize("kind", list(CONSTRAINTS))
def test_the_chart_draws_the_index_line_of_the_governing_constraint(kind):
    selection = selection_led_by(kind)
    assert selection.derivations[0].constraint == kind.split()[0]  # it governs most parts
    prop, slope = EXPECTED[kind]
    fig = chart_for_selection(selection)
    assert fig.layout.meta["x"] == "rho" and fig.layout.meta["y"] == prop
    drawn = lines(fig)
    assert drawn, f"no index line for a {kind} constraint"
    for trace in drawn:
        (x0, x1), (y0, y1) = trace.x, trace.y
        assert (math.log10(y1) - math.log10(y0)) / (math.log10(x1) - math.log10(x0)) == pytest.approx(slope)
    # the main line passes through the best-ranked class at its geometric-mean marker; its
    # value reads with density in Mg/m³ (1 Mg/m³ = 1000 kg/m³, SI Brochure, 9th ed., prefixes)
    main = next(t for t in drawn if t.meta["main"])
    best = selection.shortlist.iloc[0]
    x = math.sqrt(best["rho_low"] * best["rho_high"]) / 1000
    y = math.sqrt(best[f"{prop}_low"] * best[f"{prop}_high"])
    power = 2 / 3 if slope == 1.5 else 1 / 2
    assert main.meta["value"] == pytest.approx(y**power / x)


def test_the_goodman_axis_reads_the_strength_the_pipeline_added():
    selection = selection_led_by("fatigue R=0")
    table = selection.table
    fig = chart_for_selection(selection)
    # Goodman at R = 0 (sigma_a = sigma_m = sigma_max / 2): sigma_R = 2·σe·σts/(σe + σts),
    # worked by hand; compare the pipeline's column for one class with data.
    row = table.dropna(subset=["sigma_e_low", "sigma_ts_low"]).iloc[0]
    e, ts = row["sigma_e_low"], row["sigma_ts_low"]
    assert row["sigma_R_low"] == pytest.approx(2 * e * ts / (e + ts))
    assert "Goodman" in fig.layout.yaxis.title.text


def test_a_goodman_axis_without_a_spec_is_a_clear_error():
    with pytest.raises(InputError, match=r"sigma_R .* computed for one requirement"):
        property_chart(load_materials(), "rho", "sigma_R")


def test_cli_chart_of_a_lever_whose_first_constraint_is_fatigue_at_r_zero(tmp_path):
    spec = tmp_path / "lever.toml"
    spec.write_text(BEAM + "[[constraint]]\n" + CONSTRAINTS["fatigue R=0"] + "\n", encoding="utf-8")
    out = tmp_path / "chart.html"
    result = CliRunner().invoke(cli, ["chart", "--spec", str(spec), "-o", str(out)], catch_exceptions=False)
    assert result.exit_code == 0, result.output
    html = out.read_text(encoding="utf-8")
    assert '"role":"index-line"' in html.replace(" ", "")
