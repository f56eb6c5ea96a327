"""Property charts: material classes as boxes on log axes, index lines, pass regions, trade-offs.

Every chart is a plain ``plotly.graph_objects.Figure`` (it displays in Jupyter as is).
Each class is one translucent box spanning its low–high range on both axes, with a
marker at its geometric mean (the midpoint on a linear axis). Boxes are drawn as one
filled trace per family (closed paths separated by ``None``) so a click on the
family's legend entry hides its boxes and markers together.

Axis values are shown in the units asked for: ``"si"`` gives the stored engineering
units (GPa, MPa, kg/m³, °C, USD/kg), ``"us"`` the US customary units of the property
registry. An axis may be a property symbol (``"E"``) or an index expression
(``"price*rho"``); an expression is evaluated over the displayed values of its
properties and its range is its interval over the classes' ranges.

plotly is imported here, so callers import this module lazily.
"""

from __future__ import annotations

import html
import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from fractions import Fraction
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd
import plotly.graph_objects as go

from selector.errors import InputError, OutputError, SelectorError
from selector.inputs.expressions import Binary, Call, Expression, Negate, Node, Number, Symbol, parse
from selector.inputs.properties import FAMILIES, PROPERTIES
from selector.inputs.units import convert, format_number
from selector.pipeline.screen import PARTLY, PASSES, REJECTED, Limit, Screens, apply_screens
from selector.suggest import did_you_mean

__all__ = [
    "FAMILY_COLOURS",
    "FAMILY_SYMBOLS",
    "IMAGE_FORMATS",
    "OKABE_ITO",
    "REJECTED_GREY",
    "AxisSpec",
    "IndexLine",
    "axis_spec",
    "axis_values",
    "chart_for_selection",
    "default_axes",
    "index_line",
    "place_labels",
    "property_chart",
    "symbol_html",
    "tradeoff_chart",
    "write_chart",
]

OKABE_ITO: tuple[str, ...] = (
    "#E69F00",
    "#56B4E9",
    "#009E73",
    "#F0E442",
    "#0072B2",
    "#D55E00",
    "#CC79A7",
    "#000000",
)
"""The Okabe–Ito colour-blind-safe palette (Okabe and Ito, 2008), grey left out."""

REJECTED_GREY = "#999999"
"""Colour of rejected classes."""

FAMILY_COLOURS: dict[str, str] = {f: OKABE_ITO[i % len(OKABE_ITO)] for i, f in enumerate(FAMILIES)}
"""Family → colour, in FAMILIES order. The ninth family reuses the first colour; its marker differs."""

FAMILY_SYMBOLS: dict[str, str] = dict(
    zip(
        FAMILIES,
        (
            "circle",
            "square",
            "diamond",
            "triangle-up",
            "pentagon",
            "triangle-down",
            "hexagon",
            "star",
            "cross",
        ),
        strict=True,
    )
)
"""Family → marker symbol, a second cue beside colour."""

IMAGE_FORMATS = ("png", "svg", "pdf")
"""Static image formats written through kaleido."""

UNIT_SYSTEMS = ("si", "us")
SHORTLIST_COLOUR = "#000000"
INDEX_COLOUR = "#0B3C5D"
PASS_FILL = "rgba(0, 158, 115, 0.07)"
BOUND_COLOUR = "#3A3A3A"
MAX_LABEL = 34
MAX_REASONS = 4

_GREEK = {"rho": "ρ", "nu": "ν", "lambda": "λ", "alpha": "α", "sigma": "σ"}
_SPECIAL = {"co2": "CO<sub>2</sub>", "price": "C<sub>m</sub>"}
_STATUS_TEXT = {PASSES: "passes the screens", PARTLY: "passes the screens partly", REJECTED: "rejected"}


# --------------------------------------------------------------------------- text


def _esc(text: Any) -> str:
    """User text made safe for plotly's HTML-like labels: ``&``, ``<`` and ``>`` escaped."""
    return html.escape(str(text), quote=False)


def _short(text: str, limit: int = MAX_LABEL) -> str:
    return text if len(text) <= limit else text[: limit - 1].rstrip() + "…"


def symbol_html(symbol: str) -> str:
    """A property symbol written for a chart: ``sigma_y`` → ``σ<sub>y</sub>``."""
    if symbol in _SPECIAL:
        return _SPECIAL[symbol]
    head, _, tail = symbol.partition("_")
    head = _GREEK.get(head, head)
    return f"{head}<sub>{tail}</sub>" if tail else head


def _power_text(p: float) -> str:
    """An exponent as a short fraction where it is one (0.5 → 1/2), else a number."""
    frac = Fraction(p).limit_denominator(12)
    if abs(float(frac) - p) < 1e-9:
        return str(frac.numerator) if frac.denominator == 1 else f"{frac.numerator}/{frac.denominator}"
    return format_number(p)


def _monomial_html(terms: Sequence[tuple[str, float, bool]]) -> str:
    """``Π base^p`` written as numerator/denominator; each term is (html, power, needs brackets).

    A base that needs brackets (a unit such as kg/m³) gets them whenever it is raised to a
    power or stands beside another term.
    """
    top = [(b, p, w) for b, p, w in terms if p > 0]
    bottom = [(b, -p, w) for b, p, w in terms if p < 0]

    def group(part: list[tuple[str, float, bool]], alone: bool) -> str:
        out = []
        for base, p, wrap in part:
            body = f"({base})" if wrap and (p != 1 or not alone or len(part) > 1) else base
            out.append(body if p == 1 else f"{body}<sup>{_power_text(p)}</sup>")
        return "·".join(out)

    upper = group(top, not bottom) if top else "1"
    if not bottom:
        return upper
    lower = group(bottom, False)
    return f"{upper}/({lower})" if len(bottom) > 1 else f"{upper}/{lower}"


def _number_html(value: float) -> str:
    """A number for chart labels: plain in 0.001–99 999, else as m×10ⁿ."""
    if not math.isfinite(value) or value == 0 or 1e-3 <= abs(value) < 1e5:
        return format_number(value)
    exp = math.floor(math.log10(abs(value)))
    mantissa = format_number(value / 10**exp)
    if mantissa in ("10", "-10"):
        mantissa, exp = mantissa[:-1], exp + 1
    power = f"10<sup>{'−' if exp < 0 else ''}{abs(exp)}</sup>"
    return power if mantissa == "1" else f"{mantissa}×{power}"


