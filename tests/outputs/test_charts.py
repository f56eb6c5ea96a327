"""Property charts: figure structure, index lines, pass regions, colours, escaping, output."""

from __future__ import annotations

import itertools
import math
import re
import statistics
import sys
import tomllib
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from click.testing import CliRunner

from selector.errors import ExpressionError, InputError, OutputError
from selector.inputs.spec import spec_from_dict
from selector.outputs.charts import (
    FAMILY_COLOURS,
    REJECTED_GREY,
    axis_spec,
    chart_for_selection,
    default_axes,
    index_line,
    place_labels,
    property_chart,
    tradeoff_chart,
    write_chart,
)
from selector.pipeline.screen import apply_screens, parse_screens
from selector.pipeline.selection import select
from tests.conftest import make_table

# Conversion factors, NIST Special Publication 811 (2008), Appendix B.8:
LB_PER_IN3 = 2.767_990e4  # kg/m³ per lb/in³
PSI = 6.894_757e3  # Pa per psi


def classes() -> pd.DataFrame:
    """Six invented classes (demo data, not real materials), spread apart on E–ρ."""
    return make_table(
        [
            {
                "id": "alu",
                "name": "Light alloy",
                "family": "metal",
                "E": (68, 72),
                "rho": (2600, 2800),
                "sigma_y": (100, 300),
                "T_max": (120, 200),
                "price": (2, 3),
            },
            {
                "id": "steel",
                "name": "Heavy alloy",
                "family": "metal",
                "E": (200, 210),
                "rho": (7800, 7900),
                "sigma_y": (250, 900),
                "T_max": (350, 400),
                "price": (0.6, 1),
            },
            {
                "id": "wood",
                "name": "Grain wood",
                "family": "natural",
                "E": (8, 12),
                "rho": (400, 600),
                "sigma_y": (30, 60),
                "T_max": (100, 120),
                "price": (1, 2),
            },
            {
                "id": "pp",
                "name": "Soft plastic",
                "family": "polymer",
                "E": (1, 1.6),
                "rho": (890, 910),
                "sigma_y": (20, 35),
                "T_max": (80, 100),
                "price": (1.5, 2),
            },
            {
                "id": "foam",
                "name": "Cell foam",
                "family": "foam",
                "E": (0.001, 0.01),
                "rho": (30, 100),
                "sigma_y": (0.1, 1),
                "T_max": (70, 90),
                "price": (3, 6),
            },
            {
                "id": "cfrp",
                "name": "Fibre laminate",
                "family": "composite",
                "E": (70, 150),
                "rho": (1500, 1600),
                "sigma_y": (500, 1000),
                "T_max": (120, 180),
                "price": (30, 60),
            },
        ]
    )


def role(fig, name: str) -> list:
    return [t for t in fig.data if t.meta and t.meta.get("role") == name]


def segments(xs, ys) -> list[list[tuple[float, float]]]:
    """Split None-separated path data into its closed segments."""
    out, current = [], []
    for a, b in zip(xs, ys, strict=True):
        if a is None:
            out.append(current)
            current = []
        else:
            current.append((a, b))
    return [*out, current] if current else out


def log_slope(trace) -> float:
    (x0, x1), (y0, y1) = trace.x, trace.y
    return (math.log10(y1) - math.log10(y0)) / (math.log10(x1) - math.log10(x0))


# ----------------------------------------------------------------------------- axes and boxes


def test_log_log_by_default_and_linear_for_temperature():
    fig = property_chart(classes(), "rho", "E")
    assert fig.layout.xaxis.type == "log" and fig.layout.yaxis.type == "log"
    fig = property_chart(classes(), "T_max", "sigma_y")
    assert fig.layout.xaxis.type == "linear" and fig.layout.yaxis.type == "log"
    fig = property_chart(classes(), "price*rho", "sigma_y")
    assert fig.layout.xaxis.type == "log"


def test_axis_titles_carry_units_si_and_us():
    si = property_chart(classes(), "rho", "E")
    assert "kg/m³" in si.layout.xaxis.title.text and "GPa" in si.layout.yaxis.title.text
    us = property_chart(classes(), "rho", "E", units="us")
    assert "lb/in³" in us.layout.xaxis.title.text and "Msi" in us.layout.yaxis.title.text
    # an expression axis reads in the unit of the same index in the shortlist: density in Mg/m³
    expr = property_chart(classes(), "price*rho", "sigma_y")
    assert "(USD/kg)·(Mg/m³)" in expr.layout.xaxis.title.text


