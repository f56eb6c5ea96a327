"""The one place that chooses the units numbers are shown in.

Computation and the table keep stored units (GPa, MPa, kg/m³ ...). People read an
index the way published property charts state it: density in Mg/m³ inside the index
unit (E^(1/2)/ρ in GPa^(1/2)/(Mg/m³), about 3 for aluminium alloys), and an
energy-type index, a strength squared over a modulus, as energy stored per kilogram or
per cubic metre (J, kJ or MJ, whichever puts the typical value between 0.1 and 1000).
A property range is shown in a unit that suits its size: a rubber's modulus in MPa,
not 0.0007 GPa. ``--units us`` uses US customary units for all of these; embodied
carbon stays in kg CO2e per kg, a unit used the world over.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np

from selector.inputs.properties import PROPERTIES, property_of

PSI = 6894.757293168361
"""Pa per psi (exact by definition of the pound-force and the inch)."""
INCH = 0.0254
POUND = 0.45359237
KSI_SQRT_IN = 1e3 * PSI * math.sqrt(INCH)
"""Pa·m^0.5 per ksi·in^0.5 (1.0988e6)."""
LBF_IN = 4.4482216152605 * INCH
"""J per inch-pound-force."""

READABLE = (0.1, 1000.0)
"""The band a shown number should fall in, where a unit can put it there."""

STRENGTHS = ("sigma_y", "sigma_ts", "sigma_c", "sigma_e", "sigma_R", "tau_core")
MODULI = ("E", "G", "E_core", "G_core")


@dataclass(frozen=True)
class Shown:
    """A unit to show numbers in: its label and the factor from the stored unit."""

    label: str
    factor: float


# Per stored unit, the units a value may be shown in, largest first (label, factor from stored).
_SCALES: dict[str, dict[str, tuple[tuple[str, float], ...]]] = {
    "si": {
        "GPa": (("GPa", 1.0), ("MPa", 1e3), ("kPa", 1e6)),
        "MPa": (("GPa", 1e-3), ("MPa", 1.0), ("kPa", 1e3)),
        "MPa*m^0.5": (("MPa·m½", 1.0), ("kPa·m½", 1e3)),
    },
    "us": {
        "GPa": (("Msi", 1e9 / (1e6 * PSI)), ("ksi", 1e9 / (1e3 * PSI)), ("psi", 1e9 / PSI)),
        "MPa": (("ksi", 1e6 / (1e3 * PSI)), ("psi", 1e6 / PSI)),
        "MPa*m^0.5": (("ksi·in½", 1e6 / KSI_SQRT_IN),),
    },
}
_DEFAULT = {"si": {"MPa": "MPa"}, "us": {}}
"""A column's unit when it is not the first of its scales (strengths read in MPa, not GPa)."""


def _factor_to(symbol: str, units: str) -> Shown:
    """The column unit of a property: stored (SI) or its US unit, and the factor from stored."""
    prop = property_of(symbol)
    if symbol == "co2":
        return Shown(prop.label, 1.0)  # kg CO2e per kg in every system
    scales = _SCALES[units].get(prop.stored)
    if scales:
        want = _DEFAULT[units].get(prop.stored, scales[0][0])
        return Shown(*next(s for s in scales if s[0] == want))
    if units == "us" and prop.us != prop.stored:
        return Shown(prop.us_label, float("nan"))  # converted through pint (offset units)
    return Shown(prop.label, 1.0)


def property_unit(symbol: str, units: str = "si") -> Shown:
    """The unit a property's column is shown in (``factor`` is NaN where an offset applies)."""
    return _factor_to(symbol, units)


def range_unit(symbol: str, high: float, units: str = "si") -> Shown:
    """The unit that shows a range whose high end is ``high`` (stored unit) as a readable number.

    The column's unit when the number reads at least 0.1 in it; otherwise the first
    smaller unit in which it does (or the smallest there is).
    """
    prop = property_of(symbol)
    column = _factor_to(symbol, units)
    scales = _SCALES[units].get(prop.stored)
    if not scales or not np.isfinite(high) or high <= 0 or high * column.factor >= READABLE[0]:
        return column
    smaller = scales[[s[0] for s in scales].index(column.label) :]
    return Shown(*next((s for s in smaller if high * s[1] >= READABLE[0]), smaller[-1]))


def _index_part(symbol: str, units: str) -> tuple[str, float]:
    """(label, factor from stored) of one property inside an index unit."""
    if symbol == "rho":
        return ("Mg/m³", 1e-3) if units == "si" else ("lb/in³", INCH**3 / POUND)
    if symbol == "price" and units == "us":
        return "USD/lb", POUND
    if symbol in ("co2", "energy") or units == "si":
        return property_of(symbol).label, 1.0
    shown = _factor_to(symbol, units)
    return shown.label, shown.factor


