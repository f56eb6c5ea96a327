"""The property registry: the one place that says what each property is.

Every other module reads symbols, units and bounds from here. The data table
stores engineering units (``stored``); ``to_si`` converts once for computation.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    import numpy as np


def typical_value(low: Any, high: Any, log: bool = True) -> np.ndarray:
    """The typical value of a range [low, high], the one definition every step uses.

    On a log scale it is the geometric mean √(low·high); on a linear scale the
    midpoint (low + high)/2. Works element-wise on arrays; a negative product on a
    log scale gives NaN (no warning). Any unit, the result is in the same one.
    """
    import numpy as np

    lo, hi = np.asarray(low, dtype=float), np.asarray(high, dtype=float)
    with np.errstate(invalid="ignore"):
        return np.sqrt(lo * hi) if log else (lo + hi) / 2


@dataclass(frozen=True)
class Property:
    """One material property.

    Attributes:
        symbol: column stem in the data (``E`` gives ``E_low`` and ``E_high``).
        name: plain-English name.
        stored: unit of the values in the table (a pint-readable string).
        label: the same unit written for people.
        si_factor: multiply a stored value by this to get SI base units.
        us: US customary unit (pint-readable) for ``--units us``.
        us_label: the US unit written for people.
        lower, upper: physical sanity bounds, in the stored unit.
        log: plot and average on a log scale.
        positive: values must be > 0.
        core: must be present for every class (never "n/a").
    """

    symbol: str
    name: str
    stored: str
    label: str
    si_factor: float
    us: str
    us_label: str
    lower: float
    upper: float
    log: bool = True
    positive: bool = True
    core: bool = False

    @property
    def low(self) -> str:
        return f"{self.symbol}_low"

    @property
    def high(self) -> str:
        return f"{self.symbol}_high"

    def typical(self, low: Any, high: Any) -> np.ndarray:
        """The typical value of this property's range (``typical_value`` on its own scale)."""
        return typical_value(low, high, self.log)


def _p(*args: Any, **kwargs: Any) -> Property:
    return Property(*args, **kwargs)


PROPERTIES: dict[str, Property] = {
    p.symbol: p
    for p in (
        _p("rho", "density", "kg/m^3", "kg/m³", 1.0, "lb/in^3", "lb/in³", 1.0, 25_000.0, core=True),
        _p("E", "Young's modulus", "GPa", "GPa", 1e9, "Msi", "Msi", 1e-5, 1200.0, core=True),
        _p("G", "shear modulus", "GPa", "GPa", 1e9, "Msi", "Msi", 1e-6, 600.0),
        _p(
            "nu",
            "Poisson's ratio",
            "dimensionless",
            "–",
            1.0,
            "dimensionless",
            "–",
            -1.0,
            0.5,
            log=False,
            positive=False,
        ),
        _p(
            "sigma_y",
            "yield strength (elastic limit)",
            "MPa",
            "MPa",
            1e6,
            "ksi",
            "ksi",
            1e-3,
            10_000.0,
            core=True,
        ),
        _p("sigma_ts", "tensile strength", "MPa", "MPa", 1e6, "ksi", "ksi", 1e-3, 10_000.0, core=True),
        _p("sigma_c", "compressive strength", "MPa", "MPa", 1e6, "ksi", "ksi", 1e-3, 20_000.0, core=True),
        _p(
            "elongation",
            "elongation at break",
            "percent",
            "%",
            0.01,
            "percent",
            "%",
            0.0,
            1500.0,
            positive=False,
        ),
        _p("K_IC", "fracture toughness", "MPa*m^0.5", "MPa·m½", 1e6, "ksi*in^0.5", "ksi·in½", 1e-4, 300.0),
        _p("sigma_e", "fatigue strength at 10^7 cycles", "MPa", "MPa", 1e6, "ksi", "ksi", 1e-4, 5_000.0),
        _p(
            "T_max",
            "maximum service temperature",
            "degC",
            "°C",
            1.0,
            "degF",
            "°F",
            -273.15,
            4000.0,
            log=False,
            positive=False,
        ),
        _p(
            "T_min",
            "minimum service temperature",
            "degC",
            "°C",
            1.0,
            "degF",
            "°F",
            -273.15,
            4000.0,
            log=False,
            positive=False,
        ),
        _p(
            "lambda",
            "thermal conductivity",
            "W/(m*K)",
            "W/(m·K)",
            1.0,
            "BTU/(hour*foot*degF)",
            "BTU/(h·ft·°F)",
            1e-3,
            2500.0,
        ),
        _p(
            "alpha",
            "thermal expansion coefficient",
            "1e-6/K",
            "µstrain/K",
            1e-6,
            "1e-6/degF",
            "µstrain/°F",
            1e-2,
            1000.0,
        ),
        _p(
            "c_p",
            "specific heat",
            "J/(kg*K)",
            "J/(kg·K)",
            1.0,
            "BTU/(lb*degF)",
            "BTU/(lb·°F)",
            50.0,
            10_000.0,
        ),
        _p("price", "price", "USD/kg", "USD/kg", 1.0, "USD/lb", "USD/lb", 1e-3, 100_000.0, core=True),
        _p(
            "co2",
            "embodied CO2, primary production",
            "kg/kg",
            "kg CO2e/kg",
            1.0,
            "lb/lb",
            "lb CO2e/lb",
            1e-3,
            1000.0,
        ),
        _p(
            "energy",
            "embodied energy, primary production",
            "MJ/kg",
            "MJ/kg",
            1e6,
            "BTU/lb",
            "BTU/lb",
            1e-2,
            10_000.0,
        ),
        # Sandwich-core properties: out of plane for honeycombs, equal to E and G for isotropic
        # foams and end-grain wood; "n/a" for classes not made as cores (materials_db/SOURCES.md).
        _p("E_core", "core modulus, out of plane", "GPa", "GPa", 1e9, "Msi", "Msi", 1e-5, 1200.0),
        _p("G_core", "core shear modulus, transverse", "GPa", "GPa", 1e9, "Msi", "Msi", 1e-6, 600.0),
        _p("tau_core", "core shear strength, transverse", "MPa", "MPa", 1e6, "ksi", "ksi", 1e-3, 10_000.0),
    )
}
"""Every property, keyed by symbol, in the order of the data table."""