def _needs_brackets(label: str) -> bool:
    return any(c in label for c in "/· ")


def _expression_html(node: Node, parent: int = 0) -> str:
    """An expression tree as chart text, bracketed by precedence."""
    match node:
        case Number(value):
            text, prec = format_number(value), 5
        case Symbol(name):
            text, prec = symbol_html(name), 5
        case Negate(operand):
            text, prec = "−" + _expression_html(operand, 3), 3
        case Binary("^", left, right):
            text, prec = f"{_expression_html(left, 5)}<sup>{_expression_html(right, 0)}</sup>", 4
        case Binary(op, left, right) if op in "*/":
            sign = "·" if op == "*" else "/"
            text, prec = f"{_expression_html(left, 2)}{sign}{_expression_html(right, 3)}", 2
        case Binary(op, left, right):
            sign = "+" if op == "+" else "−"
            text, prec = f"{_expression_html(left, 1)} {sign} {_expression_html(right, 2)}", 1
        case Call(name, args):
            text, prec = f"{name}({', '.join(_expression_html(a) for a in args)})", 5
        case _:  # pragma: no cover - the parser makes no other nodes
            raise TypeError(f"not an expression node: {node!r}")
    return f"({text})" if prec < parent else text


# --------------------------------------------------------------------------- axes


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


def _display_label(symbol: str, units: str) -> str:
    prop = PROPERTIES[symbol]
    label = prop.us_label if units == "us" else prop.label
    return "" if label == "–" else label


def _units_html(powers: Mapping[str, float], units: str) -> str:
    """The unit of ``Π symbol^power`` built from the properties' display labels."""
    terms = [
        (_esc(_display_label(s, units)), p, _needs_brackets(_display_label(s, units)))
        for s, p in powers.items()
        if _display_label(s, units)
    ]
    return _monomial_html(terms) if terms else ""


def _expression_unit(expr: Expression, powers: Mapping[str, float] | None, units: str) -> str:
    if powers is not None:
        return _units_html(powers, units)
    parts = [f"{symbol_html(s)} in {_esc(_display_label(s, units))}" for s in sorted(expr.symbols)]
    return "with " + ", ".join(p for p in parts if not p.endswith(" in "))


def axis_spec(text: str, units: str = "si", where: str = "axis") -> AxisSpec:
    """Read an axis: a property symbol or an index expression.

    Raises:
        ExpressionError: the text is not a valid expression (the message points at the column).
        InputError: the unit system is unknown or the expression uses no property.
    """
    _check_units(units)
    if not isinstance(text, str) or not text.strip():
        raise InputError(where, f"{text!r} is not an axis", "a property symbol such as rho or an expression")
    text = text.strip()
    if text in PROPERTIES:
        prop = PROPERTIES[text]
        return AxisSpec(
            text,
            (text,),
            symbol_html(text),
            prop.name,
            _esc(_display_label(text, units)),
            prop.log,
            units,
            1.0,
            {text: 1.0},
        )
    expr = parse(text)
    if not expr.symbols:
        raise InputError(
            where, f"{text!r} uses no property", "an expression of property symbols, e.g. price*rho"
        )
    mono = expr.monomial()
    coef, powers = (mono[0], dict(mono[1])) if mono is not None else (1.0, None)
    return AxisSpec(
        text,
        tuple(sorted(expr.symbols)),
        _expression_html(expr.root),
        text,
        _expression_unit(expr, powers, units),
        True,
        units,
        coef,
        powers,
        expr,
    )


def _display_values(table: pd.DataFrame, symbol: str, units: str) -> tuple[np.ndarray, np.ndarray]:
    """Low and high of one property in display units."""
    prop = PROPERTIES[symbol]
    low = table[prop.low].to_numpy(dtype=float)
    high = table[prop.high].to_numpy(dtype=float)
    if units == "us":
        low, high = convert(low, prop.stored, prop.us, symbol), convert(high, prop.stored, prop.us, symbol)
    return np.minimum(low, high), np.maximum(low, high)


def _display_value(symbol: str, value: float, units: str) -> float:
    prop = PROPERTIES[symbol]
    return float(convert(value, prop.stored, prop.us, symbol)) if units == "us" else float(value)


def _centre(low: np.ndarray, high: np.ndarray, log: bool) -> np.ndarray:
    with np.errstate(invalid="ignore"):
        return np.sqrt(low * high) if log else (low + high) / 2


