"""A cylinder under external pressure: the compressive hoop stress and long-tube buckling."""

from __future__ import annotations

import pytest
from click.testing import CliRunner

from selector.cli import cli
from selector.errors import InputError, SpecError
from selector.inputs.spec import spec_from_dict
from selector.mechanics.loadcases import PLATE_NU, load_case, part_kind, with_requirement
from selector.mechanics.tube_buckling import collapse_stress, elastic_buckling_stress, yield_interaction_note
from selector.pipeline.derive import derive
from selector.pipeline.selection import select
from tests.conftest import make_table

STEEL = {
    "id": "steel",
    "family": "metal",
    "E": (200, 200),
    "sigma_y": (250, 250),
    "sigma_c": (250, 250),
    "rho": (7850, 7850),
}
"""A structural steel at round values (E = 200 GPa, σ_c = 250 MPa, ρ = 7850 kg/m³: common
practice, no source)."""


def _tube(pressure: str, constraints: list[dict], **part) -> dict:
    return {
        "part": {
            "function": "cylinder",
            "load": "external",
            "radius": "50 mm",
            "length": "1 m",
            "pressure": pressure,
            **part,
        },
        "section": {"free": "wall"},
        "constraint": constraints,
    }


BOTH = [{"type": "buckling", "safety_factor": 1.0}, {"type": "strength", "safety_factor": 1.0}]


def _sized(spec: dict, rows: list[dict] | None = None):
    return select(spec_from_dict(spec), make_table(rows or [STEEL])).shortlist.iloc[0]


# --------------------------------------------------------------------------- the derived indices


def test_the_buckling_index_is_the_cube_root_of_the_modulus_over_density():
    # Mass at free wall, long-tube buckling: t ∝ (p/E)^(1/3), so m ∝ ρ/E^(1/3) and the index is
    # E^(1/3)/ρ (Ashby, Materials Selection in Mechanical Design, index table; from memory).
    d = derive("cylinder", "buckling", "mass", "wall", load="external")
    assert d.exponents == {"E": pytest.approx(1 / 3), "rho": -1.0}
    assert d.index_text == "E^(1/3)/ρ"


def test_the_strength_index_under_external_pressure_is_the_crushing_strength_over_density():
    # Hoop stress p·r/t ≤ σ_c/SF: t ∝ p·r/σ_c, so the index is σ_c/ρ (Ashby's index table for
    # a strength-limited thin-walled vessel, with the compressive strength; from memory).
    d = derive("cylinder", "strength", "mass", "wall", load="external")
    assert d.exponents == {"sigma_c": 1.0, "rho": -1.0}


def test_the_cli_derives_the_buckling_index():
    result = CliRunner().invoke(
        cli, ["derive", "cylinder", "--constraint", "buckling", "--free", "wall", "--load", "external"]
    )
    assert result.exit_code == 0, result.output
    assert "Merit index (maximise): M = E^(1/3)/ρ" in result.output


def test_buckling_of_an_internally_pressed_cylinder_points_to_the_external_load():
    with pytest.raises(InputError) as err:
        derive("cylinder", "buckling", "mass", "wall")
    assert 'load = "external"' in str(err.value)


# --------------------------------------------------------------------------- sizing, worked by hand


def test_a_buckling_governed_tube_is_sized_to_bresses_pressure():
    # Worked by hand: p_cr = E/(4(1−ν²))·(t/r)³ = SF·p gives t = r·(4(1−ν²)·SF·p/E)^(1/3)
    # = 0.05·(3.64·1e6/200e9)^(1/3) = 0.05·(1.82e-5)^(1/3) = 0.05·0.026304 = 1.3152 mm
    # (Bresse's long-tube result in Timoshenko & Gere, Theory of Elastic Stability; from memory).
    # The hoop stress is then p·r/t = 1e6·0.05/1.3152e-3 = 38.0 MPa, 0.152 of σ_c.
    # m = 2π·r·L·t·ρ = 2π·0.05·1·1.3152e-3·7850 = 3.243 kg.
    row = _sized(_tube("1 MPa", BOTH))
    t = row["dimensions"]["t"]
    assert t == pytest.approx(1.3152e-3, rel=1e-4)
    assert t == pytest.approx(0.05 * (4 * (1 - PLATE_NU**2) * 1e6 / 200e9) ** (1 / 3), rel=1e-9)
    assert row["governing"] == "buckling"
    assert row["utilisation"]["buckling"] == pytest.approx(1.0, rel=1e-9)
    assert row["utilisation"]["strength"] == pytest.approx(38.02 / 250, rel=1e-3)
    assert row["mass"] == pytest.approx(3.243, rel=1e-3)
    # Its elastic buckling stress, 38 MPa, is far below σ_c/2: no interaction to flag.
    assert not any("Johnson-type" in w for w in row["size_warnings"])


