"""Chart axes: a property or index expression per axis, its display values, extent and frame."""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any

import numpy as np
import pandas as pd
import plotly.graph_objects as go

from selector.errors import InputError
from selector.inputs.expressions import Expression, parse
from selector.inputs.properties import DERIVED_PROPERTIES, PROPERTIES, property_of, typical_value
from selector.inputs.units import convert, format_number
from selector.outputs import display_units
from selector.outputs.charts.markup import (
    _esc,
    _expression_html,
    _monomial_html,
    _needs_brackets,
    symbol_html,
    unit_html,
)
from selector.outputs.charts.style import UNIT_SYSTEMS


@dataclass(frozen=True)
class AxisSpec:
    """One chart axis: a property or an index expression, with its display unit.

    Attributes:
        text: the axis as given (``"E"``, ``"price*rho"``).
        symbols: the property symbols it uses.
        label: the quantity written for the chart (HTML), e.g. ``E`` or ``C<sub>m</sub>·ρ``.
        name: a plain name (the property's name, or the expression text).
        unit: the display unit written for people (HTML; empty for a pure number).
        log: plotted on a log scale.
        units: ``"si"`` or ``"us"``.
        coef, powers: the axis as ``coef · Π symbol^power`` when it is a monomial, else None.
        factor: the shown value per value in stored units; NaN where no factor converts
            (an offset unit such as °F, or an expression that is no monomial).
    """

    text: str
    symbols: tuple[str, ...]
    label: str
    name: str
    unit: str
    log: bool
    units: str
    coef: float = 1.0
    powers: Mapping[str, float] | None = None
    expression: Expression | None = field(default=None, compare=False, repr=False)
    factor: float = 1.0

    @property
    def is_property(self) -> bool:
        return self.expression is None

    @property
    def title(self) -> str:
        """Axis title with the unit in brackets."""
        head = (
            f"{_esc(self.name[:1].upper() + self.name[1:])}, {self.label}" if self.is_property else self.label
        )
        return f"{head} ({self.unit})" if self.unit else head


def _check_units(units: str) -> str:
    if units not in UNIT_SYSTEMS:
        raise InputError("units", f"unknown unit system {units!r}", "'si' or 'us'")
    return units


def _unit_label(symbol: str, units: str) -> str:
    label = display_units.property_unit(symbol, units).label
    return "" if label == "–" else label


def _units_html(powers: Mapping[str, float], units: str) -> str:
    """The unit of ``Π symbol^power`` built from the properties' display labels."""
    terms = [
        (_esc(_unit_label(s, units)), p, _needs_brackets(_unit_label(s, units)))
        for s, p in powers.items()
        if _unit_label(s, units)
    ]
    return _monomial_html(terms) if terms else ""


def monomial_unit(
    powers: Mapping[str, float], units: str, values: np.ndarray | None = None
) -> tuple[str, float]:
    """(unit as chart HTML, factor from stored units) of ``Π symbol^power``.

    The unit is the one ``display_units.index_unit`` gives an index of these powers
    (``values``, in stored units, choose an energy unit's prefix), so a chart and the
    shortlist table show one number. Where it has no factor (an offset unit such as °F)
    the unit is built from the properties' own display units.
    """
    shown = display_units.index_unit(powers, units, values)
    if math.isfinite(shown.factor):
        return unit_html(shown.label), shown.factor
    factor = math.prod(display_units.property_unit(s, units).factor ** p for s, p in powers.items())
    return _units_html(powers, units), factor


def _stored_values(table: pd.DataFrame, symbol: str) -> tuple[np.ndarray, np.ndarray]:
    """Low and high of one property in stored units.

    Raises:
        InputError: a derived property (``sigma_R``) the table does not carry.
    """
    prop = property_of(symbol)
    if prop.low not in table.columns:
        raise InputError(
            "chart",
            f"{symbol} ({prop.name}) is computed for one requirement and this table has none",
            "a chart of a spec with a fatigue constraint at a load ratio (--spec), or stored properties",
        )
    low = table[prop.low].to_numpy(dtype=float)
    high = table[prop.high].to_numpy(dtype=float)
    return np.minimum(low, high), np.maximum(low, high)


