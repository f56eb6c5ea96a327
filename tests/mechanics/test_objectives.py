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