def axis_values(table: pd.DataFrame, axis: AxisSpec) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(low, high, centre) of the axis quantity for every class, in display units."""
    if axis.is_property:
        low, high = _display_values(table, axis.text, axis.units)
    else:
        assert axis.expression is not None
        lows, highs = {}, {}
        for s in axis.symbols:
            lows[s], highs[s] = _display_values(table, s, axis.units)
        low, high = axis.expression.interval(lows, highs)
    return low, high, _centre(low, high, axis.log)


# --------------------------------------------------------------------------- what is drawn


@dataclass(frozen=True)
class _Classes:
    """The drawable classes of one chart, in display units."""

    ids: list[str]
    names: list[str]
    families: list[str]
    status: list[str]
    hover: list[str]
    x_low: np.ndarray
    x_high: np.ndarray
    x_mid: np.ndarray
    y_low: np.ndarray
    y_high: np.ndarray
    y_mid: np.ndarray


@dataclass(frozen=True)
class _AxisLook:
    title: str
    log: bool


def _range_text(low: float, high: float, unit: str) -> str:
    body = (
        format_number(low)
        if np.isclose(low, high, rtol=1e-12)
        else f"{format_number(low)}–{format_number(high)}"
    )
    return f"{body} {unit}".rstrip()


def _hover(
    name: str, family: str, status: str, reasons: Sequence[str], rank: float | None, ranges: Sequence[str]
) -> str:
    lines = [f"<b>{_esc(name)}</b>", f"{_esc(family)} · {_STATUS_TEXT.get(status, _esc(status))}"]
    if rank is not None and np.isfinite(rank):
        lines[1] += f" · rank {int(rank)}"
    lines += list(ranges)
    shown = [_esc(r) for r in reasons[:MAX_REASONS]]
    if len(reasons) > MAX_REASONS:
        shown.append(f"… and {len(reasons) - MAX_REASONS} more")
    lines += shown
    return "<br>".join(lines)


def _column(table: pd.DataFrame, name: str, default: Any) -> list:
    return table[name].tolist() if name in table.columns else [default] * len(table)


def _reason_list(value: Any) -> list[str]:
    if isinstance(value, list | tuple):
        return [str(v) for v in value]
    if isinstance(value, str) and value:
        return [value]
    return []


def _gather(
    table: pd.DataFrame,
    x: tuple[np.ndarray, np.ndarray, np.ndarray],
    y: tuple[np.ndarray, np.ndarray, np.ndarray],
    x_log: bool,
    y_log: bool,
    x_hover: tuple[str, str],
    y_hover: tuple[str, str],
) -> tuple[_Classes, list[str]]:
    """The drawable classes and the ids of those that cannot be drawn (no data, or ≤ 0 on a log axis)."""
    ids = (
        [str(v) for v in _column(table, "id", "")] if "id" in table.columns else [str(i) for i in table.index]
    )
    names = [str(v) for v in _column(table, "name", "")]
    names = [n or i for n, i in zip(names, ids, strict=True)]
    families = [str(v) for v in _column(table, "family", "")]
    status = [str(v) for v in _column(table, "status", PASSES)]
    reasons = [_reason_list(v) for v in _column(table, "reasons", [])]
    ranks = [float(v) if v is not None and not pd.isna(v) else None for v in _column(table, "rank", None)]
    ok = np.ones(len(table), dtype=bool)
    for (low, high, mid), log in ((x, x_log), (y, y_log)):
        ok &= np.isfinite(low) & np.isfinite(high) & np.isfinite(mid)
        if log:
            with np.errstate(invalid="ignore"):
                ok &= low > 0
    keep = np.flatnonzero(ok)
    hover = [
        _hover(
            names[i],
            families[i],
            status[i],
            reasons[i],
            ranks[i],
            (
                f"{x_hover[0]}: {_range_text(x[0][i], x[1][i], x_hover[1])}",
                f"{y_hover[0]}: {_range_text(y[0][i], y[1][i], y_hover[1])}",
            ),
        )
        for i in keep
    ]
    classes = _Classes(
        [ids[i] for i in keep],
        [names[i] for i in keep],
        [families[i] for i in keep],
        [status[i] for i in keep],
        hover,
        x[0][keep],
        x[1][keep],
        x[2][keep],
        y[0][keep],
        y[1][keep],
        y[2][keep],
    )
    return classes, [ids[i] for i in np.flatnonzero(~ok)]


def _rgba(colour: str, alpha: float) -> str:
    r, g, b = (int(colour[i : i + 2], 16) for i in (1, 3, 5))
    return f"rgba({r}, {g}, {b}, {alpha})"


def _family_order(families: Sequence[str]) -> list[str]:
    known = [f for f in FAMILIES if f in families]
    return known + sorted(set(families) - set(FAMILIES))


def _box_path(x0: np.ndarray, x1: np.ndarray, y0: np.ndarray, y1: np.ndarray) -> tuple[list, list]:
    """Closed rectangles separated by None (one segment, hence one drawn path, per box)."""
    xs: list = []
    ys: list = []
    for a, b, c, d in zip(x0.tolist(), x1.tolist(), y0.tolist(), y1.tolist(), strict=True):
        xs += [a, b, b, a, a, None]
        ys += [c, c, d, d, c, None]
    return xs[:-1], ys[:-1]


def _draw_classes(fig: go.Figure, classes: _Classes) -> None:
    """Boxes (one filled trace per family and status colour) and markers (one trace per family)."""
    fams = np.asarray(classes.families, dtype=object)
    rejected = np.asarray(classes.status, dtype=object) == REJECTED
    order = _family_order(classes.families)
    for faded in (True, False):
        for family in order:
            picked = np.flatnonzero((fams == family) & (rejected == faded))
            if not len(picked):
                continue
            colour = REJECTED_GREY if faded else FAMILY_COLOURS.get(family, "#444444")
            xs, ys = _box_path(
                classes.x_low[picked], classes.x_high[picked], classes.y_low[picked], classes.y_high[picked]
            )
            fig.add_trace(
                go.Scatter(
                    x=xs,
                    y=ys,
                    mode="lines",
                    fill="toself",
                    fillcolor=_rgba(colour, 0.07 if faded else 0.22),
                    line={"color": _rgba(colour, 0.35 if faded else 0.85), "width": 0.8},
                    hoverinfo="skip",
                    showlegend=False,
                    legendgroup=_esc(family),
                    name=f"{_esc(family)} ranges",
                    uid=f"box-{'rejected' if faded else 'live'}-{len(fig.data)}",
                    meta={
                        "role": "boxes",
                        "family": _esc(family),
                        "rejected": faded,
                        "count": len(picked),
                        "ids": [_esc(classes.ids[i]) for i in picked],
                    },
                )
            )
    for family in order:
        members = np.flatnonzero(fams == family)
        members = members[np.argsort(rejected[members], kind="stable")]  # live first: the legend shows them
        colour = FAMILY_COLOURS.get(family, "#444444")
        faded = rejected[members]
        fig.add_trace(
            go.Scatter(
                x=classes.x_mid[members].tolist(),
                y=classes.y_mid[members].tolist(),
                mode="markers",
                marker={
                    "color": [REJECTED_GREY if f else colour for f in faded],
                    "size": [6 if f else 8 for f in faded],
                    "opacity": [0.6 if f else 1.0 for f in faded],
                    "symbol": FAMILY_SYMBOLS.get(family, "circle"),
                    "line": {"color": "#333333", "width": [0.3 if f else 0.7 for f in faded]},
                },
                text=[classes.hover[i] for i in members],
                hovertemplate="%{text}<extra></extra>",
                customdata=[_esc(classes.ids[i]) for i in members],
                name=f"{_esc(family)} ({len(members)})",
                legendgroup=_esc(family),
                uid=f"mark-{len(fig.data)}",
                meta={
                    "role": "markers",
                    "family": _esc(family),
                    "ids": [_esc(classes.ids[i]) for i in members],
                    "rejected": [bool(f) for f in faded],
                },
            )
        )


def _log_or_linear(values: np.ndarray, log: bool) -> np.ndarray:
    return np.log10(values) if log else values


def _extent(lows: Sequence[np.ndarray], highs: Sequence[np.ndarray], log: bool) -> tuple[float, float]:
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


PLOT_PIXELS = (900.0, 600.0)
"""Typical plot-area size in pixels, used only to estimate how much room a label takes."""


def _label_box(centre: tuple[float, float], size: tuple[float, float]) -> tuple[float, float, float, float]:
    (cx, cy), (w, h) = centre, size
    return cx - w / 2, cx + w / 2, cy - h / 2, cy + h / 2


def _overlap(a: tuple[float, float, float, float], b: tuple[float, float, float, float]) -> bool:
    return a[0] < b[1] and b[0] < a[1] and a[2] < b[3] and b[2] < a[3]


def place_labels(
    anchors: Sequence[tuple[float, float]],
    chars: Sequence[int],
    crowd: np.ndarray,
    avoid: Sequence[tuple[float, float, float, float]] = (),
) -> list[tuple[float, float]]:
    """Centres for labels beside anchor points, all in plot fractions (0–1 on both axes).

    Greedy, in the order given: each label takes the nearby spot that overlaps no label
    placed before it, no other anchor and no ``avoid`` box (x0, x1, y0, y1), and covers the
    fewest crowd points (N×2 array).
    """
    directions = [(math.cos(t), math.sin(t)) for t in np.radians([30, 150, 330, 210, 90, 270, 0, 180])]
    placed: list[tuple[float, float, float, float]] = []
    centres: list[tuple[float, float]] = []
    height = 22.0 / PLOT_PIXELS[1]
    for n, ((ax, ay), count) in enumerate(zip(anchors, chars, strict=True)):
        size = ((7.0 * count + 14.0) / PLOT_PIXELS[0], height)
        others = [_label_box(p, (0.03, 0.045)) for k, p in enumerate(anchors) if k != n]
        best, best_cost = (ax, ay + 0.08), math.inf
        for distance in (0.06, 0.1, 0.15, 0.21):
            for dx, dy in directions:
                centre = (ax + dx * (distance + size[0] / 2), ay + dy * (distance + size[1] / 2))
                rect = _label_box(centre, size)
                if rect[0] < 0.005 or rect[1] > 0.995 or rect[2] < 0.005 or rect[3] > 0.995:
                    continue
                cost = 3.0 * distance
                cost += 100.0 * sum(_overlap(rect, r) for r in placed)
                cost += 20.0 * sum(_overlap(rect, r) for r in others)
                cost += 10.0 * sum(_overlap(rect, r) for r in avoid)
                if len(crowd):
                    inside = (crowd[:, 0] > rect[0]) & (crowd[:, 0] < rect[1])
                    inside &= (crowd[:, 1] > rect[2]) & (crowd[:, 1] < rect[3])
                    cost += 0.6 * float(inside.sum())
                if cost < best_cost:
                    best, best_cost = centre, cost
        placed.append(_label_box(best, size))
        centres.append(best)
    return centres


def _annotation_boxes(fig: go.Figure, box: tuple[float, float, float, float]) -> list[tuple[float, ...]]:
    """Estimated extents (plot fractions) of the text labels already on the plot."""
    u0, u1, v0, v1 = box
    out = []
    for note in fig.layout.annotations:
        if note.xref not in (None, "x") or note.yref not in (None, "y") or note.x is None or note.y is None:
            continue
        w = (7.0 * len(_plain(note.text or "")) + 10.0) / PLOT_PIXELS[0]
        h = 20.0 / PLOT_PIXELS[1]
        fx, fy = (note.x - u0) / (u1 - u0), (note.y - v0) / (v1 - v0)
        x0 = {"left": fx, "right": fx - w}.get(note.xanchor or "center", fx - w / 2)
        y0 = {"bottom": fy, "top": fy - h}.get(note.yanchor or "middle", fy - h / 2)
        out.append((x0, x0 + w, y0, y0 + h))
    return out


def _fraction(values: np.ndarray, lo: float, hi: float, log: bool) -> np.ndarray:
    return (_log_or_linear(np.asarray(values, dtype=float), log) - lo) / (hi - lo)


def _label_shortlist(
    fig: go.Figure,
    classes: _Classes,
    ids: Sequence[str],
    x_log: bool,
    y_log: bool,
    box: tuple[float, float, float, float],
) -> list[str]:
    """Ring and name the highlighted classes, in the order given; returns the ids labelled."""
    where = {cid: i for i, cid in enumerate(classes.ids)}
    picked = [where[c] for c in ids if c in where]
    if not picked:
        return []
    fig.add_trace(
        go.Scatter(
            x=[float(classes.x_mid[i]) for i in picked],
            y=[float(classes.y_mid[i]) for i in picked],
            mode="markers",
            marker={"symbol": "circle-open", "size": 17, "color": SHORTLIST_COLOUR, "line": {"width": 2.2}},
            hoverinfo="skip",
            name=f"shortlist, top {len(picked)}",
            legendgroup="shortlist",
            uid="shortlist",
            meta={"role": "shortlist", "ids": [_esc(classes.ids[i]) for i in picked]},
        )
    )
    u0, u1, v0, v1 = box
    fx = _fraction(classes.x_mid, u0, u1, x_log)
    fy = _fraction(classes.y_mid, v0, v1, y_log)
    texts = [_short(classes.names[i]) for i in picked]
    centres = place_labels(
        [(float(fx[i]), float(fy[i])) for i in picked],
        [len(t) + 2 for t in texts],
        np.column_stack([fx, fy]),
        _annotation_boxes(fig, box),
    )
    for n, (i, text, (cx, cy)) in enumerate(zip(picked, texts, centres, strict=True)):
        fig.add_annotation(
            x=float(_log_or_linear(classes.x_mid[i], x_log)),
            y=float(_log_or_linear(classes.y_mid[i], y_log)),
            ax=u0 + cx * (u1 - u0),
            ay=v0 + cy * (v1 - v0),
            axref="x",
            ayref="y",
            text=f"<b>{n + 1}</b> {_esc(text)}",
            showarrow=True,
            arrowhead=0,
            arrowwidth=1,
            arrowcolor="#222222",
            standoff=8,
            font={"size": 12, "color": "#111111"},
            bgcolor="rgba(255, 255, 255, 0.9)",
            bordercolor="#222222",
            borderwidth=0.6,
            borderpad=2,
            name=f"shortlist-{n + 1}",
        )
    return [classes.ids[i] for i in picked]


def _note_skipped(fig: go.Figure, skipped: Sequence[str], why: str) -> None:
    if not skipped:
        return
    shown = ", ".join(_esc(s) for s in skipped[:5]) + (" …" if len(skipped) > 5 else "")
    fig.add_annotation(
        xref="paper",
        yref="paper",
        x=0,
        y=-0.13,
        xanchor="left",
        yanchor="top",
        showarrow=False,
        text=f"Not shown ({why}): {len(skipped)} class{'es' if len(skipped) != 1 else ''} — {shown}",
        font={"size": 11, "color": "#555555"},
        name="not-shown",
    )


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


# --------------------------------------------------------------------------- index lines


@dataclass(frozen=True)
class IndexLine:
    """A merit index on the chart's axes: ``I = coef · X^alpha · Y^beta``.

    Attributes:
        alpha, beta: powers of the x- and y-axis quantities.
        coef: constant factor (display units).
        label: the index written for the chart (HTML).
        unit: its unit, built from the properties' display units (HTML).
    """

    alpha: float
    beta: float
    coef: float
    label: str
    unit: str = ""

    @property
    def slope(self) -> float:
        """Slope of a line of constant index in log–log space, −alpha/beta (inf when vertical)."""
        return math.inf if self.beta == 0 else -self.alpha / self.beta

    def value(self, x: np.ndarray | float, y: np.ndarray | float) -> np.ndarray:
        """The index at display values ``x`` and ``y``."""
        with np.errstate(all="ignore"):
            return self.coef * np.power(x, self.alpha) * np.power(y, self.beta)


def _index_powers(index: Any) -> tuple[float, dict[str, float], str]:
    """(coef, {symbol: power}, text) of an index given as text, exponents or a Derivation."""
    if isinstance(index, str):
        expr = parse(index)
        mono = expr.monomial()
        if mono is None or not mono[1]:
            raise InputError(
                "index",
                f"{index!r} is not a product of powers of properties",
                "an index such as E^0.5/rho for an index line",
            )
        return float(mono[0]), {s: float(p) for s, p in mono[1].items()}, _expression_html(expr.root)
    exponents = getattr(index, "exponents", index)
    if not isinstance(exponents, Mapping) or not exponents:
        raise InputError(
            "index", f"{index!r} is not an index", "text such as E^0.5/rho, or {symbol: exponent}"
        )
    powers: dict[str, float] = {}
    for s, p in exponents.items():
        if s not in PROPERTIES:
            from selector.inputs.properties import get

            get(s)
        if not isinstance(p, int | float) or isinstance(p, bool) or not math.isfinite(p):
            raise InputError(
                f"index.{s}", f"exponent {p!r} is not a finite number", "a number such as 0.5 or -1"
            )
        if p:
            powers[s] = float(p)
    if not powers:
        raise InputError("index", "every exponent is zero", "at least one property with a non-zero exponent")
    text = _monomial_html([(symbol_html(s), p, False) for s, p in powers.items()])
    return 1.0, powers, text


def index_line(index: Any, x: AxisSpec, y: AxisSpec) -> IndexLine:
    """Write an index as ``coef · X^alpha · Y^beta`` over the two plotted axis quantities.

    With X = x·Π s^p and Y = y·Π s^q the index Π s^e must satisfy e = alpha·p + beta·q
    for every symbol s; the line of constant index then has log–log slope −alpha/beta
    (E^1/2/ρ on E against ρ: alpha = −1, beta = 1/2, slope 2).

    Raises:
        InputError: the index is not a monomial, needs a property on neither axis,
            cannot be written with the two axes, or an axis is not on a log scale.
    """
    coef, powers, text = _index_powers(index)
    for axis, which in ((x, "x"), (y, "y")):
        if axis.powers is None:
            raise InputError(
                f"{which} axis",
                f"{axis.text!r} is not a product of powers",
                "index lines need both axes to be properties or products of their powers",
            )
        if not axis.log:
            raise InputError(
                f"{which} axis",
                f"{axis.text} is plotted on a linear scale",
                "index lines are drawn on log–log axes; plot two log-scale quantities",
            )
    assert x.powers is not None and y.powers is not None
    missing = [s for s in powers if s not in x.powers and s not in y.powers]
    if missing:
        raise InputError(
            "index",
            f"the index {_plain(text)} needs {', '.join(missing)}, which is on neither axis "
            f"(x: {x.text}, y: {y.text})",
            "plot the index's properties, or give an index of the two plotted quantities",
        )
    symbols = sorted(set(powers) | set(x.powers) | set(y.powers))
    a = np.array([[x.powers.get(s, 0.0), y.powers.get(s, 0.0)] for s in symbols])
    b = np.array([powers.get(s, 0.0) for s in symbols])
    if np.linalg.matrix_rank(a) < 2:
        raise InputError(
            "axes",
            f"{x.text} and {y.text} are powers of one another",
            "two independent quantities on the axes for an index line",
        )
    (alpha, beta), *_ = np.linalg.lstsq(a, b, rcond=None)
    if np.max(np.abs(a @ np.array([alpha, beta]) - b)) > 1e-9 * max(1.0, float(np.max(np.abs(b)))):
        raise InputError(
            "index",
            f"the index {_plain(text)} is not a power of {x.text} times a power of {y.text}",
            "an index that reduces to the two plotted quantities",
        )
    alpha, beta = float(alpha), float(beta)
    alpha, beta = (0.0 if abs(alpha) < 1e-12 else alpha), (0.0 if abs(beta) < 1e-12 else beta)
    scale = coef * x.coef ** (-alpha) * y.coef ** (-beta)
    return IndexLine(alpha, beta, scale, text, _units_html(powers, x.units))


def _plain(text: str) -> str:
    """HTML chart text as plain text for messages."""
    for tag, plain in (("<sup>", "^"), ("</sup>", ""), ("<sub>", "_"), ("</sub>", "")):
        text = text.replace(tag, plain)
    return html.unescape(text)


def _clip_line(
    alpha: float, beta: float, k: float, box: tuple[float, float, float, float]
) -> tuple[tuple[float, float], tuple[float, float]] | None:
    """The segment of alpha·u + beta·v = k inside box (u0, u1, v0, v1) in log space, or None."""
    u0, u1, v0, v1 = box
    points: list[tuple[float, float]] = []
    if beta != 0:
        for u in (u0, u1):
            v = (k - alpha * u) / beta
            if v0 - 1e-12 <= v <= v1 + 1e-12:
                points.append((u, v))
    if alpha != 0:
        for v in (v0, v1):
            u = (k - beta * v) / alpha
            if u0 - 1e-12 <= u <= u1 + 1e-12:
                points.append((u, v))
    unique = sorted({(round(u, 12), round(v, 12)) for u, v in points})
    if len(unique) < 2:
        return None
    return unique[0], unique[-1]


def _clip_box(
    alpha: float, beta: float, k: float, sign: float, box: tuple[float, float, float, float]
) -> list[tuple[float, float]]:
    """Corners of the part of the box where sign·(alpha·u + beta·v − k) ≥ 0 (one clipping pass)."""
    u0, u1, v0, v1 = box
    corners = [(u0, v0), (u1, v0), (u1, v1), (u0, v1)]

    def side(p: tuple[float, float]) -> float:
        return sign * (alpha * p[0] + beta * p[1] - k)

    out: list[tuple[float, float]] = []
    for i, p in enumerate(corners):
        q = corners[(i + 1) % 4]
        sp, sq = side(p), side(q)
        if sp >= 0:
            out.append(p)
        if (sp >= 0) != (sq >= 0):
            t = sp / (sp - sq)
            out.append((p[0] + t * (q[0] - p[0]), p[1] + t * (q[1] - p[1])))
    return out


def _draw_index_lines(
    fig: go.Figure,
    line: IndexLine,
    value: float,
    through_name: str | None,
    box: tuple[float, float, float, float],
    steps: int,
    factor: float,
) -> None:
    """The index line at ``value``, its parallels ×/÷ factor^k, their labels and the winning side."""
    if not (np.isfinite(value) and value / line.coef > 0):
        raise InputError("index line", f"index value {value!r} cannot be drawn", "a positive finite value")
    sign = 1.0 if line.coef > 0 else -1.0
    k_main = math.log10(value / line.coef)
    shade = _clip_box(line.alpha, line.beta, k_main, sign, box)
    if len(shade) >= 3:
        fig.add_trace(
            go.Scatter(
                x=[10**u for u, _ in shade] + [10 ** shade[0][0]],
                y=[10**v for _, v in shade] + [10 ** shade[0][1]],
                mode="lines",
                fill="toself",
                fillcolor="rgba(11, 60, 93, 0.06)",
                line={"width": 0},
                hoverinfo="skip",
                name="higher index side",
                legendgroup="index",
                uid="index-side",
                meta={"role": "index-side"},
            )
        )
    first = True
    for step in range(-steps, steps + 1):
        v = value * factor**step
        seg = _clip_line(line.alpha, line.beta, math.log10(v / line.coef), box)
        if seg is None:
            continue
        (ua, va), (ub, vb) = seg
        main = step == 0
        fig.add_trace(
            go.Scatter(
                x=[10**ua, 10**ub],
                y=[10**va, 10**vb],
                mode="lines",
                line={
                    "color": INDEX_COLOUR,
                    "width": 2.2 if main else 1.1,
                    "dash": "solid" if main else "dash",
                },
                hoverinfo="skip",
                name=f"index line {line.label}, ×/÷ {format_number(factor)}",
                legendgroup="index",
                showlegend=first,
                uid=f"index-{step}",
                meta={"role": "index-line", "value": v, "main": main, "slope": line.slope},
            )
        )
        first = False
        # the main line is labelled near its lower end, the parallels near their upper ends
        (lu, lv), (hu, hv) = ((ua, va), (ub, vb)) if va + ua <= vb + ub else ((ub, vb), (ua, va))
        t = 0.1 if main else 0.9
        text = f"{line.label} = {_number_html(v)}" if main else _number_html(v)
        if main and through_name:
            text += f", through {_esc(_short(through_name, 28))}"
        fig.add_annotation(
            x=lu + t * (hu - lu),
            y=lv + t * (hv - lv),
            text=text,
            showarrow=False,
            xanchor="left" if main else "center",
            yanchor="top" if main else "middle",
            xshift=6 if main else 0,
            font={"size": 12 if main else 11, "color": INDEX_COLOUR},
            bgcolor="rgba(255, 255, 255, 0.85)",
            name=f"index-label-{step}",
        )


# --------------------------------------------------------------------------- pass region


def _limits_of(screens: Screens | Sequence[Limit] | None) -> tuple[Limit, ...]:
    if screens is None:
        return ()
    if isinstance(screens, Screens):
        return tuple(screens.limits)
    return tuple(screens)


def _bounds(axis: AxisSpec, limits: Sequence[Limit]) -> tuple[float | None, float | None, list[Limit]]:
    """Lower and upper bound (display units) the screens put on a property axis, and the limits used."""
    if not axis.is_property:
        return None, None, []
    used = [lim for lim in limits if lim.symbol == axis.text and not lim.is_rating]
    lows = [_display_value(lim.symbol, lim.value, axis.units) for lim in used if lim.op == ">="]
    highs = [_display_value(lim.symbol, lim.value, axis.units) for lim in used if lim.op == "<="]
    return (max(lows) if lows else None), (min(highs) if highs else None), used


def _draw_pass_region(
    fig: go.Figure,
    x: AxisSpec,
    y: AxisSpec,
    xb: tuple[float | None, float | None],
    yb: tuple[float | None, float | None],
    box: tuple[float, float, float, float],
) -> None:
    """Shade the pass region and draw each bound as a dashed line labelled with its screen."""
    u0, u1, v0, v1 = box
    xl = xb[0] if xb[0] is not None else _to_data(u0, x.log)
    xh = xb[1] if xb[1] is not None else _to_data(u1, x.log)
    yl = yb[0] if yb[0] is not None else _to_data(v0, y.log)
    yh = yb[1] if yb[1] is not None else _to_data(v1, y.log)
    if xl < xh and yl < yh:
        fig.add_trace(
            go.Scatter(
                x=[xl, xh, xh, xl, xl],
                y=[yl, yl, yh, yh, yl],
                mode="lines",
                fill="toself",
                fillcolor=PASS_FILL,
                line={"width": 0},
                hoverinfo="skip",
                name="pass region (screens)",
                legendgroup="pass",
                uid="pass-region",
                meta={"role": "pass-region", "x": [xb[0], xb[1]], "y": [yb[0], yb[1]]},
            )
        )
    first = True
    for axis, bounds, which in ((x, xb, "x"), (y, yb, "y")):
        for value, op in zip(bounds, (">=", "<="), strict=True):
            if value is None:
                continue
            if which == "x":
                xs, ys = [value, value], [_to_data(v0, y.log), _to_data(v1, y.log)]
            else:
                xs, ys = [_to_data(u0, x.log), _to_data(u1, x.log)], [value, value]
            fig.add_trace(
                go.Scatter(
                    x=xs,
                    y=ys,
                    mode="lines",
                    line={"color": BOUND_COLOUR, "width": 1.4, "dash": "dot"},
                    hoverinfo="skip",
                    name="screen bound",
                    legendgroup="pass",
                    showlegend=first,
                    uid=f"bound-{which}-{'low' if op == '>=' else 'high'}",
                    meta={"role": "screen-bound", "axis": which, "op": op, "value": value},
                )
            )
            first = False
            sign = "≥" if op == ">=" else "≤"
            text = f"{axis.label} {sign} {format_number(value)} {axis.unit}".rstrip()
            if which == "x":
                pos = {
                    "x": _log_or_linear(value, x.log),
                    "y": v1,
                    "yanchor": "top",
                    "xanchor": "left" if op == ">=" else "right",
                    "xshift": 3 if op == ">=" else -3,
                }
            else:
                pos = {
                    "x": u0,
                    "y": _log_or_linear(value, y.log),
                    "xanchor": "left",
                    "yanchor": "bottom" if op == ">=" else "top",
                    "xshift": 3,
                }
            fig.add_annotation(
                **pos,
                text=text,
                showarrow=False,
                font={"size": 11, "color": BOUND_COLOUR},
                bgcolor="rgba(255, 255, 255, 0.8)",
                name=f"bound-{which}-{op}",
            )


# --------------------------------------------------------------------------- the charts


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
        at: index value of the main line instead, in the chart's display units. With neither,
            the line passes through the first highlighted class, else the median class.
        screens: limits to draw as the pass region (and to screen with when ``table`` has no
            ``status`` column).
        highlight: ids of the shortlist, best first; they are ringed and named.
        title: chart title (escaped).
        steps, factor: parallel index lines at value × factor^k for k = −steps … steps.

    Raises:
        InputError: unknown axis, unit system, class id or an index that cannot be drawn.
        ExpressionError: an axis or index expression that cannot be parsed.
    """
    units = _check_units(units)
    xa, ya = axis_spec(x, units, "x axis"), axis_spec(y, units, "y axis")
    limits = _limits_of(screens)
    if limits and "status" not in table.columns:
        table = apply_screens(table.reset_index(drop=True), Screens(limits=limits))
    if (through is not None or at is not None) and index is None:
        raise InputError(
            "index line", "through= or at= was given without an index", "an index such as E^0.5/rho"
        )
    if through is not None and at is not None:
        raise InputError("index line", f"both through={through!r} and at={at!r} were given", "one of the two")
    line = index_line(index, xa, ya) if index is not None else None
    xv, yv = axis_values(table, xa), axis_values(table, ya)
    classes, skipped = _gather(table, xv, yv, xa.log, ya.log, (xa.label, xa.unit), (ya.label, ya.unit))
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
        f"{_esc(PROPERTIES[y].name.capitalize()) if ya.is_property else ya.label} against "
        f"{_esc(PROPERTIES[x].name) if xa.is_property else xa.label}"
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
            did_you_mean(target, where, fallback="the id of a class drawn on the chart"),
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
    typed = getattr(selection, "expression", None)
    derivations = tuple(getattr(selection, "derivations", ()))
    exponents = parse(typed).monomial() if typed else None
    ranking: Any = typed if exponents is not None else (derivations[0] if derivations and not typed else None)
    if x is None or y is None:
        powers = exponents[1] if exponents is not None else (derivations[0].exponents if ranking else None)
        dx, dy = default_axes(powers) if powers else ("rho", "E")
        x, y = x or dx, y or dy
    units = units or getattr(selection.spec, "units", "si") or "si"
    shortlist = selection.shortlist
    highlight = [str(v) for v in shortlist["id"].head(max(top, 0))] if "id" in shortlist.columns else []
    chosen = index if index is not None else ranking
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
    )


