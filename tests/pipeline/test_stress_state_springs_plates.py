"""Stress states, spring forms with their strain limit, and plate edges: worked by hand."""

from __future__ import annotations

import math

import pytest

from selector.errors import InputError
from selector.inputs.spec import spec_from_dict
from selector.mechanics.plates import CLAMPED_K, supported_k
from selector.mechanics.springs import ENERGY_FRACTIONS, wahl_factor
from selector.pipeline.selection import select
from tests.conftest import make_table

# Invented classes (demo data).
ISO = {
    "id": "iso",
    "E": (70, 70),
    "G": (26, 26),
    "sigma_y": (250, 250),
    "sigma_c": (250, 250),
    "rho": (2700, 2700),
}
UD = {**ISO, "id": "ud", "directions": "axial", "sigma_y": (1500, 1500)}


def _spec(part: dict, constraints: list[dict], section: dict | None = None):
    return spec_from_dict({"part": part, "section": section or {}, "constraint": constraints})


VESSEL = {"function": "cylinder", "radius": "40 mm", "length": "200 mm", "pressure": "2 MPa"}


@pytest.mark.parametrize(
    ("part", "section"),
    [
        (VESSEL, {"free": "wall"}),
        ({"function": "sphere", "radius": "40 mm", "pressure": "2 MPa"}, {"free": "wall"}),
        ({"function": "shaft", "length": "0.3 m", "torque": "60 N*m"}, {"shape": "round"}),
    ],
)
def test_one_axis_data_are_not_ranked_for_biaxial_or_shear_states(part, section):
    chosen = select(_spec(part, [{"type": "strength"}], section), make_table([ISO, UD]))
    assert list(chosen.shortlist["id"]) == ["iso"]
    reason = " ".join(chosen.rejected.iloc[0]["reasons"])
    assert "along one axis only" in reason


def test_one_axis_data_are_ranked_for_a_tie():
    tie = {"function": "tie", "length": "1 m", "force": "1 kN"}
    chosen = select(_spec(tie, [{"type": "strength"}], {"shape": "round"}), make_table([ISO, UD]))
    assert list(chosen.shortlist["id"]) == ["ud", "iso"]


def test_energy_fractions():
    # Stored-energy fractions from integrating σ²/2E over the section (Roark, 8th ed. — from memory):
    # uniform 1, rectangular leaf in bending 1/3, solid round bar in torsion 1/2.
    assert ENERGY_FRACTIONS["uniform"] == 1.0
    assert ENERGY_FRACTIONS["leaf"] == pytest.approx(1 / 3)
    assert ENERGY_FRACTIONS["torsion-bar"] == pytest.approx(1 / 2)
    # Wahl factor at C = 8: 31/28 + 0.615/8 = 1.1840 (Shigley, 10th ed., eq. 10-4 — from memory).
    assert wahl_factor(8) == pytest.approx(31 / 28 + 0.615 / 8)
    assert ENERGY_FRACTIONS["coil"] == pytest.approx(1 / (2 * 1.1840**2), rel=1e-4)


def _spring(form: str, sf: float = 1.0):
    part = {"function": "spring", "energy": "15 J", "form": form}
    return _spec(part, [{"type": "strength", "safety_factor": sf}])


def test_leaf_spring_volume_worked_by_hand():
    # U = η·V·σ²/(2E) → V = 2·E·U·SF²/(η·σ_y²) = 2·70e9·15·1.3²/((1/3)·250e6²) = 1.7035e-4 m³.
    row = select(_spring("leaf", 1.3), make_table([ISO])).shortlist.iloc[0]
    assert row["volume"] == pytest.approx(2 * 70e9 * 15 * 1.3**2 / (250e6**2 / 3))
    assert row["governing"] == "strength"


def test_torsion_bar_uses_g_and_the_shear_yield_worked_by_hand():
    # U = V·τ²/(4G), τ ≤ σ_y/√3 → V = 4·G·U/(σ_y²/3) = 4·26e9·15·3/250e6² = 7.488e-5 m³.
    row = select(_spring("torsion-bar"), make_table([ISO])).shortlist.iloc[0]
    assert row["volume"] == pytest.approx(4 * 26e9 * 15 * 3 / 250e6**2)