def test_a_strength_governed_tube_is_sized_to_the_crushing_stress():
    # Worked by hand, p = 20 MPa: strength t = p·r/σ_c = 20e6·0.05/250e6 = 4.000 mm; buckling
    # alone would need 0.05·(3.64·20e6/200e9)^(1/3) = 0.05·0.071400 = 3.570 mm, so at 4 mm the
    # buckling utilisation is (3.570/4)³ = 0.711 (Timoshenko & Gere, from memory).
    row = _sized(_tube("20 MPa", BOTH))
    assert row["dimensions"]["t"] == pytest.approx(4.0e-3, rel=1e-9)
    assert row["governing"] == "strength"
    assert row["utilisation"]["strength"] == pytest.approx(1.0, rel=1e-9)
    assert row["utilisation"]["buckling"] == pytest.approx(0.711, rel=1e-3)
    # At 4 mm the elastic buckling stress E/3.64·(t/r)² = 200e9/3.64·0.08² = 351.6 MPa is above
    # σ_c/2, and the Johnson-type parabola σ_c − σ_c²/(4σ_E) = 250 − 62500/1406.6 = 205.6 MPa puts
    # collapse 18 % below σ_c, under the working 250 MPa: the part is flagged (worked by hand).
    (note,) = [w for w in row["size_warnings"] if "Johnson-type" in w]
    assert "351.6 MPa" not in note and "352 MPa" in note and "206 MPa" in note and "18%" in note
    # 206 MPa is under the 250 MPa working hoop stress × SF 1: short of its safety factor
    assert "(250 MPa): on this estimate the wall does not keep its safety factor" in note


def test_a_given_wall_is_checked_against_both_limits():
    # t = 2 mm: p_cr = 200e9/3.64·(0.002/0.05)³ = 3.516 MPa, so 1 MPa with SF 2 uses
    # 2/3.516 = 0.569 of it; the hoop stress 25 MPa uses 2·25/250 = 0.2 of σ_c. Worked by hand.
    spec = _tube(
        "1 MPa", [{"type": "buckling", "safety_factor": 2.0}, {"type": "strength", "safety_factor": 2.0}]
    )
    spec["section"] = {"free": "none", "t": "2 mm"}
    row = _sized(spec)
    assert row["utilisation"]["buckling"] == pytest.approx(2 / 3.516, rel=1e-3)
    assert row["utilisation"]["strength"] == pytest.approx(0.2, rel=1e-9)


def test_the_internal_load_is_the_default_and_sizes_on_yield():
    inside = _tube("1 MPa", [{"type": "strength", "safety_factor": 1.0}])
    del inside["part"]["load"]
    said = _tube("1 MPa", [{"type": "strength", "safety_factor": 1.0}], load="internal")
    table = make_table([STEEL | {"sigma_c": (50, 50)}])
    a = select(spec_from_dict(inside), table).shortlist
    b = select(spec_from_dict(said), table).shortlist
    # Hoop stress p·r/t = σ_y: t = 1e6·0.05/250e6 = 0.2 mm, raised to the 0.5 mm sheet minimum.
    assert a["dimensions"].iat[0]["t"] == b["dimensions"].iat[0]["t"] == pytest.approx(0.5e-3)
    assert a["utilisation"].iat[0]["strength"] == pytest.approx(0.4)
    # Outside, the crushing strength sets it: t = p·r/σ_c = 1e6·0.05/50e6 = 1 mm, utilisation 1.
    c = select(spec_from_dict(_tube("1 MPa", [{"type": "strength", "safety_factor": 1.0}])), table)
    assert c.shortlist["dimensions"].iat[0]["t"] == pytest.approx(1e-3, rel=1e-9)
    assert c.shortlist["utilisation"].iat[0]["strength"] == pytest.approx(1.0)


