"""The one place that chooses the units numbers are shown in.

Computation and the table keep stored units (GPa, MPa, kg/m³ ...). People read an
index the way published property charts state it: density in Mg/m³ inside the index
unit (E^(1/2)/ρ in GPa^(1/2)/(Mg/m³), about 3 for aluminium alloys), powers of one
unit added and cancelled (K_IC²/σ_y in MPa·m), and an energy-type index, a strength
squared over a modulus, as elastic energy stored per what the design pays in: per
cubic metre, kilogram, US dollar, kg CO2e or MJ embodied (kJ/USD for a spring bought
on price). Of the prefixes an index may take, the one chosen reads the leaders and the
median of the shortlist between 0.1 and 1000. A property range is shown in a unit that
suits its size: a rubber's modulus in MPa, not 0.0007 GPa. ``--units us`` uses US
customary units for all of these (in·lbf, ft·lbf, kip·in or kip·ft for energies);
embodied carbon stays in kg CO2e per kg, a unit used the world over."""

from __future__ import annotations

import functools
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
BTU = 1055.05585262
"""J per British thermal unit (International Table: 4.1868 J/(g·K) × 453.59237 g × 5/9 K, exact)."""
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
        return Shown(prop.us_label, _linear_factor(prop.stored, prop.us, symbol))
    return Shown(prop.label, 1.0)


@functools.cache
def _linear_factor(stored: str, us: str, symbol: str) -> float:
    """The factor from ``stored`` to ``us`` (pint's), or NaN where the two differ by an offset
    (°C to °F), whose values are converted one by one."""
    from selector.inputs.units import convert

    zero, one = float(convert(0.0, stored, us, symbol)), float(convert(1.0, stored, us, symbol))
    return one if abs(zero) <= 1e-12 * abs(one) else math.nan


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


# Pressure atoms an index unit may re-prefix, smallest first (label, size in the smallest).
_PRESSURES: dict[str, tuple[tuple[str, float], ...]] = {
    "si": (("kPa", 1.0), ("MPa", 1e3), ("GPa", 1e6)),
    "us": (("psi", 1.0), ("ksi", 1e3), ("Msi", 1e6)),
}
# Energies an energy-type index may read in, smallest first (label, J), and the one preferred.
_ENERGIES: dict[str, tuple[tuple[str, float], ...]] = {
    "si": (("J", 1.0), ("kJ", 1e3), ("MJ", 1e6), ("GJ", 1e9)),
    "us": (("in·lbf", LBF_IN), ("ft·lbf", 12 * LBF_IN), ("kip·in", 1e3 * LBF_IN), ("kip·ft", 12e3 * LBF_IN)),
}
_PREFERRED_ENERGY = {"si": "kJ", "us": "ft·lbf"}
# What an energy-type index stores its energy per: (label, size in SI) in each system.
_PER: dict[str, dict[str, tuple[str, float]]] = {
    "volume": {"si": ("m³", 1.0), "us": ("in³", INCH**3)},
    "area": {"si": ("m²", 1.0), "us": ("in²", INCH**2)},
    "mass": {"si": ("kg", 1.0), "us": ("lb", POUND)},
    "cost": {"si": ("USD", 1.0), "us": ("USD", 1.0)},
    "co2": {"si": ("kg CO2e", 1.0), "us": ("kg CO2e", 1.0)},
    "energy": {"si": ("MJ", 1e6), "us": ("kBtu", 1e3 * BTU)},
}
_PER_DENSITY = {(): "mass", ("price",): "cost", ("co2",): "co2", ("energy",): "energy"}
"""The energy kind of a strength squared over a modulus, per density and per what else (price ...)."""


def _atoms(label: str) -> list[tuple[str, float]]:
    """A property's unit label as atoms with powers: "MPa·m½" gives MPa¹·m^½; a quotient stays whole."""
    if "/" in label or "·" not in label:
        return [(label, 1.0)]
    return [(a[:-1], 0.5) if a.endswith("½") else (a, 1.0) for a in label.split("·")]