def tradeoff_chart(
    points: pd.DataFrame,
    x: str,
    y: str,
    front_ids: Sequence[str] | None = None,
    penalty_lines: Sequence[tuple[float, float, float]] | None = None,
    *,
    log: bool = True,
    x_title: str | None = None,
    y_title: str | None = None,
    title: str | None = None,
) -> go.Figure:
    """A trade-off chart of two objectives (e.g. mass against cost of the sized parts).

    Args:
        points: one row per candidate with ``name``, ``family``, optional ``id``, ``status``,
            ``reasons``, ``rank``, the two objective columns ``x`` and ``y`` and optionally
            their ranges ``{x}_low``/``{x}_high``, ``{y}_low``/``{y}_high`` (drawn as boxes;
            without them each box is the point itself).
        x, y: the objective columns, both to be minimised.
        front_ids: ids (or index labels without an ``id`` column) on the Pareto front; they
            are ringed, named and joined in order of ``x``.
        penalty_lines: lines of constant penalty ``Z = a·x + b·y``, each given as ``(a, b, Z)``;
            straight on linear axes, curves on log axes.
        log: log axes (default) or linear.
        x_title, y_title: axis titles with units, e.g. ``"mass (kg)"`` (escaped).
        title: chart title (escaped).

    Raises:
        InputError: a named column is missing or no candidate has finite values.
    """
    for col in (x, y):
        if col not in points.columns:
            raise InputError(
                "trade-off chart", f"no column {col!r}", f"one of: {', '.join(map(str, points.columns))}"
            )
    table = points if "id" in points.columns else points.assign(id=[str(i) for i in points.index])
    table = table.reset_index(drop=True)
    values = {}
    for col in (x, y):
        v = table[col].to_numpy(dtype=float)
        lo = table[f"{col}_low"].to_numpy(dtype=float) if f"{col}_low" in table.columns else v
        hi = table[f"{col}_high"].to_numpy(dtype=float) if f"{col}_high" in table.columns else v
        values[col] = (np.minimum(lo, hi), np.maximum(lo, hi), v)
    xt, yt = _esc(x_title or x), _esc(y_title or y)
    classes, skipped = _gather(table, values[x], values[y], log, log, (_esc(x), ""), (_esc(y), ""))
    if not classes.ids:
        raise InputError(
            "trade-off chart", f"no candidate has finite values of {x} and {y}", "sized candidates"
        )
    x_extent = _extent([classes.x_low], [classes.x_high], log)
    y_extent = _extent([classes.y_low], [classes.y_high], log)
    fig = go.Figure()
    for a, b, z in penalty_lines or ():
        _draw_penalty(fig, float(a), float(b), float(z), (*x_extent, *y_extent), log)
    _draw_classes(fig, classes)
    front = [str(f) for f in front_ids or ()]
    where = {cid: i for i, cid in enumerate(classes.ids)}
    members = sorted((where[f] for f in front if f in where), key=lambda i: classes.x_mid[i])
    if members:
        fig.add_trace(
            go.Scatter(
                x=[float(classes.x_mid[i]) for i in members],
                y=[float(classes.y_mid[i]) for i in members],
                mode="lines",
                line={"color": SHORTLIST_COLOUR, "width": 1.6},
                hoverinfo="skip",
                name="Pareto front",
                legendgroup="shortlist",
                uid="front",
                meta={"role": "front", "ids": [_esc(classes.ids[i]) for i in members]},
            )
        )
    _label_shortlist(fig, classes, [classes.ids[i] for i in members], log, log, (*x_extent, *y_extent))
    _note_skipped(fig, skipped, f"no finite {x} or {y}")
    subtitle = f"{len(classes.ids)} candidates; lower-left is better" + (
        f"; {len(members)} on the Pareto front" if members else ""
    )
    _base_layout(
        fig,
        _esc(title) if title else f"{yt} against {xt}",
        subtitle,
        _axis_layout(_AxisLook(xt, log), x_extent),
        _axis_layout(_AxisLook(yt, log), y_extent),
    )
    fig.update_layout(
        meta={"chart": "tradeoff", "drawn": len(classes.ids), "skipped": [_esc(s) for s in skipped]}
    )
    return fig