def test_exactly_one_box_per_class_spanning_its_ranges():
    table = classes()
    fig = property_chart(table, "rho", "E")
    boxes = {}
    for trace in role(fig, "boxes"):
        segs = segments(trace.x, trace.y)
        assert len(segs) == trace.meta["count"] == len(trace.meta["ids"])
        boxes.update(zip(trace.meta["ids"], segs, strict=True))
    assert sorted(boxes) == sorted(table["id"])
    for _, row in table.iterrows():
        seg = boxes[row["id"]]
        assert seg[0] == seg[-1]  # closed
        xs, ys = [p[0] for p in seg], [p[1] for p in seg]
        assert (min(xs), max(xs)) == (row["rho_low"], row["rho_high"])
        assert (min(ys), max(ys)) == (row["E_low"], row["E_high"])


def test_markers_sit_at_the_geometric_mean():
    table = classes().set_index("id")
    fig = property_chart(classes(), "rho", "E")
    for trace in role(fig, "markers"):
        for cid, x, y in zip(trace.meta["ids"], trace.x, trace.y, strict=True):
            row = table.loc[cid]
            # reference: Python's statistics.geometric_mean
            assert x == pytest.approx(statistics.geometric_mean([row["rho_low"], row["rho_high"]]))
            assert y == pytest.approx(statistics.geometric_mean([row["E_low"], row["E_high"]]))


def test_us_units_convert_the_drawn_values():
    fig = property_chart(classes(), "rho", "E", units="us")
    box = next(t for t in role(fig, "boxes") if "alu" in t.meta["ids"])
    seg = segments(box.x, box.y)[box.meta["ids"].index("alu")]
    xs, ys = [p[0] for p in seg], [p[1] for p in seg]
    assert min(xs) == pytest.approx(2600 / LB_PER_IN3, rel=1e-6)
    assert max(ys) == pytest.approx(72e9 / (PSI * 1e6), rel=1e-6)


def test_expression_axis_spans_the_interval_of_the_expression():
    fig = property_chart(classes(), "price*rho", "sigma_y")
    box = next(t for t in role(fig, "boxes") if "alu" in t.meta["ids"])
    seg = segments(box.x, box.y)[box.meta["ids"].index("alu")]
    xs = [p[0] for p in seg]
    # interval of a product, by hand, with density in Mg/m³ (1 Mg/m³ = 1000 kg/m³, SI prefixes)
    assert (min(xs), max(xs)) == pytest.approx((2 * 2.6, 3 * 2.8))


def test_classes_without_data_are_left_out_and_named():
    table = classes()
    table.loc[table["id"] == "foam", ["K_IC_low", "K_IC_high"]] = np.nan
    fig = property_chart(table, "rho", "K_IC")
    drawn = sum(t.meta["count"] for t in role(fig, "boxes"))
    assert drawn == len(table) - 1
    assert fig.layout.meta["skipped"] == ["foam"]
    assert any("foam" in (a.text or "") for a in fig.layout.annotations)


# ----------------------------------------------------------------------------- colours


# The Okabe–Ito palette (Okabe & Ito 2008, "Color Universal Design"; hex values as tabulated
# by Wong, Nature Methods 8, 441 (2011), from memory), assigned to the families in the
# project's order (CONVENTIONS: metal, polymer, composite, ceramic, glass, foam, natural,
# elastomer, mineral); the ninth family reuses the first colour with its own marker.
PUBLISHED_COLOURS = {
    "metal": "#E69F00",  # orange
    "polymer": "#56B4E9",  # sky blue
    "composite": "#009E73",  # bluish green
    "ceramic": "#F0E442",  # yellow
    "glass": "#0072B2",  # blue
    "foam": "#D55E00",  # vermillion
    "natural": "#CC79A7",  # reddish purple
    "elastomer": "#000000",  # black
    "mineral": "#E69F00",
}