def _index_part(symbol: str, units: str) -> tuple[str, float]:
    """(label, factor from stored) of one property inside an index unit."""
    if symbol == "rho":
        return ("Mg/m³", 1e-3) if units == "si" else ("lb/in³", INCH**3 / POUND)
    if symbol == "price" and units == "us":
        return "USD/lb", POUND
    if symbol == "energy" and units == "us":
        return "BTU/lb", 1e6 / BTU * POUND
    if symbol == "co2" or units == "si":
        return property_of(symbol).label, 1.0
    shown = _factor_to(symbol, units)
    return shown.label, shown.factor


_FRACTIONS = (("1/2", 0.5), ("1/3", 1 / 3), ("2/3", 2 / 3), ("1/4", 0.25), ("3/4", 0.75), ("3/2", 1.5))


def _power(atom: str, p: float) -> str:
    """A power as written after an atom: m½ for a root of a length (as in MPa·m½), ^(1/3), ^2."""
    if atom in ("m", "in") and math.isclose(abs(p), 0.5):
        return "½"
    for text, value in _FRACTIONS:
        if math.isclose(abs(p), value, rel_tol=1e-9):
            return f"^({text})"
    return "" if math.isclose(abs(p), 1.0) else f"^{abs(p):.3g}"


def _join(atoms: Mapping[str, float]) -> str:
    """An index unit from its atoms and their powers: numerator, then the denominator after one slash."""

    def bracket(label: str) -> str:
        return f"({label})" if any(ch in label for ch in "/· ") else label

    up = [bracket(a) + _power(a, p) for a, p in atoms.items() if p > 0]
    down = [bracket(a) + _power(a, p) for a, p in atoms.items() if p < 0]
    if not up and not down:
        return "–"
    top = "·".join(up) or "1"
    if not down:
        return top
    return f"{top}/" + (down[0] if len(down) == 1 else "(" + "·".join(down) + ")")


def _simplified(exponents: Mapping[str, float], units: str) -> tuple[dict[str, float], float]:
    """The atoms of an index unit with the powers of each added and those that cancel gone.

    Only the same atom cancels: MPa over GPa stays MPa/GPa (σ_y/E reads as a strain in
    thousandths, about 1 for a steel), since folding the two would hide a factor of 1000
    in a bare number. Quotients such as Mg/m³ and USD/kg are atoms of their own, as
    published charts write them, so E^(1/2)/(C_m·ρ) keeps (USD/kg)·(Mg/m³).
    """
    atoms: dict[str, float] = {}
    factor = 1.0
    for symbol, p in exponents.items():
        label, f = _index_part(symbol, units)
        factor *= f**p
        for atom, q in _atoms(label):
            atoms[atom] = atoms.get(atom, 0.0) + p * q
    return {a: p for a, p in atoms.items() if not math.isclose(p, 0.0, abs_tol=1e-9)}, factor


def _energy_kind(exponents: Mapping[str, float]) -> str | None:
    """What an energy-type index stores energy per: "volume", "area", "mass", "cost", "co2" or "energy".

    Energy-type: a modulus below, strengths and K_IC above, to one power of stress in all:
    σ_y²/E (J/m³), K_IC²/E (toughness, J/m²), and σ_y²/E per density (J/kg), per density
    and price (J/USD), embodied carbon (J/kg CO2e) or embodied energy (J/MJ). None otherwise.
    """
    strengths = sum(p for s, p in exponents.items() if s in STRENGTHS)
    moduli = sum(p for s, p in exponents.items() if s in MODULI)
    toughness = exponents.get("K_IC", 0.0)
    rest = {s: p for s, p in exponents.items() if s not in STRENGTHS and s not in MODULI and s != "K_IC"}
    if moduli >= 0 or strengths < 0 or toughness < 0 or strengths + toughness <= 0:
        return None
    if not math.isclose(strengths + moduli + toughness, 1.0):
        return None
    if math.isclose(toughness, 2.0):
        return "area" if not rest else None
    if not math.isclose(toughness, 0.0):
        return None
    if not rest:
        return "volume"
    if not math.isclose(rest.pop("rho", 0.0), -1.0) or any(not math.isclose(p, -1.0) for p in rest.values()):
        return None
    return _PER_DENSITY.get(tuple(sorted(rest)))