def test_the_collapse_stress_follows_the_columns_parabola_above_half_the_strength():
    # σ_E = E/(4(1−ν²))·(t/r)²: 200e9/3.64·(0.004/0.05)² = 351.6 MPa (worked by hand); the
    # Johnson parabola σ_c − σ_c²/(4σ_E) meets σ_E at σ_c/2 (Shigley, columns; from memory).
    assert elastic_buckling_stress(200e9, 4e-3, 0.05) == pytest.approx(351.65e6, rel=1e-4)
    assert collapse_stress(200e9, 250e6, 4e-3, 0.05) == pytest.approx(205.57e6, rel=1e-4)
    assert collapse_stress(200e9, 1e12, 4e-3, 0.05) == elastic_buckling_stress(200e9, 4e-3, 0.05)
    # Far above σ_c the parabola is within 5 % of σ_c (crushing governs alone): no note; nor
    # without data.
    assert yield_interaction_note(200e9, 20e6, 4e-3, 0.05) is None
    assert yield_interaction_note(200e9, float("nan"), 4e-3, 0.05) is None
    assert yield_interaction_note(200e9, 250e6, 4e-3, 0.05) is not None
    # a collapse estimate (205.6 MPa) above the working stress × SF is flagged without the shortfall
    assert "does not keep" not in str(yield_interaction_note(200e9, 250e6, 4e-3, 0.05, demand=150e6))


# --------------------------------------------------------------------------- what kind of part it is


def test_an_external_pressure_shell_is_in_compression_and_biaxial():
    assert part_kind("cylinder", "external").in_compression
    assert not part_kind("cylinder").in_compression
    assert load_case("cylinder", load="external").kind.in_compression
    # A brittle class (K_IC 4 MPa·m½) stays ranked on a compressive check, as a column's would,
    # but an internally pressed cylinder on strength alone leaves it out (common practice, no source).
    brittle = STEEL | {"id": "brittle", "family": "ceramic", "K_IC": (4, 4)}
    one_axis = STEEL | {"id": "ud", "family": "composite", "directions": "axial"}
    rows = [STEEL, brittle, one_axis]
    outside = select(spec_from_dict(_tube("1 MPa", BOTH)), make_table(rows)).table.set_index("id")
    assert outside.loc["brittle", "status"] != "rejected"
    assert outside.loc["ud", "status"] == "rejected"  # a biaxial stress state, as inside
    inside = _tube("1 MPa", [{"type": "strength", "safety_factor": 1.0}], load="internal")
    inside_table = select(spec_from_dict(inside), make_table(rows)).table.set_index("id")
    assert inside_table.loc["brittle", "status"] == "rejected"


def test_the_assumptions_name_the_long_tube_and_out_of_roundness():
    sel = select(spec_from_dict(_tube("1 MPa", BOTH)), make_table([STEEL]))
    text = "\n".join(sel.assumptions)
    assert "thin-walled cylinder under external pressure" in text
    assert "p_cr = E/(4(1−ν²))·(t/r)³ ≥ SF·p" in text and "ν = 0.3" in text
    assert "long tube" in text and "out-of-roundness" in text and "no end caps" in text
    assert "compressive hoop stress" in text


def test_a_crack_is_checked_on_the_compressive_stress():
    spec = _tube("1 MPa", [*BOTH, {"type": "fracture", "crack_length": "1 mm"}])
    sel = select(spec_from_dict(spec), make_table([STEEL]))
    assert any("compressive stress" in a for a in sel.assumptions)


# --------------------------------------------------------------------------- what is refused


def _problems(spec: dict) -> list[str]:
    with pytest.raises(SpecError) as err:
        spec_from_dict(spec, "x.toml")
    return [str(e) for e in err.value.errors]


def test_a_misspelt_load_is_named_with_the_loads_a_cylinder_takes():
    assert _problems(_tube("1 MPa", BOTH, load="extrenal")) == [
        "x.toml: part.load: 'extrenal' is not a cylinder's load; "
        "did you mean 'external'? (valid: external, internal)"
    ]