def test_each_family_is_drawn_in_its_okabe_ito_colour():
    one_per_family = make_table(
        [
            {
                "id": f"c{i}",
                "name": f"Class {i}",
                "family": family,
                "E": (1 + i, 2 + i),
                "rho": (100 * (i + 1),) * 2,
            }
            for i, family in enumerate(PUBLISHED_COLOURS)
        ]
    )
    fig = property_chart(one_per_family, "rho", "E")
    drawn = {}
    for trace in role(fig, "markers"):
        colours = set(trace.marker.color) if not isinstance(trace.marker.color, str) else {trace.marker.color}
        assert len(colours) == 1
        drawn[trace.meta["family"]] = (colours.pop(), trace.marker.symbol)
    assert {f: colour for f, (colour, _) in drawn.items()} == PUBLISHED_COLOURS
    assert drawn["mineral"][1] != drawn["metal"][1]  # same colour, told apart by the marker
    for trace in role(fig, "boxes"):
        hex_colour = PUBLISHED_COLOURS[trace.meta["family"]]
        r, g, b = (int(hex_colour[i : i + 2], 16) for i in (1, 3, 5))
        assert trace.fillcolor.startswith(f"rgba({r}, {g}, {b}")
    assert REJECTED_GREY not in set(PUBLISHED_COLOURS.values())


def test_markers_coloured_by_family_and_rejected_in_grey():
    screens = parse_screens({"E": ">= 5 GPa"})
    fig = property_chart(apply_screens(classes(), screens), "rho", "E", screens=screens)
    seen = {}
    for trace in role(fig, "markers"):
        family = trace.meta["family"]
        for cid, colour, faded in zip(
            trace.meta["ids"], trace.marker.color, trace.meta["rejected"], strict=True
        ):
            seen[cid] = colour
            assert colour == (REJECTED_GREY if faded else FAMILY_COLOURS[family])
    assert seen["foam"] == seen["pp"] == REJECTED_GREY  # E below 5 GPa
    assert seen["alu"] == "#E69F00" and seen["wood"] == FAMILY_COLOURS["natural"]
    for trace in role(fig, "boxes"):
        r, g, b = (int(FAMILY_COLOURS[trace.meta["family"]][i : i + 2], 16) for i in (1, 3, 5))
        grey = "rgba(153, 153, 153"
        assert trace.fillcolor.startswith(grey if trace.meta["rejected"] else f"rgba({r}, {g}, {b}")


def test_each_family_is_one_legend_group():
    fig = property_chart(classes(), "rho", "E")
    markers = role(fig, "markers")
    assert len(markers) == len(set(classes()["family"]))
    for trace in role(fig, "boxes"):
        assert trace.showlegend is False
        assert trace.legendgroup in {m.legendgroup for m in markers}


# ----------------------------------------------------------------------------- index lines


@pytest.mark.parametrize(
    ("index", "x", "y", "slope"),
    [
        # Guide lines of a log E–log ρ chart: E/ρ slope 1, E^1/2/ρ slope 2, E^1/3/ρ slope 3
        # (Ashby, Materials Selection in Mechanical Design, 4th ed., ch. 4, from memory).
        ("E/rho", "rho", "E", 1.0),
        ("E^0.5/rho", "rho", "E", 2.0),
        ("E^(1/3)/rho", "rho", "E", 3.0),
        # strength guide lines σ_y^(2/3)/ρ slope 3/2 (same source)
        ("sigma_y^(2/3)/rho", "rho", "sigma_y", 1.5),
        # common practice, no source: on cost-per-volume axes the same algebra holds
        ("sigma_y/(price*rho)", "price*rho", "sigma_y", 1.0),
        ("E^0.5/(price*rho)", "price*rho", "E", 2.0),
        # the same index with the axes swapped: slope −a/b with a and b exchanged
        ("E^0.5/rho", "E", "rho", 0.5),
    ],
)
def test_index_line_slope_in_log_space_equals_the_exponent_ratio(index, x, y, slope):
    fig = property_chart(classes(), x, y, index=index, through="alu")
    lines = role(fig, "index-line")
    assert lines
    for trace in lines:
        assert log_slope(trace) == pytest.approx(slope, rel=1e-9)


