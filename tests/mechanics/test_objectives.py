"""The objectives: one home for their units, read the same way by every module."""

from __future__ import annotations

import pytest

from selector.inputs.units import magnitude_in
from selector.mechanics.objectives import (
    OBJECTIVE_FACTORS,
    OBJECTIVE_UNITS,
    OBJECTIVES,
    exchange_unit,
    readable_unit,
)
from selector.pipeline.tradeoff import EXCHANGE_LABELS, EXCHANGE_UNITS


def test_every_objective_has_a_factor_and_a_unit():
    assert set(OBJECTIVES) == set(OBJECTIVE_FACTORS) == set(OBJECTIVE_UNITS)


@pytest.mark.parametrize(
    ("objective", "quantity", "si_value"),
    [
        # 1 lb = 0.45359237 kg exactly (international pound, 1959).
        ("mass", "1 lb", 0.45359237),
        # 1 in = 0.0254 m exactly, so 1 in³ = 1.6387064e-5 m³.
        ("volume", "1 in^3", 1.6387064e-5),
        ("co2", "2 kg", 2.0),
        # 1 kWh = 3.6 MJ exactly (SI Brochure, 9th ed., Table 8 — from memory).
        ("energy", "1 kWh", 3.6),
    ],
)
def test_readable_unit_measures_the_objective(objective, quantity, si_value):
    """The parser reads each objective's unit, and with the right dimension."""
    assert magnitude_in(quantity, readable_unit(objective), "test") == pytest.approx(si_value, rel=1e-12)


def test_exchange_units_follow_the_objective_units():
    assert exchange_unit("co2") == "USD/kg CO2e"
    assert exchange_unit("volume") == "USD/m³"
    assert exchange_unit("volume", readable=True) == "USD/m^3"
    assert set(EXCHANGE_UNITS) == set(EXCHANGE_LABELS) == set(OBJECTIVE_UNITS) - {"cost"}
    # 1 USD/lb = 1/0.45359237 USD/kg (international pound).
    assert magnitude_in("1 USD/lb", EXCHANGE_UNITS["mass"], "test") == pytest.approx(1 / 0.45359237)


def test_a_part_minimising_embodied_energy_is_sized_and_ranked_by_it():
    from selector.inputs.spec import spec_from_dict
    from selector.pipeline.selection import select
    from tests.conftest import make_table

    # Invented classes (demo data): a tie of F = 10 kN sized on yield needs A = F/σ_y;
    # "lean" (σ_y 250 MPa, ρ 7850, 25 MJ/kg): A = 4e-5 m², m = 0.314 kg, 7.85 MJ over 1 m;
    # "rich" (σ_y 500 MPa, ρ 2700, 200 MJ/kg): A = 2e-5 m², m = 0.054 kg, 10.8 MJ (by hand).
    table = make_table(
        [
            {"id": "lean", "sigma_y": (250, 250), "rho": (7850, 7850), "energy": (25, 25)},
            {"id": "rich", "sigma_y": (500, 500), "rho": (2700, 2700), "energy": (200, 200)},
        ]
    )
    spec = spec_from_dict(
        {
            "part": {"function": "tie", "length": "1 m", "force": "10 kN"},
            "section": {"shape": "round"},
            "objective": {"minimize": "energy"},
            "constraint": [{"type": "strength"}],
        }
    )
    selection = select(spec, table)
    shortlist = selection.shortlist.set_index("id")
    assert list(selection.shortlist["id"]) == ["lean", "rich"]
    assert shortlist.at["lean", "energy"] == pytest.approx(7.85)
    assert shortlist.at["rich", "energy"] == pytest.approx(10.8)
    assert shortlist.at["lean", "objective_low"] == pytest.approx(7.85)
    assert selection.objective_unit == "MJ"
