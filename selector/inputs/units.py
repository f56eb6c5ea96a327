"""The one unit registry, and parsing of quantities such as "2 kN" or "10 Msi".

pint is imported on first use only, so commands that need no units start fast.
"""

from __future__ import annotations

import functools
import math
import re
from typing import TYPE_CHECKING, Any

import numpy as np

from selector.errors import UnitError

if TYPE_CHECKING:  # pragma: no cover
    import pint

_EXTRA_UNITS = (
    "Msi = 1e6 * psi",
    "USD = [currency]",
    "CO2e = [] = co2e",
)
_ABSOLUTE_TEMPERATURES = {"degC", "degF", "degR", "K", "kelvin", "celsius", "fahrenheit"}
_NUMBER = re.compile(r"^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$")


@functools.cache
def registry() -> pint.UnitRegistry:
    """The project's pint registry (built once; about 0.2 s)."""
    import pint

    ureg: pint.UnitRegistry = pint.UnitRegistry(cache_folder=":auto:", autoconvert_offset_to_baseunit=True)
    for definition in _EXTRA_UNITS:
        ureg.define(definition)
    return ureg


def _unit(text: str, where: str) -> tuple[float, Any]:
    """Parse a unit, allowing a leading scale as in ``1e-6/K``: returns (scale, unit)."""
    ureg = registry()
    body = text.strip()
    scale = 1.0
    lead = re.match(r"^(\d+\.?\d*(?:[eE][-+]?\d+)?)\s*(\*?)\s*(.*)$", body)
    if lead:
        scale, rest = float(lead.group(1)), lead.group(3).strip()
        body = rest if not rest.startswith("/") else "1" + rest
        body = "" if body == "1" else body
    if body not in _ABSOLUTE_TEMPERATURES:
        body = re.sub(r"(?<![A-Za-z_])(degF|degC|degR)(?![A-Za-z_])", r"delta_\1", body)
    try:
        if not body:
            return scale, ureg.dimensionless
        if body.startswith("1/"):
            return scale, 1 / ureg.parse_units(body[2:])
        return scale, ureg.parse_units(body)
    except Exception as exc:  # pint raises many kinds on odd text (TokenError, KeyError, ...)
        raise UnitError(
            where, f"unknown unit {text!r}", "a unit such as MPa, GPa, kg/m^3, degC, mm, kN"
        ) from exc