def _draw_penalty(
    fig: go.Figure, a: float, b: float, z: float, box: tuple[float, float, float, float], log: bool
) -> None:
    """One line of constant penalty a·x + b·y = z across the plotted box (a curve on log axes)."""
    u0, u1, v0, v1 = box
    if not all(math.isfinite(t) for t in (a, b, z)) or (a == 0 and b == 0):
        raise InputError(
            "penalty line",
            f"({a!r}, {b!r}, {z!r}) is not a line",
            "(a, b, Z) for Z = a·x + b·y, a or b non-zero",
        )
    if log:
        grid = np.logspace(u0, u1, 240)
        if b == 0:
            xs, ys = np.full(2, z / a), np.array([10**v0, 10**v1])
        else:
            xs, ys = grid, (z - a * grid) / b
        with np.errstate(invalid="ignore", divide="ignore"):
            inside = (xs > 0) & (ys >= 10**v0) & (ys <= 10**v1) & (xs >= 10**u0) & (xs <= 10**u1)
        xs, ys = xs[inside], ys[inside]
    else:
        seg = _clip_line(a, b, z, box)
        xs, ys = (
            (np.array([seg[0][0], seg[1][0]]), np.array([seg[0][1], seg[1][1]]))
            if seg
            else (np.array([]),) * 2
        )
    if len(xs) < 2:
        return
    fig.add_trace(
        go.Scatter(
            x=xs.tolist(),
            y=ys.tolist(),
            mode="lines",
            line={"color": "#6A3D9A", "width": 1.2, "dash": "dash"},
            hoverinfo="skip",
            name=f"penalty Z = {format_number(a)}·x + {format_number(b)}·y",
            legendgroup="penalty",
            showlegend=not any(t.legendgroup == "penalty" for t in fig.data),
            uid=f"penalty-{len(fig.data)}",
            meta={"role": "penalty", "a": a, "b": b, "z": z},
        )
    )
    top = int(np.argmax(ys)) if a * b > 0 else len(xs) - 1
    fig.add_annotation(
        x=float(_log_or_linear(xs[top], log)),
        y=float(_log_or_linear(ys[top], log)),
        text=f"Z = {format_number(z)}",
        showarrow=False,
        xanchor="left",
        yanchor="bottom",
        font={"size": 11, "color": "#6A3D9A"},
        name="penalty-label",
    )


