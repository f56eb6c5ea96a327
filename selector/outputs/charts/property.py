"""The property chart of two properties or index expressions, and the chart of a Selection."""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from typing import Any

import numpy as np
import pandas as pd
import plotly.graph_objects as go

from selector.errors import InputError, SelectorError
from selector.inputs.properties import property_of
from selector.inputs.units import format_number
from selector.outputs.charts.axes import (
    _axis_layout,
    _AxisLook,
    _base_layout,
    _check_units,
    _extent,
    axis_spec,
    axis_values,
    hover_ranges,
    monomial_typical,
)
from selector.outputs.charts.classes import _Classes, _draw_classes, _gather
from selector.outputs.charts.guides import (
    IndexLine,
    _bounds,
    _draw_index_lines,
    _draw_pass_region,
    _index_powers,
    _limits_of,
    index_line,
)
from selector.outputs.charts.labels import _label_shortlist, _note_skipped
from selector.outputs.charts.markup import _esc
from selector.pipeline.columns import INDEX
from selector.pipeline.screen import REJECTED, Limit, Screens
from selector.suggest import did_you_mean


def property_chart(
    table: pd.DataFrame,
    x: str,
    y: str,
    *,
    units: str = "si",
    index: Any = None,
    through: str | None = None,
    at: float | None = None,
    screens: Screens | Sequence[Limit] | None = None,
    highlight: Sequence[str] | None = None,
    title: str | None = None,
    steps: int = 3,
    factor: float = 10.0,
    index_values: Sequence[float] | None = None,
) -> go.Figure:
    """A chart of two properties or index expressions, one box per class.

    Args:
        table: materials table (``load_materials()``) or a Selection's table; ``status``,
            ``reasons`` and ``rank`` columns are used when present.
        x, y: property symbols or expressions, e.g. ``"rho"``, ``"E"``, ``"price*rho"``.
        units: ``"si"`` (stored engineering units) or ``"us"``.
        index: merit index for index lines: text (``"E^0.5/rho"``), ``{symbol: exponent}``
            or a Derivation. It must reduce to the two plotted quantities.
        through: id of the class the main index line passes through (at its marker).
        at: index value of the main line instead, in the index's display unit (the unit the
            line's label and the shortlist table give it). With neither, the line passes
            through the first highlighted class, else the median class.
        screens: limits to draw as the pass region. The chart screens nothing itself: a table
            without a ``status`` column (from ``apply_screens`` or a Selection) draws every class
            as passing.
        highlight: ids of the shortlist, best first; they are ringed and named.
        title: chart title (escaped).
        steps, factor: parallel index lines at value × factor^k for k = −steps … steps.
        index_values: the index in stored units over the classes whose table is shown beside
            the chart (a Selection's shortlist); they choose the index unit's prefix as that
            table does. By default the ranked classes of ``table`` (else every class).

    Raises:
        InputError: unknown axis, unit system, class id or an index that cannot be drawn.
        ExpressionError: an axis or index expression that cannot be parsed.
    """
    units = _check_units(units)
    xa, ya = axis_spec(x, units, "x axis", table), axis_spec(y, units, "y axis", table)
    limits = _limits_of(screens)
    if (through is not None or at is not None) and index is None:
        raise InputError(
            "index line", "through= or at= was given without an index", "an index such as E^0.5/rho"
        )
    if through is not None and at is not None:
        raise InputError("index line", f"both through={through!r} and at={at!r} were given", "one of the two")
    line = None
    if index is not None:
        values = _stored_index(table, index) if index_values is None else np.asarray(index_values, float)
        line = index_line(index, xa, ya, values)
    xv, yv = axis_values(table, xa), axis_values(table, ya)
    classes, skipped = _gather(
        table,
        xv,
        yv,
        xa.log,
        ya.log,
        (xa.label, hover_ranges(table, xa, xv[0], xv[1])),
        (ya.label, hover_ranges(table, ya, yv[0], yv[1])),
    )
    if not classes.ids:
        raise InputError(
            "chart",
            f"no class has data for both {x} and {y}",
            "a table with values for the plotted properties",
        )
    xb_low, xb_high, _ = _bounds(xa, limits)
    yb_low, yb_high, _ = _bounds(ya, limits)
    x_marks = [float(v) for v in (xb_low, xb_high) if v is not None]
    y_marks = [float(v) for v in (yb_low, yb_high) if v is not None]
    x_extent = _extent([classes.x_low, *x_marks], [classes.x_high, *x_marks], xa.log)
    y_extent = _extent([classes.y_low, *y_marks], [classes.y_high, *y_marks], ya.log)
    box = (*x_extent, *y_extent)

    fig = go.Figure()
    if any(v is not None for v in (xb_low, xb_high, yb_low, yb_high)):
        _draw_pass_region(fig, xa, ya, (xb_low, xb_high), (yb_low, yb_high), box)
    subtitle = []
    if line is not None:
        value, through_name = _index_value(line, classes, through, at, highlight)
        _draw_index_lines(fig, line, value, through_name, box, steps, factor)
        unit = f" (in {line.unit})" if line.unit else ""
        subtitle.append(
            f"index {line.label}{unit}: lines of slope {format_number(line.slope)}, "
            f"×/÷ {format_number(factor)} apart; higher on the shaded side"
        )
    _draw_classes(fig, classes)
    labelled = _label_shortlist(fig, classes, highlight or (), xa.log, ya.log, box)
    n_rejected = sum(s == REJECTED for s in classes.status)
    subtitle.append(
        f"{len(classes.ids)} classes drawn" + (f", {n_rejected} rejected (grey)" if n_rejected else "")
    )
    if labelled:
        subtitle.append(f"top {len(labelled)} of the shortlist named")
    _note_skipped(fig, skipped, f"no data for {x} or {y}, or not positive on a log axis")
    default_title = (
        f"{_esc(property_of(y).name.capitalize()) if ya.is_property else ya.label} against "
        f"{_esc(property_of(x).name) if xa.is_property else xa.label}"
    )
    _base_layout(
        fig,
        _esc(title) if title else default_title,
        " · ".join(subtitle),
        _axis_layout(_AxisLook(xa.title, xa.log), x_extent),
        _axis_layout(_AxisLook(ya.title, ya.log), y_extent),
    )
    fig.update_layout(
        meta={
            "chart": "property",
            "x": _esc(x),
            "y": _esc(y),
            "units": units,
            "drawn": len(classes.ids),
            "skipped": [_esc(s) for s in skipped],
        }
    )
    return fig