def test_derivation_exponents_give_the_same_line():
    by_text = property_chart(classes(), "rho", "E", index="E^0.5/rho", through="alu")
    by_map = property_chart(classes(), "rho", "E", index={"E": 0.5, "rho": -1.0}, through="alu")
    a, b = role(by_text, "index-line"), role(by_map, "index-line")
    assert [t.x for t in a] == [t.x for t in b] and [t.y for t in a] == [t.y for t in b]


def test_index_line_passes_through_the_chosen_class():
    table = classes().set_index("id")
    fig = property_chart(classes(), "rho", "E", index="E^0.5/rho", through="wood")
    main = next(t for t in role(fig, "index-line") if t.meta["main"])
    gx = math.sqrt(table.loc["wood", "rho_low"] * table.loc["wood", "rho_high"])
    gy = math.sqrt(table.loc["wood", "E_low"] * table.loc["wood", "E_high"])
    x0, y0 = main.x[0], main.y[0]
    assert (math.log10(gy) - math.log10(y0)) / (math.log10(gx) - math.log10(x0)) == pytest.approx(2.0)
    assert main.meta["value"] == pytest.approx(math.sqrt(gy) / (gx / 1000))  # ρ in Mg/m³


def test_index_lines_at_a_value_step_by_ten_and_are_labelled():
    # at= is in the index's unit, GPa^(1/2)/(Mg/m³): 3 there is 0.003 GPa^(1/2)·m³/kg
    fig = property_chart(classes(), "rho", "E", index="E^0.5/rho", at=3)
    lines = role(fig, "index-line")
    values = sorted(t.meta["value"] for t in lines)
    assert 3 in [pytest.approx(v) for v in values]
    ratios = [b / a for a, b in itertools.pairwise(values)]
    assert ratios == [pytest.approx(10.0)] * len(ratios)
    for trace in lines:  # every point of a line has the line's index value (ρ drawn in kg/m³)
        for xv, yv in zip(trace.x, trace.y, strict=True):
            assert 1000 * math.sqrt(yv) / xv == pytest.approx(trace.meta["value"])
    labels = [a.text for a in fig.layout.annotations if (a.name or "").startswith("index-label")]
    assert len(labels) == len(lines)
    assert any("= 3," in t or t.endswith("= 3") for t in labels)


def test_the_higher_index_side_is_shaded():
    fig = property_chart(classes(), "rho", "E", index="E^0.5/rho", at=3)  # 0.003 with ρ in kg/m³
    (side,) = role(fig, "index-side")
    points = [(x, y) for x, y in zip(side.x, side.y, strict=True)]
    cx = 10 ** np.mean([math.log10(p[0]) for p in points[:-1]])
    cy = 10 ** np.mean([math.log10(p[1]) for p in points[:-1]])
    assert math.sqrt(cy) / cx > 0.003
    assert all(math.sqrt(y) / x >= 0.003 * (1 - 1e-9) for x, y in points)


def test_index_on_other_properties_is_a_clear_error():
    with pytest.raises(InputError, match=r"needs E, which is on neither axis"):
        property_chart(classes(), "rho", "sigma_y", index="E^0.5/rho")
    with pytest.raises(InputError, match="not a power of"):
        property_chart(classes(), "price*rho", "sigma_y", index="sigma_y/rho")
    with pytest.raises(InputError, match="not a product of powers"):
        property_chart(classes(), "rho", "E", index="E + rho")
    with pytest.raises(InputError, match="linear scale"):
        property_chart(classes(), "T_max", "E", index="E/T_max")
    with pytest.raises(InputError, match="did you mean 'alu'"):
        property_chart(classes(), "rho", "E", index="E/rho", through="alu2")
    with pytest.raises(InputError, match="both"):
        property_chart(classes(), "rho", "E", index="E/rho", through="alu", at=1.0)
    with pytest.raises(InputError, match="without an index"):
        property_chart(classes(), "rho", "E", through="alu")


def test_index_line_algebra_for_expression_axes():
    x, y = axis_spec("price*rho"), axis_spec("E")
    line = index_line("E^(1/3)/(price*rho)", x, y)
    assert (line.alpha, line.beta) == pytest.approx((-1.0, 1 / 3))
    assert line.slope == pytest.approx(3.0)


