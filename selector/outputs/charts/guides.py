"""Index lines (a merit index on two axes, its parallels and winning side) and the pass region."""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
import plotly.graph_objects as go

from selector.errors import InputError
from selector.inputs.expressions import parse
from selector.inputs.properties import DERIVED_PROPERTIES, PROPERTIES
from selector.inputs.units import format_number
from selector.outputs.charts.axes import AxisSpec, _log_or_linear, _to_data, monomial_unit, shown_value
from selector.outputs.charts.markup import (
    _esc,
    _expression_html,
    _monomial_html,
    _number_html,
    _plain,
    _short,
    symbol_html,
)
from selector.outputs.charts.style import BOUND_COLOUR, INDEX_COLOUR, PASS_FILL
from selector.pipeline.screen import Limit, Screens


@dataclass(frozen=True)
class IndexLine:
    """A merit index on the chart's axes: ``I = coef · X^alpha · Y^beta``.

    Attributes:
        alpha, beta: powers of the x- and y-axis quantities.
        coef: constant factor, from the axes' display units to the index's.
        label: the index written for the chart (HTML).
        unit: the unit the index is shown in (HTML), the shortlist table's
            (``display_units.index_unit``), so a line's value is the number the table shows.
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
        if s not in PROPERTIES and s not in DERIVED_PROPERTIES:
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


def index_line(index: Any, x: AxisSpec, y: AxisSpec, values: np.ndarray | None = None) -> IndexLine:
    """Write an index as ``coef · X^alpha · Y^beta`` over the two plotted axis quantities.

    With X = x·Π s^p and Y = y·Π s^q the index Π s^e must satisfy e = alpha·p + beta·q
    for every symbol s; the line of constant index then has log–log slope −alpha/beta
    (E^1/2/ρ on E against ρ: alpha = −1, beta = 1/2, slope 2). ``coef`` turns the axes'
    display values into the index in its display unit; ``values`` (the index in stored
    units, e.g. a shortlist's) choose that unit's prefix as the shortlist table does.

    Raises:
        InputError: the index is not a monomial, needs a property on neither axis,
            cannot be written with the two axes, an axis is not on a log scale or is
            shown in an offset unit.
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
    for axis, power, which in ((x, alpha, "x"), (y, beta, "y")):
        if power and not math.isfinite(axis.factor):
            raise InputError(
                f"{which} axis",
                f"{axis.text} is shown in an offset unit ({_plain(axis.unit)})",
                "index lines over a temperature need --units si",
            )
    unit, shown = monomial_unit(powers, x.units, values)
    scale = coef * x.coef ** (-alpha) * y.coef ** (-beta)
    axes_to_index = x.factor ** (-alpha) * y.factor ** (-beta)
    return IndexLine(alpha, beta, shown * scale * axes_to_index, text, unit)


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
    lows = [float(shown_value(lim.symbol, lim.value, axis.units)) for lim in used if lim.op == ">="]
    highs = [float(shown_value(lim.symbol, lim.value, axis.units)) for lim in used if lim.op == "<="]
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
                    "x": float(_log_or_linear(np.asarray(value), x.log)),
                    "y": v1,
                    "yanchor": "top",
                    "xanchor": "left" if op == ">=" else "right",
                    "xshift": 3 if op == ">=" else -3,
                }
            else:
                pos = {
                    "x": u0,
                    "y": float(_log_or_linear(np.asarray(value), y.log)),
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