def _stored_index(table: pd.DataFrame, index: Any) -> np.ndarray | None:
    """An index in stored units at the typical values of the ranked classes (else of all).

    None when the table lacks one of its properties (``index_line`` says what is wrong).
    """
    coef, powers, _ = _index_powers(index)
    if any(property_of(s).low not in table.columns for s in powers):
        return None
    ranked = table["rank"].notna() if "rank" in table.columns else pd.Series(False, index=table.index)
    rows = table[ranked] if ranked.any() else table
    return monomial_typical(rows, coef, powers)


def _index_value(
    line: IndexLine, classes: _Classes, through: str | None, at: float | None, highlight: Sequence[str] | None
) -> tuple[float, str | None]:
    """The main line's index value and the name of the class it passes through (if any)."""
    if at is not None:
        if isinstance(at, bool) or not isinstance(at, int | float) or not math.isfinite(at):
            raise InputError("index line: at", f"{at!r} is not a number", "a positive index value")
        return float(at), None
    where = {cid: i for i, cid in enumerate(classes.ids)}
    target = through if through is not None else next((h for h in (highlight or ()) if h in where), None)
    if target is None:
        values = line.value(classes.x_mid, classes.y_mid)
        i = int(np.argsort(values)[len(values) // 2])
        return float(values[i]), classes.names[i]
    if target not in where:
        raise InputError(
            "index line: through",
            f"no drawn class with id {target!r}",
            did_you_mean(
                target,
                where,
                fallback="the id of a class drawn on the chart",
                aliases={cid: [name] for cid, name in zip(classes.ids, classes.names, strict=True)},
            ),
        )
    i = where[target]
    return float(line.value(classes.x_mid[i], classes.y_mid[i])), classes.names[i]


def default_axes(exponents: Mapping[str, float]) -> tuple[str, str]:
    """Axes that show an index as straight lines: (x, y) = (what is divided by, what is multiplied).

    ``{E: 0.5, rho: -1}`` gives ("rho", "E"); ``{E: 1/3, price: -1, rho: -1}`` gives
    ("price*rho", "E"). An index of one sign only is plotted against density.
    """
    pos = {s: p for s, p in exponents.items() if p > 0}
    neg = {s: -p for s, p in exponents.items() if p < 0}

    def product(part: Mapping[str, float]) -> str:
        base = min(part.values())
        return "*".join(
            s if math.isclose(p / base, 1) else f"{s}^{format_number(p / base, 6)}" for s, p in part.items()
        )

    if pos and neg:
        return product(neg), product(pos)
    only = pos or neg
    if not only:
        raise InputError("index", "the index has no properties", "an index such as E^0.5/rho")
    y = product(only)
    if y == "rho":
        return "price", "rho"
    return "rho", y


def chart_for_selection(
    selection: Any,
    x: str | None = None,
    y: str | None = None,
    units: str | None = None,
    *,
    index: Any = None,
    through: str | None = None,
    at: float | None = None,
    top: int = 5,
    title: str | None = None,
) -> go.Figure:
    """The property chart of a Selection: its screens, its shortlist and its merit index.

    Default axes are those of the ranking index (``rho`` and ``E`` for E^1/2/ρ; ``rho`` and
    ``E`` when the index is a typed expression that is no monomial). The index line is the
    ranking index (derived, or typed in the spec) unless ``index`` is given, and passes
    through the best-ranked class unless ``through`` or ``at`` is given; it is left out when
    the ranking index does not reduce to axes chosen here. The top ``top`` classes of the
    shortlist are named.
    """
    typed = selection.expression
    derivations = tuple(selection.derivations)
    powers = selection.index_exponents
    ranking: Any = typed if powers is not None else None
    if typed is None and derivations:
        ranking = derivations[0]
    if x is None or y is None:
        dx, dy = default_axes(powers) if powers else ("rho", "E")
        x, y = x or dx, y or dy
    units = units or getattr(selection.spec, "units", "si") or "si"
    shortlist = selection.shortlist
    highlight = [str(v) for v in shortlist["id"].head(max(top, 0))] if "id" in shortlist.columns else []
    chosen = index if index is not None else ranking
    is_ranking = index is None or (typed is not None and index == typed)
    xa, ya = axis_spec(x, units, "x axis"), axis_spec(y, units, "y axis")
    if chosen is not None and index is None and through is None and at is None:
        try:
            index_line(chosen, xa, ya)
        except SelectorError:
            chosen = None  # the ranking index does not fit the axes chosen: no index line
    spec_title = getattr(selection.spec, "title", None)
    return property_chart(
        selection.table,
        x,
        y,
        units=units,
        index=chosen,
        through=through,
        at=at,
        screens=selection.screens,
        highlight=highlight,
        title=title or spec_title,
        index_values=shortlist[INDEX].to_numpy(dtype=float) if is_ranking else None,
    )