def quantity(text: str, where: str = "value") -> pint.Quantity:
    """Parse text such as ``"2 kN"``, ``"1.5 in"`` or ``"80 degF"`` into a pint Quantity.

    Raises UnitError when the text has no unit, an unknown unit, or no number.
    """
    import pint

    if not isinstance(text, str):
        raise UnitError(
            where, f"{text!r} has no unit", 'a quantity written as text with its unit, e.g. "2 kN"'
        )
    if _NUMBER.match(text):
        raise UnitError(
            where, f"{text.strip()!r} has no unit", 'a value with its unit, e.g. "2 kN" or "4 mm"'
        )
    match = re.match(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$", text)
    if not match or not match.group(2):
        raise UnitError(where, f"cannot read {text!r}", 'a number followed by a unit, e.g. "2 kN"')
    value = float(match.group(1))
    scale, unit = _unit(match.group(2), where)
    try:
        return registry().Quantity(value * scale, unit)
    except pint.errors.PintError as exc:  # pragma: no cover - defensive
        raise UnitError(where, f"cannot read {text!r}", 'a number followed by a unit, e.g. "2 kN"') from exc


# Common units answered without building the pint registry (about 0.2 s): unit → (dimension,
# factor to SI, offset to SI). tests/inputs/test_units.py checks every entry against pint.
_FAST: dict[str, tuple[str, float, float]] = {
    "m": ("length", 1.0, 0.0),
    "mm": ("length", 1e-3, 0.0),
    "cm": ("length", 1e-2, 0.0),
    "km": ("length", 1e3, 0.0),
    "in": ("length", 0.0254, 0.0),
    "ft": ("length", 0.3048, 0.0),
    "N": ("force", 1.0, 0.0),
    "kN": ("force", 1e3, 0.0),
    "MN": ("force", 1e6, 0.0),
    "lbf": ("force", 4.4482216152605, 0.0),
    "kip": ("force", 4448.2216152605, 0.0),
    "Pa": ("pressure", 1.0, 0.0),
    "kPa": ("pressure", 1e3, 0.0),
    "MPa": ("pressure", 1e6, 0.0),
    "GPa": ("pressure", 1e9, 0.0),
    "bar": ("pressure", 1e5, 0.0),
    "psi": ("pressure", 6894.757293168361, 0.0),
    "ksi": ("pressure", 6894757.293168361, 0.0),
    "Msi": ("pressure", 6894757293.168361, 0.0),
    "degC": ("temperature", 1.0, 273.15),
    "K": ("temperature", 1.0, 0.0),
    "degF": ("temperature", 5 / 9, 459.67 * 5 / 9),
    "N*m": ("torque", 1.0, 0.0),
    "N m": ("torque", 1.0, 0.0),
    "kN*m": ("torque", 1e3, 0.0),
    "J": ("torque", 1.0, 0.0),
    "kJ": ("torque", 1e3, 0.0),
    "lbf*ft": ("torque", 1.3558179483314004, 0.0),
    "lbf*in": ("torque", 0.1129848290276167, 0.0),
    "deg": ("angle", 0.017453292519943295, 0.0),
    "degree": ("angle", 0.017453292519943295, 0.0),
    "rad": ("angle", 1.0, 0.0),
    "radian": ("angle", 1.0, 0.0),
    "USD/kg": ("price", 1.0, 0.0),
    "USD/lb": ("price", 1 / 0.45359237, 0.0),
    "kg/m^3": ("density", 1.0, 0.0),
    "lb/in^3": ("density", 27679.904710203125, 0.0),
    "MPa*m^0.5": ("toughness", 1e6, 0.0),
    "Pa*m^0.5": ("toughness", 1.0, 0.0),
    "%": ("percent", 1.0, 0.0),
    "percent": ("percent", 1.0, 0.0),
}
_FAST_QUANTITY = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(\S.*?)\s*$")


def _fast_magnitude(text: str, unit: str) -> float | None:
    """The value of ``text`` in ``unit`` from the table above, or None to ask pint."""
    if not isinstance(text, str):
        return None
    match = _FAST_QUANTITY.match(text)
    if not match:
        return None
    source, target = _FAST.get(match.group(2)), _FAST.get(unit)
    if source is None or target is None or source[0] != target[0]:
        return None
    si = float(match.group(1)) * source[1] + source[2]
    return (si - target[2]) / target[1]


def magnitude_in(text: str, unit: str, where: str = "value") -> float:
    """The value of a quantity string expressed in ``unit``; checks the dimension."""
    fast = _fast_magnitude(text, unit)
    if fast is not None:
        return fast
    q = quantity(text, where)
    return _to(q, unit, where, text)


def _to(q: Any, unit: str, where: str, shown: str) -> float:
    import pint

    scale, target = _unit(unit, where)
    try:
        return float(q.to(target).magnitude) / scale
    except pint.errors.DimensionalityError:
        raise UnitError(
            where, f"got {shown!r}, {dimension_phrase(q.units)}", f"expected {dimension_phrase(target)}"
        ) from None


# Dimensions named in messages, with units a user would write for each: (pint
# dimensionality as {base: power}, plain name, example units).
_DIMENSIONS: tuple[tuple[dict[str, float], str, str], ...] = (
    ({"[length]": 1}, "length", "mm, in, ft"),
    ({"[length]": 2}, "area", "mm^2, in^2"),
    ({"[length]": 3}, "volume", "m^3, in^3"),
    ({"[mass]": 1}, "mass", "kg, lb"),
    ({"[time]": 1}, "time", "s, min, h"),
    ({"[time]": -1}, "frequency", "Hz, rpm"),
    ({"[length]": 1, "[mass]": 1, "[time]": -2}, "force", "N, kN, lbf"),
    ({"[mass]": 1, "[length]": -1, "[time]": -2}, "pressure or stress", "MPa, GPa, psi, ksi"),
    ({"[mass]": 1, "[length]": 2, "[time]": -2}, "torque or energy", "N*m, lbf*ft, J"),
    ({"[mass]": 1, "[length]": -0.5, "[time]": -2}, "fracture toughness", "MPa*m^0.5, ksi*in^0.5"),
    ({"[mass]": 1, "[length]": -3}, "density", "kg/m^3, lb/in^3"),
    ({"[temperature]": 1}, "temperature", "degC, degF, K"),
    ({"[currency]": 1}, "cost", "USD"),
    ({"[currency]": 1, "[mass]": -1}, "price per mass", "USD/kg, USD/lb"),
    ({"[length]": 1, "[mass]": 1, "[time]": -3, "[temperature]": -1}, "thermal conductivity", "W/(m*K)"),
    ({"[temperature]": -1}, "thermal expansion", "1e-6/K, 1/degF"),
    ({}, "pure number", "1, %, deg"),
)
_BASE_SYMBOLS = {
    "[length]": "m",
    "[mass]": "kg",
    "[time]": "s",
    "[temperature]": "K",
    "[currency]": "USD",
    "[current]": "A",
    "[substance]": "mol",
    "[luminosity]": "cd",
}


def _powers(unit: Any) -> dict[str, float]:
    """The dimension of a pint unit (or unit text) as {base: power}, in no particular order."""
    units = _unit(unit, "unit")[1] if isinstance(unit, str) else unit
    dims = registry().get_dimensionality(units)
    return {str(k): float(v) for k, v in dims.items() if v}  # type: ignore[arg-type]


def _in_base_units(powers: dict[str, float]) -> str:
    """SI base units of a dimension, e.g. ``kg/(m·s^2)``."""

    def part(base: str, power: float) -> str:
        symbol = _BASE_SYMBOLS.get(base, base.strip("[]"))
        return symbol if abs(power) == 1 else f"{symbol}^{abs(power):g}"

    up = [part(b, p) for b, p in powers.items() if p > 0]
    down = [part(b, p) for b, p in powers.items() if p < 0]
    top = "·".join(up) or "1"
    if not down:
        return top
    return f"{top}/" + (down[0] if len(down) == 1 else "(" + "·".join(down) + ")")


def dimension_phrase(unit: Any) -> str:
    """The dimension of ``unit`` in plain words with units that measure it: "a length (mm, in, ft …)"."""
    powers = _powers(unit)
    for dims, name, examples in _DIMENSIONS:
        if dims == powers:
            return f"a {name} ({examples} …)"
    return f"a quantity in {_in_base_units(powers)}"


def convert(values: np.ndarray | float, source: str, target: str, where: str = "value") -> np.ndarray:
    """Convert numbers from unit ``source`` to unit ``target`` (offset units allowed).

    Raises UnitError when the two units measure different things.
    """
    import pint

    ureg = registry()
    (scale_src, src), (scale_dst, dst) = _unit(source, where), _unit(target, where)
    arr = np.asarray(values, dtype=float)
    try:
        out = ureg.Quantity(arr * scale_src, src).to(dst).magnitude
    except pint.errors.DimensionalityError:
        raise UnitError(
            where,
            f"unit {source!r} measures {dimension_phrase(src)}",
            f"expected {dimension_phrase(dst)}",
        ) from None
    return np.asarray(out, dtype=float) / scale_dst


def format_number(value: float, digits: int = 3) -> str:
    """A number to ``digits`` significant figures, without trailing noise."""
    if value is None or not math.isfinite(value):
        return "–" if value is None or math.isnan(value) else ("∞" if value > 0 else "-∞")
    if value == 0:
        return "0"
    mag = math.floor(math.log10(abs(value)))
    if -3 <= mag < 6:
        decimals = max(digits - 1 - mag, 0)
        text = f"{round(value, decimals):.{decimals}f}"
        return text.rstrip("0").rstrip(".") if "." in text else text
    return f"{value:.{digits - 1}e}"