@dataclass(frozen=True)
class _Choice:
    shown: Shown
    steps: int
    """How far the unit is from the preferred one (prefix steps)."""


def _energy_choices(kind: str, exponents: Mapping[str, float], units: str) -> list[_Choice]:
    """The energy units an energy-type index may read in, each with its steps from the preferred one."""
    si = math.prod(property_of(s).si_factor ** p for s, p in exponents.items())
    per, per_size = _PER[kind][units]
    energies = _ENERGIES[units]
    preferred = _PREFERRED_ENERGY[units]
    if units == "us" and kind in ("volume", "area"):  # per in³ or in²: inch energies (psi, ksi)
        energies, preferred = tuple(e for e in energies if "in" in e[0].split("·")), "in·lbf"
    at = [e[0] for e in energies].index(preferred)
    return [
        _Choice(Shown(f"{label}/{per}", si * per_size / size), abs(i - at))
        for i, (label, size) in enumerate(energies)
    ]


def _prefix_choices(exponents: Mapping[str, float], units: str) -> list[_Choice]:
    """The index unit as built, and with its leading stress atom re-prefixed (GPa^(1/3), MPa^(1/3))."""
    atoms, factor = _simplified(exponents, units)
    built = _Choice(Shown(_join(atoms), factor), 0)
    scale = dict(_PRESSURES[units])
    pressures = [a for a in atoms if a in scale]
    if not pressures:
        return [built]
    lead = max(pressures, key=lambda a: (atoms[a] > 0, abs(atoms[a])))
    names = list(scale)
    choices = []
    for i, other in enumerate(names):
        moved: dict[str, float] = {}
        for atom, q in atoms.items():
            key = other if atom == lead else atom
            moved[key] = moved.get(key, 0.0) + q
        moved = {a: q for a, q in moved.items() if not math.isclose(q, 0.0, abs_tol=1e-9)}
        k = factor * (scale[lead] / scale[other]) ** atoms[lead]
        choices.append(_Choice(Shown(_join(moved), k), abs(i - names.index(lead))))
    return choices


def _outside(x: float) -> float:
    """How many decades ``x`` lies outside the readable band (0 inside it)."""
    if not (math.isfinite(x) and x > 0):
        return math.inf
    low, high = READABLE
    if low <= x < high:
        return 0.0
    return max(math.log10(low / x), math.log10(x / high), 1e-9)


def _spread(values: Sequence[float] | np.ndarray | None) -> tuple[float, float]:
    """The highest and the median of the positive finite values (NaN for none)."""
    arr = np.asarray([] if values is None else values, dtype=float)
    arr = arr[np.isfinite(arr) & (arr > 0)]
    return (float(arr.max()), float(np.median(arr))) if arr.size else (math.nan, math.nan)


def _chosen(choices: Sequence[_Choice], values: Sequence[float] | np.ndarray | None) -> Shown:
    """The band rule: the unit in which the leader and the median both read in [0.1, 1000).

    Where several do, the nearest to the preferred unit, then the one with larger numbers;
    where none does, the leader decides (the unit that puts the highest value in the band,
    then the median as near to it as the unit allows). No values: the preferred unit.
    """
    top, median = _spread(values)
    if not math.isfinite(top):
        return min(choices, key=lambda c: c.steps).shown

    def key(c: _Choice) -> tuple[bool, float, float, int, float]:
        lead, mid = _outside(top * c.shown.factor), _outside(median * c.shown.factor)
        return (lead > 0 or mid > 0, lead, mid, c.steps, -c.shown.factor)

    return min(choices, key=key).shown