def test_bad_axes_and_units_are_clear_errors():
    with pytest.raises(ExpressionError, match="unknown property 'Ee'"):
        property_chart(classes(), "rho", "Ee")
    with pytest.raises(InputError, match="unknown unit system"):
        property_chart(classes(), "rho", "E", units="metric")


# ----------------------------------------------------------------------------- screens


@pytest.mark.parametrize(
    ("units", "x_bound", "y_bound"),
    [
        ("si", 150.0, 100.0),
        # °F = °C·9/5 + 32 and 1 ksi = 6.894757 MPa (NIST SP 811, Appendix B.8 and B.9)
        ("us", 150 * 9 / 5 + 32, 100e6 / (PSI * 1e3)),
    ],
)
def test_pass_region_bounds_equal_the_screens(units, x_bound, y_bound):
    screens = parse_screens({"T_max": ">= 150 degC", "sigma_y": ">= 100 MPa", "price": "<= 30 USD/kg"})
    fig = property_chart(apply_screens(classes(), screens), "T_max", "sigma_y", screens=screens, units=units)
    (region,) = role(fig, "pass-region")
    assert min(region.x) == pytest.approx(x_bound)
    assert min(region.y) == pytest.approx(y_bound)
    bounds = {(t.meta["axis"], t.meta["op"]): t for t in role(fig, "screen-bound")}
    assert set(bounds) == {("x", ">="), ("y", ">=")}  # the price screen is on neither axis
    assert bounds["x", ">="].x == pytest.approx((x_bound, x_bound))
    assert bounds["y", ">="].y == pytest.approx((y_bound, y_bound))
    # rejected: every class whose whole T_max range is below 150 °C; alu (120–200 °C) and
    # cfrp (120–180 °C) pass partly and keep their colours
    status = {
        cid: f for t in role(fig, "markers") for cid, f in zip(t.meta["ids"], t.meta["rejected"], strict=True)
    }
    assert status == {"alu": False, "steel": False, "wood": True, "pp": True, "foam": True, "cfrp": False}


def test_upper_and_lower_screens_bound_the_region_on_both_sides():
    screens = parse_screens({"rho": "<= 3000 kg/m^3", "E": ">= 5 GPa"})
    fig = property_chart(classes(), "rho", "E", screens=screens)
    (region,) = role(fig, "pass-region")
    assert max(region.x) == pytest.approx(3000.0)
    assert min(region.y) == pytest.approx(5.0)
    assert region.meta["x"] == [None, 3000.0] and region.meta["y"] == [5.0, None]


def test_shortlist_is_ringed_and_named_in_order():
    fig = property_chart(classes(), "rho", "E", highlight=["cfrp", "alu", "nope"])
    (ring,) = role(fig, "shortlist")
    assert ring.meta["ids"] == ["cfrp", "alu"]
    names = [a.text for a in fig.layout.annotations if (a.name or "").startswith("shortlist")]
    assert names == ["<b>1</b> Fibre laminate", "<b>2</b> Light alloy"]


def test_labels_do_not_overlap_each_other():
    anchors = [(0.5, 0.5), (0.51, 0.5), (0.5, 0.52), (0.52, 0.52)]
    centres = place_labels(anchors, [20] * 4, np.array(anchors))
    w, h = (7.0 * 20 + 14.0) / 900.0, 22.0 / 600.0
    for i, a in enumerate(centres):
        for b in centres[i + 1 :]:
            assert abs(a[0] - b[0]) >= w or abs(a[1] - b[1]) >= h


# ----------------------------------------------------------------------------- escaping


def test_user_text_is_escaped_in_hover_labels_and_title():
    evil = "<img src=x onerror=alert(1)>"
    table = make_table(
        [
            {"id": "x1", "name": evil, "family": "metal"},
            {"id": "x2", "name": "Tom & Jerry", "family": "foam", "E": (2, 3), "rho": (50, 60)},
        ]
    )
    fig = property_chart(table, "rho", "E", highlight=["x1"], title="<b>mine</b> & co")
    hover = [h for t in role(fig, "markers") for h in t.text]
    assert any("&lt;img src=x onerror=alert(1)&gt;" in h for h in hover)
    assert any("Tom &amp; Jerry" in h for h in hover)
    assert not any("<img" in h for h in hover)
    notes = [a.text for a in fig.layout.annotations]
    assert not any("<img" in n for n in notes) and any("&lt;img" in n for n in notes)
    assert fig.layout.title.text == "&lt;b&gt;mine&lt;/b&gt; &amp; co"


