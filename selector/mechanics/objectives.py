"""What a design minimises: each objective as a monomial per unit volume of material."""

from __future__ import annotations

from selector.mechanics.monomial import Monomial as M

OBJECTIVES = ("mass", "cost", "co2", "volume")

OBJECTIVE_FACTORS: dict[str, M] = {
    "mass": M.of(1, rho=1),
    "cost": M.of(1, price=1, rho=1),
    "co2": M.of(1, co2=1, rho=1),
    "volume": M.of(1),
}
OBJECTIVE_UNITS = {"mass": "kg", "cost": "USD", "co2": "kg CO2e", "volume": "m^3"}
OBJECTIVE_WORDS = {"mass": "mass m", "cost": "cost C", "co2": "embodied CO2", "volume": "volume V"}
