"""Minimum walls of product forms and the spec's ``min_wall``: parts are never thinner."""

from __future__ import annotations

import pytest

from selector.inputs.spec import spec_from_dict
from selector.pipeline.selection import select
from tests.conftest import make_table

# Invented steel-like class (demo data).
STEELISH = {"id": "steelish", "family": "metal", "sigma_y": (250, 250), "rho": (7850, 7850), "E": (200, 200)}


def _vessel(pressure: str, **section: str):
    return spec_from_dict(
        {
            "part": {"function": "cylinder", "radius": "40 mm", "length": "200 mm", "pressure": pressure},
            "section": {"free": "wall", **section},
            "constraint": [{"type": "strength", "safety_factor": 2.0}],
        }
    )


def test_a_wall_below_the_product_form_minimum_is_sized_at_the_minimum():
    # t = p·r·SF/σ_y = 0.5e6·0.04·2/250e6 = 0.16 mm < 0.5 mm (metal sheet and drawn tube, common
    # practice, no source): sized at 0.5 mm, hoop utilisation 0.16/0.5 = 0.32.
    row = select(_vessel("0.5 MPa"), make_table([STEELISH])).shortlist.iloc[0]
    assert row["dimensions"]["t"] == pytest.approx(0.5e-3)
    assert row["utilisation"]["strength"] == pytest.approx(0.32)
    assert any("over-designed" in w for w in row["size_warnings"])


def test_a_wall_above_the_minimum_is_unchanged():
    # t = 2e6·0.04·2/250e6 = 0.64 mm > 0.5 mm.
    row = select(_vessel("2 MPa"), make_table([STEELISH])).shortlist.iloc[0]
    assert row["dimensions"]["t"] == pytest.approx(0.64e-3)
    assert row["utilisation"]["strength"] == pytest.approx(1.0)


def test_castings_have_thicker_minimum_walls_than_their_family():
    row = select(_vessel("0.5 MPa"), make_table([{**STEELISH, "id": "cast-iron-grey"}])).shortlist.iloc[0]
    assert row["dimensions"]["t"] == pytest.approx(3e-3)


def test_the_spec_min_wall_raises_the_floor():
    row = select(_vessel("0.5 MPa", min_wall="2 mm"), make_table([STEELISH])).shortlist.iloc[0]
    assert row["dimensions"]["t"] == pytest.approx(2e-3)
    assert row["utilisation"]["strength"] == pytest.approx(0.16 / 2)
    assert row["mass"] > row["objective_low"]
    assert row["objective_high"] >= row["mass"]


def test_a_minimum_wall_no_section_can_have_rejects_the_class_with_the_reason():
    # A 30 mm tube cannot have a 20 mm wall (it would exceed the radius, 15 mm): the part is
    # refused with the reason, not sized (common practice, no source).
    spec = spec_from_dict(
        {
            "part": {
                "function": "beam",
                "support": "cantilever",
                "load": "end",
                "length": "1.2 m",
                "force": "40 N",
            },
            "section": {"shape": "tube", "free": "wall", "d": "30 mm", "t": "2 mm", "min_wall": "20 mm"},
            "constraint": [{"type": "stiffness", "max_deflection": "8 mm"}],
        }
    )
    result = select(spec, make_table([STEELISH]))
    assert result.shortlist.empty
    row = result.table.set_index("id").loc["steelish"]
    assert row["status"] == "rejected"
    assert any("20 mm minimum wall" in w for w in row["size_warnings"])


def _solid(function: str, shape: str):
    load = {"torque": "50 N*m"} if function == "shaft" else {"force": "5 kN"}
    part = {"function": function, "length": "1 m", **load}
    return spec_from_dict({"part": part, "section": {"shape": shape}, "constraint": [{"type": "strength"}]})


def test_a_honeycomb_is_never_sized_as_a_solid_part():
    # honeycombs are made only as sandwich cores (common practice, no source)
    table = make_table([STEELISH, {**STEELISH, "id": "al-honeycomb", "family": "foam"}])
    rows = select(_solid("tie", "round"), table).table.set_index("id")
    assert rows.at["al-honeycomb", "status"] == "rejected"
    assert any("sandwich core" in r for r in rows.at["al-honeycomb", "reasons"])
    assert rows.at["steelish", "status"] == "passes"


@pytest.mark.parametrize(("shape", "rejected"), [("round", True), ("tube", False)])
def test_a_laminate_is_not_made_as_a_solid_round_bar(shape, rejected):
    # laminates are laid up as plate, shell and tube (common practice, no source)
    table = make_table([STEELISH, {**STEELISH, "id": "cfrp-qi", "family": "composite"}])
    rows = select(_solid("shaft", shape), table).table.set_index("id")
    assert (rows.at["cfrp-qi", "status"] == "rejected") is rejected
    if rejected:
        assert any("not as a solid round bar" in r for r in rows.at["cfrp-qi", "reasons"])


