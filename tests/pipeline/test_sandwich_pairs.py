"""The sandwich pair search inside the pipeline: spec keys, ranking, bounds and errors."""

from __future__ import annotations

import math

import pytest

from selector.errors import InputError
from selector.inputs.spec import EXAMPLES, load_spec, spec_from_dict
from selector.mechanics.sandwich import MODES
from selector.pipeline.sandwich import MIN_CORE, MIN_FACE
from selector.pipeline.selection import select
from tests.conftest import sandwich_panel

HATCH = EXAMPLES / "walkway-hatch.toml"


@pytest.fixture(scope="module")
def hatch():
    return select(load_spec(HATCH))


def test_a_sandwich_panel_is_not_ranked_as_a_solid_plate(hatch):
    result = hatch.sandwich
    assert result is not None
    best = result.pairs.iloc[0]
    assert best["rank"] == 1 and best["feasible"]
    assert {best["face_family"], best["core_family"]} <= {"metal", "composite", "foam", "natural"}
    assert best["t_face"] > 0 and best["t_core"] > 0
    assert set(best["utilisation"]) == set(MODES)
    assert best["governing"] == max(best["utilisation"], key=best["utilisation"].get)
    # The deflection is the sum of its parts and within the limit.
    assert best["deflection"] == pytest.approx(best["deflection_bending"] + best["deflection_shear"])
    assert best["deflection"] <= 3e-3 * (1 + 1e-6)


def test_pairs_are_ranked_by_the_objective_and_honour_the_bounds(hatch):
    feasible = hatch.sandwich.feasible
    assert feasible["objective"].is_monotonic_increasing
    assert feasible["mass"].to_numpy() == pytest.approx(feasible["objective"].to_numpy(), rel=1e-12)
    assert (feasible["depth"] <= 40e-3 * (1 + 1e-9)).all()  # max_depth of the example
    assert (feasible["t_core"] >= MIN_CORE * (1 - 1e-12)).all()
    for family, minimum in MIN_FACE.items():
        rows = feasible[feasible["face_family"] == family]
        assert (rows["t_face"] >= minimum * (1 - 1e-12)).all(), family
    # every mode stays within its limit
    assert all(max(u.values()) <= 1 + 1e-6 for u in feasible["utilisation"])


def test_the_best_pair_is_far_lighter_than_the_best_solid_within_the_depth(hatch):
    solid = hatch.sandwich.solid
    assert solid is not None and solid["thickness"] <= 40e-3
    assert hatch.sandwich.pairs.iloc[0]["mass"] < 0.5 * solid["mass"]


def test_classes_without_core_data_are_left_out_with_a_reason(hatch):
    excluded = hatch.sandwich.excluded
    assert "pe-foam" in set(excluded["id"])
    assert "pe-foam" not in set(hatch.sandwich.pairs["core"])


def test_faces_and_cores_by_id_and_family():
    spec = spec_from_dict(
        sandwich_panel(sandwich={"faces": ["al-6xxx-wrought", "composite"], "cores": ["pvc-foam"]})
    )
    pairs = select(spec).sandwich.pairs
    assert set(pairs["core"]) == {"pvc-foam"}
    assert "al-6xxx-wrought" in set(pairs["face"]) and "cfrp-qi" in set(pairs["face"])
    assert set(pairs["face_family"]) == {"metal", "composite"}


def test_cost_objective_ranks_by_cost():
    spec = spec_from_dict(sandwich_panel(objective={"minimize": "cost"}))
    feasible = select(spec).sandwich.feasible
    assert feasible["cost"].to_numpy() == pytest.approx(feasible["objective"].to_numpy(), rel=1e-12)
    assert feasible["cost"].is_monotonic_increasing


def test_spec_minimum_thicknesses_override_the_family_ones():
    spec = spec_from_dict(sandwich_panel(sandwich={"min_face": "1 mm", "min_core": "12 mm"}))
    feasible = select(spec).sandwich.feasible
    assert feasible["t_face"].min() >= 1e-3 * (1 - 1e-12)
    assert feasible["t_core"].min() >= 12e-3 * (1 - 1e-12)


def test_conservative_sizing_is_heavier():
    spec = spec_from_dict(sandwich_panel(sandwich={"faces": ["al-6xxx-wrought"], "cores": ["pvc-foam"]}))
    mid = select(spec).sandwich.pairs.iloc[0]["mass"]
    low = select(spec, conservative=True).sandwich.pairs.iloc[0]["mass"]
    assert low > mid


@pytest.mark.parametrize(
    ("changes", "where"),
    [
        ({"section": {"shape": "sandwich", "free": "thickness"}}, "section.free"),
        ({"section": {"shape": "rectangle", "free": "faces-and-core"}}, "section.shape"),
        ({"section": {"shape": "sandwich", "free": "faces-and-core", "t": "5 mm"}}, "section.t"),
        ({"sandwich": {"faces": ["alumnium"]}}, "sandwich.faces[0]"),
        ({"sandwich": {"min_core": "-2 mm"}}, "spec: sandwich.min_core"),  # refused as the spec loads
    ],
)
def test_bad_sandwich_specs_name_the_field(changes, where):
    with pytest.raises(InputError) as info:
        select(spec_from_dict(sandwich_panel(**changes)))
    assert str(info.value).startswith(f"{where}: ")


def test_a_sandwich_needs_a_width():
    data = sandwich_panel()
    del data["part"]["width"]
    with pytest.raises(InputError, match=r"part\.width"):
        select(spec_from_dict(data))


def test_a_sandwich_beam_takes_its_width_from_the_section():
    data = sandwich_panel(section={"shape": "sandwich", "free": "faces-and-core", "b": "80 mm"})
    data["part"]["function"] = "beam"
    del data["part"]["width"]
    result = select(spec_from_dict(data)).sandwich
    assert result.loads.b == pytest.approx(0.08)
    assert result.loads.function == "beam"
    assert not any("panel spans" in a for a in result.assumptions)


def test_no_strength_constraint_still_checks_failure_modes_at_one():
    data = sandwich_panel()
    data["constraint"] = [{"type": "stiffness", "max_deflection": "3 mm"}]
    result = select(spec_from_dict(data)).sandwich
    assert result.loads.SF == 1.0
    assert any("safety factor 1" in note for note in result.assumptions)
    assert math.isfinite(result.pairs.iloc[0]["objective"])
