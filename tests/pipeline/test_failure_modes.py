"""Fracture, fatigue and frequency constraints through the whole pipeline."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest

from selector.errors import InputError
from selector.inputs.spec import spec_from_dict
from selector.outputs import tables
from selector.pipeline.selection import select
from tests.conftest import make_table

ALUMINIUM = {
    "id": "alu",
    "E": (70, 70),
    "rho": (2700, 2700),
    "sigma_y": (250, 250),
    "sigma_ts": (300, 300),
    "sigma_e": (100, 100),
    "K_IC": (30, 30),
}
CERAMIC = {
    "id": "ceramic",
    "family": "ceramic",
    "E": (400, 400),
    "rho": (3900, 3900),
    "sigma_y": (400, 400),
    "sigma_ts": (400, 400),
    "sigma_e": (300, 300),
    "K_IC": (4, 4),
}


def _spec(function="beam", constraints=(), screen=None, section=None, **part):
    base = {"function": function, "length": "1 m", "force": "200 N"}
    if function == "beam":
        base |= {"support": "simply-supported", "load": "centre"}
    return spec_from_dict(
        {
            "part": base | part,
            "section": section or {"free": "scale"},
            "constraint": list(constraints),
            "screen": screen or {},
        }
    )


def test_coupled_stiffness_frequency_fatigue_beam_worked_by_hand():
    # Simply supported beam, centre load 200 N, span 1 m, solid square section (I = A²/12,
    # Z = A^1.5/6), E = 70 GPa, ρ = 2700 kg/m³, σ_e = 100 MPa, SF = 2 (worked by hand):
    #   stiffness δ = F·L³/(48·E·I) ≤ 2 mm:  I = 200/(48·70e9·0.002) = 2.976e-8 m⁴, A = √(12·I)
    #   frequency f1 = π/(2L²)·√(E·A/(12ρ)) ≥ 60 Hz:  A = 12ρ/E·(2·L²·f/π)²
    #   fatigue σ = F·L/(4·Z) ≤ σ_e/SF:  Z = SF·F·L/(4·σ_e) = 1e-6 m³, A = (6·Z)^(2/3)
    a_stiff = math.sqrt(12 * 200 / (48 * 70e9 * 0.002))
    a_freq = 12 * 2700 / 70e9 * (2 * 60 / math.pi) ** 2
    a_fat = (6 * 2 * 200 / (4 * 100e6)) ** (2 / 3)
    assert a_freq > a_stiff > a_fat  # frequency governs: 6.75, 5.98, 3.30 cm²
    constraints = [
        {"type": "stiffness", "max_deflection": "2 mm"},
        {"type": "frequency", "min_frequency": "60 Hz"},
        {"type": "fatigue", "safety_factor": 2},
    ]
    row = select(_spec(constraints=constraints), make_table([ALUMINIUM])).shortlist.iloc[0]
    assert row["governing"] == "frequency"
    assert row["mass"] == pytest.approx(a_freq * 1.0 * 2700, rel=1e-9)
    util = row["utilisation"]
    assert util["frequency"] == pytest.approx(1.0, rel=1e-9)
    assert util["stiffness"] == pytest.approx((a_stiff / a_freq) ** 2, rel=1e-9)  # u ∝ 1/I ∝ A⁻²
    assert util["fatigue"] == pytest.approx((a_fat / a_freq) ** 1.5, rel=1e-9)  # u ∝ 1/Z ∝ A^-1.5


def test_fatigue_with_a_mean_stress_sizes_on_the_goodman_strength():
    # Tie, F = 10 kN peak, R = 0, σ_e = 100, σ_ts = 300 MPa: σ_R = 2/(1/100 + 1/300) = 150 MPa;
    # SF = 1.5 gives A = 1.5·10e3/150e6 = 100 mm² (worked by hand).
    constraints = [{"type": "fatigue", "load_ratio": 0, "safety_factor": 1.5}]
    sel = select(_spec("tie", constraints, force="10 kN"), make_table([ALUMINIUM]))
    row = sel.shortlist.iloc[0]
    assert row["volume"] / 1.0 == pytest.approx(100e-6, rel=1e-9)
    assert sel.derivations[0].index_text == "σ_R/ρ"


def test_brittle_classes_leave_a_strength_sized_tie_unless_asked():
    strength = [{"type": "strength", "safety_factor": 2}]
    table = make_table([ALUMINIUM, CERAMIC])
    sel = select(_spec("tie", strength), table)
    assert list(sel.shortlist["id"]) == ["alu"]
    reason = " ".join(sel.rejected.set_index("id").loc["ceramic", "reasons"])
    assert "brittle: K_IC 4–4 MPa·m½ is below 15 MPa·m½" in reason and "allow_brittle" in reason
    allowed = select(_spec("tie", strength, screen={"allow_brittle": True}), table)
    assert set(allowed.shortlist["id"]) == {"alu", "ceramic"}
    cracked = [*strength, {"type": "fracture", "crack_length": "1 mm", "safety_factor": 2}]
    with_crack = select(_spec("tie", cracked), table).shortlist.set_index("id")
    assert with_crack.loc["ceramic", "governing"] == "fracture"
    assert with_crack.index[0] == "alu"  # the crack makes the ceramic heavier than the metal


def test_columns_keep_brittle_classes():
    spec = _spec("column", [{"type": "strength"}, {"type": "buckling"}], support="pinned-pinned")
    sel = select(spec, make_table([ALUMINIUM, CERAMIC]))
    assert set(sel.shortlist["id"]) == {"alu", "ceramic"}


def test_a_class_without_an_endurance_limit_is_rejected_with_the_reason():
    no_data = ALUMINIUM | {"id": "unknown", "sigma_e": (math.nan, math.nan)}
    constraints = [{"type": "stiffness", "max_deflection": "2 mm"}, {"type": "fatigue"}]
    sel = select(_spec(constraints=constraints), make_table([ALUMINIUM, no_data]))
    assert list(sel.shortlist["id"]) == ["alu"]
    reasons = sel.rejected.set_index("id").loc["unknown", "reasons"]
    assert "no data for sigma_e, which the fatigue constraint needs" in reasons


def test_tie_frequency_is_a_screen_on_the_class():
    # f1 = √(E/ρ)/(2L): aluminium 5092 m/s over a 2 m tie is 1273 Hz (worked by hand); a limit of
    # 1500 Hz rejects it whatever its size, and the output says the check sets no size.
    soft = ALUMINIUM | {"id": "steel", "E": (200, 200), "rho": (7850, 7850)}  # √(E/ρ) = 5048 m/s
    fast = ALUMINIUM | {"id": "stiff", "E": (400, 400), "rho": (3000, 3000), "K_IC": (40, 40)}
    constraints = [{"type": "strength"}, {"type": "frequency", "min_frequency": "1500 Hz"}]
    sel = select(_spec("tie", constraints, length="2 m"), make_table([ALUMINIUM, soft, fast]))
    assert list(sel.shortlist["id"]) == ["stiff"]
    assert any("frequency sets no size" in n for n in sel.notes)
    reason = " ".join(sel.rejected.set_index("id").loc["alu", "reasons"])
    assert "fails frequency (utilisation 1.18)" in reason  # 1500/1273 = 1.18
    assert sel.derivations[0].constraint == "strength"  # the screen never ranks


def test_json_uses_the_type_names():
    constraints = [
        {"type": "strength"},
        {"type": "fracture", "crack_length": "0.5 mm"},
        {"type": "fatigue"},
        {"type": "frequency", "min_frequency": "20 Hz"},
    ]
    sel = select(_spec(constraints=constraints), make_table([ALUMINIUM]))
    out = json.loads(tables.render_selection(sel, "json", "si", None, False))
    text = json.dumps(out)
    for kind in ("strength", "fracture", "fatigue", "frequency"):
        assert f'"{kind}"' in text
    assert sel.shortlist.iloc[0]["governing"] in ("strength", "fracture", "fatigue", "frequency")


@pytest.mark.parametrize(
    ("constraint", "where", "message"),
    [
        ({"type": "fatigue", "crack_length": "1 mm"}, "spec: constraint[0].crack_length", "does not apply"),
        ({"type": "fracture", "criterion": "leak-before-break"}, "spec: constraint[0].criterion", "cylinder"),
        ({"type": "frequency", "min_frequency": "3 mm"}, "spec: constraint[0].min_frequency", "(Hz"),
        ({"type": "frequency", "min_frequency": "-3 Hz"}, "spec: constraint[0].min_frequency", "above zero"),
        ({"type": "frequency", "safety_factor": 2}, "constraint[0].safety_factor", "no safety factor"),
    ],
)
def test_misplaced_failure_fields_are_one_clear_line(constraint, where, message):
    with pytest.raises(InputError) as err:
        select(_spec("tie", [constraint]), make_table([ALUMINIUM]))
    assert str(err.value).startswith(where) and message in str(err.value)


def test_rpm_counts_turns():
    # A shaft limit given as a speed: 1500 rpm is 25 Hz (not 157 rad/s).
    constraints = [{"type": "strength"}, {"type": "frequency", "min_frequency": "1500 rpm"}]
    spec = spec_from_dict(
        {
            "part": {"function": "shaft", "length": "1 m", "torque": "50 N*m"},
            "section": {"shape": "round", "free": "scale"},
            "constraint": constraints,
        }
    )
    row = select(spec, make_table([ALUMINIUM])).shortlist.iloc[0]
    d = row["dimensions"]["d"]
    f1 = math.pi / 2 * math.sqrt(70e9 * d**2 / 16 / 2700)  # √(EI/(ρA)) = d/4·√(E/ρ) for a round bar
    assert 25 / f1 == pytest.approx(row["utilisation"]["frequency"], rel=1e-9)
    assert np.isfinite(row["mass"])


@pytest.mark.parametrize("example", ["greenhouse-tie-rod.toml", "enclosure-lid.toml"])
def test_bundled_tie_and_lid_lead_with_a_tough_class_unless_brittle_is_allowed(example):
    # Before the brittle rule a ceramic led both on strength and stiffness per kilogram.
    from selector.inputs.spec import EXAMPLES, load_spec

    spec = load_spec(EXAMPLES / example)
    shortlist = select(spec).shortlist
    assert shortlist["family"].iat[0] not in ("ceramic", "glass", "mineral")
    assert (shortlist["K_IC_high"].dropna() >= 15).all()  # classes without K_IC carry a note instead
    opened = spec.model_copy(update={"screen": {**spec.screen, "allow_brittle": True}})
    assert (select(opened).shortlist["K_IC_high"] < 15).any()  # brittle classes are back


def test_a_goodman_index_renders_in_every_table_format():
    constraints = [{"type": "fatigue", "load_ratio": 0, "safety_factor": 2}]
    sel = select(_spec("tie", constraints, force="5 kN"), make_table([ALUMINIUM]))
    for fmt in ("table", "csv", "json", "md"):
        assert "alu" in tables.render_selection(sel, fmt, "si", None, False)