@pytest.mark.parametrize(
    ("function", "shape", "rejected"),
    [
        ("shaft", "round", False),
        ("tie", "generic", False),
        ("beam", "tube", True),
        ("beam", "rectangle", True),
    ],
)
def test_wire_is_ranked_only_as_a_round_bar(function, shape, rejected):
    # drawn wire is round: no tube, plate or rolled section is made from it (common practice,
    # no source); strong enough that the round bar is thinner than the 10 mm its data cover
    table = make_table([STEELISH, {**STEELISH, "id": "spring-steel-wire", "sigma_y": (1500, 1500)}])
    rows = select(_solid(function, shape), table).table.set_index("id")
    assert (rows.at["spring-steel-wire", "status"] == "rejected") is rejected
    if rejected:
        assert any("only as round wire" in r for r in rows.at["spring-steel-wire", "reasons"])


def test_wire_thicker_than_its_data_cover_is_refused():
    # A 10 kN tie of σ_y = 250 MPa needs A = F/σ_y = 40 mm², d = (4A/π)^½ = 7.14 mm (within the
    # 1–10 mm the class's data note covers); 40 kN needs d = 14.3 mm, beyond it.
    wire = {**STEELISH, "id": "spring-steel-wire"}

    def tie(force: str, shape: str = "round"):
        part = {"function": "tie", "length": "1 m", "force": force}
        spec = spec_from_dict(
            {"part": part, "section": {"shape": shape}, "constraint": [{"type": "strength"}]}
        )
        return select(spec, make_table([wire])).table.set_index("id").loc["spring-steel-wire"]

    assert tie("10 kN")["dimensions"]["d"] == pytest.approx(7.136e-3, rel=1e-3)
    for shape in ("round", "generic"):  # a generic tie of wire is a bar of the same area
        thick = tie("40 kN", shape)
        assert thick["status"] == "rejected"
        assert any("needs d = 14.3 mm, thicker than the 10 mm" in r for r in thick["reasons"])


def test_a_panel_sandwich_leaves_out_one_axis_faces():
    # a panel's faces carry stress both ways; unidirectional data hold along the fibres only
    ud = {**STEELISH, "id": "ud-face", "family": "composite", "directions": "axial"}
    flat = {**STEELISH, "id": "flat-face"}
    core = {
        "id": "foamish",
        "family": "foam",
        "rho": (100, 100),
        "E": (0.1, 0.1),
        "G": (0.04, 0.04),
        "tau_core": (1.0, 1.0),
    }
    spec = spec_from_dict(
        {
            "part": {"function": "panel", "length": "0.9 m", "width": "0.6 m", "force": "1.5 kN"},
            "section": {"shape": "sandwich", "free": "faces-and-core"},
            "constraint": [{"type": "stiffness", "max_deflection": "3 mm"}, {"type": "strength"}],
        }
    )
    result = select(spec, make_table([ud, flat, core])).sandwich
    assert set(result.pairs["face"]) == {"flat-face"}
    left_out = result.excluded.set_index("id")
    assert "one axis" in left_out.at["ud-face", "reason"]


def test_a_scaled_section_grows_until_its_thinnest_wall_can_be_made():
    # Tie of F = 100 N on σ_y = 250 MPa: A = 4e-7 m²; a tube at d/t = 10 has A = 0.2827·d²,
    # so d = 1.19 mm and t = 0.119 mm, below the 0.5 mm of drawn metal tube (common practice,
    # no source): scaled ×4.2 to t = 0.5 mm, d = 5 mm, utilisation 4e-7/(0.2827·0.005²) = 0.0566.
    spec = spec_from_dict(
        {
            "part": {"function": "tie", "length": "1 m", "force": "100 N"},
            "section": {"shape": "tube", "d": "10 mm", "t": "1 mm"},
            "constraint": [{"type": "strength"}],
        }
    )
    row = select(spec, make_table([STEELISH])).shortlist.iloc[0]
    assert row["dimensions"]["t"] == pytest.approx(0.5e-3)
    assert row["dimensions"]["d"] == pytest.approx(5e-3)
    assert row["utilisation"]["strength"] == pytest.approx(4e-7 / (0.2827433 * 0.005**2), rel=1e-4)
    assert any("thinnest wall" in w and "over-designed" in w for w in row["size_warnings"])