DERIVED_PROPERTIES: dict[str, Property] = {
    "sigma_R": _p(
        "sigma_R",
        "fatigue strength at the load ratio (Goodman)",
        "MPa",
        "MPa",
        1e6,
        "ksi",
        "ksi",
        1e-4,
        5_000.0,
    ),
}
"""Properties computed from stored ones for one requirement (columns added by the pipeline, never
read from a data file): sigma_R from sigma_e and sigma_ts at the fatigue load ratio."""


def property_of(symbol: str) -> Property:
    """A stored or derived property by symbol (KeyError for neither)."""
    return PROPERTIES[symbol] if symbol in PROPERTIES else DERIVED_PROPERTIES[symbol]


FAMILIES: tuple[str, ...] = (
    "metal",
    "polymer",
    "composite",
    "ceramic",
    "glass",
    "foam",
    "natural",
    "elastomer",
    "mineral",
)
"""The nine families, in the order that fixes their chart colours."""

RATINGS: dict[str, str] = {
    "fresh_water": "resistance to fresh water",
    "salt_water": "resistance to salt water",
    "uv": "resistance to sunlight (UV)",
    "flammability": "resistance to burning",
}
"""Durability ratings; every one reads 'higher is better'."""

RATING_LEVELS: tuple[str, ...] = ("poor", "fair", "good", "excellent")
"""Our rating scale, worst to best."""

NOT_APPLICABLE = "n/a"
"""The one spelling of "no value" in a data cell or field: the property does not apply to the
class, or its value is unknown (an empty CSV cell or a TOML field left out mean the same)."""

OTHER_MISSING_WORDS = frozenset({"", "na", "n.a.", "nan", "none", "null", "nil", "unknown", "-", "--", "?"})
"""Other ways people write "no value" (compared without case); refused with a pointer to n/a."""


def misspelt_missing(text: str) -> bool:
    """True when ``text`` means "no value" but is not written ``n/a`` (N/A, NaN, none, -, ...)."""
    word = text.strip().lower()
    return text.strip() != NOT_APPLICABLE and (word in OTHER_MISSING_WORDS or word in ("n/a", "#n/a"))


MISSING_HINT = f"write {NOT_APPLICABLE!r} for a value that is unknown or does not apply"

HIGH_IS_UNFAVOURABLE = frozenset({"rho", "price", "co2", "energy"})
"""Properties whose high end is the unfavourable one when a part is sized (for the rest, the low end)."""

TEXT_COLUMNS: tuple[str, ...] = ("id", "name", "short_name", "family", "directions", "note", "source")


def data_columns() -> list[str]:
    """Every column of a complete materials table, in order."""
    cols = ["id", "name", "short_name", "family"]
    for prop in PROPERTIES.values():
        cols += [prop.low, prop.high]
    return cols + list(RATINGS) + ["directions", "note", "source"]


def get(symbol: str) -> Property:
    """The property with this symbol; raises InputError naming the nearest ones."""
    try:
        return PROPERTIES[symbol]
    except KeyError:
        from selector.errors import InputError
        from selector.suggest import did_you_mean

        raise InputError(
            "property", f"unknown property {symbol!r}", did_you_mean(symbol, PROPERTIES)
        ) from None
