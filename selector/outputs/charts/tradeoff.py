"""The trade-off chart: two objectives of the sized parts, the Pareto front and penalty lines."""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np
import pandas as pd
import plotly.graph_objects as go

from selector.errors import InputError
from selector.inputs.units import format_number
from selector.outputs.charts.axes import (
    _axis_layout,
    _AxisLook,
    _base_layout,
    _extent,
    _log_or_linear,
    range_texts,
)
from selector.outputs.charts.classes import _draw_classes, _gather
from selector.outputs.charts.guides import _clip_line
from selector.outputs.charts.labels import _label_shortlist, _note_skipped
from selector.outputs.charts.markup import _esc
from selector.outputs.charts.style import SHORTLIST_COLOUR


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
    hover = {col: (_esc(col), range_texts(values[col][0], values[col][1], "")) for col in (x, y)}
    classes, skipped = _gather(table, values[x], values[y], log, log, hover[x], hover[y])
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