# --------------------------------------------------------------------------- output


def write_chart(
    fig: go.Figure, path: str | Path, *, width: int = 1100, height: int = 760, scale: float = 2.0
) -> Path:
    """Write a chart: ``.html`` (self-contained, works offline) or ``.png``/``.svg``/``.pdf``.

    Images are rendered by kaleido in a headless Chromium, with MathJax off. Every file is
    written atomically.

    Raises:
        OutputError: unknown extension, missing folder, or no Chromium/kaleido for images.
    """
    from selector.outputs.files import write_bytes_atomic

    path = Path(path)
    fmt = path.suffix.lower().lstrip(".")
    folder = path.parent if str(path.parent) else Path(".")
    if fmt not in ("html", *IMAGE_FORMATS):
        raise OutputError(
            str(path), f"unknown chart format {path.suffix or '(none)'!r}; expected .html, .png, .svg or .pdf"
        )
    if not folder.is_dir():
        raise OutputError(str(path), f"folder {str(folder)!r} does not exist")
    if fmt == "html":
        text = fig.to_html(
            include_plotlyjs=True,
            include_mathjax=False,
            full_html=True,
            config={
                "displaylogo": False,
                "responsive": True,
                "toImageButtonOptions": {"filename": path.stem, "width": width, "height": height},
            },
        )
        write_bytes_atomic(path, text.encode("utf-8"))
        return path
    write_bytes_atomic(path, _render_image(fig, fmt, width, height, scale, str(path)))
    return path


def _render_image(fig: go.Figure, fmt: str, width: int, height: int, scale: float, where: str) -> bytes:
    """PNG/SVG/PDF bytes from kaleido (≥ 1), MathJax disabled; OutputError when it cannot run."""
    advice = "install Chromium (Debian: apt-get install chromium) or write the chart as .html"
    try:
        import kaleido
        from kaleido.errors import ChromeNotFoundError
    except ImportError:
        raise OutputError(
            where, f"writing .{fmt} needs the kaleido package; pip install kaleido, or write .html"
        ) from None
    try:
        data = kaleido.calc_fig_sync(
            fig.to_dict(),
            opts={"format": fmt, "width": width, "height": height, "scale": scale},
            kopts={"mathjax": False},
        )
    except ChromeNotFoundError:
        raise OutputError(where, f"no Chromium browser found to render .{fmt}; {advice}") from None
    except (RuntimeError, OSError) as exc:
        raise OutputError(where, f"Chromium could not render .{fmt} ({exc}); {advice}") from None
    if not isinstance(data, bytes | bytearray) or not data:
        raise OutputError(where, f"the renderer returned no .{fmt} image; {advice}")
    return bytes(data)