def test_hover_shows_name_family_ranges_status_and_reasons():
    screens = parse_screens({"E": ">= 5 GPa"})
    fig = property_chart(apply_screens(classes(), screens), "rho", "E", screens=screens)
    text = {cid: h for t in role(fig, "markers") for cid, h in zip(t.meta["ids"], t.text, strict=True)}
    assert "Light alloy" in text["alu"] and "metal" in text["alu"]
    assert "2600–2800 kg/m³" in text["alu"] and "68–72 GPa" in text["alu"]
    assert "passes" in text["alu"]
    assert "rejected" in text["pp"] and "fails E &gt;= 5 GPa" in text["pp"]  # the screen's reason, escaped


# ----------------------------------------------------------------------------- selections


SPEC = """
title = "Test strut <&>"
[part]
function = "beam"
support = "cantilever"
load = "end"
[section]
shape = "tube"
free = "scale"
[[constraint]]
type = "stiffness"
[screen]
families = ["metal", "composite", "natural"]
"""


def test_chart_for_selection_uses_the_derived_index_and_shortlist():
    selection = select(spec_from_dict(tomllib.loads(SPEC)), classes())
    assert selection.derivations[0].exponents == {"E": 0.5, "rho": -1.0}
    fig = chart_for_selection(selection, top=2)
    assert "Density" in fig.layout.xaxis.title.text and "Young" in fig.layout.yaxis.title.text
    for trace in role(fig, "index-line"):
        assert log_slope(trace) == pytest.approx(2.0)
    (ring,) = role(fig, "shortlist")
    assert ring.meta["ids"] == list(selection.shortlist["id"].head(2))
    main = next(t for t in role(fig, "index-line") if t.meta["main"])
    best = selection.shortlist.iloc[0]
    assert main.meta["value"] == pytest.approx(  # ρ in Mg/m³ (1 Mg/m³ = 1000 kg/m³)
        math.sqrt(math.sqrt(best["E_low"] * best["E_high"]))
        / (math.sqrt(best["rho_low"] * best["rho_high"]) / 1000)
    )
    grey = {
        cid
        for t in role(fig, "markers")
        for cid, f in zip(t.meta["ids"], t.meta["rejected"], strict=True)
        if f
    }
    assert grey == {"pp", "foam"}  # polymer and foam are screened out
    assert fig.layout.title.text == "Test strut &lt;&amp;&gt;"


def test_chart_for_selection_drops_an_index_that_does_not_fit_chosen_axes():
    selection = select(spec_from_dict(tomllib.loads(SPEC)), classes())
    fig = chart_for_selection(selection, x="T_max", y="sigma_y")
    assert not role(fig, "index-line")


@pytest.mark.parametrize(
    ("exponents", "axes"),
    [
        ({"E": 0.5, "rho": -1.0}, ("rho", "E")),
        ({"E": 1 / 3, "price": -1.0, "rho": -1.0}, ("price*rho", "E")),
        ({"sigma_y": 1.0, "price": -1.0, "rho": -1.0}, ("price*rho", "sigma_y")),
        ({"E": 1.0}, ("rho", "E")),
    ],
)
def test_default_axes_show_the_index_as_straight_lines(exponents, axes):
    assert default_axes(exponents) == axes
    index_line(exponents, axis_spec(axes[0]), axis_spec(axes[1]))  # reduces without error


# ----------------------------------------------------------------------------- trade-offs


def points() -> pd.DataFrame:
    """Invented sized candidates (demo data): mass in kg, cost in USD."""
    return pd.DataFrame(
        {
            "id": ["a", "b", "c", "d"],
            "name": ["Alpha", "Beta", "Gamma", "Delta"],
            "family": ["metal", "composite", "natural", "metal"],
            "status": ["passes"] * 4,
            "mass": [4.0, 1.5, 2.5, 5.0],
            "mass_low": [3.5, 1.2, 2.0, 4.5],
            "mass_high": [4.5, 1.8, 3.0, 5.5],
            "cost": [8.0, 60.0, 20.0, 30.0],
        }
    )


