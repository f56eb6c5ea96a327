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