def shown_value(symbol: str, value: np.ndarray | float, units: str) -> np.ndarray:
    """A property's value(s) in stored units converted to the unit its axis shows."""
    shown = display_units.property_unit(symbol, units)
    if math.isfinite(shown.factor):
        return np.asarray(value, dtype=float) * shown.factor
    prop = property_of(symbol)
    return convert(value, prop.stored, prop.us, symbol)


def _shown_values(table: pd.DataFrame, symbol: str, units: str) -> tuple[np.ndarray, np.ndarray]:
    low, high = _stored_values(table, symbol)
    return shown_value(symbol, low, units), shown_value(symbol, high, units)


def monomial_typical(table: pd.DataFrame, coef: float, powers: Mapping[str, float]) -> np.ndarray:
    """``coef · Π symbol^power`` at every class's typical values (stored units)."""
    out = np.full(len(table), float(coef))
    with np.errstate(all="ignore"):
        for s, p in powers.items():
            out = out * typical_value(*_stored_values(table, s), True) ** p
    return out


def axis_spec(
    text: str, units: str = "si", where: str = "axis", table: pd.DataFrame | None = None
) -> AxisSpec:
    """Read an axis: a property symbol or an index expression.

    A property is shown in its ``display_units`` unit, a monomial expression in the unit
    ``display_units`` gives an index of its powers; with ``table`` an energy-type
    expression's prefix is chosen from the classes' values.

    Raises:
        ExpressionError: the text is not a valid expression (the message points at the column).
        InputError: the unit system is unknown or the expression uses no property.
    """
    _check_units(units)
    if not isinstance(text, str) or not text.strip():
        raise InputError(where, f"{text!r} is not an axis", "a property symbol such as rho or an expression")
    text = text.strip()
    if text in PROPERTIES or text in DERIVED_PROPERTIES:
        prop = property_of(text)
        return AxisSpec(
            text,
            (text,),
            symbol_html(text),
            prop.name,
            _esc(_unit_label(text, units)),
            prop.log,
            units,
            1.0,
            {text: 1.0},
            factor=display_units.property_unit(text, units).factor,
        )
    expr = parse(text)
    if not expr.symbols:
        raise InputError(
            where, f"{text!r} uses no property", "an expression of property symbols, e.g. price*rho"
        )
    mono = expr.monomial()
    if mono is None:
        parts = [f"{symbol_html(s)} in {_esc(_unit_label(s, units))}" for s in sorted(expr.symbols)]
        unit = "with " + ", ".join(p for p in parts if not p.endswith(" in "))
        coef, powers, factor = 1.0, None, math.nan
    else:
        coef, powers = mono[0], {s: float(p) for s, p in mono[1].items()}
        dimensioned = {s: p for s, p in powers.items() if _unit_label(s, units)}
        values = None if table is None else monomial_typical(table, coef, powers)
        unit, factor = monomial_unit(dimensioned, units, values) if dimensioned else ("", 1.0)
    return AxisSpec(
        text,
        tuple(sorted(expr.symbols)),
        _expression_html(expr.root),
        text,
        unit,
        True,
        units,
        coef,
        powers,
        expr,
        factor,
    )