def test_a_sphere_refuses_external_pressure_and_says_why():
    spec = {
        "part": {"function": "sphere", "load": "external", "radius": "50 mm", "pressure": "1 MPa"},
        "section": {"free": "wall"},
        "constraint": [{"type": "strength"}],
    }
    (line,) = _problems(spec)
    assert line.startswith("x.toml: part.load: a sphere is sized for internal pressure only; ")
    assert "out-of-roundness" in line and 'a cylinder with load = "external"' in line
    with pytest.raises(InputError, match="internal pressure only"):
        load_case("sphere", load="external")
    # Saying "internal" is allowed and changes nothing; any other word is named.
    said = {**spec, "part": {**spec["part"], "load": "internal"}}
    plain = {**spec, "part": {k: v for k, v in spec["part"].items() if k != "load"}}
    table = make_table([STEEL])
    assert (
        select(spec_from_dict(said), table).shortlist["mass"].iat[0]
        == select(spec_from_dict(plain), table).shortlist["mass"].iat[0]
    )
    assert _problems({**spec, "part": {**spec["part"], "load": "inside"}}) == [
        "x.toml: part.load: 'inside' is not a sphere's load; expected one of: internal"
    ]


@pytest.mark.parametrize("criterion", ["leak-before-break", "yield-before-break"])
def test_the_vessel_fracture_criteria_are_refused_under_external_pressure(criterion):
    spec = _tube("1 MPa", [*BOTH, {"type": "fracture", "criterion": criterion}])
    (line,) = _problems(spec)
    assert line.startswith("x.toml: constraint[2].criterion: leak-before-break and yield-before-break ")
    assert "internal pressure, not external" in line
    with pytest.raises(InputError, match="internal pressure, not external"):
        with_requirement(load_case("cylinder", load="external"), criterion)


def test_the_cli_gives_one_error_line_for_a_bad_load(tmp_path):
    spec = tmp_path / "housing.toml"
    text = (
        '[part]\nfunction = "cylinder"\nload = "outside"\nradius = "40 mm"\nlength = "0.2 m"\n'
        'pressure = "2 MPa"\n[section]\nfree = "wall"\n[[constraint]]\ntype = "buckling"\n'
    )
    spec.write_text(text, encoding="utf-8")
    result = CliRunner().invoke(cli, ["rank", str(spec)])
    assert result.exit_code == 2
    lines = [ln for ln in result.output.splitlines() if ln]
    assert len(lines) == 1 and lines[0].startswith("error: ") and "housing.toml: part.load" in lines[0]
    assert "'outside' is not a cylinder's load" in lines[0]
    assert spec.read_text(encoding="utf-8") == text


# --------------------------------------------------------------------------- the bundled housing


def test_the_bundled_housing_leads_as_its_comment_works_out_by_hand():
    from selector.inputs.materials import load_materials
    from selector.inputs.spec import EXAMPLES, load_spec

    spec = load_spec(EXAMPLES / "sensor-pressure-housing.toml")
    assert spec.part.load == "external"
    top = select(spec, load_materials()).shortlist.head(3)
    # The example's comment: walls of 2.80, 3.62 and 2.71 mm, 0.218, 0.245 and 0.366 kg, from
    # t = r·(3.64·SF·p/E)^(1/3) at the classes' typical E (worked by hand from the data ranges).
    assert list(top["id"]) == ["cfrp-qi", "afrp-qi", "al-5xxx-wrought"]
    walls = [d["t"] for d in top["dimensions"]]
    assert walls == pytest.approx([2.80e-3, 3.62e-3, 2.71e-3], rel=2e-3)
    assert list(top["mass"]) == pytest.approx([0.218, 0.245, 0.366], rel=2e-3)
    assert set(top["governing"]) == {"buckling"}
    # An engineer's first look: no ceramic or glass, no wall below the 1.5 mm handling minimum,
    # every wall thin enough for the membrane stress (r/t above 10; common practice, no source).
    assert not set(top["family"]) & {"ceramic", "glass"}
    assert min(walls) >= 1.5e-3 and 0.040 / max(walls) > 10