def test_elastomer_spring_is_held_to_its_elongation_with_the_safety_factor():
    # Rubber-like class: E = 2 MPa, failure stress 25 MPa (strain 12.5 > elongation 6).
    # Strain limit ε = elongation/SF = 6/1.5 = 4: V = 2·U/(E·ε²) = 2·15/(2e6·16) = 9.375e-7 m³,
    # larger than the stress-limited V = 2·E·U·SF²/σ² = 2·2e6·15·2.25/25e6² = 2.16e-7 m³.
    rubber = {
        "id": "rubber",
        "family": "elastomer",
        "E": (0.002, 0.002),
        "sigma_y": (25, 25),
        "elongation": (600, 600),
    }
    row = select(_spring("uniform", 1.5), make_table([rubber])).shortlist.iloc[0]
    assert row["governing"] == "strain"
    assert row["volume"] == pytest.approx(2 * 15 / (2e6 * 4**2))
    assert row["stress"] / 2e6 == pytest.approx(4.0)


def test_form_on_a_tie_is_an_error():
    message = "form does not apply to a tie; a tie takes: function, length, force"
    with pytest.raises(InputError, match=message):
        select(
            _spec(
                {"function": "tie", "length": "1 m", "force": "1 kN", "form": "coil"}, [{"type": "strength"}]
            ),
            make_table([ISO]),
        )


def test_supported_plate_coefficient():
    # Timoshenko & Gere, Theory of Elastic Stability, §9.2 (from memory): k = (m/α + α/m)²,
    # 4 at whole-number α; 4.5 at α = √2·1 between m = 1 and 2: (1/√2 + √2)² = 4.5.
    assert supported_k(1.0) == pytest.approx(4.0)
    assert supported_k(3.0) == pytest.approx(4.0)
    assert supported_k(math.sqrt(2)) == pytest.approx(4.5)
    assert supported_k(0.5) == pytest.approx(6.25)


def _plate(edges: str):
    part = {"function": "plate", "length": "1.2 m", "width": "80 mm", "force": "4 kN", "edges": edges}
    return _spec(part, [{"type": "buckling"}], {"free": "thickness"})


@pytest.mark.parametrize(
    ("edges", "t_expected"),
    [
        # σ_cr = k·π²·E/(12(1−ν²))·(t/b)² = F/(b·t) → t = (12(1−ν²)·F·b/(k·π²·E))^(1/3)
        ("supported", (12 * 0.91 * 4e3 * 0.08 / (4.0 * math.pi**2 * 70e9)) ** (1 / 3)),
        ("clamped", (12 * 0.91 * 4e3 * 0.08 / (CLAMPED_K * math.pi**2 * 70e9)) ** (1 / 3)),
        # free sides: σ_cr = π²·E·t²/(12·L²) = F/(b·t) → t = (12·F·L²/(π²·E·b))^(1/3)
        ("free-sides", (12 * 4e3 * 1.2**2 / (math.pi**2 * 70e9 * 0.08)) ** (1 / 3)),
    ],
)
def test_plate_edges_set_the_thickness(edges, t_expected):
    row = select(_plate(edges), make_table([{**ISO, "sigma_c": (1e4, 1e4)}])).shortlist.iloc[0]
    assert row["dimensions"]["t"] == pytest.approx(t_expected)


def test_free_sides_need_several_times_the_thickness():
    table = make_table([{**ISO, "sigma_c": (1e4, 1e4)}])
    t = {
        e: select(_plate(e), table).shortlist.iloc[0]["dimensions"]["t"] for e in ("supported", "free-sides")
    }
    # t_free/t_supported = (k·L²/((1−ν²)·b²))^(1/3) = (4·1.2²/(0.91·0.08²))^(1/3) = 9.96
    assert t["free-sides"] / t["supported"] == pytest.approx(9.96, rel=1e-3)


def test_panel_edges_other_than_free_sides_are_refused():
    part = {"function": "panel", "length": "0.6 m", "width": "0.4 m", "force": "500 N", "edges": "clamped"}
    with pytest.raises(InputError, match="not supported"):
        select(_spec(part, [{"type": "strength"}], {"free": "thickness"}), make_table([ISO]))
