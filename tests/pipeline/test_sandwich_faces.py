"""Faces a workshop can make: castings no thinner than the casting allows, no face of wire,
and every objective (energy too) carried by each pair."""

from __future__ import annotations

import pytest

from selector.inputs.spec import spec_from_dict
from selector.mechanics.product_forms import CLASS_MIN_WALL
from selector.pipeline.sandwich import MIN_FACE
from selector.pipeline.selection import select, studies
from tests.conftest import sandwich_panel


def _panel(objective: str = "mass", **sandwich) -> dict:
    return sandwich_panel(
        title="Plant-room hatch (illustrative)",
        sandwich={"faces": ["metal"], "cores": ["foam", "natural"], **sandwich},
        objective={"minimize": objective},
    )


@pytest.fixture(scope="module")
def by_energy():
    return select(spec_from_dict(_panel("energy")))


def test_cast_faces_are_at_least_their_casting_minimum(by_energy):
    pairs = by_energy.sandwich.feasible
    cast = pairs[pairs["face"].isin(CLASS_MIN_WALL)]
    assert len(cast) > 0, "the metal faces include castings"
    # common practice, no source: sand-cast iron about 3 mm, aluminium castings 2.5 mm
    floor = cast["face"].map(CLASS_MIN_WALL)
    assert (cast["t_face"] >= floor * (1 - 1e-9)).all()
    wrought = pairs[~pairs["face"].isin(CLASS_MIN_WALL)]
    assert wrought["t_face"].min() == pytest.approx(MIN_FACE["metal"], rel=1e-6)


def test_a_spec_minimum_does_not_thin_a_casting():
    pairs = select(spec_from_dict(_panel(min_face="0.3 mm"))).sandwich.feasible
    iron = pairs[pairs["face"] == "cast-iron-ductile"]
    assert len(iron) and (iron["t_face"] >= 3e-3 * (1 - 1e-9)).all()
    assert pairs["t_face"].min() < 0.5e-3  # the spec's thinner sheet holds for wrought metals


def test_wire_is_no_face(by_energy):
    excluded = by_energy.sandwich.excluded
    wire = excluded[excluded["id"] == "spring-steel-wire"]
    assert list(wire["role"]) == ["face"] and "round wire" in wire["reason"].iloc[0]
    assert "spring-steel-wire" not in set(by_energy.sandwich.pairs["face"])


def test_energy_ranks_pairs_and_takes_part_in_a_tradeoff(by_energy):
    pairs = by_energy.sandwich.feasible
    assert list(pairs["energy"]) == sorted(pairs["energy"])
    assert pairs["objective"].to_numpy() == pytest.approx(pairs["energy"].to_numpy(), rel=1e-12)
    study = studies(by_energy, tradeoff="mass").tradeoff
    assert {"energy", "mass"} <= set(study.front.columns) and len(study.front) >= 1


def test_a_panel_leaves_out_one_axis_faces_as_a_solid_panel_does():
    panel = _panel(faces=["composite"])
    result = select(spec_from_dict(panel))
    excluded = result.sandwich.excluded.set_index("id")
    # CFRP UD's data hold along the fibres only; a panel's faces are in biaxial stress
    assert excluded.loc["cfrp-ud", "role"] == "face" and "one axis" in excluded.loc["cfrp-ud", "reason"]
    assert "cfrp-ud" not in set(result.sandwich.pairs["face"])
    solid = result.table.set_index("id")
    assert solid.loc["cfrp-ud", "status"] == "rejected"  # the same rule for the solid panel
    assert result.sandwich.feasible["face"].iloc[0] == "cfrp-qi"


def test_a_beam_keeps_one_axis_faces_along_its_span():
    beam = _panel(faces=["composite"])
    beam["part"] = {**beam["part"], "function": "beam"}
    beam["part"].pop("width")
    beam["section"] = {**beam["section"], "b": "100 mm"}
    pairs = select(spec_from_dict(beam)).sandwich.pairs
    assert "cfrp-ud" in set(pairs["face"])


def test_a_metal_matrix_face_is_rolled_sheet_not_plies():
    pairs = select(spec_from_dict(_panel(faces=["composite"]))).sandwich.feasible
    mmc = pairs[pairs["face"] == "al-sic-mmc"]
    assert len(mmc) and mmc["t_face"].min() >= 0.5e-3 * (1 - 1e-9)  # common practice, no source
