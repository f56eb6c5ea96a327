"""What a design minimises: each objective as a monomial per unit volume of material."""

from __future__ import annotations

from selector.mechanics.monomial import Monomial as M

OBJECTIVES = ("mass", "cost", "co2", "energy", "volume")

OBJECTIVE_FACTORS: dict[str, M] = {
    "mass": M.of(1, rho=1),
    "cost": M.of(1, price=1, rho=1),
    "co2": M.of(1, co2=1, rho=1),
    "energy": M.of(1e-6, energy=1, rho=1),  # in MJ: the property is J/kg in SI
    "volume": M.of(1),
}
OBJECTIVE_UNITS: dict[str, str] = {
    "mass": "kg",
    "cost": "USD",
    "co2": "kg CO2e",
    "energy": "MJ",
    "volume": "m³",
}
"""Unit of each objective of a sized part as people read it: the one home of these units."""
OBJECTIVE_WORDS = {
    "mass": "mass m",
    "cost": "cost C",
    "co2": "embodied CO2",
    "energy": "embodied energy",
    "volume": "volume V",
}

_PARSED_AS = {"kg CO2e": "kg", "m³": "m^3"}
"""Shown units the unit parser reads under another spelling (a kilogram of CO2e is a kilogram)."""


def readable_unit(objective: str) -> str:
    """The unit of ``objective`` as the unit parser reads it, e.g. ``"m^3"`` for volume."""
    unit = OBJECTIVE_UNITS[objective]
    return _PARSED_AS.get(unit, unit)


def exchange_unit(objective: str, readable: bool = False) -> str:
    """Unit of an exchange constant pricing ``objective`` in USD: ``"USD/kg CO2e"`` for co2.

    With ``readable`` the unit is spelled for the unit parser (``"USD/kg"``).
    """
    per = readable_unit(objective) if readable else OBJECTIVE_UNITS[objective]
    return f"{OBJECTIVE_UNITS['cost']}/{per}"