def index_unit(
    exponents: Mapping[str, float], units: str = "si", values: Sequence[float] | np.ndarray | None = None
) -> Shown:
    """The unit an index is shown in, and the factor from its value in stored units.

    The unit is built from each property's unit (density in Mg/m³ or lb/in³), powers of
    the same atom added and cancelled: K_IC²/σ_y reads in MPa·m, K_IC/σ_y in m½
    (``_simplified`` says what cancels). An energy-type index reads as elastic energy per
    what it is bought by: J/m³, J/m² (K_IC²/E), J/kg, J/USD, J/kg CO2e or J/MJ, with
    in·lbf, ft·lbf, kip·in or kip·ft per in³, in², lb, USD ... for ``--units us``.

    ``values`` are the index values (stored units) of the classes shown. Of the units an
    index may take (the energy's prefix, or its leading stress or modulus re-prefixed:
    GPa^(1/3) or MPa^(1/3)), the one chosen puts the highest value (the leaders) and the
    median both between 0.1 and 1000, keeping the preferred unit (the published one, kJ
    for energies, ft·lbf in US units, in·lbf per in³ or in²) where it does; where no unit
    can, the leaders are read in the band and the median as near to it as a prefix allows.
    """
    kind = _energy_kind(exponents)
    choices = _energy_choices(kind, exponents, units) if kind else _prefix_choices(exponents, units)
    return _chosen(choices, values)


# Quantities inside texts: a number or a range ("6–20", "1 to 10", "0 and -20") and a unit,
# either a property's stored label (as the pipeline writes reasons) or a unit written in prose.
_LABELS = {p.label: p for p in PROPERTIES.values() if p.label not in ("–", "%")}
_PROSE_UNITS = {
    # written unit: (pint unit it is, US pint unit, US label)
    "mm": ("mm", "in", "in"),
    "m": ("m", "ft", "ft"),
    "J": ("J", "ft*lbf", "ft·lbf"),
    "kN": ("kN", "lbf", "lbf"),
    "N": ("N", "lbf", "lbf"),
    "degC": ("degC", "degF", "°F"),
}
_NUMBER = r"-?\d+(?:\.\d+)?(?:e[-+]?\d+)?"
_UNIT_WORDS = "|".join(re.escape(x) for x in sorted([*_LABELS, *_PROSE_UNITS], key=len, reverse=True))
_QUANTITY = re.compile(
    rf"(?<![\w.-])(?P<low>{_NUMBER})(?:(?P<sep>–|-| to | and )(?P<high>{_NUMBER}))? "
    rf"(?P<unit>{_UNIT_WORDS})(?![\w/·²³½])"
)


def text_in_units(text: str, units: str, quoted: bool = False) -> str:
    """A message with its quantities ("6–20 MPa·m½", "300 mm", "27 J") in ``units``.

    ``quoted`` keeps each quantity as written and adds the converted one in brackets,
    for text quoting a standard ("t up to 16 mm [0.63 in]").
    """
    if units != "us":
        return text
    from selector.inputs.units import convert, format_number

    def repl(match: re.Match[str]) -> str:
        unit = match.group("unit")
        if unit in _PROSE_UNITS:
            stored, us, label = _PROSE_UNITS[unit]
        else:
            prop = _LABELS[unit]
            stored, us, label = prop.stored, prop.us, prop.us_label
        if stored == us:
            return match.group(0)
        out = format_number(float(convert(float(match.group("low")), stored, us)))
        if match.group("high") is not None:
            high = format_number(float(convert(float(match.group("high")), stored, us)))
            out += f"{match.group('sep')}{high}"
        return f"{match.group(0)} [{out} {label}]" if quoted else f"{out} {label}"

    return _QUANTITY.sub(repl, text)


__all__ = ["Shown", "index_unit", "property_unit", "range_unit", "text_in_units"]