def axis_values(table: pd.DataFrame, axis: AxisSpec) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(low, high, centre) of the axis quantity for every class, in display units.

    A property is converted on its own; a monomial expression is evaluated in stored
    units and scaled by the axis factor; an expression that is no monomial is
    evaluated over its properties' displayed values.
    """
    if axis.is_property:
        low, high = _shown_values(table, axis.text, axis.units)
    else:
        assert axis.expression is not None
        scaled = math.isfinite(axis.factor)
        lows, highs = {}, {}
        for s in axis.symbols:
            values = _stored_values(table, s) if scaled else _shown_values(table, s, axis.units)
            lows[s], highs[s] = values
        low, high = axis.expression.interval(lows, highs)
        if scaled:
            low, high = low * axis.factor, high * axis.factor
    return low, high, typical_value(low, high, axis.log)


def hover_ranges(table: pd.DataFrame, axis: AxisSpec, low: np.ndarray, high: np.ndarray) -> list[str]:
    """Each class's range on the axis as hover text: a property in the unit that suits its size.

    ``low`` and ``high`` are the axis values (display units); a property whose range is
    small beside the axis unit (a rubber's modulus on a GPa axis) is shown in a smaller
    unit chosen by ``display_units.range_unit``.
    """
    texts = range_texts(low, high, axis.unit)
    if not axis.is_property or not math.isfinite(axis.factor):
        return texts
    stored_low, stored_high = _stored_values(table, axis.text)
    column = display_units.property_unit(axis.text, axis.units).label
    for i, top in enumerate(stored_high):
        shown = display_units.range_unit(axis.text, float(top), axis.units)
        if math.isfinite(shown.factor) and shown.label != column:
            texts[i] = _range_text(stored_low[i] * shown.factor, top * shown.factor, _esc(shown.label))
    return texts


def _range_text(low: float, high: float, unit: str) -> str:
    body = (
        format_number(low)
        if np.isclose(low, high, rtol=1e-12)
        else f"{format_number(low)}–{format_number(high)}"
    )
    return f"{body} {unit}".rstrip()


def range_texts(low: np.ndarray, high: np.ndarray, unit: str) -> list[str]:
    """Every class's low–high range as hover text in ``unit`` (chart HTML)."""
    return [_range_text(lo, hi, unit) for lo, hi in zip(low.tolist(), high.tolist(), strict=True)]


@dataclass(frozen=True)
class _AxisLook:
    title: str
    log: bool


def _log_or_linear(values: np.ndarray, log: bool) -> np.ndarray:
    return np.log10(values) if log else values


def _extent(
    lows: Sequence[np.ndarray | float], highs: Sequence[np.ndarray | float], log: bool
) -> tuple[float, float]:
    """The plotted range of one axis in plotly's units (log10 of the value on a log axis)."""
    low = np.concatenate([np.atleast_1d(v) for v in lows]).astype(float)
    high = np.concatenate([np.atleast_1d(v) for v in highs]).astype(float)
    if log:
        low, high = low[low > 0], high[high > 0]
    low, high = low[np.isfinite(low)], high[np.isfinite(high)]
    if not len(low) or not len(high):
        return (0.0, 1.0)
    lo, hi = float(_log_or_linear(low, log).min()), float(_log_or_linear(high, log).max())
    span = hi - lo
    if log:
        pad = max(0.06 * span, 0.12) if span > 0 else 0.5
    else:
        pad = 0.06 * span if span > 0 else max(abs(lo) * 0.1, 1.0)
    return (lo - pad, hi + pad)


def _axis_layout(look: _AxisLook, extent: tuple[float, float]) -> dict:
    axis: dict[str, Any] = {
        "title": {"text": look.title, "font": {"size": 15}},
        "type": "log" if look.log else "linear",
        "range": list(extent),
        "autorange": False,
        "showline": True,
        "linecolor": "#444444",
        "mirror": True,
        "ticks": "outside",
        "gridcolor": "#E4E4E4",
        "zeroline": False,
        "tickfont": {"size": 12},
    }
    if look.log and extent[1] - extent[0] >= 3:
        axis |= {"dtick": 1, "exponentformat": "power", "minor": {"ticks": "outside", "showgrid": False}}
    return axis


def _to_data(value: float, log: bool) -> float:
    return 10**value if log else value


def _base_layout(fig: go.Figure, title: str, subtitle: str, x: dict, y: dict) -> None:
    fig.update_layout(
        template="plotly_white",
        title={
            "text": title,
            "x": 0.01,
            "xanchor": "left",
            "font": {"size": 19},
            "subtitle": {"text": subtitle, "font": {"size": 12, "color": "#555555"}},
        },
        xaxis=x,
        yaxis=y,
        hovermode="closest",
        legend={
            "title": {"text": "family (classes)"},
            "itemsizing": "constant",
            "groupclick": "togglegroup",
            "bgcolor": "rgba(255, 255, 255, 0.9)",
            "font": {"size": 12},
        },
        hoverlabel={"bgcolor": "white", "font": {"size": 12}, "align": "left"},
        margin={"l": 80, "r": 30, "t": 90, "b": 95},
        plot_bgcolor="white",
    )