def _power(p: float) -> str:
    for text, value in (("1/2", 0.5), ("1/3", 1 / 3), ("2/3", 2 / 3), ("1/4", 0.25), ("3/4", 0.75)):
        if math.isclose(abs(p), value, rel_tol=1e-9):
            return f"^({text})"
    return "" if math.isclose(abs(p), 1.0) else f"^{abs(p):.3g}"


def _join(parts: Sequence[tuple[str, float]]) -> str:
    def bracket(label: str) -> str:
        return f"({label})" if any(ch in label for ch in "/· ") else label

    up = [bracket(label) + _power(p) for label, p in parts if p > 0]
    down = [bracket(label) + _power(p) for label, p in parts if p < 0]
    top = "·".join(up) or "1"
    if not down:
        return top
    return f"{top}/" + (down[0] if len(down) == 1 else "(" + "·".join(down) + ")")


def _energy_kind(exponents: Mapping[str, float]) -> str | None:
    """ "volume" or "mass" for a strength squared over a modulus (per density), else None."""
    strengths = sum(p for s, p in exponents.items() if s in STRENGTHS)
    moduli = sum(p for s, p in exponents.items() if s in MODULI)
    rest = {s: p for s, p in exponents.items() if s not in STRENGTHS and s not in MODULI}
    if strengths <= 0 or moduli >= 0 or not math.isclose(strengths + moduli, 1.0):
        return None
    if not rest:
        return "volume"
    if set(rest) == {"rho"} and math.isclose(rest["rho"], -1.0):
        return "mass"
    return None


def _typical(values: Sequence[float] | np.ndarray | None) -> float:
    arr = np.asarray([] if values is None else values, dtype=float)
    arr = arr[np.isfinite(arr) & (arr > 0)]
    return float(np.median(arr)) if arr.size else float("nan")


def index_unit(
    exponents: Mapping[str, float], units: str = "si", values: Sequence[float] | np.ndarray | None = None
) -> Shown:
    """The unit an index is shown in, and the factor from its value in stored units.

    ``values`` are the index values (stored units) of the classes shown; an energy-type
    index takes the prefix that puts their median between 0.1 and 1000.
    """
    kind = _energy_kind(exponents)
    if kind is not None:
        si = math.prod(property_of(s).si_factor ** p for s, p in exponents.items())
        if units == "us":
            label, per = (
                ("in·lbf/in³", LBF_IN / INCH**3) if kind == "volume" else ("ft·lbf/lb", 12 * LBF_IN / POUND)
            )
            return Shown(label, si / per)
        typical = _typical(values) * si
        prefixes = (("J", 1.0), ("kJ", 1e3), ("MJ", 1e6), ("GJ", 1e9))
        chosen = prefixes[1]
        if math.isfinite(typical):
            chosen = next((x for x in prefixes if typical / x[1] < READABLE[1]), prefixes[-1])
        return Shown(f"{chosen[0]}/{'m³' if kind == 'volume' else 'kg'}", si / chosen[1])
    parts = [(*_index_part(s, units), p) for s, p in exponents.items()]
    label = _join([(label, p) for label, _f, p in parts])
    return Shown(label, math.prod(f**p for _label, f, p in parts))


# Quantities inside reason texts, as the pipeline writes them: a number or a range and a stored label.
_LABELS = {p.label: p for p in PROPERTIES.values() if p.label not in ("–", "%")}
_QUANTITY = re.compile(
    r"(?P<low>-?\d+(?:\.\d+)?(?:e[-+]?\d+)?)(?:–(?P<high>-?\d+(?:\.\d+)?(?:e[-+]?\d+)?))? "
    r"(?P<unit>" + "|".join(re.escape(x) for x in sorted([*_LABELS, "mm"], key=len, reverse=True)) + r")"
    r"(?![\w/·])"
)


def text_in_units(text: str, units: str) -> str:
    """A message with its stored-unit quantities ("6–20 MPa·m½", "300 mm") in ``units``."""
    if units != "us":
        return text
    from selector.inputs.units import convert, format_number

    def repl(match: re.Match[str]) -> str:
        unit = match.group("unit")
        if unit == "mm":
            label, stored, us = "in", "mm", "in"
        else:
            prop = _LABELS[unit]
            label, stored, us = prop.us_label, prop.stored, prop.us
        low = float(convert(float(match.group("low")), stored, us))
        out = format_number(low)
        if match.group("high") is not None:
            out += "–" + format_number(float(convert(float(match.group("high")), stored, us)))
        return f"{out} {label}"

    return _QUANTITY.sub(repl, text)


__all__ = ["Shown", "index_unit", "property_unit", "range_unit", "text_in_units"]