def test_tradeoff_chart_joins_the_front_in_order_of_x():
    fig = tradeoff_chart(points(), "mass", "cost", front_ids=["a", "b", "c"], log=False)
    (front,) = role(fig, "front")
    assert front.meta["ids"] == ["b", "c", "a"]
    assert list(front.x) == [1.5, 2.5, 4.0]
    assert sum(t.meta["count"] for t in role(fig, "boxes")) == 4
    box = next(t for t in role(fig, "boxes") if "a" in t.meta["ids"])
    seg = segments(box.x, box.y)[box.meta["ids"].index("a")]
    assert (min(p[0] for p in seg), max(p[0] for p in seg)) == (3.5, 4.5)
    assert fig.layout.xaxis.type == "linear"


@pytest.mark.parametrize("log", [False, True])
def test_penalty_lines_keep_a_constant_penalty(log):
    fig = tradeoff_chart(points(), "mass", "cost", penalty_lines=[(10.0, 1.0, 50.0)], log=log)
    (line,) = role(fig, "penalty")
    assert len(line.x) == 2 if not log else len(line.x) > 20  # straight, or a curve on log axes
    for xv, yv in zip(line.x, line.y, strict=True):
        assert 10.0 * xv + yv == pytest.approx(50.0)


def test_tradeoff_chart_reports_a_missing_column():
    with pytest.raises(InputError, match="no column 'co2'"):
        tradeoff_chart(points(), "mass", "co2")


# ----------------------------------------------------------------------------- output


def test_html_is_self_contained_and_written_atomically(tmp_path):
    fig = property_chart(classes(), "rho", "E", index="E^0.5/rho", through="alu")
    path = write_chart(fig, tmp_path / "chart.html")
    text = path.read_text(encoding="utf-8")
    assert text.lstrip().lower().startswith("<html") or text.lstrip().lower().startswith("<!doctype")
    assert "plotly.js v" in text or "plotly.js" in text
    assert len(text) > 1_000_000  # plotly.js embedded
    assert not re.search(r"<script[^>]*\bsrc=", text)  # nothing loaded from elsewhere
    assert "mathjax.js" not in text.lower()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["chart.html"]


def test_output_errors_are_clear(tmp_path, monkeypatch):
    fig = property_chart(classes(), "rho", "E")
    with pytest.raises(OutputError, match=r"unknown chart format '\.jpg'"):
        write_chart(fig, tmp_path / "chart.jpg")
    with pytest.raises(OutputError, match="does not exist"):
        write_chart(fig, tmp_path / "missing" / "chart.html")
    monkeypatch.setenv("BROWSER_PATH", str(tmp_path / "no-such-chromium"))
    with pytest.raises(OutputError, match=r"Chromium|kaleido"):
        write_chart(fig, tmp_path / "chart.png")
    assert not list(tmp_path.iterdir())


def test_cli_chart_writes_html(tmp_path):
    from selector.cli import cli

    out = tmp_path / "c.html"
    result = CliRunner().invoke(
        cli,
        ["chart", "--x", "rho", "--y", "E", "--index", "E^0.5/rho", "-o", str(out)],
        catch_exceptions=False,
    )
    assert result.exit_code == 0, result.output
    assert out.stat().st_size > 1_000_000


def test_cli_chart_errors_are_one_line(tmp_path, monkeypatch, capsys):
    from selector.cli import main

    monkeypatch.setattr(
        sys,
        "argv",
        [
            "selector",
            "chart",
            "--x",
            "rho",
            "--y",
            "K_IC",
            "--index",
            "E^0.5/rho",
            "-o",
            str(tmp_path / "c.html"),
        ],
    )
    with pytest.raises(SystemExit) as stop:
        main()
    assert stop.value.code == 2
    err = capsys.readouterr().err
    assert err.startswith("error: index:") and "neither axis" in err and "Traceback" not in err
    assert not Path(tmp_path / "c.html").exists()


def test_builtin_table_draws_every_class():
    from selector.inputs.materials import load_materials

    table = load_materials()
    fig = property_chart(table, "rho", "E")
    assert sum(t.meta["count"] for t in role(fig, "boxes")) == len(table)
    assert fig.layout.meta["skipped"] == []
